import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { capacityQueries } from '@/features/capacity/api/capacity-api';
import { CapacityScreen } from '@/features/capacity/components/capacity-screen';
import { PageHeader } from '@/components/ui/page-header';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/states';
import { useCurrentSite, useMe } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  const me = await requireScreen(request, '/capacity');
  // the zone form needs the rule sets; the check itself depends on the site chosen on screen
  if (me.user.roles.includes('biomedical_engineer')) void queryClient.ensureQueryData(capacityQueries.ruleSets()).catch(() => undefined);
  return null;
}

export function Component() {
  const me = useMe();
  const { site } = useCurrentSite();
  if (!site) {
    return (
      <>
        <PageHeader title="Capacity" />
        <Card>
          <EmptyState title="No site is granted to you">An administrator grants the sites you work on.</EmptyState>
        </Card>
      </>
    );
  }
  return (
    <CapacityScreen
      key={site.id}
      siteId={site.id}
      siteName={site.name}
      timeZone={site.timeZone}
      canEdit={me.user.roles.includes('biomedical_engineer')}
      engineerName={me.user.name}
    />
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
