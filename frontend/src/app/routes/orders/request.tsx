import type { LoaderFunctionArgs } from 'react-router-dom';
import { useParams } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { ordersQueries } from '@/features/orders/api/orders-api';
import { RequestDetailView } from '@/features/orders/components/request-detail';
import { OrdersTabs } from '@/features/orders/components/orders-tabs';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireScreen(request, '/orders');
  void queryClient.ensureQueryData(ordersQueries.request(Number(params.id))).catch(() => undefined);
  return null;
}

export function Component() {
  const id = Number(useParams().id);
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title={`Request R-${id}`} />
      <OrdersTabs />
      <PanelBoundary title="Request">
        <RequestDetailView id={id} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
