import type { LoaderFunctionArgs } from 'react-router-dom';
import { parseListParams } from '@/lib/list-params';
import { queryClient } from '@/lib/query-client';
import { auditQueries } from '@/features/audit/api/audit-api';
import { AUDIT_EXTRAS, AUDIT_LIST_DEFAULTS, AuditLog } from '@/features/audit/components/audit-log';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/audit');
  await queryClient.ensureQueryData(auditQueries.list(parseListParams(new URL(request.url).searchParams, AUDIT_LIST_DEFAULTS, AUDIT_EXTRAS)));
  return null;
}

export function Component() {
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Audit log" description="Every change and every sign-in, with what it was before and after." />
      <PanelBoundary title="The audit log">
        <AuditLog />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
