import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangePasswordInput, LoginInput, Me } from '@common/schemas/auth.schema';
import { api, clearCsrfToken, setCsrfToken } from '@/lib/api-client';

export type { Me, MeSite } from '@common/schemas/auth.schema';

export const authQueries = {
  all: () => ['auth'] as const,
  /**
   * Who is signed in. Fresh for 5 minutes: roles and granted sites change rarely, and every API call
   * is checked on the server anyway; a 401 anywhere sends the person back to sign in.
   */
  me: () =>
    queryOptions({
      queryKey: [...authQueries.all(), 'me'] as const,
      queryFn: ({ signal }) => api.get<Me>('/auth/me', { signal, on401: 'throw' }),
      staleTime: 5 * 60_000,
      retry: false,
    }),
};

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: LoginInput) => api.post<Me & { csrfToken: string }>('/auth/login', body, { on401: 'throw', skipCsrf: true }),
    meta: { formHandlesErrors: true },
    onSuccess: ({ csrfToken, ...me }) => {
      // another person may have used this browser: nothing of theirs stays in the cache
      qc.clear();
      setCsrfToken(csrfToken);
      qc.setQueryData(authQueries.me().queryKey, me);
    },
  });
}

/**
 * Signs out. The caller leaves the signed-in screens first and then calls `forget()`: clearing the
 * cache while the app frame is still on screen would make it refetch who is signed in, and fail.
 */
export function useSignOut() {
  const qc = useQueryClient();
  const mutation = useMutation({
    mutationFn: () => api.post<{ ok: true }>('/auth/logout', undefined, { on401: 'throw' }),
    onSettled: () => clearCsrfToken(),
  });
  return { ...mutation, forget: () => qc.clear() };
}

export function useChangePassword() {
  return useMutation({
    mutationFn: (body: ChangePasswordInput) => api.post<{ ok: true }>('/auth/password', body),
    meta: { formHandlesErrors: true },
  });
}
