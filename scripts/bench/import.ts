/**
 * Import benchmark: a generated year-and-more of 1-minute tank telemetry (1,000,000 rows: local time
 * without offset, level in %, unit column) goes through the product's upload path — inspect the file,
 * check every row (the preview pass), then import it in one transaction with the `mariadb` connector's
 * batch() — against a private MariaDB started here. The same rows, already converted, are then loaded
 * into the same table with MariaDB's own `LOAD DATA LOCAL INFILE`: our floor. Memory is the process's
 * peak RSS while the upload runs, for 250,000 and for 1,000,000 rows (flat means the two are close).
 *
 * Prints `name: value unit (target …; ratio …)`, one line per figure. PLENUM_BENCH_CHILD_FLAGS adds
 * node flags to the upload process (e.g. `--cpu-prof`); IMPORT_BATCH_ROWS changes the batch size.
 */
import 'reflect-metadata';
import { copyFileSync, createWriteStream, rmSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { once } from 'node:events';
import os from 'node:os';
import path from 'node:path';
import { startPrivateMariaDb } from './lib/private-app';
import { IMPORT_WORKER_NODE_FLAGS } from '../../backend/src/modules/imports/import-worker-process';

const ROWS = 1_000_000;
const SMALL = 250_000;
const ZONE = 'Europe/London';
const CAPACITY_KG = 20_000;

const fmt = (n: number) => Math.round(n).toLocaleString('en-GB');

/** Writes the telemetry CSV and, beside it, the same rows converted to source_reading columns for LOAD DATA. */
async function writeFiles(dir: string, rows: number, sourceId: number, userId: number): Promise<{ csv: string; tsv: string }> {
  const csv = path.join(dir, `telemetry-${rows}.csv`);
  const tsv = path.join(dir, `telemetry-${rows}.tsv`);
  const a = createWriteStream(csv);
  const b = createWriteStream(tsv);
  a.write('time,level,unit\n');
  const fmtLocal = new Intl.DateTimeFormat('sv-SE', {
    timeZone: ZONE,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  });
  const end = Math.floor(Date.now() / 3_600_000) * 3_600_000 - 24 * 3_600_000;
  const start = end - rows * 60_000;
  let bufA = '';
  let bufB = '';
  let hourKey = -1;
  let hourLocal = '';
  for (let i = 0; i < rows; i++) {
    const t = start + i * 60_000;
    const h = Math.floor(t / 3_600_000);
    if (h !== hourKey) {
      hourKey = h;
      hourLocal = fmtLocal
        .format(new Date(h * 3_600_000))
        .replace(' ', 'T')
        .slice(0, 14);
    }
    const minute = String(Math.floor((t % 3_600_000) / 60_000)).padStart(2, '0');
    const level = Math.round((55 + 30 * Math.sin(i / 4000) + ((i * 7919) % 13) / 10) * 10) / 10;
    bufA += `${hourLocal}${minute},${level},%\n`;
    bufB += `${sourceId}\t${new Date(t).toISOString().slice(0, 23).replace('T', ' ')}\tlevel_percent\t${level}\t\\N\t${(level / 100) * CAPACITY_KG}\timport\t${userId}\t\n`;
    if (bufA.length > 1 << 20) {
      if (!a.write(bufA)) await once(a, 'drain');
      if (!b.write(bufB)) await once(b, 'drain');
      bufA = '';
      bufB = '';
    }
  }
  a.end(bufA);
  b.end(bufB);
  await Promise.all([once(a, 'finish'), once(b, 'finish')]);
  return { csv, tsv };
}

export async function run(): Promise<void> {
  const db = await startPrivateMariaDb();
  const work = path.join(db.dir, 'files');
  try {
    const { parseEnv, setEnv } = await import('../../backend/src/config/env');
    setEnv(
      parseEnv({
        ...process.env,
        NODE_ENV: 'test',
        DB_PORT: String(db.port),
        DB_NAME: 'plenum_bench',
        DB_USER: 'plenum_bench',
        DB_PASSWORD: 'plenum-bench',
        LOG_LEVEL: 'error',
        UPLOAD_MAX_MB: '500',
        UPLOAD_DIR: work,
      }),
    );
    const { logger } = await import('../../backend/src/logger');
    logger.setLevel('error');
    const { createDataSource } = await import('../../backend/src/db/data-source');
    const { setDb } = await import('../../backend/src/db/db');
    const { closeBulkPool } = await import('../../backend/src/db/bulk-pool');
    const { Organisation } = await import('../../backend/src/db/entities/organisation.entity');
    const { Site } = await import('../../backend/src/db/entities/site.entity');
    const { User } = await import('../../backend/src/db/entities/user.entity');
    const { SupplySource } = await import('../../backend/src/db/entities/supply.entity');
    const ds = createDataSource({ poolSize: 4 });
    await ds.initialize();
    await ds.runMigrations({ transaction: 'each' });
    setDb(ds);
    const mkdir = (await import('node:fs/promises')).mkdir;
    await mkdir(work, { recursive: true });

    const org = await ds.getRepository(Organisation).save({ name: 'Bench organisation' });
    const site = await ds.getRepository(Site).save(
      ds.getRepository(Site).create({
        organisationId: org.id,
        name: 'Bench site',
        kind: 'hospital',
        address: '',
        timeZone: ZONE,
        referenceCode: '15C',
        unitSystem: 'metric',
        altitudeM: 0,
        atmosphericBar: 1.01325,
        currency: 'GBP',
        cylinderColours: 'ISO32',
        storeTemperatureC: 15,
        beds: 100,
      }),
    );
    const user = await ds.getRepository(User).save(
      ds.getRepository(User).create({
        organisationId: org.id,
        email: 'bench@bench.example',
        name: 'Bench',
        passwordHash: 'x',
        active: true,
        failedLogins: 0,
        lockedUntil: null,
        passwordChangedAt: null,
      }),
    );
    const tank = await ds.getRepository(SupplySource).save(
      ds.getRepository(SupplySource).create({
        siteId: site.id,
        name: 'Bench tank',
        type: 'bulk_liquid',
        gasCode: 'O2',
        capacityKg: CAPACITY_KG,
        evaporationPercentPerDay: 0.3,
        reorderMode: 'none',
        forecastBasis: 'model',
        modelCorrectionFactor: 1,
        notes: '',
        active: true,
      }),
    );
    const count = async () => Number(((await ds.query('SELECT COUNT(*) AS n FROM source_reading')) as { n: string }[])[0].n);

    /** One upload through the product path, in a child process (its peak RSS is the upload's own). */
    function upload(file: string, rows: number): { checkS: number; importS: number; importCpuS: number; maxRssMb: number; rssAtStartMb: number } {
      const out = spawnSync(
        process.execPath,
        [
          ...IMPORT_WORKER_NODE_FLAGS,
          ...(process.env.PLENUM_BENCH_CHILD_FLAGS ?? '').split(' ').filter(Boolean),
          '--import',
          'tsx',
          fileURLToPath(new URL('./lib/import-child.ts', import.meta.url)),
        ],
        {
          env: {
            ...process.env,
            PLENUM_BENCH_IMPORT: JSON.stringify({
              port: db.port,
              file,
              rows,
              siteId: site.id,
              sourceId: tank.id,
              userId: user.id,
              organisationId: org.id,
              uploadDir: work,
            }),
          },
          encoding: 'utf8',
          maxBuffer: 1 << 24,
        },
      );
      if (out.status !== 0) throw new Error(`upload process failed: ${out.stderr.slice(-2000)}`);
      return JSON.parse(out.stdout.trim().split('\n').pop()!);
    }

    const small = await writeFiles(work, SMALL, tank.id, user.id);
    const big = await writeFiles(work, ROWS, tank.id, user.id);

    // Flatness: a quarter of the rows first.
    const s = upload(small.csv, SMALL);
    await ds.query('DELETE FROM source_reading');

    // The floor: MariaDB's own bulk loader, the same converted rows into the same (emptied) table.
    const mariadb = (await import('mariadb')).default;
    // The connector (3.5) streams a LOCAL INFILE as one logical packet, so the server must accept a
    // packet the size of the file: raised on this private server only.
    await ds.query('SET GLOBAL max_allowed_packet = 1073741824');
    const loadData = async (): Promise<number> => {
      const conn = await mariadb.createConnection({
        host: '127.0.0.1',
        port: db.port,
        user: 'plenum_bench',
        password: 'plenum-bench',
        database: 'plenum_bench',
        permitLocalInfile: true,
      });
      try {
        const l0 = performance.now();
        await conn.query(
          `LOAD DATA LOCAL INFILE '${big.tsv}' INTO TABLE source_reading FIELDS TERMINATED BY '\\t' LINES TERMINATED BY '\\n' (source_id, taken_at, kind, value, detail_json, contents, method, taken_by_user_id, note)`,
        );
        return (performance.now() - l0) / 1000;
      } finally {
        await conn.end();
      }
    };

    // Two rounds, alternating, best of each: the machine is shared, so a single timing says little.
    let loadS = Infinity;
    let r = { checkS: Infinity, importS: Infinity, importCpuS: Infinity, maxRssMb: 0, rssAtStartMb: 0 };
    for (let round = 0; round < 2; round++) {
      loadS = Math.min(loadS, await loadData());
      if ((await count()) !== ROWS) throw new Error('LOAD DATA did not load every row');
      await ds.query('TRUNCATE TABLE source_reading');
      const big2 = path.join(work, `round-${round}.csv`);
      copyFileSync(big.csv, big2);
      const u = upload(big2, ROWS);
      if ((await count()) !== ROWS) throw new Error('the import did not store every row');
      await ds.query('TRUNCATE TABLE source_reading');
      await ds.query('DELETE FROM import_job');
      await ds.query('DELETE FROM import_file');
      r = {
        checkS: Math.min(r.checkS, u.checkS),
        importS: Math.min(r.importS, u.importS),
        importCpuS: Math.min(r.importCpuS, u.importCpuS),
        maxRssMb: Math.max(r.maxRssMb, u.maxRssMb),
        rssAtStartMb: u.rssAtStartMb,
      };
    }

    const importRate = ROWS / r.importS;
    const loadRate = ROWS / loadS;
    console.log(
      `import rows per second: ${fmt(importRate)} rows/s (${fmt(ROWS)} rows of 1-minute telemetry in ${r.importS.toFixed(1)} s, best of 2, ${r.importCpuS.toFixed(1)} s of it on the app's CPU; one transaction, batch() of ${fmt(Number(process.env.IMPORT_BATCH_ROWS ?? 5000))} rows with constant columns inlined; LOAD DATA LOCAL INFILE of the same rows: ${fmt(loadRate)} rows/s in ${loadS.toFixed(1)} s, best of 2; ratio ${(importRate / loadRate).toFixed(2)}; target ≥ 0.5)`,
    );
    console.log(
      `import check pass: ${fmt(ROWS / r.checkS)} rows/s (${r.checkS.toFixed(1)} s to read, convert and check every row and look for repeats before anything is written)`,
    );
    console.log(
      `import upload end to end: ${fmt(ROWS / (r.checkS + r.importS))} rows/s (check + import, ${(r.checkS + r.importS).toFixed(1)} s; ratio to LOAD DATA ${(ROWS / (r.checkS + r.importS) / loadRate).toFixed(2)})`,
    );
    console.log(
      `import peak memory: ${r.maxRssMb.toFixed(0)} MB peak RSS of the upload process for ${fmt(ROWS)} rows (target < 300 MB and flat; ${s.maxRssMb.toFixed(0)} MB for ${fmt(SMALL)} rows; ${r.rssAtStartMb.toFixed(0)} MB before the upload; ${os.cpus().length} cores, shared)`,
    );
    await closeBulkPool();
    await ds.destroy();
  } finally {
    rmSync(work, { recursive: true, force: true });
    db.stop();
  }
}
