import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { SubscriptionInput, SubscriptionView } from '@common/schemas/orders.schema';
import { api } from '@/lib/api-client';

export type { SubscriptionView as Subscription };

export const subscriptionQueries = {
  all: () => ['subscriptions'] as const,
  /** One's own subscriptions change only here: fresh for 5 minutes. */
  mine: () =>
    queryOptions({
      queryKey: [...subscriptionQueries.all(), 'mine'] as const,
      queryFn: ({ signal }) => api.get<SubscriptionView[]>('/subscriptions', { signal }),
      staleTime: 5 * 60_000,
    }),
};

export function useSetSubscription() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ siteId, body }: { siteId: number; body: SubscriptionInput }) =>
      api.put<Omit<SubscriptionView, 'siteName' | 'lastDigestAt'>>(`/sites/${siteId}/subscription`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: subscriptionQueries.all() }),
  });
}

export function useDeleteSubscription() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (siteId: number) => api.delete<{ ok: true }>(`/sites/${siteId}/subscription`),
    onSuccess: () => qc.invalidateQueries({ queryKey: subscriptionQueries.all() }),
  });
}
