/**
 * Process entry of the upload worker (started by main.ts as a child process): checks and imports CSV
 * uploads from import_job. A process of its own keeps a 500,000-row parse off the API's event loop and
 * lets the heap be sized for the job (see IMPORT_WORKER_NODE_FLAGS), so its memory stays flat.
 */
import 'reflect-metadata';
import { env } from '../../config/env';
import { createDataSource } from '../../db/data-source';
import { setDb } from '../../db/db';
import { closeBulkPool } from '../../db/bulk-pool';
import { logger } from '../../logger';
import { startImportWorker, wakeImportWorker } from './import-runner';

const e = env();
logger.setLevel(e.LOG_LEVEL);
const ds = createDataSource({ poolSize: 3 });
await ds.initialize();
setDb(ds);
const stopWorker = startImportWorker();
logger.info('upload worker started');
process.on('message', (m) => {
  if (m === 'wake') wakeImportWorker();
});

let stopping = false;
async function stop(why: string) {
  if (stopping) return;
  stopping = true;
  logger.info(`upload worker: ${why}, stopping`);
  // A running import rolls back and is queued again; the next start picks it up.
  await stopWorker().catch(() => undefined);
  await closeBulkPool();
  await ds.destroy().catch(() => undefined);
  process.exit(0);
}
process.on('SIGTERM', () => void stop('SIGTERM'));
process.on('SIGINT', () => void stop('SIGINT'));
process.on('disconnect', () => void stop('the app went away'));
