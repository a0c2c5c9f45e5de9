import { useCallback } from 'react';
import { data, useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { sourcesQueries } from '@/features/sources/api/sources-api';
import { SourceDetailScreen } from '@/features/sources/components/source-detail';
import { useMe } from '../hooks/use-current-site';
import { useRefreshSupply } from '../hooks/use-refresh-supply';
import { requireMe } from '../route-guards';

function idOf(params: { id?: string }): number {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) throw data({ message: 'There is no such source.' }, { status: 404 });
  return id;
}

function scenarioOf(search: URLSearchParams): number | null {
  const v = Number(search.get('scenario'));
  return Number.isInteger(v) && v > 0 ? v : null;
}

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireMe(request);
  const id = idOf(params);
  // start the forecast now; the screen shows its own loading and error states
  void queryClient.ensureQueryData(sourcesQueries.detail(id, scenarioOf(new URL(request.url).searchParams))).catch(() => undefined);
  return null;
}

/** Anyone signed in may read a source of their sites; the forms inside follow the roles. */
export function Component() {
  const me = useMe();
  const id = idOf(useParams());
  const [search, setSearch] = useSearchParams();
  const refresh = useRefreshSupply();
  const onScenarioChange = useCallback(
    (scenario: number | null) =>
      setSearch(
        (prev) => {
          const next = new URLSearchParams(prev);
          if (scenario) next.set('scenario', String(scenario));
          else next.delete('scenario');
          return next;
        },
        { replace: true, preventScrollReset: true },
      ),
    [setSearch],
  );
  return (
    <SourceDetailScreen
      key={id}
      id={id}
      scenarioId={scenarioOf(search)}
      onScenarioChange={onScenarioChange}
      roles={me.user.roles}
      meId={me.user.id}
      onSupplyChanged={refresh}
    />
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
