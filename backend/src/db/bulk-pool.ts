import mariadb, { type Pool } from 'mariadb';
import { env } from '../config/env';

let pool: Pool | undefined;

/**
 * A second pool, through the `mariadb` connector, for bulk writes only: its batch() sends a whole
 * batch of rows in one COM_STMT_BULK_EXECUTE (MariaDB's bulk protocol), several times faster than
 * row-by-row inserts. TypeORM cannot drive this connector (it uses mysql2), so large CSV imports take
 * a connection from here, with the same host, user and database as the DataSource.
 */
export function bulkPool(): Pool {
  if (!pool) {
    const e = env();
    pool = mariadb.createPool({
      host: e.DB_HOST,
      port: e.DB_PORT,
      user: e.DB_USER,
      password: e.DB_PASSWORD,
      database: e.DB_NAME,
      connectionLimit: 4,
      // Times are written as UTC text ('yyyy-MM-dd HH:mm:ss.SSS'): no session time zone applies.
      timezone: 'Z',
      bigIntAsNumber: true,
      insertIdAsNumber: true,
      decimalAsNumber: true,
      connectTimeout: 5000,
    });
  }
  return pool;
}

/** Ends the bulk pool (SIGTERM, tests). */
export async function closeBulkPool(): Promise<void> {
  const p = pool;
  pool = undefined;
  if (p) await p.end().catch(() => undefined);
}
