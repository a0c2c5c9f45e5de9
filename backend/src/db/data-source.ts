import 'reflect-metadata';
import { DataSource, type EntityManager } from 'typeorm';
import { env } from '../config/env';
import { SnakeNamingStrategy } from './naming-strategy';
import { entities } from './entities';
import { migrations } from './migrations';
import { isLockConflict } from './db-errors';
import { backoffMs } from '@common/api/backoff';

// The last overload of DataSource.transaction takes the isolation level first.
type IsolationLevel = Parameters<DataSource['transaction']>[0];

const TRANSACTION_ATTEMPTS = 8;

/**
 * A DataSource whose transactions are run again when InnoDB picks them as a deadlock victim or a lock
 * wait times out. Two writes at one site deadlock in the ordinary course (each insert's foreign-key check
 * takes a shared lock on the site row, then both bump the site's data version); the whole unit is rolled
 * back, so running it again is what a person pressing the button again would do, only sooner. This is the
 * only retry layer: callers use `transaction` directly and must keep side effects inside the manager.
 */
export class RetryingDataSource extends DataSource {
  override transaction<T>(run: (m: EntityManager) => Promise<T>): Promise<T>;
  override transaction<T>(isolationLevel: IsolationLevel, run: (m: EntityManager) => Promise<T>): Promise<T>;
  override async transaction<T>(a: IsolationLevel | ((m: EntityManager) => Promise<T>), b?: (m: EntityManager) => Promise<T>): Promise<T> {
    for (let attempt = 1; ; attempt++) {
      try {
        return typeof a === 'function' ? await super.transaction(a) : await super.transaction(a, b!);
      } catch (e) {
        if (attempt >= TRANSACTION_ATTEMPTS || !isLockConflict(e)) throw e;
        // Exponential back-off with full jitter, so the victims of one deadlock do not meet again at once.
        await new Promise((r) => setTimeout(r, backoffMs(attempt, { baseMs: 20, maxMs: 1_000, jitter: 'full' })));
      }
    }
  }
}

/** Builds the application's one DataSource (MariaDB through mysql2). Times are read and written in UTC. */
export function createDataSource(overrides: { database?: string; port?: number; poolSize?: number } = {}): DataSource {
  const e = env();
  return new RetryingDataSource({
    type: 'mariadb',
    host: e.DB_HOST,
    port: overrides.port ?? e.DB_PORT,
    username: e.DB_USER,
    password: e.DB_PASSWORD,
    database: overrides.database ?? e.DB_NAME,
    timezone: 'Z',
    charset: 'utf8mb4_unicode_ci',
    entities,
    migrations,
    migrationsTableName: 'schema_migration',
    synchronize: false,
    namingStrategy: new SnakeNamingStrategy(),
    poolSize: overrides.poolSize ?? e.DB_POOL_SIZE,
    // A request may hold several queries at once (Promise.all): at 100 users a queue of 200 overflowed.
    // Past this many waiting queries the app answers 503 "busy" rather than queue without bound.
    extra: { connectTimeout: 5000, waitForConnections: true, queueLimit: 2000 },
    logging: ['error'],
  });
}
