import { useMemo } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Field, Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { Pagination } from '@/components/ui/pagination';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { ordersQueries, useScanNow, type RequestListParams, type RequestRow } from '../api/orders-api';
import { OrderStatusBadge } from './status-badge';
import { formatOrderQuantity } from './format-order';

const col = createColumnHelper<RequestRow>();

const FILTERS: [string, string][] = [
  ['open', 'Open'],
  ['submitted', 'Awaiting approval'],
  ['draft', 'Drafts'],
  ['ordered', 'Ordered'],
  ['closed', 'Closed'],
  ['all', 'All'],
];

export function requestListParams(search: URLSearchParams): RequestListParams {
  return { status: search.get('status') ?? 'open', page: Math.max(1, Number(search.get('page') ?? 1) || 1) };
}

/** Reorder requests with their status, newest first, awaiting approval on top. */
export function RequestsList({ canScan }: { canScan: boolean }) {
  const [search, setSearch] = useSearchParams();
  const params = requestListParams(search);
  const list = useQuery(ordersQueries.requests(params));
  const scan = useScanNow();
  const columns = useMemo(
    () => [
      col.accessor('reference', {
        header: 'Request',
        enableSorting: false,
        cell: (i) => (
          <span>
            <Link
              to={`/orders/requests/${i.row.original.id}`}
              className="inline-flex min-h-11 items-center font-bold text-primary underline-offset-2 hover:underline"
            >
              {i.getValue()}
            </Link>
            <span className="block text-xs text-fg-muted">
              {i.row.original.origin === 'auto' ? 'Raised by Plenum' : `By ${i.row.original.requestedBy?.name ?? 'hand'}`}
            </span>
          </span>
        ),
      }),
      col.accessor('sourceName', {
        header: 'Source',
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
        cell: (i) => (i.getValue() === null ? <span className="text-fg-muted">no price</span> : formatMoney(i.getValue(), i.row.original.currency)),
      }),
      col.accessor('status', {
        header: 'Status',
        enableSorting: false,
        cell: (i) => <OrderStatusBadge status={i.getValue()} text={i.row.original.statusText} />,
      }),
      col.accessor('createdAt', {
        header: 'Raised',
        enableSorting: false,
        meta: { className: 'hidden md:table-cell' },
        cell: (i) => <span className="tabular">{formatDateTime(i.getValue())}</span>,
      }),
      col.accessor('order', {
        header: 'Order',
        enableSorting: false,
        meta: { className: 'hidden sm:table-cell' },
        cell: (i) =>
          i.getValue() ? (
            <Link to={`/orders/purchase-orders/${i.getValue()!.id}`} className="font-bold text-primary underline-offset-2 hover:underline">
              {i.getValue()!.poNumber}
            </Link>
          ) : (
            '–'
          ),
      }),
    ],
    [],
  );
  return (
    <Card>
      <div className="flex flex-wrap items-end justify-between gap-3 border-b border-line px-4 py-3">
        <Field label="Show" className="w-56">
          {(c) => (
            <Select {...c} value={params.status} onChange={(e) => setSearch({ status: e.target.value })}>
              {FILTERS.map(([v, l]) => (
                <option key={v} value={v}>
                  {l}
                </option>
              ))}
            </Select>
          )}
        </Field>
        {canScan && (
          <Button
            variant="secondary"
            busy={scan.isPending}
            onClick={() =>
              scan.mutate(undefined, {
                onSuccess: (r) =>
                  toast.ok(
                    r.raised.length
                      ? `${r.raised.length} new request${r.raised.length === 1 ? '' : 's'} raised from the forecast`
                      : 'No source crosses its reorder level without an open request',
                  ),
                onError: (e) => toast.error(errorMessage(e)),
              })
            }
          >
            <Icon name="refresh" />
            Check forecasts now
          </Button>
        )}
      </div>
      {list.isPending ? (
        <LoadingState label="Loading requests…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => list.refetch()} />
      ) : (
        <>
          <DataTable
            caption="Reorder requests"
            columns={columns}
            data={list.data.items}
            getRowId={(r) => String(r.id)}
            sorting={[]}
            empty={
              <EmptyState title="No requests here" icon="check">
                Plenum raises a request when a source’s forecast crosses its reorder level; facilities managers can raise one from a source’s page.
              </EmptyState>
            }
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
