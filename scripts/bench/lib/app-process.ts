/**
 * For benchmarks: the app as its own process (`node --import tsx backend/src/main.ts`, as production runs
 * it), on a private MariaDB with the demo organisation, on a free loopback port. The load generator then
 * runs in the bench process without sharing the app's event loop.
 */
import 'reflect-metadata';
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { freePort, startPrivateMariaDb } from './private-app';

const root = fileURLToPath(new URL('../../../', import.meta.url));

export interface AppProcess {
  baseUrl: string;
  output: () => string;
  stop: () => Promise<void>;
}

export async function startAppProcess(extraEnv: Record<string, string> = {}): Promise<AppProcess> {
  const db = await startPrivateMariaDb();
  const dbEnv = { DB_HOST: '127.0.0.1', DB_PORT: String(db.port), DB_NAME: 'plenum_bench', DB_USER: 'plenum_bench', DB_PASSWORD: 'plenum-bench' };
  const { parseEnv, setEnv } = await import('../../../backend/src/config/env');
  setEnv(parseEnv({ ...process.env, NODE_ENV: 'test', ...dbEnv }));
  const { createDataSource } = await import('../../../backend/src/db/data-source');
  const { seedDemo } = await import('../../../backend/src/db/seed/seed-demo');
  const ds = createDataSource({ poolSize: 2 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  await seedDemo(ds);
  await ds.destroy();

  const port = await freePort();
  const proc = spawn(process.execPath, ['--import', 'tsx', 'backend/src/main.ts'], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      SERVE_FRONTEND: 'false',
      LOG_LEVEL: 'error',
      LOGIN_RATE_LIMIT_PER_15_MIN: '100000',
      JOBS_ENABLED: 'false',
      ...dbEnv,
      ...extraEnv,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  proc.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  proc.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  const exited = new Promise<void>((resolve) => proc.on('exit', () => resolve()));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    const ok = await fetch(`${baseUrl}/api/health`).then(
      (r) => r.status === 200,
      () => false,
    );
    if (ok) break;
    if (proc.exitCode !== null || Date.now() > deadline) {
      proc.kill('SIGKILL');
      db.stop();
      throw new Error(`the app did not start:\n${out}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    baseUrl,
    output: () => out,
    stop: async () => {
      proc.kill('SIGTERM');
      const t = setTimeout(() => proc.kill('SIGKILL'), 10_000);
      await exited;
      clearTimeout(t);
      db.stop();
    },
  };
}

/** Signs in; returns the cookie and the session's CSRF token. */
export async function signInSession(baseUrl: string, email: string, password = 'demo-plenum'): Promise<{ cookie: string; csrf: string }> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { csrfToken: string };
  return {
    cookie: res.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; '),
    csrf: body.csrfToken,
  };
}
