import type { LoaderFunctionArgs } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import { queryClient } from '@/lib/query-client';
import { authQueries } from '@/features/auth/api/auth-api';
import { sitesQueries } from '@/features/sites/api/sites-api';
import { OrganisationCard } from '@/features/sites/components/organisation-card';
import { SitesAdmin } from '@/features/sites/components/sites-admin';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/sites');
  await queryClient.ensureQueryData(sitesQueries.list());
  return null;
}

export function Component() {
  const qc = useQueryClient();
  // the session carries the granted sites and the organisation's name: refresh it after an edit
  const refreshSession = () => void qc.invalidateQueries({ queryKey: authQueries.all() });
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Sites" description="The hospitals and clinics of your organisation, with the units and conditions their figures use." />
      <PanelBoundary title="Sites">
        <SitesAdmin onSiteSaved={refreshSession} />
      </PanelBoundary>
      <PanelBoundary title="The organisation">
        <OrganisationCard onRenamed={refreshSession} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
