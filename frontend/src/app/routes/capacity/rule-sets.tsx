import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { capacityQueries } from '@/features/capacity/api/capacity-api';
import { RuleSetsScreen } from '@/features/capacity/components/rule-sets-screen';
import { useMe } from '../../hooks/use-current-site';
import { requireScreen } from '../../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, '/capacity');
  await queryClient.ensureQueryData(capacityQueries.ruleSets());
  return null;
}

export function Component() {
  const me = useMe();
  return <RuleSetsScreen canEdit={me.user.roles.includes('biomedical_engineer')} />;
}

export { ScreenErrorBoundary as ErrorBoundary } from '../route-error';
