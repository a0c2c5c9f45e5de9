import { data, redirect } from 'react-router-dom';
import { ApiError } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { authQueries, type Me } from '@/features/auth/api/auth-api';
import { canUse, navItem } from './navigation';

/** Where to come back to after signing in: only paths inside this app. */
export function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') && !next.startsWith('/sign-in') ? next : '/';
}

/** The signed-in person, or a redirect to sign in that remembers where they were going. */
export async function requireMe(request: Request): Promise<Me> {
  try {
    return await queryClient.ensureQueryData({ ...authQueries.me(), revalidateIfStale: true });
  } catch (e) {
    if (e instanceof ApiError && e.status === 401) {
      const url = new URL(request.url);
      throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
    }
    throw e;
  }
}

/** As requireMe, and refuses (403) a screen the person's roles cannot use. */
export async function requireScreen(request: Request, path: string): Promise<Me> {
  const me = await requireMe(request);
  if (!canUse(me.user.roles, navItem(path))) {
    throw data({ message: 'Your roles do not include this screen. Ask an administrator if you need it.' }, { status: 403 });
  }
  return me;
}
