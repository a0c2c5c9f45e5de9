/**
 * Time from a fresh clone to a running app, and a warm start. The repository is cloned into a temporary
 * folder; `scripts/start` runs there with its own PORT, DB_PORT, SMTP_PORT and PLENUM_DATA_DIR (npm ci,
 * MariaDB initialised, migrations, demo data, front-end build, app) until GET /api/health answers 200;
 * then it is stopped (SIGTERM: it stops what it started) and started again in the same clone.
 * Target for the warm start ≤ 10 s; the fresh clone is reported with the time of each step.
 * Committed work only (a clone); npm packages come from the local npm cache or the registry.
 */
import { execFileSync, spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { freePort } from './lib/private-app';

const root = fileURLToPath(new URL('../../', import.meta.url));
const WARM_TARGET_S = 10;

interface StartRun {
  seconds: number;
  steps: string[];
  /** SIGTERM, as Ctrl-C would; resolves with the seconds it took and whether it had to be killed. */
  stop: () => Promise<{ seconds: number; killed: boolean }>;
}

/** Runs scripts/start in `dir` until /api/health answers 200; records when each of its log lines came. */
async function startUntilHealthy(dir: string, env: Record<string, string>, t0: number): Promise<StartRun> {
  const proc = spawn('bash', ['scripts/start'], { cwd: dir, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
  let out = '';
  const steps: string[] = [];
  const onData = (d: Buffer) => {
    out += d.toString();
    for (const line of d.toString().split('\n')) {
      const m = line.match(/^\[plenum\] (.*)$/);
      if (m) steps.push(`${((performance.now() - t0) / 1000).toFixed(1)} s ${m[1]}`);
    }
  };
  proc.stdout!.on('data', onData);
  proc.stderr!.on('data', onData);
  const exited = new Promise<void>((resolve) => proc.on('exit', () => resolve()));
  const stop = async () => {
    const t0 = performance.now();
    let killed = false;
    if (proc.exitCode !== null) return { seconds: 0, killed };
    proc.kill('SIGTERM');
    const t = setTimeout(() => {
      killed = true;
      try {
        process.kill(-proc.pid!, 'SIGKILL'); // the group this bench started
      } catch {
        /* gone */
      }
    }, 30_000);
    await exited;
    clearTimeout(t);
    return { seconds: (performance.now() - t0) / 1000, killed };
  };
  const deadline = Date.now() + 15 * 60_000;
  for (;;) {
    const ok = await fetch(`http://127.0.0.1:${env.PORT}/api/health`, { signal: AbortSignal.timeout(2_000) }).then(
      (r) => r.status === 200,
      () => false,
    );
    if (ok) break;
    if (proc.exitCode !== null || Date.now() > deadline) {
      await stop();
      throw new Error(`scripts/start did not bring the app up:\n${out.slice(-3000)}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return { seconds: (performance.now() - t0) / 1000, steps, stop };
}

export async function run(): Promise<void> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), 'plenum-start-'));
  const dir = path.join(tmp, 'plenum');
  const env = {
    PORT: String(await freePort()),
    DB_PORT: String(await freePort()),
    SMTP_PORT: String(await freePort()),
    PLENUM_DATA_DIR: path.join(tmp, 'data'),
  };
  try {
    const t0 = performance.now();
    execFileSync('git', ['clone', '--quiet', '--no-local', root, dir], { stdio: 'ignore' });
    const cloneS = (performance.now() - t0) / 1000;
    const cold = await startUntilHealthy(dir, env, t0);
    const coldStop = await cold.stop();
    console.log(
      `start_fresh_clone: ${cold.seconds.toFixed(1)} s from git clone to /api/health 200 (clone ${cloneS.toFixed(1)} s; npm ci, MariaDB, migrations, demo data, build included)`,
    );
    console.log(`start_fresh_clone_steps: ${cold.steps.join(' | ')}`);

    const t1 = performance.now();
    const warm = await startUntilHealthy(dir, env, t1);
    const warmStop = await warm.stop();
    console.log(
      `start_warm: ${warm.seconds.toFixed(1)} s to /api/health 200 (target ≤ ${WARM_TARGET_S} s; ratio ${(warm.seconds / WARM_TARGET_S).toFixed(2)} of target)`,
    );
    console.log(`start_warm_steps: ${warm.steps.join(' | ')}`);
    for (const [name, st] of [
      ['fresh', coldStop],
      ['warm', warmStop],
    ] as const) {
      console.log(
        `start_stop_${name}: ${st.seconds.toFixed(1)} s from SIGTERM to scripts/start ending${st.killed ? ' (it did NOT stop by itself: killed after 30 s)' : ''}`,
      );
    }
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}
