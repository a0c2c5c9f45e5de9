import { data, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { capacityQueries } from '@/features/capacity/api/capacity-api';
import { SignedReport } from '@/features/capacity/components/signed-report';
import { ButtonLink } from '@/components/ui/button';
import { Icon } from '@/components/ui/icons';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useCurrentSite } from '../../hooks/use-current-site';
import { requireScreen } from '../../route-guards';

function signoffId(raw: string | undefined): number {
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw data({ message: 'There is no sign-off at this address.' }, { status: 404 });
  return id;
}

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireScreen(request, '/capacity');
  await queryClient.ensureQueryData(capacityQueries.signoff(signoffId(params.signoffId)));
  return null;
}

export function Component() {
  const id = signoffId(useParams().signoffId);
  const { site } = useCurrentSite();
  return (
    <div className="flex flex-col gap-5">
      <div className="print:hidden">
        <ButtonLink to="/capacity" variant="ghost" className="-ml-3">
          <Icon name="chevronLeft" />
          Back to the check
        </ButtonLink>
      </div>
      <h1 className="sr-only">Signed capacity report</h1>
      <PanelBoundary title="The signed report">
        <SignedReport id={id} timeZone={site?.timeZone ?? 'UTC'} />
      </PanelBoundary>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
