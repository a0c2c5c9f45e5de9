import type { LoaderFunctionArgs } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { parseListParams } from '@/lib/list-params';
import { queryClient } from '@/lib/query-client';
import { sitesQueries } from '@/features/sites/api/sites-api';
import { usersQueries } from '@/features/users/api/users-api';
import { approvalLimitQueries } from '@/features/users/api/approval-limits-api';
import { ApprovalLimits } from '@/features/users/components/approval-limits';
import { USERS_LIST_DEFAULTS, UsersAdmin } from '@/features/users/components/users-admin';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useMe } from '../../hooks/use-current-site';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/users');
  const params = parseListParams(new URL(request.url).searchParams, USERS_LIST_DEFAULTS);
  void queryClient.ensureQueryData(approvalLimitQueries.list()).catch(() => undefined);
  await Promise.all([queryClient.ensureQueryData(usersQueries.list(params)), queryClient.ensureQueryData(sitesQueries.list())]);
  return null;
}

export function Component() {
  const me = useMe();
  const sites = useQuery(sitesQueries.list());
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Users" description="Who may sign in, with which roles, for which sites." />
      <PanelBoundary title="Users">
        <UsersAdmin sites={(sites.data ?? me.sites).map((s) => ({ id: s.id, name: s.name }))} currentUserId={me.user.id} />
      </PanelBoundary>
      <PanelBoundary title="Approval limits">
        <ApprovalLimits siteCurrencies={(sites.data ?? me.sites).map((s) => s.currency)} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
