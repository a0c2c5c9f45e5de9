import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { OutboxMessage, OutboxPage, OutboxStatus } from '@common/schemas/mail.schema';
import { api } from '@/lib/api-client';
import { pageFromSearch } from '@/lib/list-params';

export type { OutboxMessage, OutboxPage, OutboxStatus };
export type OutboxFilter = OutboxStatus | 'attention' | 'all';
export const OUTBOX_FILTERS: readonly OutboxFilter[] = ['all', 'attention', 'pending', 'failed', 'sent'];

export interface OutboxListParams {
  status: OutboxFilter;
  page: number;
}

export function outboxListParams(search: URLSearchParams): OutboxListParams {
  const raw = search.get('status');
  const status = OUTBOX_FILTERS.includes(raw as OutboxFilter) ? (raw as OutboxFilter) : 'all';
  return { status, page: pageFromSearch(search.get('page')) };
}

export const outboxQueries = {
  all: () => ['outbox'] as const,
  /** The worker sends in the background: fresh for 10 s, and polled while anything is queued. */
  list: (p: OutboxListParams) =>
    queryOptions({
      queryKey: [...outboxQueries.all(), 'list', p] as const,
      queryFn: ({ signal }) => api.get<OutboxPage>('/outbox', { signal, query: { status: p.status, page: p.page, pageSize: 25 } }),
      staleTime: 10_000,
      placeholderData: keepPreviousData,
      refetchInterval: (q) => (q.state.data?.items.some((m) => m.status === 'pending') ? 10_000 : false),
    }),
};

/** Puts a failed message back in the queue; the worker sends it within its next pass. */
export function useRetryOutbox() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.post<OutboxMessage>(`/outbox/${id}/retry`),
    onSuccess: () => qc.invalidateQueries({ queryKey: outboxQueries.all() }),
  });
}
