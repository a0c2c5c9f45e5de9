/**
 * For the import benchmark: one upload through the product path (inspect, check every row, import in
 * one transaction) in a process of its own, so its peak memory is the upload's and nothing else's.
 * Reads its settings from PLENUM_BENCH_IMPORT (JSON) and prints one JSON line of timings and memory.
 */
import 'reflect-metadata';
import path from 'node:path';

const a = JSON.parse(process.env.PLENUM_BENCH_IMPORT ?? '{}') as {
  port: number;
  file: string;
  rows: number;
  siteId: number;
  sourceId: number;
  userId: number;
  organisationId: number;
  uploadDir: string;
};
const { parseEnv, setEnv } = await import('../../../backend/src/config/env');
setEnv(
  parseEnv({
    ...process.env,
    NODE_ENV: 'test',
    DB_PORT: String(a.port),
    DB_NAME: 'plenum_bench',
    DB_USER: 'plenum_bench',
    DB_PASSWORD: 'plenum-bench',
    LOG_LEVEL: 'error',
    UPLOAD_MAX_MB: '500',
    UPLOAD_DIR: a.uploadDir,
  }),
);
const { logger } = await import('../../../backend/src/logger');
logger.setLevel('error');
const { createDataSource } = await import('../../../backend/src/db/data-source');
const { setDb } = await import('../../../backend/src/db/db');
const { closeBulkPool } = await import('../../../backend/src/db/bulk-pool');
const { ImportJob } = await import('../../../backend/src/db/entities/usage.entity');
const { createImport, commitImport } = await import('../../../backend/src/modules/imports/import.service');
const { processNextJob } = await import('../../../backend/src/modules/imports/import-runner');
const ds = createDataSource({ poolSize: 4 });
await ds.initialize();
setDb(ds);
const actor = {
  user: {
    id: a.userId,
    organisationId: a.organisationId,
    email: 'bench@bench.example',
    name: 'Bench',
    roles: ['facilities_manager' as const],
    siteIds: [a.siteId],
  },
  requestId: 'bench',
};
const rssAtStart = process.memoryUsage().rss;
const t0 = performance.now();
const job = await createImport(
  actor,
  a.siteId,
  { path: a.file, originalname: path.basename(a.file) },
  { kind: 'tank_readings', sourceId: a.sourceId, dateOrder: 'ymd', confirmDuplicate: false },
);
if (job.status !== 'validating') throw new Error(`upload not accepted: ${job.status} ${job.message}`);
await processNextJob('bench');
const t1 = performance.now();
const checked = await ds.getRepository(ImportJob).findOneByOrFail({ id: job.id });
if (checked.status !== 'ready') throw new Error(`check failed: ${checked.message} ${checked.errorsJson?.slice(0, 500)}`);
await commitImport(actor, job.id, false);
const t2 = performance.now();
const cpu0 = process.cpuUsage();
await processNextJob('bench');
const cpu = process.cpuUsage(cpu0);
const t3 = performance.now();
const done = await ds.getRepository(ImportJob).findOneByOrFail({ id: job.id });
if (done.status !== 'done' || done.insertedRows !== a.rows) throw new Error(`import failed: ${done.status} ${done.message}`);
console.log(
  JSON.stringify({
    checkS: (t1 - t0) / 1000,
    importS: (t3 - t2) / 1000,
    maxRssMb: process.resourceUsage().maxRSS / 1024,
    importCpuS: (cpu.user + cpu.system) / 1e6,
    rssAtStartMb: rssAtStart / 1024 / 1024,
  }),
);
await closeBulkPool();
await ds.destroy();
