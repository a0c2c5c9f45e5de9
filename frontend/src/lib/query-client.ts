import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError, errorMessage } from './api-client';
import { toast } from './toast';

declare module '@tanstack/react-query' {
  interface Register {
    defaultError: Error;
    mutationMeta: {
      /** The form shows this mutation's errors itself (inline fields, banner): no toast. */
      formHandlesErrors?: boolean;
    };
  }
}

/**
 * One QueryClient for the app. Defaults: data counts as fresh for 30 s (screens set their own
 * staleTime where data moves slower or faster); retries only for network trouble and 5xx, never for
 * a 4xx that will not change on its own.
 */
export const queryClient = new QueryClient({
  queryCache: new QueryCache({
    onError: (error, query) => {
      // a first load shows its own error state; a failed background refresh would otherwise be silent
      if (query.state.data !== undefined) toast.error(`Could not refresh: ${errorMessage(error)}`);
    },
  }),
  mutationCache: new MutationCache({
    onError: (error, _vars, _ctx, mutation) => {
      if (mutation.meta?.formHandlesErrors) return;
      toast.error(errorMessage(error));
    },
  }),
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      retry: (count, error) => error instanceof ApiError && (error.status === 0 || error.status >= 500) && count < 2,
      refetchOnWindowFocus: true,
    },
    mutations: { retry: false },
  },
});
