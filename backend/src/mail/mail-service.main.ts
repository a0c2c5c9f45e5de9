/** Process entry of the local mail service (development): `node --import tsx backend/src/mail/mail-service.main.ts`. */
import 'reflect-metadata';
import { env } from '../config/env';
import { createDataSource } from '../db/data-source';
import { logger } from '../logger';
import { startMailService, stopMailService } from './mail-service';

const e = env();
const ds = createDataSource({ poolSize: 3 });
await ds.initialize();
const server = await startMailService(ds, e.SMTP_PORT, e.SMTP_HOST);
logger.info(`local mail service listening on ${e.SMTP_HOST}:${e.SMTP_PORT}`);

async function stop() {
  await stopMailService(server);
  await ds.destroy();
  process.exit(0);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
