import { spawn, type ChildProcess } from 'node:child_process';
import { createServer, type AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import 'reflect-metadata';
import { createDataSource } from '@backend/db/data-source';

const root = fileURLToPath(new URL('../../', import.meta.url));

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.on('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

export interface ChildApp {
  baseUrl: string;
  proc: ChildProcess;
  /** Everything the process wrote to stdout and stderr so far. */
  output: () => string;
  /** Resolves with the exit code (or signal) when the process ends. */
  exited: Promise<number | string | null>;
  /** SIGTERM (a clean stop), then SIGKILL after a grace period. */
  stop: () => Promise<void>;
}

/**
 * The real app as its own process (`node --import tsx backend/src/main.ts`), as production runs it, on a
 * free loopback port. `env` overrides the configuration (DB_*, limits); background jobs are off unless
 * asked for. Resolves once the process answers HTTP (whatever the state of its database).
 */
export async function startChildApp(env: Record<string, string>, opts: { timeoutMs?: number } = {}): Promise<ChildApp> {
  const port = await freePort();
  const proc = spawn(process.execPath, ['--import', 'tsx', 'backend/src/main.ts'], {
    cwd: root,
    env: { ...process.env, NODE_ENV: 'test', HOST: '127.0.0.1', PORT: String(port), SERVE_FRONTEND: 'false', JOBS_ENABLED: 'false', LOG_LEVEL: 'info', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  proc.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  proc.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  const exited = new Promise<number | string | null>((resolve) => proc.on('exit', (code, signal) => resolve(code ?? signal)));
  const deadline = Date.now() + (opts.timeoutMs ?? 60_000);
  let gone = false;
  void exited.then(() => (gone = true));
  const answers = () =>
    fetch(`http://127.0.0.1:${port}/api/health`, { signal: AbortSignal.timeout(5_000) }).then(
      () => true,
      () => false,
    );
  while (!(await answers())) {
    if (gone) throw new Error(`The app exited before listening:\n${out}`);
    if (Date.now() > deadline) {
      proc.kill('SIGKILL');
      throw new Error(`The app did not listen in time:\n${out}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    proc,
    output: () => out,
    exited,
    stop: async () => {
      if (gone) return;
      proc.kill('SIGTERM');
      const t = setTimeout(() => proc.kill('SIGKILL'), 10_000);
      await exited;
      clearTimeout(t);
    },
  };
}

/** Creates (or recreates) a database on the test MariaDB and runs the migrations in it. */
export async function createMigratedDatabase(name: string, conn: { port?: number } = {}): Promise<void> {
  const extra = conn.port ? { port: conn.port } : {};
  const admin = createDataSource({ ...extra, database: 'information_schema', poolSize: 1 });
  await admin.initialize();
  try {
    await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await admin.destroy();
  }
  const ds = createDataSource({ ...extra, database: name, poolSize: 1 });
  await ds.initialize();
  try {
    await ds.runMigrations({ transaction: 'each' });
  } finally {
    await ds.destroy();
  }
}
