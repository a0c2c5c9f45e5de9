import type { LoaderFunctionArgs } from 'react-router-dom';
import { useParams } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { ordersQueries } from '@/features/orders/api/orders-api';
import { OrderDetailView } from '@/features/orders/components/order-detail';
import { OrdersTabs } from '@/features/orders/components/orders-tabs';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireScreen(request, '/orders');
  void queryClient.ensureQueryData(ordersQueries.order(Number(params.id))).catch(() => undefined);
  return null;
}

export function Component() {
  const id = Number(useParams().id);
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Purchase order" />
      <OrdersTabs />
      <PanelBoundary title="Purchase order">
        <OrderDetailView id={id} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
