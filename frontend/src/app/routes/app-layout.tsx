import type { LoaderFunctionArgs } from 'react-router-dom';
import { AppShell } from '../layout/app-shell';
import { requireMe } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireMe(request);
  return null;
}

export { AppShell as Component };
