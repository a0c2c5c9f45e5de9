import type { Page } from './common.schema';

/**
 * Responses about mail: the messages the local mail service received (administrators read them) and the
 * organisation's outbox of mail Plenum sends (orders, rejections, alerts, digests).
 */

export interface MailSummary {
  id: number;
  receivedAt: string;
  from: string;
  to: string;
  subject: string;
  sizeBytes: number;
  attachments: number;
}

export interface MailAttachmentView {
  id: number;
  filename: string;
  contentType: string;
  sizeBytes: number;
}

export interface MailMessageView {
  id: number;
  receivedAt: string;
  from: string;
  to: string;
  subject: string;
  text: string | null;
  html: string | null;
  attachments: MailAttachmentView[];
}

export const OUTBOX_STATUSES = ['pending', 'sent', 'failed'] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];
export type OutboxKind = 'purchase_order' | 'rejection' | 'alert' | 'digest';

export interface OutboxMessage {
  id: number;
  kind: OutboxKind;
  to: string;
  cc: string;
  subject: string;
  status: OutboxStatus;
  attempts: number;
  /** Failed, or still queued after several failed attempts. */
  needsAttention: boolean;
  nextAttemptAt: string;
  lastError: string;
  sentAt: string | null;
  createdAt: string;
  purchaseOrderId: number | null;
  requestId: number | null;
}

export interface OutboxPage extends Page<OutboxMessage> {
  counts: Record<OutboxStatus | 'attention', number>;
}
