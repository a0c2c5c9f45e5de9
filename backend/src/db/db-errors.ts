/**
 * The one reader of database error codes. TypeORM wraps a driver error in a QueryFailedError that keeps
 * the driver's code both on itself and on `driverError`; the mysql2 and mariadb connectors use the same
 * MariaDB symbols (ER_DUP_ENTRY, ER_LOCK_DEADLOCK, …) and Node's network codes (ECONNREFUSED, …).
 */
export function dbErrorCode(e: unknown): string | undefined {
  const x = e as { code?: unknown; driverError?: { code?: unknown } } | null | undefined;
  const code = x?.driverError?.code ?? x?.code;
  return typeof code === 'string' ? code : undefined;
}

const LOCK_CODES = new Set(['ER_LOCK_DEADLOCK', 'ER_LOCK_WAIT_TIMEOUT']);
const DOWN_CODES = new Set([
  'ECONNREFUSED',
  'PROTOCOL_CONNECTION_LOST',
  'ETIMEDOUT',
  'ER_CON_COUNT_ERROR',
  'ECONNRESET',
  'POOL_CLOSED',
  'ER_SERVER_SHUTDOWN',
  'EPIPE',
]);

/** A deadlock victim or a lock wait timed out (on Galera, a certification failure is reported as a deadlock). */
export function isLockConflict(e: unknown): boolean {
  return LOCK_CODES.has(dbErrorCode(e) ?? '');
}

/** A unique key refused the row. */
export function isDuplicateKey(e: unknown): boolean {
  return dbErrorCode(e) === 'ER_DUP_ENTRY';
}

/** The database cannot be reached (stopped, restarting, network gone, too many connections). */
export function isDatabaseDown(e: unknown): boolean {
  const code = dbErrorCode(e);
  return (
    (code !== undefined && DOWN_CODES.has(code)) || /connect ECONNREFUSED|Pool is closed|Connection lost/i.test((e as { message?: string })?.message ?? '')
  );
}
