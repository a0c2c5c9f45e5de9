import type { LoaderFunctionArgs } from 'react-router-dom';
import { ROLE_LABELS } from '@common/api/roles';
import { ChangePasswordForm } from '@/features/auth/components/change-password-form';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '../hooks/use-current-site';
import { requireMe } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireMe(request);
  return null;
}

export function Component() {
  const me = useMe();
  return (
    <div className="max-w-3xl">
      <PageHeader title="Account" description="Your details and your password." />
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
