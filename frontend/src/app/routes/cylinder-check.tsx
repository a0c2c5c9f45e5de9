import type { LoaderFunctionArgs } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { isGasCode } from '@common/gas/gases';
import { queryClient } from '@/lib/query-client';
import { catalogueQueries } from '@/features/catalogue/api/catalogue-api';
import { CylinderCheck } from '@/features/cylinder-check/components/cylinder-check';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { useCurrentSite } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/cylinder-check');
  await Promise.all([queryClient.ensureQueryData(catalogueQueries.cylinderTypes()), queryClient.ensureQueryData(catalogueQueries.gases())]).catch(
    () => undefined,
  );
  return null;
}

export function Component() {
  const { site } = useCurrentSite();
  const types = useQuery(catalogueQueries.cylinderTypes());
  const gases = useQuery(catalogueQueries.gases());
  return (
    <div>
      <PageHeader
        title="Cylinder check"
        description={
          site ? `How long a cylinder lasts, and what it holds. ${site.name}: ${site.unitSystem === 'us' ? 'psi and °F' : 'bar and °C'}.` : undefined
        }
      />
      {!site ? (
        <Card>
          <EmptyState title="No site granted yet">An administrator grants you a site; its store temperature and units set up the check.</EmptyState>
        </Card>
      ) : gases.isPending || types.isPending ? (
        <Card>
          <LoadingState label="Loading the cylinder catalogue…" />
        </Card>
      ) : gases.isError ? (
        <Card>
          <ErrorState error={gases.error} onRetry={() => gases.refetch()} />
        </Card>
      ) : (
        <>
          {types.isError && (
            <Alert tone="warn" className="mb-4" title="The cylinder types could not be loaded">
              Enter the water capacity by hand; the check works without the catalogue.
            </Alert>
          )}
          <CylinderCheck
            // a new site means new units and a new store temperature: start afresh
            key={site.id}
            site={site}
            gases={gases.data.filter((g) => isGasCode(g.code))}
            cylinderTypes={types.data ?? []}
          />
        </>
      )}
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
