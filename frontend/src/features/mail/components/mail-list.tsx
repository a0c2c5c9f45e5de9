import { MAIL_SORT_KEYS } from '@common/schemas/common.schema';
import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { formatBytes, formatDateTime } from '@/lib/format';
import { useListParams } from '@/lib/list-params';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Icon } from '@/components/ui/icons';
import { Pagination } from '@/components/ui/pagination';
import { SearchInput } from '@/components/ui/search-input';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { mailQueries, type MailSummary } from '../api/mail-api';

const col = createColumnHelper<MailSummary>();
export const MAIL_LIST_DEFAULTS = { pageSize: 25, sortKeys: MAIL_SORT_KEYS };

export function MailList() {
  const { params, setPage, setQuery } = useListParams(MAIL_LIST_DEFAULTS);
  const mail = useQuery(mailQueries.list(params));
  // the server lists newest first and does not sort otherwise: the headers are not sort buttons
  const columns = useMemo(
    () => [
      col.accessor('receivedAt', {
        header: 'Received',
        enableSorting: false,
        cell: (info) => <span className="tabular sm:whitespace-nowrap">{formatDateTime(info.getValue())}</span>,
      }),
      col.accessor('subject', {
        header: 'Subject',
        enableSorting: false,
        cell: (info) => (
          <span>
            <Link
              to={`/admin/mail/${info.row.original.id}`}
              className="inline-flex min-h-11 items-center font-bold text-primary underline-offset-2 hover:underline"
            >
              {info.getValue() || '(no subject)'}
            </Link>
            <span className="block text-xs wrap-anywhere text-fg-muted md:hidden">to {info.row.original.to}</span>
          </span>
        ),
      }),
      col.accessor('to', {
        header: 'To',
        enableSorting: false,
        cell: (info) => <span className="wrap-anywhere">{info.getValue()}</span>,
        meta: { className: 'hidden md:table-cell' },
      }),
      col.accessor('from', {
        header: 'From',
        enableSorting: false,
        cell: (info) => <span className="wrap-anywhere">{info.getValue()}</span>,
        meta: { className: 'hidden xl:table-cell' },
      }),
      col.accessor('attachments', {
        header: 'Files',
        enableSorting: false,
        meta: { numeric: true },
        cell: (info) =>
          info.getValue() > 0 ? (
            <span className="inline-flex items-center gap-1">
              <Icon name="paperclip" className="size-4" />
              {info.getValue()}
              <span className="sr-only">{info.getValue() === 1 ? 'attachment' : 'attachments'}</span>
            </span>
          ) : (
            '–'
          ),
      }),
      col.accessor('sizeBytes', {
        header: 'Size',
        enableSorting: false,
        meta: { numeric: true, className: 'hidden sm:table-cell' },
        cell: (info) => formatBytes(info.getValue()),
      }),
    ],
    [],
  );
  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <SearchInput value={params.q ?? ''} onChange={setQuery} label="Search subject, sender or recipient" />
        <Button variant="secondary" onClick={() => mail.refetch()} busy={mail.isFetching && !mail.isPending}>
          <Icon name="refresh" />
          Check for new mail
        </Button>
      </div>
      {mail.isPending ? (
        <LoadingState label="Loading mail…" />
      ) : mail.isError ? (
        <ErrorState error={mail.error} onRetry={() => mail.refetch()} />
      ) : (
        <>
          <DataTable
            caption="Mail received by the local mail service"
            columns={columns}
            data={mail.data.items}
            getRowId={(m) => String(m.id)}
            sorting={[]}
            empty={
              <EmptyState title={params.q ? `No message matches “${params.q}”` : 'No mail yet'} icon="mail">
                {params.q ? null : 'Purchase orders and alerts that Plenum sends appear here.'}
              </EmptyState>
            }
          />
          <Pagination page={mail.data.page} pageSize={mail.data.pageSize} total={mail.data.total} onPage={setPage} busy={mail.isPlaceholderData} />
        </>
      )}
    </Card>
  );
}
