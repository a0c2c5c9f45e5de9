import 'reflect-metadata';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { existsSync } from 'node:fs';
import type { TestProject } from 'vitest/node';
import { parseEnv, setEnv } from '@backend/config/env';
import { createDataSource } from '@backend/db/data-source';
import { setDb } from '@backend/db/db';
import { createApp } from '@backend/app';
import { logger } from '@backend/logger';
import { seedDemo } from '@backend/db/seed/seed-demo';
import { startMailService, stopMailService } from '@backend/mail/mail-service';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}

/**
 * Browser tests run against the real app with the demo organisation in its own database (plenum_e2e)
 * on the throw-away MariaDB of scripts/test, serving the front end built into dist/.
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  if (!process.env.PLENUM_TEST_DB) throw new Error('Browser tests need the throw-away MariaDB started by scripts/test. Run scripts/test.');
  if (!existsSync(new URL('../../dist/index.html', import.meta.url)))
    throw new Error('No front-end build in dist/: scripts/test builds it before the browser tests.');
  const database = 'plenum_e2e';
  setEnv(parseEnv({ ...process.env, DB_NAME: database, NODE_ENV: 'test', SERVE_FRONTEND: 'true', LOG_LEVEL: 'error' }));
  logger.setLevel('error');
  const admin = createDataSource({ database: process.env.DB_NAME, poolSize: 1 });
  await admin.initialize();
  await admin.query(`DROP DATABASE IF EXISTS ${database}`);
  await admin.query(`CREATE DATABASE ${database} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.destroy();
  const ds = createDataSource({ database, poolSize: 5 });
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  setDb(ds);
  await seedDemo(ds);
  const mail = await startMailService(ds, Number(process.env.SMTP_PORT));
  const { app, close } = await createApp();
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  project.provide('baseUrl', `http://127.0.0.1:${port}`);
  return async () => {
    server.closeAllConnections();
    await new Promise<void>((r) => server.close(() => r()));
    await close();
    await stopMailService(mail);
    await ds.destroy();
  };
}
