import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@common/schemas/common.schema';
import type { ActionState, DeliveryRecordInput, OrderDetail, OrderRow, RequestDetail, RequestRow, SpendReport, SpendRow } from '@common/schemas/orders.schema';
import { api, apiUrl } from '@/lib/api-client';

export type { ActionState, OrderDetail, OrderRow, RequestDetail, RequestRow, SpendReport, SpendRow };

export interface RequestListParams {
  status: string;
  page: number;
}

export const ordersQueries = {
  all: () => ['orders'] as const,
  /** Requests change when someone approves elsewhere: fresh for 15 s, refetched on focus. */
  requests: (p: RequestListParams) =>
    queryOptions({
      queryKey: [...ordersQueries.all(), 'requests', p] as const,
      queryFn: ({ signal }) => api.get<Page<RequestRow>>('/requests', { signal, query: { status: p.status, page: p.page, pageSize: 25 } }),
      staleTime: 15_000,
      placeholderData: keepPreviousData,
    }),
  request: (id: number) =>
    queryOptions({
      queryKey: [...ordersQueries.all(), 'request', id] as const,
      queryFn: ({ signal }) => api.get<RequestDetail>(`/requests/${id}`, { signal }),
      staleTime: 10_000,
    }),
  orders: (p: RequestListParams) =>
    queryOptions({
      queryKey: [...ordersQueries.all(), 'orders', p] as const,
      queryFn: ({ signal }) => api.get<Page<OrderRow>>('/orders', { signal, query: { status: p.status, page: p.page, pageSize: 25 } }),
      staleTime: 15_000,
      placeholderData: keepPreviousData,
    }),
  /** An order's e-mail goes in the background: poll while it is queued. */
  order: (id: number) =>
    queryOptions({
      queryKey: [...ordersQueries.all(), 'order', id] as const,
      queryFn: ({ signal }) => api.get<OrderDetail>(`/orders/${id}`, { signal }),
      staleTime: 5_000,
      refetchInterval: (q) => (q.state.data?.status === 'approved' ? 5_000 : false),
    }),
  /** Spend moves only with orders and counts: a minute is fresh enough. */
  spend: (siteId: number | null) =>
    queryOptions({
      queryKey: [...ordersQueries.all(), 'spend', siteId] as const,
      queryFn: ({ signal }) => api.get<SpendReport>('/spend', { signal, query: { siteId } }),
      staleTime: 60_000,
    }),
};

export function spendCsvUrl(siteId: number | null): string {
  return apiUrl('/spend.csv', { siteId });
}

export function orderPdfUrl(id: number, download = false): string {
  return apiUrl(`/orders/${id}/pdf`, { download: download ? 1 : undefined });
}

/** A fresh key per intended action: a double click or a network retry of the same action sends the same key. */
export function newIdempotencyKey(action: string): string {
  const rnd = globalThis.crypto?.randomUUID?.() ?? `${Date.now()}-${Math.random().toString(36).slice(2)}`;
  return `${action}-${rnd}`.slice(0, 100);
}

type Decision = { kind: 'approve' | 'reject' | 'submit' | 'cancel'; comment?: string; reason?: string; version: number; key: string };

export function useRequestDecision(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (d: Decision) => {
      const body =
        d.kind === 'cancel'
          ? { reason: d.reason ?? '', version: d.version }
          : d.kind === 'submit'
            ? { version: d.version }
            : { comment: d.comment ?? '', version: d.version };
      return api.post<RequestDetail>(`/requests/${id}/${d.kind}`, { ...body, idempotencyKey: d.key });
    },
    onSuccess: async (data) => {
      qc.setQueryData(ordersQueries.request(id).queryKey, data);
      await qc.invalidateQueries({ queryKey: ordersQueries.all() });
    },
  });
}

export function useChangeQuantity(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { quantity: number; reason: string; version: number }) => api.put<RequestDetail>(`/requests/${id}/quantity`, v),
    onSuccess: async (data) => {
      qc.setQueryData(ordersQueries.request(id).queryKey, data);
      await qc.invalidateQueries({ queryKey: ordersQueries.all() });
    },
  });
}

export function useRecordDelivery(orderId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: DeliveryRecordInput & { key: string }) => {
      const { key, ...body } = v;
      return api.post<OrderDetail>(`/orders/${orderId}/deliveries`, { ...body, idempotencyKey: key });
    },
    onSuccess: async (data) => {
      qc.setQueryData(ordersQueries.order(orderId).queryKey, data);
      await qc.invalidateQueries({ queryKey: ordersQueries.all() });
    },
  });
}

export function useScanNow() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<{ raised: number[] }>('/requests/scan'),
    onSuccess: () => qc.invalidateQueries({ queryKey: ordersQueries.all() }),
  });
}
