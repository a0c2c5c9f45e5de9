import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { pickSite } from '@/lib/current-site';
import { usageQueries } from '@/features/usage/api/usage-api';
import { DailyReportScreen } from '@/features/usage/components/daily-report';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/states';
import { useCurrentSite, useMe } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  const me = await requireScreen(request, '/report');
  // most ward leads hold one site: start its ward list now (another site's comes with the screen)
  const site = pickSite(me.sites, null);
  if (site && me.sites.length === 1) void queryClient.ensureQueryData(usageQueries.status(site.id)).catch(() => undefined);
  return null;
}

/** The ward's daily usage report (ward leads, on a phone at the bedside; facilities managers too). */
export function Component() {
  const me = useMe();
  const { site } = useCurrentSite();
  return (
    <div className="mx-auto flex w-full max-w-3xl flex-col gap-4">
      <PageHeader title="Daily report" description={site ? `Oxygen use on your ward, ${site.name}. Under a minute: check the counts and file.` : undefined} />
      {site ? (
        <DailyReportScreen key={site.id} site={site} roles={me.user.roles} />
      ) : (
        <Card>
          <EmptyState title="No site granted yet">An administrator grants you a site; its wards then report here.</EmptyState>
        </Card>
      )}
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
