import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createDataSource } from '@backend/db/data-source';
import { seedDemo } from '@backend/db/seed/seed-demo';
import { Client, startTestApp } from '../support/test-app';
import { createMigratedDatabase } from '../support/child-app';

/**
 * scripts/backup and scripts/restore round-trip the demo organisation: seeded into a fresh database,
 * dumped, restored into another database; every table has the same rows (count and CHECKSUM TABLE) and
 * the app runs on the restored copy.
 */
const root = fileURLToPath(new URL('../../', import.meta.url));
const SOURCE = 'plenum_backup_source';
const TARGET = 'plenum_backup_restored';
let tmp: string;
const sources: DataSource[] = [];

function open(database: string): Promise<DataSource> {
  const ds = createDataSource({ database, poolSize: 2 });
  sources.push(ds);
  return ds.initialize();
}

/** Row count and checksum of every base table, by name. */
async function fingerprint(ds: DataSource): Promise<Record<string, string>> {
  const tables: { name: string }[] = await ds.query(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name`,
  );
  const out: Record<string, string> = {};
  for (const { name } of tables) {
    const [{ n }] = await ds.query(`SELECT COUNT(*) AS n FROM \`${name}\``);
    const [sum] = await ds.query(`CHECKSUM TABLE \`${name}\` EXTENDED`);
    out[name] = `${n} rows, checksum ${sum.Checksum}`;
  }
  return out;
}

const scriptEnv = (database: string) => ({ ...process.env, DB_NAME: database });

beforeAll(async () => {
  tmp = mkdtempSync(path.join(os.tmpdir(), 'plenum-backup-test-'));
  await createMigratedDatabase(SOURCE);
  const admin = await open(SOURCE);
  await admin.query(`DROP DATABASE IF EXISTS ${TARGET}`);
  expect(await seedDemo(admin)).toBe(true);
}, 180_000);

afterAll(async () => {
  for (const ds of sources) if (ds.isInitialized) await ds.destroy();
  rmSync(tmp, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('round-trips the demo organisation: same tables, row counts and checksums', async () => {
    const file = path.join(tmp, 'demo.sql.gz');
    const backup = execFileSync(path.join(root, 'scripts/backup'), [file], { env: scriptEnv(SOURCE), encoding: 'utf8', timeout: 120_000 });
    expect(backup).toMatch(/backed up database/);
    expect(statSync(file).size).toBeGreaterThan(10_000);

    const restore = execFileSync(path.join(root, 'scripts/restore'), [file], { env: scriptEnv(TARGET), encoding: 'utf8', timeout: 180_000 });
    expect(restore).toMatch(/restored/);

    const before = await fingerprint(await open(SOURCE));
    const after = await fingerprint(await open(TARGET));
    expect(Object.keys(before).length).toBeGreaterThan(20);
    expect(Number(before.source_reading?.split(' ')[0])).toBeGreaterThan(1000); // the demo tank's telemetry came along
    expect(after).toEqual(before);
  }, 300_000);

  it('refuses to restore over a database that has tables', () => {
    const file = path.join(tmp, 'demo.sql.gz');
    let failed = false;
    try {
      execFileSync(path.join(root, 'scripts/restore'), [file], { env: scriptEnv(TARGET), encoding: 'utf8', stdio: 'pipe' });
    } catch (e) {
      failed = true;
      expect(String((e as { stderr?: string }).stderr)).toMatch(/already has \d+ tables/);
    }
    expect(failed).toBe(true);
  });

  it('the app runs on the restored copy: the demo sign-in and the overview work', async () => {
    const app = await startTestApp({ DB_NAME: TARGET });
    try {
      expect(await app.ds.showMigrations()).toBe(false);
      const c = new Client(app.baseUrl);
      expect((await c.login('facilities@plenum.example', 'demo-plenum')).status).toBe(200);
      const overview = await c.get('/api/overview');
      expect(overview.status).toBe(200);
      expect(JSON.stringify(overview.body)).toMatch(/Main VIE/);
    } finally {
      await app.close();
    }
  }, 120_000);
});
