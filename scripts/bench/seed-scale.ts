/**
 * Seed benchmark: builds the invented health system (`npm run seed -- --scale health-system`) on a
 * private MariaDB started here, as its own process, and prints the wall time and the rows of each table.
 * SEED_TELEMETRY_DAYS shortens the telemetry (default 730, two years of hourly readings per bulk tank).
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { startPrivateMariaDb } from './lib/private-app';

const root = fileURLToPath(new URL('../../', import.meta.url));
const TARGET_S = 600;

export async function run(): Promise<void> {
  const days = process.env.SEED_TELEMETRY_DAYS ?? '730';
  const db = await startPrivateMariaDb();
  try {
    const started = performance.now();
    const r = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/seed.ts', '--scale', 'health-system', '--telemetry-days', days], {
      cwd: root,
      encoding: 'utf8',
      env: {
        ...process.env,
        NODE_ENV: 'test',
        DB_HOST: '127.0.0.1',
        DB_PORT: String(db.port),
        DB_NAME: 'plenum_bench',
        DB_USER: 'plenum_bench',
        DB_PASSWORD: 'plenum-bench',
        LOG_LEVEL: 'error',
      },
    });
    const seconds = (performance.now() - started) / 1000;
    process.stdout.write(
      r.stdout
        .split('\n')
        .filter((l) => !l.includes('migration ran'))
        .join('\n'),
    );
    if (r.status !== 0) throw new Error(`seed exited ${r.status}: ${r.stderr}`);
    const count = spawnSync('mariadb', ['--no-defaults', `--socket=${db.socket}`, '-uroot', '-N', '-e', 'SELECT COUNT(*) FROM plenum_bench.source_reading'], {
      encoding: 'utf8',
    });
    const readings = Number(count.stdout.trim());
    console.log(`seed-scale source_reading rows: ${readings.toLocaleString('en-GB')} (${days} days of telemetry)`);
    console.log(`seed-scale build time (migrations included): ${seconds.toFixed(1)} s (target ≤ ${TARGET_S} s; ratio ${(seconds / TARGET_S).toFixed(2)})`);
    console.log(`seed-scale readings per second: ${Math.round(readings / seconds).toLocaleString('en-GB')}`);
  } finally {
    db.stop();
  }
}
