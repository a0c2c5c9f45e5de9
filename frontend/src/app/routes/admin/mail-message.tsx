import { data, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { mailQueries } from '@/features/mail/api/mail-api';
import { MailMessageView } from '@/features/mail/components/mail-message-view';
import { ButtonLink } from '@/components/ui/button';
import { Icon } from '@/components/ui/icons';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { requireScreen } from '../../route-guards';

function messageId(raw: string | undefined): number {
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw data({ message: 'There is no message at this address.' }, { status: 404 });
  return id;
}

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireScreen(request, '/admin/mail');
  await queryClient.ensureQueryData(mailQueries.detail(messageId(params.messageId)));
  return null;
}

export function Component() {
  const id = messageId(useParams().messageId);
  return (
    <div className="flex max-w-4xl flex-col gap-5">
      <div>
        <ButtonLink to="/admin/mail" variant="ghost" className="-ml-3">
          <Icon name="chevronLeft" />
          All mail
        </ButtonLink>
      </div>
      <h1 className="sr-only">Mail message</h1>
      <PanelBoundary title="The message">
        <MailMessageView id={id} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
