import { useMemo } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { formatDateTime, formatMoney } from '@/lib/format';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Field, Select } from '@/components/ui/field';
import { Pagination } from '@/components/ui/pagination';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { ordersQueries, type OrderRow, type RequestListParams } from '../api/orders-api';
import { OrderStatusBadge } from './status-badge';
import { formatOrderQuantity } from './format-order';

const col = createColumnHelper<OrderRow>();

export function orderListParams(search: URLSearchParams): RequestListParams {
  return { status: search.get('status') ?? 'all', page: Math.max(1, Number(search.get('page') ?? 1) || 1) };
}

/** Purchase orders by number, newest first. */
export function OrdersList() {
  const [search, setSearch] = useSearchParams();
  const params = orderListParams(search);
  const list = useQuery(ordersQueries.orders(params));
  const columns = useMemo(
    () => [
      col.accessor('poNumber', {
        header: 'Order',
        enableSorting: false,
        cell: (i) => (
          <Link
            to={`/orders/purchase-orders/${i.row.original.id}`}
            className="inline-flex min-h-11 items-center font-bold text-primary underline-offset-2 hover:underline"
          >
            {i.getValue()}
          </Link>
        ),
      }),
      col.accessor('sourceName', {
        header: 'For',
        enableSorting: false,
        cell: (i) => (
          <span>
            <span className="font-bold">{i.getValue()}</span>
            <span className="block text-xs text-fg-muted">
              {i.row.original.siteName} · {i.row.original.description}
            </span>
          </span>
        ),
      }),
      col.accessor('supplierName', { header: 'Supplier', enableSorting: false, meta: { className: 'hidden lg:table-cell' } }),
      col.accessor('quantity', {
        header: 'Quantity',
        enableSorting: false,
        meta: { numeric: true },
        cell: (i) => formatOrderQuantity(i.getValue(), i.row.original.unit),
      }),
      col.accessor('totalMinor', {
        header: 'Total',
        enableSorting: false,
        meta: { numeric: true },
        cell: (i) => formatMoney(i.getValue(), i.row.original.currency),
      }),
      col.accessor('windowStart', {
        header: 'Delivery from',
        enableSorting: false,
        meta: { className: 'hidden md:table-cell' },
        cell: (i) => <span className="tabular">{formatDateTime(i.getValue())}</span>,
      }),
      col.accessor('status', {
        header: 'Status',
        enableSorting: false,
        cell: (i) => <OrderStatusBadge status={i.getValue()} text={i.row.original.statusText} />,
      }),
    ],
    [],
  );
  return (
    <Card>
      <div className="flex flex-wrap items-end gap-3 border-b border-line px-4 py-3">
        <Field label="Show" className="w-56">
          {(c) => (
            <Select {...c} value={params.status} onChange={(e) => setSearch({ status: e.target.value })}>
              <option value="all">All</option>
              <option value="open">Awaiting delivery</option>
              <option value="delivered">Delivered</option>
              <option value="part_delivered">Delivered in part</option>
            </Select>
          )}
        </Field>
      </div>
      {list.isPending ? (
        <LoadingState label="Loading orders…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => list.refetch()} />
      ) : (
        <>
          <DataTable
            caption="Purchase orders"
            columns={columns}
            data={list.data.items}
            getRowId={(r) => String(r.id)}
            sorting={[]}
            empty={<EmptyState title="No purchase orders yet">An approved request becomes a numbered purchase order, e-mailed to the supplier.</EmptyState>}
          />
          <Pagination
            page={list.data.page}
            pageSize={list.data.pageSize}
            total={list.data.total}
            onPage={(p) => setSearch({ status: params.status, page: String(p) })}
            busy={list.isPlaceholderData}
          />
        </>
      )}
    </Card>
  );
}
