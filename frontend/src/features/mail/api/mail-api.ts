import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page } from '@common/schemas/common.schema';
import { api, apiUrl } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';

export interface MailSummary {
  id: number;
  receivedAt: string;
  from: string;
  to: string;
  subject: string;
  sizeBytes: number;
  attachments: number;
}

export interface MailAttachment {
  id: number;
  filename: string;
  contentType: string;
  sizeBytes: number;
}

export interface MailMessage {
  id: number;
  receivedAt: string;
  from: string;
  to: string;
  subject: string;
  text: string | null;
  html: string | null;
  attachments: MailAttachment[];
}

export const mailQueries = {
  all: () => ['mail'] as const,
  /** New mail arrives while the admin watches (an order just sent): fresh for 10 s. */
  list: (params: ListParams) =>
    queryOptions({
      queryKey: [...mailQueries.all(), 'list', params] as const,
      queryFn: ({ signal }) => api.get<Page<MailSummary>>('/mail', { signal, query: { ...params } }),
      staleTime: 10_000,
      placeholderData: keepPreviousData,
    }),
  /** A received message never changes. */
  detail: (id: number) => queryOptions({ queryKey: [...mailQueries.all(), 'detail', id] as const, queryFn: ({ signal }) => api.get<MailMessage>(`/mail/${id}`, { signal }), staleTime: Infinity }),
};

/** A plain link downloads the file with the session cookie; no script touches its bytes. */
export function attachmentUrl(messageId: number, attachmentId: number): string {
  return apiUrl(`/mail/${messageId}/attachments/${attachmentId}`);
}
