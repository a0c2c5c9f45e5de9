import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { freePort } from './child-app';

const root = fileURLToPath(new URL('../../', import.meta.url));

export interface PrivateMariaDb {
  port: number;
  socket: string;
  /** Stops the server (a clean shutdown) and waits until its process is gone. */
  stop: () => Promise<void>;
  /** Starts it again on the same data and port. */
  start: () => void;
  /** Stops it and deletes its data. */
  destroy: () => Promise<void>;
}

/**
 * A MariaDB of a test's own, in a temporary folder on a free loopback port, started with the functions of
 * scripts/lib/setup.sh (as scripts/test does), so a test may stop and restart it without touching the
 * shared test database. The database `name` and the test user (DB_USER/DB_PASSWORD) are created in it.
 */
export async function startPrivateMariaDb(name: string): Promise<PrivateMariaDb> {
  const port = await freePort();
  const dir = mkdtempSync(path.join(os.tmpdir(), 'plenum-faults-'));
  const dbDir = path.join(dir, 'db');
  const socket = path.join(dbDir, 'mysqld.sock');
  const pidFile = path.join(dbDir, 'mysqld.pid');
  const user = process.env.DB_USER ?? 'plenum_test';
  const password = process.env.DB_PASSWORD ?? 'plenum-test';
  const start = () => {
    const script = `
      set -e
      ROOT=${JSON.stringify(root)}; . "$ROOT/scripts/lib/setup.sh"
      ensure_mariadb >/dev/null
      start_mariadb ${JSON.stringify(dbDir)} ${port} >/dev/null
      create_database ${name} ${user} ${JSON.stringify(password)} >/dev/null
      grant_all ${user} >/dev/null
    `;
    execFileSync('bash', ['-c', script], { stdio: ['ignore', 'ignore', 'pipe'] });
  };
  const pid = () => {
    try {
      return Number(readFileSync(pidFile, 'utf8').trim());
    } catch {
      return 0;
    }
  };
  const alive = (p: number) => {
    if (!p) return false;
    try {
      process.kill(p, 0);
      return true;
    } catch {
      return false;
    }
  };
  const stop = async () => {
    const p = pid();
    spawnSync('mariadb-admin', ['--no-defaults', `--socket=${socket}`, '-uroot', 'shutdown'], { stdio: 'ignore' });
    for (let i = 0; i < 100 && alive(p); i++) await new Promise((r) => setTimeout(r, 100));
    if (alive(p)) process.kill(p, 'SIGKILL');
  };
  start();
  return {
    port,
    socket,
    stop,
    start,
    destroy: async () => {
      await stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
