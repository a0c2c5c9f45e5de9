import type { LoaderFunctionArgs } from 'react-router-dom';
import { parseListParams } from '@/lib/list-params';
import { queryClient } from '@/lib/query-client';
import { mailQueries } from '@/features/mail/api/mail-api';
import { MAIL_LIST_DEFAULTS, MailList } from '@/features/mail/components/mail-list';
import { PageHeader } from '@/components/ui/page-header';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/mail');
  await queryClient.ensureQueryData(mailQueries.list(parseListParams(new URL(request.url).searchParams, MAIL_LIST_DEFAULTS)));
  return null;
}

export function Component() {
  return (
    <div className="flex flex-col gap-5">
      <PageHeader title="Mail" description="Messages Plenum has sent, as the mail service received them: orders, alerts, notices." />
      <PanelBoundary title="Mail">
        <MailList />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
