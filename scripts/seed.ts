/**
 * `npm run seed`: runs pending migrations, then loads the invented demo organisation into the database
 * named by DB_* (as the app reads it), once; a second run leaves the existing demo data as it is.
 * Refused with NODE_ENV=production: demo sign-ins must never exist there.
 */
import 'reflect-metadata';
import { env } from '../backend/src/config/env';
import { createDataSource } from '../backend/src/db/data-source';
import { seedDemo } from '../backend/src/db/seed/seed-demo';

const e = env();
if (e.NODE_ENV === 'production') {
  console.error('[plenum] NODE_ENV=production: the demo organisation and its sign-ins are not created there.');
  process.exit(2);
}
const ds = createDataSource({ poolSize: 2 });
await ds.initialize();
try {
  for (const m of await ds.runMigrations({ transaction: 'each' })) console.log(`[plenum] migration ran: ${m.name}`);
  console.log((await seedDemo(ds)) ? '[plenum] Demo organisation created.' : '[plenum] Demo organisation exists already; left as it is.');
} finally {
  await ds.destroy();
}
