/** Process entry: configuration, DataSource, listen, and a clean stop on SIGINT/SIGTERM. */
import 'reflect-metadata';
import type { Server } from 'node:http';
import { env } from './config/env';
import { createDataSource } from './db/data-source';
import { setDb } from './db/db';
import { createApp } from './app';
import { logger } from './logger';
import { seedDemo } from './db/seed/seed-demo';
import { startImportWorkerProcess } from './modules/imports/import-worker-process';
import { startReminderJob } from './modules/usage/usage-reminder';
import { closeBulkPool } from './db/bulk-pool';
import { startOrderJobs, type OrderJobs } from './modules/orders/order-jobs';
import { fileStore } from './storage/file-store';

const e = env();
logger.setLevel(e.LOG_LEVEL);
const ds = createDataSource();
await ds.initialize();
setDb(ds);
if (e.PREPARE_ON_START !== 'none') {
  for (const m of await ds.runMigrations({ transaction: 'each' })) logger.info(`migration ran: ${m.name}`);
  if (e.PREPARE_ON_START === 'migrate-and-seed') {
    if (e.NODE_ENV === 'production') logger.info('Production: no demo data and no demo sign-ins are created.');
    else logger.info((await seedDemo(ds)) ? 'Demo organisation created.' : 'Demo organisation exists already; left as it is.');
  }
}
const pending = await ds.showMigrations();
if (pending) {
  logger.error('The database has migrations that have not run: run `npm run migrate` (scripts/start and scripts/test do it)');
  process.exit(1);
}
// Uploads wait in the file store: a wrong bucket or endpoint stops the start here, not an upload later.
await fileStore().ready();
const { app, close } = await createApp();
const server: Server = app.listen(e.PORT, e.HOST, (err?: Error) => {
  if (err) {
    logger.error(`Cannot listen on ${e.HOST}:${e.PORT}: ${err.message}`);
    process.exit(1);
  }
  logger.info(`Plenum listening on http://${e.HOST}:${e.PORT}`);
});
// Idle keep-alive connections stay open longer than a load balancer's or client's idle timeout (HAProxy,
// undici and browsers reuse them for up to a minute): otherwise the server may close a connection just as
// a request arrives on it, and that request gets no answer at all (seen under load as "other side closed").
server.keepAliveTimeout = 65_000;
server.headersTimeout = 66_000;
const jobs: OrderJobs | undefined = e.JOBS_ENABLED ? startOrderJobs() : undefined;

// Background work of uploads and usage reports (outside createApp, so tests start their own).
const stopImportWorker = startImportWorkerProcess();
const stopReminders = startReminderJob();

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info(`${signal}: stopping`);
  server.close();
  server.closeAllConnections?.();
  await stopImportWorker().catch(() => undefined);
  await stopReminders().catch(() => undefined);
  await closeBulkPool();
  await jobs?.stop().catch(() => undefined);
  await close().catch(() => undefined);
  await ds.destroy().catch(() => undefined);
  process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
