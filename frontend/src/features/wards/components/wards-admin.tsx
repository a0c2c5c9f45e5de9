import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { formatNumber } from '@/lib/format';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { wardsQueries, type Ward } from '../api/wards-api';
import { DEPARTMENT_LABEL } from '../lib/ward-labels';
import { WardForm } from './ward-form';

const col = createColumnHelper<Ward>();

/** The wards of a site, each linking to its demand; facilities managers add and change them. */
export function WardsAdmin({
  siteId,
  canEdit,
  onSaved,
  grantedOnly = false,
}: {
  siteId: number;
  canEdit: boolean;
  onSaved?: () => void;
  grantedOnly?: boolean;
}) {
  const wards = useQuery(wardsQueries.site(siteId));
  const [editing, setEditing] = useState<Ward | 'new' | null>(null);
  const columns = useMemo(
    () => [
      col.accessor('name', {
        header: 'Ward',
        cell: (info) => (
          <span>
            <Link to={`/wards/${info.row.original.id}`} className="font-bold text-primary underline-offset-2 hover:underline">
              {info.getValue()}
            </Link>
            <span className="block text-xs text-fg-muted">{DEPARTMENT_LABEL[info.row.original.department] ?? info.row.original.department}</span>
            {!info.row.original.active && (
              <Badge tone="neutral" className="mt-1">
                Closed
              </Badge>
            )}
          </span>
        ),
      }),
      col.accessor('beds', { header: 'Beds', meta: { numeric: true }, cell: (info) => formatNumber(info.getValue()) }),
      col.accessor('leakagePercent', {
        header: 'Leakage',
        meta: { numeric: true, className: 'hidden sm:table-cell' },
        cell: (info) => `${formatNumber(info.getValue(), 1)} %`,
      }),
      ...(canEdit
        ? [
            col.display({
              id: 'edit',
              header: () => <span className="sr-only">Edit</span>,
              cell: (info) => (
                <Button variant="ghost" size="sm" onClick={() => setEditing(info.row.original)} aria-label={`Edit ${info.row.original.name}`}>
                  <Icon name="pencil" className="size-4" />
                  Edit
                </Button>
              ),
            }),
          ]
        : []),
    ],
    [canEdit],
  );
  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <p className="text-sm text-fg-muted">Open a ward for its therapy lines, its supply feeds and its modelled against measured use.</p>
        {canEdit && (
          <Button onClick={() => setEditing('new')}>
            <Icon name="plus" />
            New ward
          </Button>
        )}
      </div>
      {wards.isPending ? (
        <LoadingState label="Loading the wards…" />
      ) : wards.isError ? (
        <ErrorState error={wards.error} onRetry={() => wards.refetch()} />
      ) : wards.data.length === 0 && grantedOnly ? (
        <EmptyState title="No wards granted to you yet" icon="bed">
          You see the wards an administrator grants you. Ask an administrator to grant your wards.
        </EmptyState>
      ) : wards.data.length === 0 ? (
        <EmptyState title="No wards on this site yet" icon="sites">
          {canEdit ? 'Add the wards and departments that use medical gases.' : 'A facilities manager adds the wards of a site.'}
        </EmptyState>
      ) : (
        <DataTable caption="Wards" columns={columns} data={wards.data} getRowId={(w) => String(w.id)} />
      )}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New ward' : `Edit ${editing?.name ?? ''}`}>
        {editing !== null && <WardForm siteId={siteId} initial={editing === 'new' ? null : editing} onDone={() => setEditing(null)} onSaved={onSaved} />}
      </Dialog>
    </Card>
  );
}
