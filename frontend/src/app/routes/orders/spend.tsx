import type { LoaderFunctionArgs } from 'react-router-dom';
import { SpendView } from '@/features/orders/components/spend-view';
import { OrdersTabs } from '@/features/orders/components/orders-tabs';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/orders');
  return null;
}

export function Component() {
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Orders" description="Spend on gas and cylinder rental, by month, site, gas and supplier (all sites you can see)." />
      <OrdersTabs />
      <PanelBoundary title="Spend">
        <SpendView siteId={null} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
