import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { formatKg, formatLitres } from '@/lib/format';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { GasSwatch, coloursFor } from '@/components/ui/gas-swatch';
import { Icon } from '@/components/ui/icons';
import { SearchInput } from '@/components/ui/search-input';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { catalogueQueries, type CylinderType, type Gas } from '../api/catalogue-api';
import { CylinderTypeForm } from './cylinder-type-form';

const col = createColumnHelper<CylinderType>();

export function CylinderTypesAdmin({ canEdit, colourConvention }: { canEdit: boolean; colourConvention: string }) {
  const types = useQuery(catalogueQueries.cylinderTypes());
  const gases = useQuery(catalogueQueries.gases());
  const [filter, setFilter] = useState('');
  const [editing, setEditing] = useState<CylinderType | 'new' | null>(null);

  const gasByCode = useMemo(() => new Map((gases.data ?? []).map((g) => [g.code, g])), [gases.data]);
  const columns = useMemo(
    () => [
      col.accessor((t) => gasByCode.get(t.gasCode)?.name ?? t.gasCode, {
        id: 'gas',
        header: 'Gas',
        cell: (info) => {
          const gas = gasByCode.get(info.row.original.gasCode);
          return gas ? <GasSwatch colours={coloursFor(gas, colourConvention)} label={gas.name} /> : info.getValue();
        },
      }),
      col.accessor('name', { header: 'Cylinder', cell: (info) => <span className="font-bold whitespace-nowrap">{info.getValue()}</span> }),
      col.accessor((t) => t.nominal?.freeGasL ?? null, {
        id: 'freeGas',
        header: 'Full: free gas',
        meta: { numeric: true },
        cell: (info) => {
          const n = info.row.original.nominal;
          if (!n) return '–';
          return (
            <span className="whitespace-nowrap">
              {formatLitres(n.freeGasL)}
              {n.idealFreeGasL !== null && <span className="block text-xs text-fg-muted">ideal {formatLitres(n.idealFreeGasL)}</span>}
            </span>
          );
        },
      }),
      col.accessor((t) => t.nominal?.massKg ?? null, {
        id: 'mass',
        header: 'Gas mass',
        meta: { numeric: true, className: 'hidden sm:table-cell' },
        cell: (info) => formatKg(info.getValue()),
      }),
      col.accessor('tareKg', { header: 'Tare', meta: { numeric: true, className: 'hidden md:table-cell' }, cell: (info) => formatKg(info.getValue()) }),
      col.accessor('material', { header: 'Material', meta: { className: 'hidden lg:table-cell' }, cell: (info) => info.getValue() || '–' }),
      col.accessor('active', {
        header: 'Status',
        meta: { className: 'hidden sm:table-cell' },
        cell: (info) => (info.getValue() ? <Badge tone="ok">Active</Badge> : <Badge>Retired</Badge>),
      }),
      ...(canEdit
        ? [
            col.display({
              id: 'edit',
              header: () => <span className="sr-only">Edit</span>,
              cell: (info) => (
                <Button
                  variant="ghost"
                  size="sm"
                  onClick={() => setEditing(info.row.original)}
                  aria-label={`Edit ${info.row.original.name} ${gasByCode.get(info.row.original.gasCode)?.name ?? ''}`}
                >
                  <Icon name="pencil" className="size-4" />
                  Edit
                </Button>
              ),
            }),
          ]
        : []),
    ],
    [gasByCode, colourConvention, canEdit],
  );

  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <SearchInput value={filter} onChange={setFilter} label="Filter cylinder types" delayMs={0} />
        {canEdit && (
          <Button onClick={() => setEditing('new')}>
            <Icon name="plus" />
            New cylinder type
          </Button>
        )}
      </div>
      {types.isPending ? (
        <LoadingState label="Loading cylinder types…" />
      ) : types.isError ? (
        <ErrorState error={types.error} onRetry={() => types.refetch()} />
      ) : types.data.length === 0 ? (
        <EmptyState title="No cylinder types yet" icon="cylinder">
          {canEdit
            ? 'Add the cylinders your supplier delivers: water capacity and fill pressure.'
            : 'An administrator adds the cylinders your supplier delivers.'}
        </EmptyState>
      ) : (
        <DataTable
          caption="Cylinder types"
          columns={columns}
          data={types.data}
          getRowId={(t) => String(t.id)}
          globalFilter={filter}
          empty={<EmptyState title="No cylinder type matches the filter" />}
        />
      )}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New cylinder type' : `Edit ${editing?.name ?? ''}`}>
        {editing !== null && (
          <CylinderTypeForm initial={editing === 'new' ? null : editing} gases={gases.data ?? ([] as Gas[])} onDone={() => setEditing(null)} />
        )}
      </Dialog>
    </Card>
  );
}
