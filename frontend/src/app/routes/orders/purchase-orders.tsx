import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { ordersQueries } from '@/features/orders/api/orders-api';
import { OrdersList, orderListParams } from '@/features/orders/components/orders-list';
import { OrdersTabs } from '@/features/orders/components/orders-tabs';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/orders');
  void queryClient.ensureQueryData(ordersQueries.orders(orderListParams(new URL(request.url).searchParams))).catch(() => undefined);
  return null;
}

export function Component() {
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Orders" description="Purchase orders e-mailed to suppliers, and their deliveries." />
      <OrdersTabs />
      <PanelBoundary title="Purchase orders">
        <OrdersList />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
