import { useCallback } from 'react';
import { data, useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import type { Role } from '@common/api/roles';
import { queryClient } from '@/lib/query-client';
import { catalogueQueries } from '@/features/catalogue/api/catalogue-api';
import { sourcesQueries } from '@/features/sources/api/sources-api';
import { SourcesAdmin } from '@/features/sources/components/sources-admin';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useMe } from '../hooks/use-current-site';
import { useRefreshSupply } from '../hooks/use-refresh-supply';
import { useSiteRoute } from '../hooks/use-site-route';
import { requireScreen } from '../route-guards';

const SUPPLIER_READERS: Role[] = ['administrator', 'purchasing_officer', 'facilities_manager'];

function siteIdOf(params: { siteId?: string }): number {
  const id = Number(params.siteId);
  if (!Number.isInteger(id) || id <= 0) throw data({ message: 'There is no such site.' }, { status: 404 });
  return id;
}

export async function loader({ request, params }: LoaderFunctionArgs) {
  const me = await requireScreen(request, '/sources');
  const siteId = siteIdOf(params);
  if (!me.sites.some((s) => s.id === siteId)) throw data({ message: 'This site is not one of yours, or does not exist.' }, { status: 404 });
  const catalogue: Promise<unknown>[] = [queryClient.ensureQueryData(catalogueQueries.cylinderTypes())];
  if (me.user.roles.some((r) => SUPPLIER_READERS.includes(r))) catalogue.push(queryClient.ensureQueryData(catalogueQueries.suppliers()));
  await Promise.all([queryClient.ensureQueryData(sourcesQueries.site(siteId)), ...catalogue]).catch(() => undefined);
  return null;
}

export function Component() {
  const me = useMe();
  const params = useParams();
  const siteId = Number(params.siteId);
  const site = useSiteRoute(siteId, (id) => `/sites/${id}/sources`);
  const refresh = useRefreshSupply();
  const [search, setSearch] = useSearchParams();
  const fm = me.user.roles.includes('facilities_manager');
  const readsSuppliers = me.user.roles.some((r) => SUPPLIER_READERS.includes(r));
  const types = useQuery(catalogueQueries.cylinderTypes());
  const suppliers = useQuery({ ...catalogueQueries.suppliers(), enabled: readsSuppliers });
  const editParam = search.get('edit');
  const editing = editParam === 'new' ? 'new' : editParam && Number.isInteger(Number(editParam)) ? Number(editParam) : null;
  const onEdit = useCallback(
    (id: number | 'new' | null) =>
      setSearch(
        (prev) => {
          const next = new URLSearchParams(prev);
          if (id === null) next.delete('edit');
          else next.set('edit', String(id));
          return next;
        },
        { replace: true },
      ),
    [setSearch],
  );
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Sources" description={site ? `The supply sources of ${site.name}: their settings, reorder rules and forecast basis.` : undefined} />
      <PanelBoundary title="The sources">
        <SourcesAdmin
          siteId={siteId}
          canEdit={fm}
          cylinderTypes={types.data ?? []}
          suppliers={readsSuppliers ? (suppliers.data ?? []) : null}
          editing={editing}
          onEdit={onEdit}
          onSaved={refresh}
        />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
