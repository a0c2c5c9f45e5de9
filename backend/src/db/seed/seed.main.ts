/**
 * Loads the demo organisation once (idempotent: does nothing when it exists). Refuses in production,
 * where demo sign-ins must never exist.
 */
import 'reflect-metadata';
import { env } from '../../config/env';
import { createDataSource } from '../data-source';
import { setDb } from '../db';
import { seedDemo } from './seed-demo';

if (env().NODE_ENV === 'production') {
  console.error('[plenum] Refusing to create demo data and demo sign-ins in production (NODE_ENV=production).');
  process.exit(1);
}
const ds = createDataSource({ poolSize: 2 });
await ds.initialize();
setDb(ds);
try {
  const created = await seedDemo(ds);
  console.log(created ? '[plenum] Demo organisation created.' : '[plenum] Demo organisation exists already; left as it is.');
} finally {
  await ds.destroy();
}
