import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createDataSource } from '@backend/db/data-source';
import { Client, createTestOrg, PASSWORD, type TestOrg } from '../support/test-app';
import { createMigratedDatabase, freePort, startChildApp, type ChildApp } from '../support/child-app';
import { startPrivateMariaDb, type PrivateMariaDb } from '../support/private-mariadb';

/**
 * Faults, on a MariaDB of this file's own (never the shared test database) and the app as its own
 * process, as production runs it:
 * - the database stops under load and comes back: requests fail cleanly (503 with a message, the
 *   session kept), the process survives and recovers by itself, and no write is lost or made twice;
 * - the mail service is away for a while: every queued message is sent exactly once after it returns,
 *   with two app processes sending;
 * - the app is killed in the middle of a CSV import: no partial rows, and the import runs again whole.
 * Bounded in time; loopback only.
 */
const DATABASE = 'plenum_faults';
let mariadb: PrivateMariaDb;
let ds: DataSource;
let org: TestOrg;
const children: ChildApp[] = [];

const appEnv = (extra: Record<string, string> = {}) => ({
  DB_PORT: String(mariadb.port),
  DB_NAME: DATABASE,
  LOG_LEVEL: 'error',
  LOGIN_RATE_LIMIT_PER_15_MIN: '100000',
  DB_POOL_SIZE: '10',
  ...extra,
});

async function startApp(extra: Record<string, string> = {}): Promise<ChildApp> {
  const child = await startChildApp(appEnv(extra));
  children.push(child);
  return child;
}

async function signIn(baseUrl: string, email: string): Promise<Client> {
  const c = new Client(baseUrl);
  const res = await c.login(email, PASSWORD);
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
  return c;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function until(what: string, check: () => Promise<boolean>, timeoutMs = 30_000, everyMs = 250): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check().catch(() => false))) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(everyMs);
  }
}

beforeAll(async () => {
  mariadb = await startPrivateMariaDb(DATABASE);
  await createMigratedDatabase(DATABASE, { port: mariadb.port });
  ds = createDataSource({ port: mariadb.port, database: DATABASE, poolSize: 3 });
  await ds.initialize();
  org = await createTestOrg(ds, 1);
}, 120_000);

afterAll(async () => {
  for (const c of children) await c.stop().catch(() => undefined);
  await ds?.destroy().catch(() => undefined);
  await mariadb?.destroy();
}, 60_000);

// ---------------------------------------------------------------------------------------------------

describe('the database stops under load and comes back', () => {
  interface Outcome {
    phase: 'before' | 'down' | 'after';
    /** the phase when the answer came: a request under way when the database stopped may be refused */
    endPhase: 'before' | 'down' | 'after';
    what: string;
    status: number | 'no answer';
    code?: string;
    message?: string;
    retryAfter?: string | null;
    ward?: string;
  }

  it('answers 503 with a message while it is down, keeps sessions, recovers by itself, loses and doubles no write', async () => {
    const app = await startApp();
    const users = [
      org.users.facilities_manager,
      org.users.ward_lead,
      org.users.administrator,
      org.users.facilities_manager,
      org.users.purchasing_officer,
      org.users.biomedical_engineer,
    ];
    const clients = await Promise.all(users.map((u) => signIn(app.baseUrl, u)));
    const siteId = org.siteIds[0];
    let phase: Outcome['phase'] = 'before';
    let running = true;
    let wardNo = 0;
    const outcomes: Outcome[] = [];

    const call = async (c: Client, what: string, method: string, path: string, body?: unknown, ward?: string) => {
      const started = phase;
      try {
        const res = await Promise.race([c.request(method, path, body), sleep(20_000).then(() => null)]);
        if (!res) return outcomes.push({ phase: started, endPhase: phase, what, status: 'no answer' });
        outcomes.push({
          phase: started,
          endPhase: phase,
          what,
          status: res.status,
          code: res.body?.error?.code,
          message: res.body?.error?.message,
          retryAfter: res.headers.get('retry-after'),
          ward,
        });
      } catch (e) {
        const cause = (e as { cause?: { code?: string; message?: string } }).cause;
        outcomes.push({
          phase: started,
          endPhase: phase,
          what,
          status: 'no answer',
          message: `${(e as Error).message}${cause ? ` (${cause.code ?? ''} ${cause.message ?? ''})` : ''}`,
        });
      }
    };

    const loops = clients.map(async (c, i) => {
      const writer = users[i] === org.users.facilities_manager;
      while (running) {
        await call(c, 'overview', 'GET', '/api/overview');
        await call(c, 'session', 'GET', '/api/auth/me');
        await call(c, 'cylinder check', 'POST', '/api/calc/contents', { gas: 'O2', water_capacity_L: 10, gauge_bar: 200, temperature_C: 15 });
        if (writer) {
          const name = `Fault ward ${++wardNo}`;
          await call(c, 'write', 'POST', `/api/sites/${siteId}/wards`, { name, department: 'ward', beds: 10 }, name);
        }
        await sleep(20);
      }
    });

    await sleep(2_500);
    phase = 'down';
    await mariadb.stop();
    const health = await fetch(`${app.baseUrl}/api/health`);
    expect(health.status).toBe(503);
    expect(((await health.json()) as { status: string }).status).toBe('down');
    await sleep(5_000);
    mariadb.start();
    phase = 'after';
    // Recovery by itself: no restart of the app, no new sign-in.
    await until('the app to answer again', async () => (await fetch(`${app.baseUrl}/api/health`)).status === 200, 30_000);
    const recoveredAt = outcomes.length;
    await sleep(3_000);
    running = false;
    await Promise.all(loops);

    const show = (o: Outcome) => `${o.phase} ${o.what} → ${o.status} ${o.code ?? ''} ${o.message ?? ''}`;
    const before = outcomes.filter((o) => o.endPhase === 'before');
    const down = outcomes.filter((o) => o.endPhase === 'down');
    const settled = outcomes.slice(recoveredAt);
    expect(before.length).toBeGreaterThan(20);
    expect(before.filter((o) => o.status !== 200).map(show), app.output().slice(-3000)).toEqual([]);
    // While down: only clean refusals (a request that began before the stop may still succeed).
    expect(down.filter((o) => o.status !== 503 && o.status !== 200).map(show), app.output().slice(-3000)).toEqual([]);
    const refused = down.filter((o) => o.status === 503);
    expect(refused.length).toBeGreaterThan(10);
    for (const o of refused) {
      expect(o.code, show(o)).toBe('service_unavailable');
      expect(o.message, show(o)).toMatch(/database is not reachable/);
      expect(o.retryAfter, show(o)).toBe('5');
    }
    // Every kind of request was refused cleanly, the session and sign-in path included.
    expect(new Set(refused.map((o) => o.what))).toEqual(new Set(['overview', 'session', 'cylinder check', 'write']));
    // Back: every request of every signed-in user succeeds with the session it had.
    expect(settled.length).toBeGreaterThan(20);
    expect(settled.filter((o) => o.status !== 200).map(show), app.output().slice(-3000)).toEqual([]);
    expect(app.proc.exitCode).toBeNull();

    // Writes: each acknowledged one is there once; each refused one is not there at all.
    const rows: { name: string; n: number }[] = await ds.query(
      `SELECT name, COUNT(*) AS n FROM ward WHERE site_id = ? AND name LIKE 'Fault ward %' GROUP BY name`,
      [siteId],
    );
    const stored = new Map(rows.map((r) => [r.name, Number(r.n)]));
    const writes = outcomes.filter((o) => o.what === 'write');
    expect(writes.filter((o) => o.status === 200).length).toBeGreaterThan(5);
    for (const w of writes) {
      if (w.status === 200) expect(stored.get(w.ward!), `${w.ward} acknowledged`).toBe(1);
      else expect(stored.get(w.ward!), `${w.ward} refused with ${w.status}`).toBeUndefined();
    }
    expect([...stored.values()].every((n) => n === 1)).toBe(true);
    await app.stop();
  }, 120_000);
});

// ---------------------------------------------------------------------------------------------------

describe('the mail service is away for a while', () => {
  it('sends every queued message exactly once after it returns, with two app processes sending', async () => {
    const { enqueueMail } = await import('@backend/modules/orders/outbox.service');
    const { startMailService, stopMailService } = await import('@backend/mail/mail-service');
    const smtpPort = await freePort();
    const jobs = {
      JOBS_ENABLED: 'true',
      SMTP_PORT: String(smtpPort),
      OUTBOX_POLL_MS: '200',
      OUTBOX_BACKOFF_BASE_MS: '200',
      OUTBOX_BACKOFF_MAX_MS: '1000',
      ORDERS_SCAN_MS: '3600000',
      ALERTS_POLL_MS: '3600000',
    };
    const apps = [await startApp(jobs), await startApp(jobs)];
    const tag = `fault-mail-${Date.now()}`;
    const N = 12;
    await ds.transaction(async (m) => {
      for (let i = 1; i <= N; i++)
        await enqueueMail(m, {
          organisationId: org.organisationId,
          kind: 'alert',
          to: `ward-${i}@test.example`,
          subject: `${tag} #${i}`,
          text: `Message ${i} of ${N}`,
        });
    });
    // No mail service: the workers try, fail and keep the messages.
    await until('failed attempts while the mail service is away', async () => {
      const [r] = await ds.query(`SELECT COUNT(*) AS n FROM mail_outbox WHERE subject LIKE ? AND attempts >= 2 AND status = 'pending'`, [`${tag} %`]);
      return Number(r.n) === N;
    });
    const [{ sent }] = await ds.query(`SELECT COUNT(*) AS sent FROM mail_outbox WHERE subject LIKE ? AND status <> 'pending'`, [`${tag} %`]);
    expect(Number(sent)).toBe(0);

    const mail = await startMailService(ds, smtpPort);
    try {
      await until(
        'every message sent',
        async () => {
          const [r] = await ds.query(`SELECT COUNT(*) AS n FROM mail_outbox WHERE subject LIKE ? AND status = 'sent'`, [`${tag} %`]);
          return Number(r.n) === N;
        },
        45_000,
      );
      await sleep(1_500); // a late duplicate would arrive by now
      const received: { subject: string; n: number }[] = await ds.query(
        `SELECT subject, COUNT(*) AS n FROM mail_message WHERE subject LIKE ? GROUP BY subject`,
        [`${tag} %`],
      );
      expect(received).toHaveLength(N);
      expect(received.filter((r) => Number(r.n) !== 1)).toEqual([]);
    } finally {
      await stopMailService(mail);
    }
    for (const a of apps) {
      expect(a.proc.exitCode).toBeNull();
      await a.stop();
    }
  }, 120_000);
});

// ---------------------------------------------------------------------------------------------------

describe('the app is killed during a CSV import', () => {
  it('leaves no partial rows, and the import runs again whole after a restart', async () => {
    const ROWS = 60_000;
    let app = await startApp({ IMPORT_BATCH_ROWS: '500', IMPORT_POLL_MS: '100' });
    const fm = await signIn(app.baseUrl, org.users.facilities_manager);
    const siteId = org.siteIds[0];
    const tank = await fm.post(`/api/sites/${siteId}/sources`, {
      name: `Fault tank ${Date.now()}`,
      type: 'bulk_liquid',
      gasCode: 'O2',
      capacityKg: 10000,
      evaporationPercentPerDay: 0.5,
    });
    expect(tank.status, JSON.stringify(tank.body)).toBe(200);
    const sourceId = tank.body.id as number;

    // One reading a minute, slowly falling: a tank telemetry export.
    const start = Date.UTC(2026, 0, 1);
    let csv = 'time,level_percent\n';
    for (let i = 0; i < ROWS; i++) csv += `${new Date(start + i * 60_000).toISOString()},${(90 - (i * 60) / ROWS).toFixed(3)}\n`;
    const form = new FormData();
    form.append('kind', 'tank_readings');
    form.append('sourceId', String(sourceId));
    form.append('unit', '%');
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'telemetry.csv');
    const cookie = () => `plenum.sid=${fm.cookies.get('plenum.sid')}`;
    const up = await fetch(`${app.baseUrl}/api/sites/${siteId}/imports`, {
      method: 'POST',
      body: form,
      headers: { cookie: cookie(), 'x-csrf-token': fm.csrf! },
    });
    const job = (await up.json()) as { id: number; status: string };
    expect(up.status, JSON.stringify(job)).toBe(200);
    const status = async () =>
      (
        (await ds.query('SELECT status, processed_rows, message FROM import_job WHERE id = ?', [job.id])) as {
          status: string;
          processed_rows: number;
          message: string;
        }[]
      )[0];
    await until('the file to be checked', async () => (await status()).status === 'ready', 60_000).catch(async (e) => {
      throw new Error(`${(e as Error).message}: ${JSON.stringify(await status())}`);
    });
    expect((await fm.post(`/api/imports/${job.id}/commit`, {})).status).toBe(200);
    await until(
      'the import to be under way',
      async () => {
        const s = await status();
        return s.status === 'running' && Number(s.processed_rows) > 0;
      },
      60_000,
      20,
    );

    app.proc.kill('SIGKILL');
    await app.exited;
    const count = async () => Number(((await ds.query('SELECT COUNT(*) AS n FROM source_reading WHERE source_id = ?', [sourceId])) as { n: number }[])[0].n);
    expect(await count()).toBe(0); // the open transaction died with the process

    // The job stays "running" until its heartbeat is stale (2 minutes): age it rather than wait.
    await ds.query(`UPDATE import_job SET heartbeat_at = UTC_TIMESTAMP(3) - INTERVAL 1 HOUR WHERE id = ?`, [job.id]);
    app = await startApp({ IMPORT_BATCH_ROWS: '5000', IMPORT_POLL_MS: '100' });
    await until('the import to finish after the restart', async () => (await status()).status === 'done', 90_000, 250);
    expect(await count()).toBe(ROWS);
    const [dupes] = await ds.query(
      'SELECT COUNT(*) AS n FROM (SELECT taken_at FROM source_reading WHERE source_id = ? GROUP BY taken_at HAVING COUNT(*) > 1) d',
      [sourceId],
    );
    expect(Number(dupes.n)).toBe(0);
    await app.stop();
  }, 240_000);
});
