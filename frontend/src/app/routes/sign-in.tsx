import { useEffect } from 'react';
import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { authQueries } from '@/features/auth/api/auth-api';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { PlenumWordmark } from '@/components/ui/logo';
import { safeNext } from '../route-guards';

export async function loader({ request }: LoaderFunctionArgs) {
  const next = safeNext(new URL(request.url).searchParams.get('next'));
  // already signed in: straight on (asks the server, since a cached answer may predate a sign-out)
  const me = await queryClient.fetchQuery({ ...authQueries.me(), staleTime: 0 }).catch(() => null);
  if (me) throw redirect(next);
  return null;
}

export function Component() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  useEffect(() => {
    document.title = 'Sign in · Plenum';
  }, []);
  return (
    <div className="flex min-h-dvh flex-col bg-primary lg:flex-row">
      <div className="flex flex-col justify-center gap-3 px-6 py-8 text-primary-fg lg:w-1/2 lg:px-16">
        <PlenumWordmark inverted />
        <p className="max-w-md text-lg text-ink-100">Medical-gas supply, planned: what you hold, how long it lasts, and when to reorder.</p>
      </div>
      <main className="flex flex-1 items-start justify-center bg-canvas px-4 py-8 lg:items-center lg:rounded-l-3xl">
        <div className="w-full max-w-sm rounded-card border border-line bg-surface p-6 shadow-card">
          <h1 className="mb-1 text-2xl">Sign in</h1>
          <p className="mb-5 text-sm text-fg-muted">Use the e-mail address your organisation registered for you.</p>
          <SignInForm onSignedIn={() => navigate(next, { replace: true })} />
        </div>
      </main>
    </div>
  );
}

export { RootErrorBoundary as ErrorBoundary } from './route-error';
