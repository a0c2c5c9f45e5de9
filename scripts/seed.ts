/**
 * `npm run seed`: runs pending migrations, then loads the invented demo organisation into the database
 * named by DB_* (as the app reads it), once; a second run leaves the existing demo data as it is.
 * `npm run seed -- --scale health-system [--telemetry-days N]` loads, instead, the invented 40-site
 * health system used to check the hot paths at scale (backend/src/db/seed/health-system.ts).
 * Refused with NODE_ENV=production: demo sign-ins must never exist there.
 */
import 'reflect-metadata';
import { parseArgs } from 'node:util';
import { env } from '../backend/src/config/env';
import { createDataSource } from '../backend/src/db/data-source';
import { closeBulkPool } from '../backend/src/db/bulk-pool';
import { seedDemo } from '../backend/src/db/seed/seed-demo';
import { seedHealthSystem } from '../backend/src/db/seed/health-system';

const usage = 'usage: npm run seed -- [--scale demo|health-system] [--telemetry-days 1..730]';
let scale: 'demo' | 'health-system' = 'demo';
let telemetryDays = 730;
try {
  const { values } = parseArgs({ options: { scale: { type: 'string' }, 'telemetry-days': { type: 'string' } }, strict: true, allowPositionals: false });
  if (values.scale !== undefined) {
    if (values.scale !== 'demo' && values.scale !== 'health-system') throw new Error(`unknown --scale "${values.scale}" (demo or health-system)`);
    scale = values.scale;
  }
  if (values['telemetry-days'] !== undefined) {
    const n = Number(values['telemetry-days']);
    if (!/^\d+$/.test(values['telemetry-days']) || !Number.isInteger(n) || n < 1 || n > 730)
      throw new Error(`--telemetry-days must be a whole number from 1 to 730, not "${values['telemetry-days']}"`);
    if (scale !== 'health-system') throw new Error('--telemetry-days applies to --scale health-system only');
    telemetryDays = n;
  }
} catch (e) {
  console.error(`[plenum] ${(e as Error).message}\n${usage}`);
  process.exit(2);
}

const e = env();
if (e.NODE_ENV === 'production') {
  console.error('[plenum] NODE_ENV=production: the demo organisation and its sign-ins are not created there.');
  process.exit(2);
}
const ds = createDataSource({ poolSize: 2 });
await ds.initialize();
try {
  for (const m of await ds.runMigrations({ transaction: 'each' })) console.log(`[plenum] migration ran: ${m.name}`);
  if (scale === 'demo') {
    console.log((await seedDemo(ds)) ? '[plenum] Demo organisation created.' : '[plenum] Demo organisation exists already; left as it is.');
  } else {
    const started = performance.now();
    const r = await seedHealthSystem(ds, { telemetryDays, log: (line) => console.log(`[plenum] ${line}`) });
    const seconds = (performance.now() - started) / 1000;
    if (!r.created) console.log('[plenum] Health-system organisation exists already; left as it is.');
    else console.log(`[plenum] Health-system organisation created in ${seconds.toFixed(1)} s (${telemetryDays} days of telemetry): ${JSON.stringify(r.rows)}`);
  }
} finally {
  await ds.destroy();
  await closeBulkPool();
}
