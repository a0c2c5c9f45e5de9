import type { DataSource, EntityManager } from 'typeorm';
import type { Request } from 'express';
import { IDEMPOTENCY_HEADER, idempotencyKeySchema } from '@common/schemas/orders.schema';
import { validate } from '../../http/validate';
import { conflict } from '../../errors/app-error';

import { isDuplicateKey } from '../../db/db-errors';

export { isDuplicateKey };

/**
 * Runs `work` in one transaction. The DataSource itself runs a deadlock victim's transaction again
 * (RetryingDataSource, the one retry layer); this wrapper used to add a second loop around it (up to
 * 5 × 8 attempts) and is kept only as the orders module's name for it.
 */
export function transactionWithRetry<T>(ds: DataSource, work: (m: EntityManager) => Promise<T>): Promise<T> {
  return ds.transaction(work);
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
    const rows: { scope: string; response_json: string | null }[] = await m.query(
      'SELECT scope, response_json FROM idempotency_key WHERE user_id = ? AND idem_key = ? LOCK IN SHARE MODE',
      [userId, key],
    );
    const row = rows[0];
    if (!row || row.scope !== scope || row.response_json === null)
      throw conflict('This Idempotency-Key was used for another action: send a new key', 'idempotency_key_reused');
    return JSON.parse(row.response_json) as T;
  }
  const result = await work();
  await m.query('UPDATE idempotency_key SET response_json = ? WHERE user_id = ? AND idem_key = ?', [JSON.stringify(result ?? null), userId, key]);
  return result;
}
