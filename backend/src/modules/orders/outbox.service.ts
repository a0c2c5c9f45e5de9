import type { DataSource, EntityManager } from 'typeorm';
import { env } from '../../config/env';
import { db } from '../../db/db';
import { MailOutbox, PurchaseOrder, ReorderRequest } from '../../db/entities/orders.entity';
import { mailer } from '../../mail/mailer';
import { logger } from '../../logger';
import { conflict, notFound } from '../../errors/app-error';
import type { Actor } from '../../http/context';
import { recordAudit, whoOf } from '../audit/audit.service';
import { addEvent } from './orders.shared';
import { isDuplicateKey } from './transactions';
import { pdfForOrder } from './purchase-orders.service';
import { backoffMs } from '@common/api/backoff';
import type { OutboxKind, OutboxMessage, OutboxPage, OutboxStatus } from '@common/schemas/mail.schema';

export interface OutgoingMail {
  organisationId: number;
  kind: 'purchase_order' | 'rejection' | 'alert' | 'digest';
  to: string;
  cc?: string;
  subject: string;
  text: string;
  purchaseOrderId?: number;
  requestId?: number;
  /** A message with the same key is queued once only (alerts: one per change). */
  dedupeKey?: string;
}

/**
 * Queues a message with the caller's transaction manager: it is sent only if the change it reports
 * commits, and it survives a mail service that is down. Returns false when its dedupe key was queued before.
 */
export async function enqueueMail(m: EntityManager, mail: OutgoingMail): Promise<boolean> {
  try {
    await m.getRepository(MailOutbox).insert({
      organisationId: mail.organisationId,
      kind: mail.kind,
      toAddress: mail.to.slice(0, 500),
      ccAddress: (mail.cc ?? '').slice(0, 1000),
      subject: mail.subject.slice(0, 300),
      textBody: mail.text,
      purchaseOrderId: mail.purchaseOrderId ?? null,
      requestId: mail.requestId ?? null,
      dedupeKey: mail.dedupeKey ?? null,
      status: 'pending',
      attempts: 0,
      nextAttemptAt: new Date(),
    });
    return true;
  } catch (e) {
    if (isDuplicateKey(e)) return false;
    throw e;
  }
}

/** An SMTP refusal of the message itself (5xx) is permanent; anything else (no answer, 4xx) is worth retrying. */
function isPermanent(err: unknown): boolean {
  const code = (err as { responseCode?: number }).responseCode;
  return typeof code === 'number' && code >= 500 && code < 600;
}

/**
 * Sends one due message: it is taken with SELECT … FOR UPDATE SKIP LOCKED and its row stays locked while
 * it is sent, so other workers (in this or another process) skip it and each message goes once. A
 * process that dies mid-send releases the lock with its connection and the message is tried again.
 * Returns false when nothing was due.
 */
export async function sendNextMail(ds: DataSource = db()): Promise<boolean> {
  const e = env();
  const qr = ds.createQueryRunner();
  await qr.connect();
  try {
    await qr.startTransaction();
    const rows: { id: string }[] = await qr.query(
      "SELECT id FROM mail_outbox WHERE status = 'pending' AND next_attempt_at <= NOW(3) ORDER BY next_attempt_at, id LIMIT 1 FOR UPDATE SKIP LOCKED",
    );
    if (!rows.length) {
      await qr.commitTransaction();
      return false;
    }
    const m = qr.manager;
    const msg = await m.getRepository(MailOutbox).findOneByOrFail({ id: String(rows[0].id) });
    let attachments: { filename: string; content: Buffer; contentType: string }[] = [];
    let sendError: unknown = null;
    let info: { messageId?: string } | undefined;
    try {
      if (msg.purchaseOrderId) {
        const { pdf, poNumber } = await pdfForOrder(ds, msg.purchaseOrderId);
        attachments = [{ filename: `${poNumber}.pdf`, content: pdf, contentType: 'application/pdf' }];
      }
      info = await mailer().sendMail({
        from: e.MAIL_FROM,
        to: msg.toAddress,
        cc: msg.ccAddress || undefined,
        subject: msg.subject,
        text: msg.textBody,
        attachments,
        headers: { 'X-Plenum-Outbox-Id': msg.id },
      });
    } catch (err) {
      sendError = err;
    }
    const attempts = msg.attempts + 1;
    if (sendError === null) {
      await m
        .getRepository(MailOutbox)
        .update({ id: msg.id }, { status: 'sent', attempts, sentAt: new Date(), messageId: info?.messageId?.slice(0, 300) ?? null, lastError: '' });
      if (msg.kind === 'purchase_order' && msg.purchaseOrderId) await markOrdered(m, msg);
    } else {
      const text = (sendError as Error)?.message ?? String(sendError);
      const permanent = isPermanent(sendError);
      const failed = permanent && attempts >= e.OUTBOX_MAX_ATTEMPTS;
      await m.getRepository(MailOutbox).update(
        { id: msg.id },
        {
          attempts,
          lastError: text.slice(0, 1000),
          status: failed ? 'failed' : 'pending',
          nextAttemptAt: new Date(Date.now() + backoffMs(attempts, { baseMs: e.OUTBOX_BACKOFF_BASE_MS, maxMs: e.OUTBOX_BACKOFF_MAX_MS })),
        },
      );
      if (failed && msg.requestId)
        await addEvent(
          m,
          msg.requestId,
          null,
          'email_failed',
          null,
          null,
          `The message "${msg.subject}" could not be delivered after ${attempts} attempts: ${text.slice(0, 300)}`,
        );
      logger.error(`outbox ${msg.id}: attempt ${attempts} failed${failed ? ' (marked failed)' : ''}: ${text}`);
    }
    await qr.commitTransaction();
    return true;
  } catch (err) {
    if (qr.isTransactionActive) await qr.rollbackTransaction().catch(() => undefined);
    throw err;
  } finally {
    await qr.release();
  }
}

/** The supplier has the order: the purchase order and its request move to "ordered". */
async function markOrdered(m: EntityManager, msg: MailOutbox): Promise<void> {
  const po = await m.getRepository(PurchaseOrder).findOneBy({ id: msg.purchaseOrderId! });
  if (!po) return;
  if (po.status === 'approved') await m.getRepository(PurchaseOrder).update({ id: po.id }, { status: 'ordered', sentAt: new Date() });
  else await m.getRepository(PurchaseOrder).update({ id: po.id }, { sentAt: po.sentAt ?? new Date() });
  const r = await m.getRepository(ReorderRequest).findOneBy({ id: po.requestId });
  if (r && r.status === 'approved') {
    await m.getRepository(ReorderRequest).update({ id: r.id }, { status: 'ordered', version: r.version + 1 });
    await addEvent(
      m,
      r.id,
      null,
      'ordered',
      'approved',
      'ordered',
      `Purchase order ${po.poNumber} e-mailed to ${msg.toAddress}${msg.ccAddress ? `, copy to ${msg.ccAddress}` : ''}`,
    );
  } else if (r) {
    await addEvent(m, r.id, null, 'emailed', null, null, `Purchase order ${po.poNumber} e-mailed to ${msg.toAddress}`);
  }
}

/** Sends every due message (bounded per call), returning how many were handled. */
export async function drainOutbox(ds: DataSource = db(), max = 200): Promise<number> {
  let n = 0;
  while (n < max && (await sendNextMail(ds))) n++;
  return n;
}

export interface OutboxWorker {
  stop: () => Promise<void>;
  /** Resolves after the next full pass (for tests and shutdown). */
  kick: () => void;
}

/** Polls the outbox every `pollMs`, sending what is due; several workers (and processes) may run at once. */
export function startOutboxWorker(opts: { ds?: DataSource; pollMs?: number } = {}): OutboxWorker {
  const pollMs = opts.pollMs ?? env().OUTBOX_POLL_MS;
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> = Promise.resolve();
  const pass = async () => {
    try {
      await drainOutbox(opts.ds ?? db());
    } catch (err) {
      logger.error(`outbox worker: ${(err as Error).message}`);
    }
  };
  const loop = () => {
    if (stopped) return;
    running = pass().finally(() => {
      if (!stopped) timer = setTimeout(loop, pollMs);
    });
  };
  loop();
  return {
    kick: () => {
      if (timer) clearTimeout(timer);
      void running.then(loop);
    },
    stop: async () => {
      stopped = true;
      if (timer) clearTimeout(timer);
      await running;
    },
  };
}

// ---------- administrators ----------

export function presentOutbox(o: MailOutbox, attentionAttempts: number): OutboxMessage {
  return {
    id: Number(o.id),
    kind: o.kind as OutboxKind,
    to: o.toAddress,
    cc: o.ccAddress,
    subject: o.subject,
    status: o.status as OutboxStatus,
    attempts: o.attempts,
    needsAttention: o.status === 'failed' || (o.status === 'pending' && o.attempts >= attentionAttempts),
    nextAttemptAt: o.nextAttemptAt.toISOString(),
    lastError: o.lastError,
    sentAt: o.sentAt?.toISOString() ?? null,
    createdAt: o.createdAt.toISOString(),
    purchaseOrderId: o.purchaseOrderId,
    requestId: o.requestId,
  };
}

/** The organisation's outbox; "attention" lists failed messages and ones that keep failing. */
export async function listOutbox(actor: Actor, q: { status: string; page: number; pageSize: number }): Promise<OutboxPage> {
  const attention = Math.min(3, env().OUTBOX_MAX_ATTEMPTS);
  const qb = db()
    .getRepository(MailOutbox)
    .createQueryBuilder('o')
    .select([
      'o.id',
      'o.kind',
      'o.toAddress',
      'o.ccAddress',
      'o.subject',
      'o.status',
      'o.attempts',
      'o.nextAttemptAt',
      'o.lastError',
      'o.sentAt',
      'o.createdAt',
      'o.purchaseOrderId',
      'o.requestId',
    ])
    .where('o.organisation_id = :org', { org: actor.user.organisationId });
  if (q.status === 'attention') qb.andWhere("(o.status = 'failed' OR (o.status = 'pending' AND o.attempts >= :n))", { n: attention });
  else if (q.status !== 'all') qb.andWhere('o.status = :st', { st: q.status });
  qb.orderBy('o.id', 'DESC')
    .skip((q.page - 1) * q.pageSize)
    .take(q.pageSize);
  const [rows, total] = await qb.getManyAndCount();
  const counts: { status: string; n: string }[] = await db().query('SELECT status, COUNT(*) AS n FROM mail_outbox WHERE organisation_id = ? GROUP BY status', [
    actor.user.organisationId,
  ]);
  const [{ n: attn }] = (await db().query(
    "SELECT COUNT(*) AS n FROM mail_outbox WHERE organisation_id = ? AND (status = 'failed' OR (status = 'pending' AND attempts >= ?))",
    [actor.user.organisationId, attention],
  )) as { n: string }[];
  return {
    items: rows.map((o) => presentOutbox(o, attention)),
    total,
    page: q.page,
    pageSize: q.pageSize,
    counts: { pending: 0, sent: 0, failed: 0, ...Object.fromEntries(counts.map((c) => [c.status, Number(c.n)])), attention: Number(attn) },
  };
}

/** Puts a failed (or stuck) message back in the queue to go at once. */
export async function retryOutbox(actor: Actor, id: number) {
  return db().transaction(async (m) => {
    const rows: { id: string }[] = await m.query('SELECT id FROM mail_outbox WHERE id = ? AND organisation_id = ? FOR UPDATE', [id, actor.user.organisationId]);
    if (!rows.length) throw notFound('Message');
    const o = await m.getRepository(MailOutbox).findOneByOrFail({ id: String(id) });
    if (o.status === 'sent') throw conflict('This message was sent already', 'already_sent');
    await m.getRepository(MailOutbox).update({ id: o.id }, { status: 'pending', nextAttemptAt: new Date(), attempts: 0 });
    await recordAudit(m, whoOf(actor), {
      action: 'retry',
      entity: 'mail_outbox',
      entityId: String(id),
      before: { status: o.status, attempts: o.attempts, lastError: o.lastError },
    });
    return presentOutbox({ ...o, status: 'pending', attempts: 0, nextAttemptAt: new Date() } as MailOutbox, 3);
  });
}
