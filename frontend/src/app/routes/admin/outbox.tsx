import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { outboxListParams, outboxQueries } from '@/features/outbox/api/outbox-api';
import { OutboxList } from '@/features/outbox/components/outbox-list';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/outbox');
  void queryClient.ensureQueryData(outboxQueries.list(outboxListParams(new URL(request.url).searchParams))).catch(() => undefined);
  return null;
}

export function Component() {
  return (
    <div className="flex flex-col gap-5">
      <PageHeader
        title="Outbox"
        description="Mail waiting to go, sent and failed: purchase orders, rejection notices and alerts. A failed message can be sent again."
      />
      <PanelBoundary title="Outbox">
        <OutboxList />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
