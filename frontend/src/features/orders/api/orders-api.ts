import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@common/schemas/common.schema';
import type { DeliveryRecordInput, RequestStatus } from '@common/schemas/orders.schema';
import { api, apiUrl } from '@/lib/api-client';

export interface RequestRow {
  id: number;
  reference: string;
  status: RequestStatus;
  statusText: string;
  origin: 'auto' | 'manual';
  siteId: number;
  siteName: string;
  sourceId: number;
  sourceName: string;
  gasCode: string;
  description: string;
  supplierName: string | null;
  unit: 'kg' | 'cylinders';
  suggestedQuantity: number;
  quantity: number;
  quantityReason: string;
  unitPriceMinor: number | null;
  totalMinor: number | null;
  currency: string;
  neededBy: string | null;
  problem: string;
  note: string;
  requestedBy: { id: number; name: string } | null;
  /** Who last changed the quantity or price (may not approve, like the raiser). */
  amendedBy: { id: number; name: string } | null;
  version: number;
  createdAt: string;
  order: { id: number; poNumber: string; status: string } | null;
}

export interface ActionState {
  allowed: boolean;
  reason: string | null;
}

export interface RequestDetail extends RequestRow {
  trigger: { status?: string; daysOfStock?: number | null; reorderAt?: string | null; emptyAt?: string | null } | null;
  approvals: { userId: number; name: string; at: string; limitMinor: number; comment: string }[];
  timeline: { at: string; action: string; by: string; fromStatus: string | null; toStatus: string | null; comment: string; detail: Record<string, unknown> | null }[];
  myApprovalLimit: { limitMinor: number; currency: string } | null;
  actions: Record<'approve' | 'reject' | 'submit' | 'cancel' | 'changeQuantity', ActionState>;
}

export interface OrderRow {
  id: number;
  poNumber: string;
  status: string;
  statusText: string;
  requestId: number;
  siteName: string;
  sourceId: number;
  sourceName: string;
  supplierName: string;
  description: string;
  unit: 'kg' | 'cylinders';
  quantity: number;
  deliveredQuantity: number | null;
  unitPriceMinor: number;
  totalMinor: number;
  currency: string;
  windowStart: string;
  windowEnd: string;
  deliveryAddress: string;
  contact: { name: string; email: string };
  approvedBy: { userId: number; name: string }[];
  sentAt: string | null;
  createdAt: string;
}

export interface OrderDetail extends OrderRow {
  pdfUrl: string;
  request: { id: number; reference: string; status: string; origin: string };
  delivery: { deliveryNote: string; deliveredAt: string; quantity: number; unit: string; emptiesCollected: number; note: string } | null;
  emails: { id: number; kind: string; to: string; cc: string; status: string; attempts: number; lastError: string; sentAt: string | null; nextAttemptAt: string }[];
}

export interface SpendRow {
  month: string;
  siteId: number;
  siteName: string;
  gasCode: string;
  supplierId: number;
  supplierName: string;
  currency: string;
  orderedMinor: number;
  deliveredMinor: number;
  rentalMinor: number;
  cylinderDays: number;
}

export interface SpendReport {
  from: string;
  to: string;
  months: string[];
  rows: SpendRow[];
  currencies: string[];
}

export interface RequestListParams {
  status: string;
  page: number;
}

export const ordersQueries = {
  all: () => ['orders'] as const,
  /** Requests change when someone approves elsewhere: fresh for 15 s, refetched on focus. */
  requests: (p: RequestListParams) =>
    queryOptions({ queryKey: [...ordersQueries.all(), 'requests', p] as const, queryFn: ({ signal }) => api.get<Page<RequestRow>>('/requests', { signal, query: { status: p.status, page: p.page, pageSize: 25 } }), staleTime: 15_000, placeholderData: keepPreviousData }),
  request: (id: number) => queryOptions({ queryKey: [...ordersQueries.all(), 'request', id] as const, queryFn: ({ signal }) => api.get<RequestDetail>(`/requests/${id}`, { signal }), staleTime: 10_000 }),
  orders: (p: RequestListParams) =>
    queryOptions({ queryKey: [...ordersQueries.all(), 'orders', p] as const, queryFn: ({ signal }) => api.get<Page<OrderRow>>('/orders', { signal, query: { status: p.status, page: p.page, pageSize: 25 } }), staleTime: 15_000, placeholderData: keepPreviousData }),
  /** An order's e-mail goes in the background: poll while it is queued. */
  order: (id: number) =>
    queryOptions({ queryKey: [...ordersQueries.all(), 'order', id] as const, queryFn: ({ signal }) => api.get<OrderDetail>(`/orders/${id}`, { signal }), staleTime: 5_000, refetchInterval: (q) => (q.state.data?.status === 'approved' ? 5_000 : false) }),
  /** Spend moves only with orders and counts: a minute is fresh enough. */
  spend: (siteId: number | null) => queryOptions({ queryKey: [...ordersQueries.all(), 'spend', siteId] as const, queryFn: ({ signal }) => api.get<SpendReport>('/spend', { signal, query: { siteId } }), staleTime: 60_000 }),
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
      const body = d.kind === 'cancel' ? { reason: d.reason ?? '', version: d.version } : d.kind === 'submit' ? { version: d.version } : { comment: d.comment ?? '', version: d.version };
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
