import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { importsQueries } from '@/features/imports/api/imports-api';
import { UploadsScreen } from '@/features/imports/components/uploads-screen';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/states';
import { useCurrentSite } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/uploads');
  void queryClient.ensureQueryData(importsQueries.kinds()).catch(() => undefined);
  return null;
}

/** CSV uploads of readings, telemetry, store counts and historic usage, and exports of every table. */
export function Component() {
  const { site } = useCurrentSite();
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Uploads"
        description={
          site ? `Tank telemetry, flow meters, store counts and historic usage for ${site.name}: checked row by row before anything is stored.` : undefined
        }
      />
      {site ? (
        <UploadsScreen key={site.id} siteId={site.id} />
      ) : (
        <Card>
          <EmptyState title="No site granted yet">An administrator grants you a site first.</EmptyState>
        </Card>
      )}
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
