import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createDataSource } from '@backend/db/data-source';

/**
 * Galera replicates row events and certifies them by key: a table without a primary key is replicated
 * badly (every row event scans the table on each node; DELETE of duplicate rows may diverge) and the
 * MariaDB Galera documentation lists "all tables must have a primary key" among its limitations. Every
 * base table of the migrated test database, the session store's and the rate limiter's included, must
 * have one and must use InnoDB (Galera replicates only InnoDB).
 */
let ds: DataSource;
beforeAll(async () => {
  ds = createDataSource({ poolSize: 1 });
  await ds.initialize();
});
afterAll(async () => {
  await ds?.destroy();
});

describe('schema fit for Galera', () => {
  it('every table has a primary key and uses InnoDB', async () => {
    const tables: { name: string; engine: string; pk: number }[] = await ds.query(
      `SELECT t.TABLE_NAME AS name, t.ENGINE AS engine,
              (SELECT COUNT(*) FROM information_schema.TABLE_CONSTRAINTS c
                WHERE c.TABLE_SCHEMA = t.TABLE_SCHEMA AND c.TABLE_NAME = t.TABLE_NAME AND c.CONSTRAINT_TYPE = 'PRIMARY KEY') AS pk
         FROM information_schema.TABLES t
        WHERE t.TABLE_SCHEMA = DATABASE() AND t.TABLE_TYPE = 'BASE TABLE'`,
    );
    const names = tables.map((t) => t.name);
    // The stores that other processes share: sessions (express-mysql-session), sign-in limits, migrations.
    expect(names).toEqual(expect.arrayContaining(['sessions', 'rate_limit_hit', 'schema_migration']));
    expect(tables.filter((t) => Number(t.pk) !== 1).map((t) => t.name)).toEqual([]);
    expect(tables.filter((t) => t.engine !== 'InnoDB').map((t) => t.name)).toEqual([]);
  });

  it('the app issues no LOCK TABLES and no GET_LOCK (neither is replicated by Galera)', async () => {
    const { execFileSync } = await import('node:child_process');
    const { fileURLToPath } = await import('node:url');
    const root = fileURLToPath(new URL('../../backend/src', import.meta.url));
    let hits = '';
    try {
      hits = execFileSync('grep', ['-rniE', '--include=*.ts', '--exclude=*.test.ts', 'LOCK TABLES|GET_LOCK\\(|RELEASE_LOCK\\(', root], { encoding: 'utf8' });
    } catch {
      hits = ''; // grep exits 1 when nothing matches
    }
    expect(hits).toBe('');
  });
});
