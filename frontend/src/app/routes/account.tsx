import type { LoaderFunctionArgs } from 'react-router-dom';
import { ROLE_LABELS } from '@common/api/roles';
import { queryClient } from '@/lib/query-client';
import { ChangePasswordForm } from '@/features/auth/components/change-password-form';
import { subscriptionQueries } from '@/features/alerts/api/subscriptions-api';
import { AlertSubscriptions } from '@/features/alerts/components/alert-subscriptions';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '../hooks/use-current-site';
import { requireMe } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireMe(request);
  void queryClient.ensureQueryData(subscriptionQueries.mine()).catch(() => undefined);
  return null;
}

export function Component() {
  const me = useMe();
  return (
    <div className="max-w-3xl">
      <PageHeader title="Account" description="Your details, your e-mail alerts and your password." />
      <div className="flex flex-col gap-5">
        <Card>
          <CardHeader title="You" />
          <CardBody>
            <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-[10rem_1fr]">
              <dt className="font-bold text-fg-muted">Name</dt>
              <dd>{me.user.name}</dd>
              <dt className="font-bold text-fg-muted">E-mail</dt>
              <dd className="break-all">{me.user.email}</dd>
              <dt className="font-bold text-fg-muted">Organisation</dt>
              <dd>{me.organisation.name}</dd>
              <dt className="font-bold text-fg-muted">Roles</dt>
              <dd>{me.user.roles.map((r) => ROLE_LABELS[r]).join(', ')}</dd>
              <dt className="font-bold text-fg-muted">Sites</dt>
              <dd>{me.sites.length ? me.sites.map((s) => s.name).join(', ') : 'None granted yet'}</dd>
            </dl>
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Alerts by e-mail" description="Hear when a source at a site runs low, at once or in one daily e-mail." />
          <CardBody>
            <AlertSubscriptions sites={me.sites.map((s) => ({ id: s.id, name: s.name }))} />
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Change password" />
          <CardBody>
            <ChangePasswordForm />
          </CardBody>
        </Card>
      </div>
    </div>
  );
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
