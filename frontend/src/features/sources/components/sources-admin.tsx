import { useMemo } from 'react';
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
import { sourcesQueries, type Source } from '../api/sources-api';
import { describeReorderRule, gasName, SOURCE_TYPE_LABEL } from '../lib/source-labels';
import { SourceForm, type CylinderTypeOption, type SupplierOption } from './source-form';

const col = createColumnHelper<Source>();

/**
 * The supply sources of a site, each linking to its forecast. Facilities managers add and change
 * them; `editing` is kept by the caller (in the address), so "Settings" on a source page opens here.
 */
export function SourcesAdmin({
  siteId,
  canEdit,
  cylinderTypes,
  suppliers,
  editing,
  onEdit,
  onSaved,
}: {
  siteId: number;
  canEdit: boolean;
  cylinderTypes: CylinderTypeOption[];
  /** Null for those who may not read the supplier list (the column is left out). */
  suppliers: SupplierOption[] | null;
  editing: number | 'new' | null;
  onEdit: (id: number | 'new' | null) => void;
  onSaved?: () => void;
}) {
  const sources = useQuery(sourcesQueries.site(siteId));
  const columns = useMemo(() => {
    const typeName = (id: number | null) => cylinderTypes.find((c) => c.id === id)?.name;
    const supplierName = (id: number | null) => suppliers?.find((s) => s.id === id)?.name;
    return [
      col.accessor('name', {
        header: 'Source',
        cell: (info) => {
          const s = info.row.original;
          return (
            <span>
              <Link to={`/sources/${s.id}`} className="font-bold text-primary underline-offset-2 hover:underline">
                {s.name}
              </Link>
              <span className="block text-xs text-fg-muted">
                {gasName(s.gasCode)} · {SOURCE_TYPE_LABEL[s.type]}
              </span>
              {!s.active && (
                <Badge tone="neutral" className="mt-1">
                  Not in use
                </Badge>
              )}
            </span>
          );
        },
      }),
      col.display({
        id: 'size',
        header: 'Size',
        meta: { className: 'hidden sm:table-cell' },
        cell: (info) => {
          const s = info.row.original;
          if (s.type === 'bulk_liquid') return s.capacityKg ? `${formatNumber(s.capacityKg)} kg tank` : '–';
          const t = typeName(s.cylinderTypeId) ?? 'No cylinder type';
          return s.type === 'manifold' && s.cylindersPerBank ? `2 × ${s.cylindersPerBank} × ${t}` : t;
        },
      }),
      col.display({
        id: 'reorder',
        header: 'Reorder rule',
        meta: { className: 'hidden md:table-cell' },
        cell: (info) => describeReorderRule(info.row.original),
      }),
      ...(suppliers === null
        ? []
        : [
            col.display({
              id: 'supplier',
              header: 'Supplier',
              meta: { className: 'hidden lg:table-cell' },
              cell: (info) => {
                const s = info.row.original;
                return (
                  <span>
                    {supplierName(s.supplierId) ?? 'None'}
                    {s.leadTimeHours !== null && <span className="block text-xs text-fg-muted">lead time {s.leadTimeHours} h</span>}
                  </span>
                );
              },
            }),
          ]),
      col.accessor('forecastBasis', {
        header: 'Basis',
        meta: { className: 'hidden xl:table-cell' },
        cell: (info) =>
          info.getValue() === 'scaled'
            ? `Model × ${formatNumber(info.row.original.modelCorrectionFactor, 2)}`
            : info.getValue() === 'measured'
              ? 'Measured'
              : 'Model',
      }),
      ...(canEdit
        ? [
            col.display({
              id: 'edit',
              header: () => <span className="sr-only">Edit</span>,
              cell: (info) => (
                <Button variant="ghost" size="sm" onClick={() => onEdit(info.row.original.id)} aria-label={`Edit ${info.row.original.name}`}>
                  <Icon name="pencil" className="size-4" />
                  Edit
                </Button>
              ),
            }),
          ]
        : []),
    ];
  }, [cylinderTypes, suppliers, canEdit, onEdit]);

  const list = sources.data ?? [];
  const current = typeof editing === 'number' ? list.find((s) => s.id === editing) : undefined;
  const dialogOpen = canEdit && (editing === 'new' || current !== undefined);

  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <p className="text-sm text-fg-muted">Bulk tanks, manifolds, cylinder stores and emergency reserves. Open one for its forecast and readings.</p>
        {canEdit && (
          <Button onClick={() => onEdit('new')}>
            <Icon name="plus" />
            New source
          </Button>
        )}
      </div>
      {sources.isPending ? (
        <LoadingState label="Loading the sources…" />
      ) : sources.isError ? (
        <ErrorState error={sources.error} onRetry={() => sources.refetch()} />
      ) : list.length === 0 ? (
        <EmptyState title="No supply sources on this site yet" icon="cylinder">
          {canEdit ? 'Add the bulk tank, manifolds and cylinder stores that supply this site.' : 'A facilities manager adds the sources of a site.'}
        </EmptyState>
      ) : (
        <DataTable caption="Supply sources" columns={columns} data={list} getRowId={(s) => String(s.id)} />
      )}
      <Dialog open={dialogOpen} onClose={() => onEdit(null)} title={editing === 'new' ? 'New supply source' : `Edit ${current?.name ?? ''}`} wide>
        {dialogOpen && (
          <SourceForm
            key={String(editing)}
            siteId={siteId}
            initial={current ?? null}
            siteSources={list}
            cylinderTypes={cylinderTypes}
            suppliers={suppliers ?? []}
            onDone={() => onEdit(null)}
            onSaved={onSaved}
          />
        )}
      </Dialog>
    </Card>
  );
}
