import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { overviewQueries } from '@/features/overview/api/overview-api';
import { OverviewBoard } from '@/features/overview/components/overview-board';
import { ButtonLink } from '@/components/ui/button';
import { Card, CardBody } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useCurrentSite, useMe } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/');
  // start the fetch now, but let the screen show while the forecast answers (the board has its own states)
  void queryClient.ensureQueryData(overviewQueries.summary()).catch(() => undefined);
  return null;
}

function greeting(): string {
  const h = new Date().getHours();
  if (h < 5) return 'Night shift';
  if (h < 12) return 'Good morning';
  if (h < 18) return 'Good afternoon';
  return 'Good evening';
}

export function Component() {
  const me = useMe();
  const { site } = useCurrentSite();
  const wardLead = me.user.roles.includes('ward_lead');
  return (
    <div className="flex flex-col gap-6">
      <PageHeader title="Today" description={`${greeting()}, ${me.user.name.split(' ')[0]}.${site ? ` ${site.name}.` : ''}`} />
      {wardLead && (
        <Card className="border-2 border-primary bg-primary-soft">
          <CardBody className="flex flex-col gap-3 sm:flex-row sm:items-center sm:justify-between">
            <div className="flex items-start gap-3">
              <Icon name="cylinder" className="mt-1 size-8 text-primary" />
              <div>
                <h2 className="text-xl">How long will this cylinder last?</h2>
                <p className="text-fg-muted">Gauge reading and flow in, time remaining out: for a transfer, or before the night.</p>
              </div>
            </div>
            <ButtonLink to="/cylinder-check" size="lg" className="w-full sm:w-auto">
              Cylinder check
              <Icon name="chevronRight" />
            </ButtonLink>
          </CardBody>
        </Card>
      )}
      <PanelBoundary title="The supply overview">
        <OverviewBoard />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
