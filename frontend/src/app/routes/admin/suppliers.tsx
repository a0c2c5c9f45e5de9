import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { catalogueQueries } from '@/features/catalogue/api/catalogue-api';
import { SuppliersAdmin } from '@/features/catalogue/components/suppliers-admin';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useCurrentSite, useMe } from '../../hooks/use-current-site';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/suppliers');
  await Promise.all([
    queryClient.ensureQueryData(catalogueQueries.suppliers()),
    queryClient.ensureQueryData(catalogueQueries.cylinderTypes()),
    queryClient.ensureQueryData(catalogueQueries.gases()),
  ]);
  return null;
}

export function Component() {
  const me = useMe();
  const { site } = useCurrentSite();
  const canEdit = me.user.roles.includes('administrator');
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title="Suppliers"
        description={
          canEdit
            ? 'Who delivers, how fast, and at what price. Purchase orders go to the order e-mail.'
            : 'Who delivers, how fast, and at what price. An administrator keeps this list.'
        }
      />
      <PanelBoundary title="Suppliers">
        <SuppliersAdmin canEdit={canEdit} defaultCurrency={site?.currency ?? 'GBP'} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
