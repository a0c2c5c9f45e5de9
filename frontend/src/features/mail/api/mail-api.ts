import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page } from '@common/schemas/common.schema';
import type { MailAttachmentView, MailMessageView, MailSummary } from '@common/schemas/mail.schema';
import { api, apiUrl } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';

export type { MailSummary, MailAttachmentView as MailAttachment, MailMessageView as MailMessage };

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
  detail: (id: number) =>
    queryOptions({
      queryKey: [...mailQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => api.get<MailMessageView>(`/mail/${id}`, { signal }),
      staleTime: Infinity,
    }),
};

/** A plain link downloads the file with the session cookie; no script touches its bytes. */
export function attachmentUrl(messageId: number, attachmentId: number): string {
  return apiUrl(`/mail/${messageId}/attachments/${attachmentId}`);
}
