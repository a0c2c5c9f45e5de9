import { data, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { queryClient } from '@/lib/query-client';
import { sourcesQueries } from '@/features/sources/api/sources-api';
import { wardsQueries } from '@/features/wards/api/wards-api';
import { WardDetailScreen } from '@/features/wards/components/ward-detail';
import { useMe } from '../hooks/use-current-site';
import { useRefreshSupply } from '../hooks/use-refresh-supply';
import { requireMe } from '../route-guards';

function idOf(params: { id?: string }): number {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) throw data({ message: 'There is no such ward.' }, { status: 404 });
  return id;
}

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireMe(request);
  const id = idOf(params);
  try {
    const detail = await queryClient.ensureQueryData(wardsQueries.detail(id));
    // the feeds editor offers the sources of the ward's site
    await queryClient.ensureQueryData(sourcesQueries.site(detail.ward.siteId));
  } catch {
    // the screen shows its own error state
  }
  void queryClient.ensureQueryData(wardsQueries.deviceFlows()).catch(() => undefined);
  return null;
}

/** Anyone signed in may read a ward of their sites; editing follows the roles. */
export function Component() {
  const me = useMe();
  const id = idOf(useParams());
  const refresh = useRefreshSupply();
  const ward = useQuery(wardsQueries.detail(id));
  const siteId = ward.data?.ward.siteId;
  const sources = useQuery({ ...sourcesQueries.site(siteId ?? 0), enabled: siteId !== undefined });
  return <WardDetailScreen key={id} id={id} roles={me.user.roles} sources={sources.data ?? []} onSupplyChanged={refresh} />;
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
