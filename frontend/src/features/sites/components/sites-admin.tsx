import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { formatNumber } from '@/lib/format';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { sitesQueries, type Site } from '../api/sites-api';
import { SiteForm } from './site-form';

const col = createColumnHelper<Site>();
const KIND: Record<Site['kind'], string> = { hospital: 'Hospital', clinic: 'Clinic', other: 'Other' };
const REF_SHORT: Record<Site['referenceCode'], string> = { '15C': '15 °C', '21C': '70 °F', '0C': '0 °C' };

export function SitesAdmin({ onSiteSaved }: { onSiteSaved?: () => void }) {
  const sites = useQuery(sitesQueries.list());
  const [editing, setEditing] = useState<Site | 'new' | null>(null);
  const columns = useMemo(
    () => [
      col.accessor('name', {
        header: 'Site',
        cell: (info) => (
          <span>
            <span className="font-bold">{info.getValue()}</span>
            <span className="block text-xs text-fg-muted">{KIND[info.row.original.kind]}</span>
          </span>
        ),
      }),
      col.accessor('timeZone', { header: 'Time zone', meta: { className: 'hidden md:table-cell' } }),
      col.accessor('beds', { header: 'Beds', meta: { numeric: true, className: 'hidden sm:table-cell' }, cell: (info) => formatNumber(info.getValue()) }),
      col.accessor('referenceCode', { header: 'Free gas at', meta: { className: 'hidden md:table-cell' }, cell: (info) => REF_SHORT[info.getValue()] }),
      col.accessor('unitSystem', {
        header: 'Units',
        meta: { className: 'hidden md:table-cell' },
        cell: (info) => (info.getValue() === 'us' ? 'US' : 'Metric'),
      }),
      col.accessor('cylinderColours', {
        header: 'Colours',
        meta: { className: 'hidden lg:table-cell' },
        cell: (info) => (info.getValue() === 'CGA_C9' ? 'CGA C-9' : 'ISO 32'),
      }),
      col.accessor('storeTemperatureC', { header: 'Store', meta: { numeric: true }, cell: (info) => `${formatNumber(info.getValue(), 1)} °C` }),
      col.accessor('atmosphericBar', {
        header: 'Atmosphere',
        meta: { numeric: true, className: 'hidden sm:table-cell' },
        cell: (info) => (
          <span className="whitespace-nowrap">
            {formatNumber(info.getValue(), 4)} bar
            <span className="block text-xs text-fg-muted">{formatNumber(info.row.original.altitudeM)} m</span>
          </span>
        ),
      }),
      col.accessor('currency', { header: 'Currency', meta: { className: 'hidden md:table-cell' } }),
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
    ],
    [],
  );
  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <p className="text-sm text-fg-muted">Each site has its own units, reference conditions and store temperature.</p>
        <Button onClick={() => setEditing('new')}>
          <Icon name="plus" />
          New site
        </Button>
      </div>
      {sites.isPending ? (
        <LoadingState label="Loading sites…" />
      ) : sites.isError ? (
        <ErrorState error={sites.error} onRetry={() => sites.refetch()} />
      ) : sites.data.length === 0 ? (
        <EmptyState title="No sites yet" icon="sites">
          Add the hospital or clinic whose supply you plan.
        </EmptyState>
      ) : (
        <DataTable caption="Sites" columns={columns} data={sites.data} getRowId={(s) => String(s.id)} />
      )}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New site' : `Edit ${editing?.name ?? ''}`} wide>
        {editing !== null && <SiteForm initial={editing === 'new' ? null : editing} onDone={() => setEditing(null)} onSaved={onSiteSaved} />}
      </Dialog>
    </Card>
  );
}
