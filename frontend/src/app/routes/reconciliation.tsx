import type { LoaderFunctionArgs } from 'react-router-dom';
import { ReconciliationPanel } from '@/features/reconciliation/components/reconciliation-panel';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/states';
import { useCurrentSite, useMe } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/reconciliation');
  return null;
}

/** Measured use against the demand model, per source and per ward, and the correction to accept. */
export function Component() {
  const me = useMe();
  const { site } = useCurrentSite();
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Measured use"
        description={site ? `What ${site.name} really uses, from tank readings, store counts, meters and ward reports, against the demand model.` : undefined}
      />
      {site ? (
        <ReconciliationPanel key={site.id} siteId={site.id} roles={me.user.roles} />
      ) : (
        <Card>
          <EmptyState title="No site granted yet">An administrator grants you a site first.</EmptyState>
        </Card>
      )}
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
