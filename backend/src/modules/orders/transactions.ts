import type { DataSource, EntityManager } from 'typeorm';
import type { Request } from 'express';
import { IDEMPOTENCY_HEADER, idempotencyKeySchema } from '@common/schemas/orders.schema';
import { validate } from '../../http/validate';
import { conflict } from '../../errors/app-error';

const RETRYABLE = new Set(['ER_LOCK_DEADLOCK', 'ER_LOCK_WAIT_TIMEOUT']);

function codeOf(e: unknown): string | undefined {
  const x = e as { code?: string; driverError?: { code?: string } };
  return x?.driverError?.code ?? x?.code;
}

export function isDuplicateKey(e: unknown): boolean {
  return codeOf(e) === 'ER_DUP_ENTRY';
}

/**
 * Runs `work` in one transaction and runs it again (up to 5 times) when InnoDB picks it as a deadlock
 * victim or a lock wait times out: the whole unit is rolled back, so a retry is safe.
 */
export async function transactionWithRetry<T>(ds: DataSource, work: (m: EntityManager) => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await ds.transaction(work);
    } catch (e) {
      if (attempt >= 5 || !RETRYABLE.has(codeOf(e) ?? '')) throw e;
      await new Promise((r) => setTimeout(r, 10 * attempt + Math.random() * 40));
    }
  }
}

/**
 * The request's idempotency key (validated), or undefined: the Idempotency-Key header, or an
 * `idempotencyKey` field of the JSON body for clients that cannot set headers.
 */
export function idempotencyKeyOf(req: Request): string | undefined {
  const fromBody = (req.body as { idempotencyKey?: unknown } | undefined)?.idempotencyKey;
  const raw = req.get(IDEMPOTENCY_HEADER) ?? (fromBody === undefined ? undefined : fromBody);
  return raw === undefined ? undefined : validate(idempotencyKeySchema, raw, 'Idempotency-Key header');
}

/**
 * Makes a write repeatable: the key row is inserted first in the write's own transaction. A second call
 * with the same key blocks on that row until the first commits, then finds it and returns the first
 * answer; if the first rolled back, the second simply does the work. A key reused for another action is
 * refused.
 */
export async function idempotent<T>(m: EntityManager, userId: number, key: string | undefined, scope: string, work: () => Promise<T>): Promise<T> {
  if (!key) return work();
  try {
    await m.query('INSERT INTO idempotency_key (user_id, idem_key, scope) VALUES (?, ?, ?)', [userId, key, scope]);
  } catch (e) {
    if (!isDuplicateKey(e)) throw e;
    const rows: { scope: string; response_json: string | null }[] = await m.query('SELECT scope, response_json FROM idempotency_key WHERE user_id = ? AND idem_key = ? LOCK IN SHARE MODE', [userId, key]);
    const row = rows[0];
    if (!row || row.scope !== scope || row.response_json === null) throw conflict('This Idempotency-Key was used for another action: send a new key', 'idempotency_key_reused');
    return JSON.parse(row.response_json) as T;
  }
  const result = await work();
  await m.query('UPDATE idempotency_key SET response_json = ? WHERE user_id = ? AND idem_key = ?', [JSON.stringify(result ?? null), userId, key]);
  return result;
}
