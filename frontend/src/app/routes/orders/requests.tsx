import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { ordersQueries } from '@/features/orders/api/orders-api';
import { RequestsList, requestListParams } from '@/features/orders/components/requests-list';
import { OrdersTabs } from '@/features/orders/components/orders-tabs';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useMe } from '../../hooks/use-current-site';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/orders');
  void queryClient.ensureQueryData(ordersQueries.requests(requestListParams(new URL(request.url).searchParams))).catch(() => undefined);
  return null;
}

export function Component() {
  const me = useMe();
  const canScan = me.user.roles.some((r) => r === 'facilities_manager' || r === 'purchasing_officer');
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Orders" description="Reorder requests from the forecast or by hand, approvals, purchase orders and deliveries." />
      <OrdersTabs />
      <PanelBoundary title="Requests">
        <RequestsList canScan={canScan} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
