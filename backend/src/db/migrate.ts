/** Runs pending migrations (scripts/start and scripts/test call it; production runs it before the app). */
import 'reflect-metadata';
import { createDataSource } from './data-source';

const ds = createDataSource({ poolSize: 2 });
await ds.initialize();
const ran = await ds.runMigrations({ transaction: 'each' });
for (const m of ran) console.log(`[plenum] migration ran: ${m.name}`);
await ds.destroy();
