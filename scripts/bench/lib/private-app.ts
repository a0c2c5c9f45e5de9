/**
 * For benchmarks: a private MariaDB in a temporary folder (started through scripts/lib/setup.sh), a
 * migrated database with the demo organisation, and the app in this process on a free loopback port.
 */
import 'reflect-metadata';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../../../', import.meta.url));

export async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

export interface PrivateDb {
  port: number;
  dir: string;
  socket: string;
  stop: () => void;
}

/** Starts a throw-away MariaDB with database `plenum_bench` and user plenum_bench (all privileges). */
export async function startPrivateMariaDb(): Promise<PrivateDb> {
  const port = await freePort();
  const dir = mkdtempSync(path.join(os.tmpdir(), 'plenum-bench-'));
  const script = `
    set -e
    ROOT=${JSON.stringify(root)}; . "$ROOT/scripts/lib/setup.sh"
    ensure_mariadb >/dev/null
    start_mariadb ${JSON.stringify(path.join(dir, 'db'))} ${port} >/dev/null
    create_database plenum_bench plenum_bench plenum-bench >/dev/null
    grant_all plenum_bench >/dev/null
    echo "$MARIADB_PID"
  `;
  const pid = execFileSync('bash', ['-c', script], { encoding: 'utf8' }).trim().split('\n').pop()!;
  const socket = path.join(dir, 'db', 'mysqld.sock');
  return {
    port,
    dir,
    socket,
    stop: () => {
      spawnSync('mariadb-admin', ['--no-defaults', `--socket=${socket}`, '-uroot', 'shutdown']);
      try {
        process.kill(Number(pid), 0);
        process.kill(Number(pid), 'SIGKILL');
      } catch {
        /* gone */
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** The app with the demo organisation on a private MariaDB; returns its URL and a stop function. */
export async function startPrivateApp(): Promise<{ baseUrl: string; stop: () => Promise<void> }> {
  const db = await startPrivateMariaDb();
  const { parseEnv, setEnv } = await import('../../../backend/src/config/env');
  setEnv(
    parseEnv({
      ...process.env,
      NODE_ENV: 'test',
      DB_PORT: String(db.port),
      DB_NAME: 'plenum_bench',
      DB_USER: 'plenum_bench',
      DB_PASSWORD: 'plenum-bench',
      SERVE_FRONTEND: 'false',
      LOG_LEVEL: 'error',
      LOGIN_RATE_LIMIT_PER_15_MIN: '100000',
      DB_POOL_SIZE: '10',
    }),
  );
  const { logger } = await import('../../../backend/src/logger');
  logger.setLevel('error');
  const { createDataSource } = await import('../../../backend/src/db/data-source');
  const { setDb } = await import('../../../backend/src/db/db');
  const { seedDemo } = await import('../../../backend/src/db/seed/seed-demo');
  const { createApp } = await import('../../../backend/src/app');
  const ds = createDataSource();
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  setDb(ds);
  await seedDemo(ds);
  const { app, close } = await createApp();
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    stop: async () => {
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
      await close();
      await ds.destroy();
      db.stop();
    },
  };
}

/** Signs in and returns the cookie header for later requests. */
export async function signIn(baseUrl: string, email: string, password = 'demo-plenum'): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1));
  return sorted[i];
}
