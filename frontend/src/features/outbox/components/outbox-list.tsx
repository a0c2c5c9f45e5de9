import { useMemo } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, formatRelative } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Badge, type Tone } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Field, Select } from '@/components/ui/field';
import type { IconName } from '@/components/ui/icons';
import { Icon } from '@/components/ui/icons';
import { Pagination } from '@/components/ui/pagination';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { OUTBOX_FILTERS, outboxListParams, outboxQueries, useRetryOutbox, type OutboxFilter, type OutboxMessage, type OutboxPage } from '../api/outbox-api';

const col = createColumnHelper<OutboxMessage>();

const KIND_TEXT: Record<OutboxMessage['kind'], string> = {
  purchase_order: 'Purchase order',
  rejection: 'Rejection notice',
  alert: 'Stock alert',
  digest: 'Daily digest',
};

/** Keyed by a value that comes from the address bar, so a Map: `__proto__` or `constructor` finds nothing. */
const FILTER_TEXT: ReadonlyMap<OutboxFilter, string> = new Map<OutboxFilter, string>([
  ['all', 'All messages'],
  ['attention', 'Needs attention'],
  ['pending', 'Queued'],
  ['failed', 'Failed'],
  ['sent', 'Sent'],
]);

function filterText(f: OutboxFilter): string {
  return FILTER_TEXT.get(f) ?? 'All messages';
}

function filterLabel(f: OutboxFilter, counts: OutboxPage['counts'] | undefined): string {
  if (!counts || f === 'all') return filterText(f);
  return `${filterText(f)} (${counts[f]})`;
}

/** A message's state in words, colour and a shape: queued, queued but failing, sent, failed. */
function outboxStatus(m: OutboxMessage): { text: string; tone: Tone; icon: IconName } {
  if (m.status === 'sent') return { text: 'Sent', tone: 'ok', icon: 'check' };
  if (m.status === 'failed') return { text: 'Failed', tone: 'critical', icon: 'alert' };
  if (m.needsAttention) return { text: 'Queued, retrying', tone: 'warn', icon: 'clock' };
  return { text: 'Queued', tone: 'info', icon: 'clock' };
}

/** What is due next for a message: the next try while queued, when it went once sent. */
function NextTry({ m }: { m: OutboxMessage }) {
  if (m.status === 'sent') return <span className="text-fg-muted">Sent {formatDateTime(m.sentAt)}</span>;
  if (m.status === 'failed') return <span className="text-fg-muted">No more tries</span>;
  return (
    <span>
      <span className="tabular">{formatDateTime(m.nextAttemptAt)}</span>
      <span className="block text-xs text-fg-muted">{formatRelative(m.nextAttemptAt)}</span>
    </span>
  );
}

/** The organisation's outgoing mail queue, newest first, with a retry for messages that failed. */
export function OutboxList() {
  const [search, setSearch] = useSearchParams();
  const params = outboxListParams(search);
  const list = useQuery(outboxQueries.list(params));
  const retry = useRetryOutbox();
  const columns = useMemo(
    () => [
      col.accessor('subject', {
        header: 'Message',
        enableSorting: false,
        cell: (i) => {
          const m = i.row.original;
          return (
            <span className="block sm:min-w-48">
              <span className="font-bold wrap-anywhere">{m.subject || '(no subject)'}</span>
              <span className="block text-xs wrap-anywhere text-fg-muted">
                {KIND_TEXT[m.kind] ?? m.kind} · to {m.to}
                {m.cc ? `, copy to ${m.cc}` : ''}
              </span>
              {m.purchaseOrderId !== null && (
                <Link to={`/orders/purchase-orders/${m.purchaseOrderId}`} className="text-xs font-bold text-primary underline-offset-2 hover:underline">
                  Open the purchase order
                </Link>
              )}
              <span className="block text-xs text-fg-muted">Queued {formatDateTime(m.createdAt)}</span>
              {m.status === 'pending' && <span className="block text-xs text-fg-muted md:hidden">Next try {formatDateTime(m.nextAttemptAt)}</span>}
              {m.lastError && <span className="mt-1 block text-xs wrap-anywhere text-critical lg:hidden">Last error: {m.lastError}</span>}
            </span>
          );
        },
      }),
      col.accessor('status', {
        header: 'Status',
        enableSorting: false,
        cell: (i) => {
          const s = outboxStatus(i.row.original);
          return (
            <span>
              <Badge tone={s.tone} icon={s.icon}>
                {s.text}
              </Badge>
              <span className="block text-xs text-fg-muted sm:hidden">
                {i.row.original.attempts} {i.row.original.attempts === 1 ? 'attempt' : 'attempts'}
              </span>
            </span>
          );
        },
      }),
      col.accessor('attempts', {
        header: 'Attempts',
        enableSorting: false,
        meta: { numeric: true, className: 'hidden sm:table-cell' },
        cell: (i) => <span className="tabular">{i.getValue()}</span>,
      }),
      col.accessor('nextAttemptAt', {
        header: 'Next try',
        enableSorting: false,
        meta: { className: 'hidden md:table-cell' },
        cell: (i) => <NextTry m={i.row.original} />,
      }),
      col.accessor('lastError', {
        header: 'Last error',
        enableSorting: false,
        meta: { className: 'hidden lg:table-cell' },
        cell: (i) =>
          i.getValue() ? <span className="block max-w-80 text-xs wrap-anywhere text-critical">{i.getValue()}</span> : <span className="text-fg-muted">–</span>,
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (i) => {
          const m = i.row.original;
          if (m.status === 'sent' || !(m.status === 'failed' || m.needsAttention)) return null;
          return (
            <div className="flex justify-end">
              <Button
                variant="secondary"
                size="sm"
                busy={retry.isPending && retry.variables === m.id}
                aria-label={`Retry “${m.subject}”`}
                onClick={() =>
                  retry.mutate(m.id, {
                    onSuccess: () => toast.ok('Queued again: it goes with the next pass of the mail worker.'),
                    onError: (e) => toast.error(errorMessage(e)),
                  })
                }
              >
                <Icon name="refresh" className="size-4" />
                Retry
              </Button>
            </div>
          );
        },
      }),
    ],
    [retry],
  );
  const counts = list.data?.counts;
  return (
    <Card>
      <div className="flex flex-wrap items-end justify-between gap-3 border-b border-line px-4 py-3">
        <Field label="Show" className="w-64">
          {(c) => (
            <Select {...c} value={params.status} onChange={(e) => setSearch({ status: e.target.value }, { replace: true })}>
              {OUTBOX_FILTERS.map((f) => (
                <option key={f} value={f}>
                  {filterLabel(f, counts)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Button variant="secondary" onClick={() => list.refetch()} busy={list.isFetching && !list.isPending}>
          <Icon name="refresh" />
          Refresh
        </Button>
      </div>
      {counts && counts.attention > 0 && params.status !== 'attention' && (
        <p className="flex flex-wrap items-center gap-2 border-b border-line bg-critical-soft px-4 py-2 text-sm">
          <Icon name="alert" className="size-4 text-critical" />
          <span>
            <span className="font-bold">{counts.attention === 1 ? '1 message needs' : `${counts.attention} messages need`} attention</span> (failed, or still
            failing after several tries).
          </span>
          <button
            type="button"
            className="min-h-11 font-bold text-primary underline-offset-2 hover:underline"
            onClick={() => setSearch({ status: 'attention' }, { replace: true })}
          >
            Show them
          </button>
        </p>
      )}
      {list.isPending ? (
        <LoadingState label="Loading the outbox…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => list.refetch()} />
      ) : (
        <>
          <DataTable
            caption="Outgoing mail"
            columns={columns}
            data={list.data.items}
            getRowId={(m) => String(m.id)}
            sorting={[]}
            empty={
              <EmptyState
                title={
                  params.status === 'all'
                    ? 'No outgoing mail yet'
                    : params.status === 'attention'
                      ? 'Nothing needs attention'
                      : `No ${filterText(params.status).toLowerCase()} messages`
                }
                icon={params.status === 'all' ? 'mail' : 'check'}
              >
                {params.status === 'all'
                  ? 'Purchase orders, rejection notices and stock alerts are queued here before they are sent.'
                  : 'Every message was sent or is waiting for its next try.'}
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
