import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { formatKg, formatMoney, formatNumber } from '@/lib/format';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { SearchInput } from '@/components/ui/search-input';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { catalogueQueries, type Supplier } from '../api/catalogue-api';
import { SupplierForm } from './supplier-form';

const col = createColumnHelper<Supplier>();

function formatLeadTime(hours: number): string {
  if (hours < 48) return `${formatNumber(hours)} h`;
  return `${formatNumber(hours / 24, 1)} days`;
}

export function SuppliersAdmin({ canEdit, defaultCurrency }: { canEdit: boolean; defaultCurrency: string }) {
  const suppliers = useQuery(catalogueQueries.suppliers());
  const types = useQuery(catalogueQueries.cylinderTypes());
  const gases = useQuery(catalogueQueries.gases());
  const [filter, setFilter] = useState('');
  const [open, setOpen] = useState<Supplier | 'new' | null>(null);

  const columns = useMemo(
    () => [
      col.accessor('name', { header: 'Supplier', cell: (info) => <span className="font-bold">{info.getValue()}</span> }),
      col.accessor('orderEmail', {
        header: 'Orders to',
        meta: { className: 'hidden md:table-cell' },
        cell: (info) => (
          <span className="wrap-anywhere">
            {info.getValue()}
            {info.row.original.phone && <span className="block text-xs whitespace-nowrap text-fg-muted">{info.row.original.phone}</span>}
          </span>
        ),
      }),
      col.accessor('leadTimeHours', { header: 'Lead time', meta: { numeric: true }, cell: (info) => formatLeadTime(info.getValue()) }),
      col.accessor('rentalMinorPerCylinderDay', {
        header: 'Rental / cylinder-day',
        meta: { numeric: true, className: 'hidden sm:table-cell' },
        cell: (info) => formatMoney(info.getValue(), info.row.original.currency),
      }),
      col.accessor('minBulkDropKg', {
        header: 'Min. bulk drop',
        meta: { numeric: true, className: 'hidden md:table-cell' },
        cell: (info) => (info.getValue() ? formatKg(info.getValue()) : '–'),
      }),
      col.accessor((s) => s.prices.length, { id: 'prices', header: 'Prices', meta: { numeric: true, className: 'hidden sm:table-cell' } }),
      col.accessor('active', {
        header: 'Status',
        meta: { className: 'hidden sm:table-cell' },
        cell: (info) => (info.getValue() ? <Badge tone="ok">Active</Badge> : <Badge>Inactive</Badge>),
      }),
      col.display({
        id: 'open',
        header: () => <span className="sr-only">Open</span>,
        cell: (info) => (
          <Button variant="ghost" size="sm" onClick={() => setOpen(info.row.original)} aria-label={`${canEdit ? 'Edit' : 'View'} ${info.row.original.name}`}>
            <Icon name={canEdit ? 'pencil' : 'chevronRight'} className="size-4" />
            {canEdit ? 'Edit' : 'View'}
          </Button>
        ),
      }),
    ],
    [canEdit],
  );

  const current = open === 'new' ? null : open;
  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <SearchInput value={filter} onChange={setFilter} label="Filter suppliers" delayMs={0} />
        {canEdit && (
          <Button onClick={() => setOpen('new')}>
            <Icon name="plus" />
            New supplier
          </Button>
        )}
      </div>
      {suppliers.isPending ? (
        <LoadingState label="Loading suppliers…" />
      ) : suppliers.isError ? (
        <ErrorState error={suppliers.error} onRetry={() => suppliers.refetch()} />
      ) : suppliers.data.length === 0 ? (
        <EmptyState title="No suppliers yet" icon="supplier">
          {canEdit ? 'Add the companies that deliver your gases, with their lead times and prices.' : 'An administrator adds the suppliers.'}
        </EmptyState>
      ) : (
        <DataTable
          caption="Suppliers"
          columns={columns}
          data={suppliers.data}
          getRowId={(s) => String(s.id)}
          globalFilter={filter}
          empty={<EmptyState title="No supplier matches the filter" />}
        />
      )}
      <Dialog open={open !== null} onClose={() => setOpen(null)} title={open === 'new' ? 'New supplier' : (current?.name ?? '')} wide>
        {open !== null &&
          (canEdit ? (
            <SupplierForm
              initial={current}
              gases={gases.data ?? []}
              cylinderTypes={types.data ?? []}
              defaultCurrency={defaultCurrency}
              onDone={() => setOpen(null)}
            />
          ) : (
            current && (
              <SupplierPrices
                supplier={current}
                typeName={(id) => {
                  const t = types.data?.find((x) => x.id === id);
                  return t ? `${gases.data?.find((g) => g.code === t.gasCode)?.name ?? t.gasCode} · ${t.name}` : `#${id}`;
                }}
                gasName={(code) => gases.data?.find((g) => g.code === code)?.name ?? code}
              />
            )
          ))}
      </Dialog>
    </Card>
  );
}

function SupplierPrices({ supplier, typeName, gasName }: { supplier: Supplier; typeName: (id: number) => string; gasName: (code: string) => string }) {
  if (supplier.prices.length === 0) return <EmptyState title="No prices recorded" />;
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">Prices of {supplier.name}</caption>
      <thead>
        <tr className="border-b border-line-strong text-fg-muted">
          <th scope="col" className="py-2 pr-3">
            Item
          </th>
          <th scope="col" className="py-2 text-right">
            Price
          </th>
        </tr>
      </thead>
      <tbody>
        {supplier.prices.map((p) => (
          <tr key={p.id} className="border-b border-line last:border-b-0">
            <td className="py-2 pr-3">{p.unit === 'kg' ? `${gasName(p.gasCode ?? '')}, per kg` : `${typeName(p.cylinderTypeId ?? 0)}, per cylinder`}</td>
            <td className="py-2 text-right tabular">{formatMoney(p.priceMinor, supplier.currency)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
