import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { catalogueQueries } from '@/features/catalogue/api/catalogue-api';
import { CylinderTypesAdmin } from '@/features/catalogue/components/cylinder-types-admin';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useCurrentSite, useMe } from '../../hooks/use-current-site';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/cylinder-types');
  await Promise.all([queryClient.ensureQueryData(catalogueQueries.cylinderTypes()), queryClient.ensureQueryData(catalogueQueries.gases())]);
  return null;
}

export function Component() {
  const me = useMe();
  const { site } = useCurrentSite();
  const canEdit = me.user.roles.includes('administrator');
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title="Cylinder types"
        description="Named by water capacity and fill pressure. Contents when full are computed by the gas engine at 15 °C: real gas, with the ideal-gas figure beside it."
      />
      <PanelBoundary title="Cylinder types">
        <CylinderTypesAdmin canEdit={canEdit} colourConvention={site?.cylinderColours ?? 'ISO32'} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
