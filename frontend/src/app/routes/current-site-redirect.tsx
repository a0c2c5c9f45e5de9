import { Navigate, useLocation, type LoaderFunctionArgs } from 'react-router-dom';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/states';
import { useCurrentSite } from '../hooks/use-current-site';
import { requireScreen } from '../route-guards';

/**
 * The menu's /sources and /wards: the same screen for the site chosen in the menu
 * (/sites/:siteId/sources), so a shared link names its site.
 */
export async function loader({ request }: LoaderFunctionArgs) {
  await requireScreen(request, new URL(request.url).pathname.replace(/\/$/, ''));
  return null;
}

export function Component() {
  const { site } = useCurrentSite();
  const { pathname, search } = useLocation();
  if (!site) {
    return (
      <Card>
        <EmptyState title="No site granted yet">An administrator grants you a site; its sources and wards appear here.</EmptyState>
      </Card>
    );
  }
  return <Navigate to={`/sites/${site.id}${pathname.replace(/\/$/, '')}${search}`} replace />;
}

export { ScreenErrorBoundary as ErrorBoundary } from './route-error';
