import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Logger, QueryRunner } from 'typeorm';
import { createTestOrg, signedIn, startTestApp, type Client, type TestApp, type TestOrg } from '../support/test-app';

/**
 * The hot reads of source_reading stay bounded at health-system size: every SELECT the app sends on
 * source_reading while answering the overview, a source's detail, its readings list, the reconciliation
 * screens and the spend report is captured from the DataSource's logger, run again under EXPLAIN, and
 * no plan may read source_reading by a full table scan (`type: ALL`). The EXPLAIN rows are printed.
 *
 * The table holds enough rows here (a busy tank and others around it, then ANALYZE TABLE) that the
 * optimiser's choice is the one it makes on a large table, not the shortcut it takes on a tiny one.
 */

interface Captured {
  sql: string;
  params: unknown[];
}

let app: TestApp;
let org: TestOrg;
let fm: Client;
let purchasing: Client;
let siteId: number;
let tankId: number;
const captured: Captured[] = [];
let restoreLogger: () => void = () => undefined;

const HOURS = 24 * 90; // 90 days of hourly telemetry on the tank under test
const OTHER_TANKS = 12; // and twelve tanks elsewhere with the same, so one site is a small part of the table

async function insertTelemetry(sourceId: number, hours: number) {
  const end = Math.floor(Date.now() / 3_600_000) * 3_600_000;
  for (let from = 0; from < hours; from += 2000) {
    const values: unknown[] = [];
    const rows: string[] = [];
    for (let h = from; h < Math.min(hours, from + 2000); h++) {
      const pct = 40 + 30 * Math.sin(h / 50);
      rows.push("(?, ?, 'level_percent', ?, NULL, ?, 'telemetry', NULL, '')");
      values.push(sourceId, new Date(end - h * 3_600_000), pct, pct * 100);
    }
    await app.ds.query(
      `INSERT INTO source_reading (source_id, taken_at, kind, value, detail_json, contents, method, taken_by_user_id, note) VALUES ${rows.join(',')}`,
      values,
    );
  }
}

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
  siteId = org.siteIds[0];
  fm = await signedIn(app, org.users.facilities_manager);
  purchasing = await signedIn(app, org.users.purchasing_officer);
  const tank = await fm.post(`/api/sites/${siteId}/sources`, {
    name: 'Plan tank',
    type: 'bulk_liquid',
    gasCode: 'O2',
    capacityKg: 10_000,
    evaporationPercentPerDay: 0.4,
    leadTimeHours: 48,
  });
  expect(tank.status).toBe(200);
  tankId = tank.body.id;
  const ward = await fm.post(`/api/sites/${siteId}/wards`, {
    name: 'Plan ward',
    department: 'ward',
    beds: 20,
  });
  expect(ward.status).toBe(200);
  expect(
    (
      await fm.put(`/api/wards/${ward.body.id}/feeds`, {
        feeds: [{ sourceId: tankId, gasCode: 'O2', role: 'primary' }],
      })
    ).status,
  ).toBe(200);
  expect(
    (
      await fm.put(`/api/wards/${ward.body.id}/therapy`, {
        lines: [
          {
            gasCode: 'O2',
            device: 'custom',
            patients: 10,
            flowLMin: 10,
            label: 'constant',
          },
        ],
      })
    ).status,
  ).toBe(200);
  await insertTelemetry(tankId, HOURS);
  // The rest of the table: other tanks of another organisation (at health-system size one site's
  // sources hold about a fortieth of the readings), and one more tank at this site.
  const otherOrg = await createTestOrg(app.ds);
  const otherFm = await signedIn(app, otherOrg.users.facilities_manager);
  for (let k = 0; k < OTHER_TANKS; k++) {
    const other = await otherFm.post(`/api/sites/${otherOrg.siteIds[0]}/sources`, {
      name: `Other tank ${k + 1}`,
      type: 'bulk_liquid',
      gasCode: 'O2',
      capacityKg: 10_000,
      evaporationPercentPerDay: 0.4,
      leadTimeHours: 48,
    });
    expect(other.status).toBe(200);
    await insertTelemetry(other.body.id, HOURS);
  }
  const second = await fm.post(`/api/sites/${siteId}/sources`, {
    name: 'Plan tank 2',
    type: 'bulk_liquid',
    gasCode: 'O2',
    capacityKg: 10_000,
    evaporationPercentPerDay: 0.4,
    leadTimeHours: 48,
  });
  expect(second.status).toBe(200);
  await insertTelemetry(second.body.id, HOURS);
  await app.ds.query('ANALYZE TABLE source_reading');

  // Capture every query the app sends from here on (the logger is called before each query runs).
  const logger = app.ds.logger as Logger;
  const original = logger.logQuery.bind(logger);
  logger.logQuery = (query: string, parameters?: unknown[], runner?: QueryRunner) => {
    captured.push({ sql: query, params: parameters ?? [] });
    return original(query, parameters, runner);
  };
  restoreLogger = () => {
    logger.logQuery = original;
  };
}, 120_000);

afterAll(async () => {
  restoreLogger();
  await app.close();
});

/** The names a statement gives source_reading (the table itself and each alias). */
function readingAliases(sql: string): Set<string> {
  const out = new Set(['source_reading']);
  for (const m of sql.matchAll(/`?source_reading`?\s+(?:AS\s+)?`?([A-Za-z_][A-Za-z0-9_]*)`?/gi)) {
    if (!/^(WHERE|JOIN|LEFT|INNER|ON|GROUP|ORDER|LIMIT|SET|VALUES)$/i.test(m[1])) out.add(m[1]);
  }
  return out;
}

/** Rows and index entries the server reads running a statement (Handler_read_* of its session). */
async function handlerReads(runner: QueryRunner, q: Captured): Promise<number> {
  const total = async () =>
    (
      (await runner.query("SHOW SESSION STATUS LIKE 'Handler_read%'")) as {
        Variable_name: string;
        Value: string;
      }[]
    ).reduce((s, r) => s + Number(r.Value), 0);
  const before = await total();
  await runner.query(q.sql, q.params);
  return (await total()) - before;
}

type PlanRow = {
  id: number;
  select_type: string;
  table: string | null;
  type: string | null;
  possible_keys: string | null;
  key: string | null;
  rows: number | string | null;
  Extra: string | null;
};

describe('hot queries on source_reading use an index', () => {
  it('no plan of the overview, source detail, readings list, reconciliation or spend scans the whole readings table', async () => {
    const calls: [string, Client][] = [
      ['/api/overview', fm],
      [`/api/sources/${tankId}?draws=20`, fm],
      [`/api/sources/${tankId}/readings?page=3&pageSize=50`, fm],
      [`/api/sources/${tankId}/reconciliation?days=60`, fm],
      [`/api/sites/${siteId}/reconciliation?days=60`, fm],
      ['/api/spend', purchasing],
    ];
    const perRoute = new Map<string, number>();
    const rowsRead = new Map<string, number>();
    let overviewSql: string[] = [];
    for (const [path, client] of calls) {
      const before = captured.length;
      const res = await client.get(path);
      expect(res.status, `${path}: ${JSON.stringify(res.body).slice(0, 300)}`).toBe(200);
      const reads = captured.slice(before).filter((q) => /source_reading/i.test(q.sql) && /^\s*SELECT/i.test(q.sql));
      perRoute.set(path, reads.length);
      if (path === '/api/overview') overviewSql = [...new Set(reads.map((q) => q.sql))];
    }
    // Each hot path read the readings table (otherwise this test would check nothing); spend reads it
    // only for cylinder sources with rental, which this organisation has none of.
    for (const [path, n] of perRoute) if (!path.startsWith('/api/spend')) expect(n, `${path} sent no SELECT on source_reading`).toBeGreaterThan(0);

    const seen = new Set<string>();
    const scans: string[] = [];
    const runner = app.ds.createQueryRunner();
    await runner.connect();
    try {
      for (const q of captured) {
        if (!/source_reading/i.test(q.sql) || !/^\s*SELECT/i.test(q.sql) || seen.has(q.sql)) continue;
        seen.add(q.sql);
        const plan = (await runner.query(`EXPLAIN ${q.sql}`, q.params)) as PlanRow[];
        const aliases = readingAliases(q.sql);
        const read = await handlerReads(runner, q);
        rowsRead.set(q.sql, read);
        console.log(`\nEXPLAIN ${q.sql.replace(/\s+/g, ' ').slice(0, 400)}\n(index and row reads when run: ${read})`);
        console.table(
          plan.map((r) => ({
            id: r.id,
            select_type: r.select_type,
            table: r.table,
            type: r.type,
            key: r.key,
            rows: r.rows,
            Extra: r.Extra,
          })),
        );
        for (const r of plan) if (r.type === 'ALL' && r.table && aliases.has(r.table)) scans.push(`${r.table} in: ${q.sql.replace(/\s+/g, ' ').slice(0, 300)}`);
      }
    } finally {
      await runner.release();
    }
    expect(seen.size).toBeGreaterThanOrEqual(4);
    expect(scans, 'full scans of source_reading').toEqual([]);

    // Bounded, not only indexed: the overview's reads of source_reading (the newest reading of each
    // source and the last 21 days) stay well below the site's whole history of 2 × 2,160 readings; a
    // plan that walks every reading of the site's sources (and asks of each whether it is the newest)
    // reads all of it. 21 days × 24 h × 2 tanks = 1,008 recent readings, plus a few per source.
    const overviewReads = overviewSql.filter((q) => rowsRead.has(q)).reduce((sum, q) => sum + rowsRead.get(q)!, 0);
    console.log(`overview: ${overviewReads} index and row reads of source_reading (history: ${2 * HOURS})`);
    expect(overviewReads).toBeGreaterThan(0);
    expect(overviewReads).toBeLessThan(2 * HOURS * 0.5);
  });
});
