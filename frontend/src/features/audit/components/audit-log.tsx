import { AUDIT_SORT_KEYS } from '@common/schemas/common.schema';
import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { formatDateTime } from '@/lib/format';
import { useListParams } from '@/lib/list-params';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { Select } from '@/components/ui/field';
import { Pagination } from '@/components/ui/pagination';
import { SearchInput } from '@/components/ui/search-input';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { auditQueries, type AuditRow } from '../api/audit-api';
import { AuditDiff } from './audit-diff';

const col = createColumnHelper<AuditRow>();
export const AUDIT_LIST_DEFAULTS = { pageSize: 50, sort: 'at', dir: 'desc' as const, sortKeys: AUDIT_SORT_KEYS };
export const AUDIT_EXTRAS = ['entity'] as const;

const ENTITIES = [
  'session',
  'user',
  'password',
  'organisation',
  'site',
  'cylinder_type',
  'supplier',
  'supply_source',
  'source_reading',
  'ward',
  'therapy_lines',
  'ward_feeds',
  'scenario',
  'scheduled_delivery',
  'device_flows',
];
const words = (s: string) => s.replace(/_/g, ' ');

export function AuditLog() {
  const { params, sorting, setSorting, setPage, setQuery, update } = useListParams(AUDIT_LIST_DEFAULTS, AUDIT_EXTRAS);
  const audit = useQuery(auditQueries.list(params));
  const [open, setOpen] = useState<AuditRow | null>(null);
  const columns = useMemo(
    () => [
      col.accessor('at', { header: 'When', cell: (info) => <span className="tabular sm:whitespace-nowrap">{formatDateTime(info.getValue())}</span> }),
      col.accessor('userEmail', { header: 'Who', cell: (info) => <span className="wrap-anywhere">{info.getValue() ?? 'system'}</span> }),
      col.accessor('action', { header: 'Action', cell: (info) => words(info.getValue()) }),
      col.accessor('entity', {
        header: 'Record',
        cell: (info) => (
          <span>
            {words(info.getValue())}
            {info.row.original.entityId && <span className="text-fg-muted"> #{info.row.original.entityId}</span>}
          </span>
        ),
      }),
      col.display({
        id: 'changes',
        header: () => <span className="sr-only">Changes</span>,
        cell: (info) =>
          info.row.original.before !== null || info.row.original.after !== null ? (
            <Button variant="ghost" size="sm" onClick={() => setOpen(info.row.original)}>
              Changes
            </Button>
          ) : null,
      }),
    ],
    [],
  );
  return (
    <Card>
      <div className="flex flex-wrap items-center gap-3 border-b border-line px-4 py-3">
        <SearchInput value={params.q ?? ''} onChange={setQuery} label="Search e-mail, action or record" />
        <Select aria-label="Record kind" value={String(params.entity ?? '')} onChange={(e) => update({ entity: e.target.value })} className="w-full sm:w-56">
          <option value="">All records</option>
          {ENTITIES.map((e) => (
            <option key={e} value={e}>
              {words(e)}
            </option>
          ))}
        </Select>
      </div>
      {audit.isPending ? (
        <LoadingState label="Loading the audit log…" />
      ) : audit.isError ? (
        <ErrorState error={audit.error} onRetry={() => audit.refetch()} />
      ) : (
        <>
          <DataTable
            caption="Audit log"
            columns={columns}
            data={audit.data.items}
            getRowId={(r) => r.id}
            sorting={sorting}
            onSortingChange={setSorting}
            empty={<EmptyState title="No entries match" icon="audit" />}
          />
          <Pagination page={audit.data.page} pageSize={audit.data.pageSize} total={audit.data.total} onPage={setPage} busy={audit.isPlaceholderData} />
        </>
      )}
      <Dialog
        open={open !== null}
        onClose={() => setOpen(null)}
        title={open ? `${words(open.action)} · ${words(open.entity)}${open.entityId ? ` #${open.entityId}` : ''}` : ''}
        description={open ? `${formatDateTime(open.at)} by ${open.userEmail ?? 'system'}` : undefined}
        wide
      >
        {open && <AuditDiff before={open.before} after={open.after} />}
      </Dialog>
    </Card>
  );
}
