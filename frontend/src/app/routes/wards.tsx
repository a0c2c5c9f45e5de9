import { data, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { wardsQueries } from '@/features/wards/api/wards-api';
import { WardsScreen } from '@/features/wards/components/wards-screen';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '../hooks/use-current-site';
import { useRefreshSupply } from '../hooks/use-refresh-supply';
import { useSiteRoute } from '../hooks/use-site-route';
import { requireScreen } from '../route-guards';

export async function loader({ request, params }: LoaderFunctionArgs) {
  const me = await requireScreen(request, '/wards');
  const siteId = Number(params.siteId);
  if (!me.sites.some((s) => s.id === siteId)) throw data({ message: 'This site is not one of yours, or does not exist.' }, { status: 404 });
  await Promise.all([
    queryClient.ensureQueryData(wardsQueries.site(siteId)),
    queryClient.ensureQueryData(wardsQueries.scenarios(siteId)),
    queryClient.ensureQueryData(wardsQueries.deviceFlows()),
  ]).catch(() => undefined);
  return null;
}

export function Component() {
  const me = useMe();
  const siteId = Number(useParams().siteId);
  const site = useSiteRoute(siteId, (id) => `/sites/${id}/wards`);
  const refresh = useRefreshSupply();
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title="Wards"
        description={site ? `The wards of ${site.name}: their demand, the scenarios of the forecasts, and the device flows.` : undefined}
      />
      <WardsScreen siteId={siteId} timeZone={site?.timeZone ?? 'UTC'} roles={me.user.roles} onSupplyChanged={refresh} />
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
