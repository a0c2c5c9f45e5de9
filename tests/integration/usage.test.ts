import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import type { SMTPServer } from 'smtp-server';
import { parseEnv, setEnv } from '@backend/config/env';
import { startImportWorker } from '@backend/modules/imports/import-runner';
import { closeBulkPool } from '@backend/db/bulk-pool';
import { sendDueReminders } from '@backend/modules/usage/usage-reminder';
import { resetMailer } from '@backend/mail/mailer';
import { startMailService, stopMailService } from '@backend/mail/mail-service';
import { UsageReport } from '@backend/db/entities/usage.entity';
import { CylinderType } from '@backend/db/entities/catalogue.entity';
import { freeGasLitresPerKg } from '@common/gas/reference-conditions';
import { createTestOrg, signedIn, startTestApp, uniq, type Client, type TestApp, type TestOrg } from '../support/test-app';

let app: TestApp;
let org: TestOrg;
let fm: Client;
let lead: Client;
let siteId: number;
let stopWorker: () => Promise<void>;
let mail: SMTPServer;
let smtpPort: number;

const baseEnv = () =>
  ({
    ...process.env,
    NODE_ENV: 'test',
    SERVE_FRONTEND: 'false',
    LOG_LEVEL: 'error',
    SMTP_PORT: String(smtpPort),
    UPLOAD_MAX_MB: '40',
    IMPORT_BATCH_ROWS: '5000',
  }) as Record<string, string>;

beforeAll(async () => {
  smtpPort = 20000 + Math.floor(Math.random() * 20000);
  app = await startTestApp({ SMTP_PORT: String(smtpPort), UPLOAD_MAX_MB: '40', IMPORT_BATCH_ROWS: '5000' });
  resetMailer();
  mail = await startMailService(app.ds, smtpPort);
  org = await createTestOrg(app.ds);
  siteId = org.siteIds[0];
  fm = await signedIn(app, org.users.facilities_manager);
  lead = await signedIn(app, org.users.ward_lead);
  stopWorker = startImportWorker({ pollMs: 50 });
});
afterAll(async () => {
  await stopWorker?.();
  await closeBulkPool();
  if (mail) await stopMailService(mail);
  resetMailer();
  await app.close();
});

async function count(sql: string, params: unknown[]): Promise<number> {
  const rows: { n: string }[] = await app.ds.query(sql, params);
  return Number(rows[0].n);
}

/** Posts a multipart upload as the browser does (session cookie and CSRF header from the client). */
async function upload(c: Client, site: number, body: string | Buffer, fields: Record<string, string>, name = 'data.csv') {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  form.append('file', new Blob([typeof body === 'string' ? body : new Uint8Array(body)]), name);
  const res = await fetch(`${c.baseUrl}/api/sites/${site}/imports`, {
    method: 'POST',
    headers: { cookie: [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; '), 'x-csrf-token': c.csrf ?? '' },
    body: form,
  });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : undefined };
}

async function waitFor(c: Client, jobId: number, statuses: string[], timeoutMs = 60_000) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const res = await c.get(`/api/imports/${jobId}`);
    if (statuses.includes(res.body.status)) return res.body;
    if (Date.now() > until) throw new Error(`upload ${jobId} still ${res.body.status}: ${res.body.message}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function tank(name: string, extra: Record<string, unknown> = {}) {
  const res = await fm.post(`/api/sites/${siteId}/sources`, {
    name: `${name} ${uniq()}`,
    type: 'bulk_liquid',
    gasCode: 'O2',
    capacityKg: 10_000,
    evaporationPercentPerDay: 0.4,
    ...extra,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as { id: number; name: string };
}

const readingsOf = (sourceId: number) => count('SELECT COUNT(*) AS n FROM source_reading WHERE source_id = ?', [sourceId]);
/** Local wall-clock text of the site (Europe/London) for an instant. */
const local = (ms: number) => DateTime.fromMillis(ms, { zone: 'Europe/London' }).toFormat("yyyy-MM-dd'T'HH:mm");
const START = DateTime.fromISO('2025-10-06T00:00', { zone: 'Europe/London' }).toMillis();

/** n 1-minute telemetry rows from START (kg), with an optional different value at one data row (1-based). */
function telemetryCsv(n: number, kg = 5000, odd?: { row: number; kg: number }): string {
  const parts: string[] = ['time,level,unit\n'];
  for (let i = 0; i < n; i++) {
    const t = new Date(START + i * 60_000).toISOString().slice(0, 19) + 'Z';
    parts.push(`${t},${odd && odd.row === i + 1 ? odd.kg : kg},kg\n`);
  }
  return parts.join('');
}

// ---------- usage reports ----------

describe('usage reports', () => {
  let wardId: number;
  let cylId: number;
  const today = () => DateTime.now().setZone('Europe/London').toISODate()!;

  beforeAll(async () => {
    const w = await fm.post(`/api/sites/${siteId}/wards`, { name: `Ward ${uniq()}`, department: 'ward', beds: 24 });
    wardId = w.body.id;
    // Ward leads file only for the wards an administrator granted them.
    const admin = await signedIn(app, org.users.administrator);
    expect((await admin.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [wardId] })).status).toBe(200);
    await fm.put(`/api/wards/${wardId}/therapy`, {
      lines: [
        { gasCode: 'O2', device: 'nasal_cannula', patients: 6 },
        { gasCode: 'O2', device: 'simple_mask', patients: 2 },
      ],
    });
    const cyl = await app.ds.getRepository(CylinderType).save(
      app.ds.getRepository(CylinderType).create({
        organisationId: org.organisationId,
        gasCode: 'O2',
        waterCapacityL: 2,
        fillPressureBar: 230,
        tareKg: null,
        maxFillingRatioKgPerL: null,
        material: 'aluminium',
        valveNotes: '',
        active: true,
      }),
    );
    cylId = cyl.id;
  });

  it('a ward lead files the day’s report; the same day twice is refused; the filing is in the audit log', async () => {
    const yesterday = DateTime.fromISO(today()).minus({ days: 1 }).toISODate()!;
    const body = {
      date: yesterday,
      devices: [
        { device: 'nasal_cannula', patientsNow: 7, patientsShift: 9 },
        { device: 'hfno', patientsNow: 1, patientsShift: 1 },
      ],
      cylinders: [{ cylinderTypeId: cylId, used: 3, returned: 2 }],
      note: 'busy night',
    };
    const res = await lead.post(`/api/wards/${wardId}/usage-reports`, body);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.devices).toEqual(body.devices);
    expect(res.body.canEdit).toBe(true);
    const again = await lead.post(`/api/wards/${wardId}/usage-reports`, body);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('report_exists');
    expect(
      await count("SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'usage_report' AND entity_id = ? AND action = 'create'", [String(res.body.id)]),
    ).toBe(1);

    // Today's screen is prefilled from yesterday: patients carried over, cylinder types at zero.
    const open = await lead.get(`/api/wards/${wardId}/usage-reports`);
    expect(open.status).toBe(200);
    expect(open.body.report).toBeNull();
    expect(open.body.draft.prefilledFrom).toBe(yesterday);
    expect(open.body.draft.devices).toEqual(body.devices);
    expect(open.body.draft.cylinders).toEqual([{ cylinderTypeId: cylId, used: 0, returned: 0 }]);
    expect(open.body.devices.find((d: { device: string }) => d.device === 'nasal_cannula').modelPatients).toBe(6);
    expect(open.body.cylinderTypes.some((t: { id: number }) => t.id === cylId)).toBe(true);
  });

  it('refuses a shift peak below the count now, a future day, and old days for ward leads', async () => {
    const bad = await lead.post(`/api/wards/${wardId}/usage-reports`, {
      date: today(),
      devices: [{ device: 'simple_mask', patientsNow: 3, patientsShift: 2 }],
      cylinders: [],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('devices.0.patientsShift');
    const future = await lead.post(`/api/wards/${wardId}/usage-reports`, {
      date: DateTime.fromISO(today()).plus({ days: 1 }).toISODate(),
      devices: [],
      cylinders: [],
    });
    expect(future.status).toBe(400);
    const old = await lead.post(`/api/wards/${wardId}/usage-reports`, {
      date: DateTime.fromISO(today()).minus({ days: 10 }).toISODate(),
      devices: [],
      cylinders: [],
    });
    expect(old.status).toBe(403);
    // A facilities manager may file an old day.
    expect(
      (await fm.post(`/api/wards/${wardId}/usage-reports`, { date: DateTime.fromISO(today()).minus({ days: 10 }).toISODate(), devices: [], cylinders: [] }))
        .status,
    ).toBe(200);
  });

  it('lets the ward lead edit inside the window, then only a facilities manager; every change is audited', async () => {
    const created = await lead.post(`/api/wards/${wardId}/usage-reports`, {
      date: today(),
      devices: [{ device: 'nasal_cannula', patientsNow: 5, patientsShift: 6 }],
      cylinders: [],
      note: '',
    });
    expect(created.status).toBe(200);
    const id = created.body.id;
    const edit = await lead.put(`/api/usage-reports/${id}`, {
      devices: [{ device: 'nasal_cannula', patientsNow: 6, patientsShift: 6 }],
      cylinders: [],
      note: 'corrected',
    });
    expect(edit.status, JSON.stringify(edit.body)).toBe(200);
    expect(edit.body.devices[0].patientsNow).toBe(6);
    // Filed two days ago: outside the default 24 h window.
    await app.ds.getRepository(UsageReport).update({ id }, { submittedAt: new Date(Date.now() - 48 * 3_600_000) });
    const late = await lead.put(`/api/usage-reports/${id}`, { devices: [], cylinders: [], note: 'too late' });
    expect(late.status).toBe(403);
    expect(late.body.error.code).toBe('edit_window_closed');
    const byFm = await fm.put(`/api/usage-reports/${id}`, {
      devices: [{ device: 'nasal_cannula', patientsNow: 4, patientsShift: 6 }],
      cylinders: [],
      note: 'fixed by facilities',
    });
    expect(byFm.status).toBe(200);
    const detail = await fm.get(`/api/usage-reports/${id}`);
    expect(detail.body.history.map((h: { action: string }) => h.action)).toEqual(['create', 'update', 'update']);
    const audit: { before_json: string; after_json: string }[] = await app.ds.query(
      "SELECT before_json, after_json FROM audit_log WHERE entity = 'usage_report' AND entity_id = ? AND action = 'update' ORDER BY id",
      [String(id)],
    );
    expect(JSON.parse(audit[1].before_json).note).toBe('corrected');
    expect(JSON.parse(audit[1].after_json).note).toBe('fixed by facilities');
  });

  it('e-mails a reminder to the ward leads granted a ward without a report, once; an ungranted ward goes to the facilities managers', async () => {
    const w = await fm.post(`/api/sites/${siteId}/wards`, { name: `Quiet ward ${uniq()}`, department: 'ward', beds: 10 });
    const nobody = await fm.post(`/api/sites/${siteId}/wards`, { name: `Ungranted ward ${uniq()}`, department: 'ward', beds: 10 });
    const admin = await signedIn(app, org.users.administrator);
    expect((await admin.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [wardId, w.body.id] })).status).toBe(200);
    setEnv(parseEnv({ ...baseEnv(), REPORT_REMINDER_LOCAL_TIME: '00:00' }));
    try {
      const sent = await sendDueReminders(new Date(), { siteIds: [siteId] });
      const mine = sent.find((s) => s.to === org.users.ward_lead);
      expect(mine, JSON.stringify(sent)).toBeDefined();
      expect(mine!.wards).toContain(w.body.name);
      // Nobody is granted the other ward: its reminder goes to the site's facilities manager, not to the ward lead.
      expect(mine!.wards).not.toContain(nobody.body.name);
      expect(sent.find((s) => s.to === org.users.facilities_manager)?.wards, JSON.stringify(sent)).toContain(nobody.body.name);
      expect(sent.find((s) => s.to === org.users.facilities_manager)?.wards).not.toContain(w.body.name);
      const fmMail: { text_body: string }[] = await app.ds.query('SELECT text_body FROM mail_message WHERE mail_to LIKE ? ORDER BY id DESC LIMIT 1', [
        `%${org.users.facilities_manager}%`,
      ]);
      expect(fmMail[0].text_body).toMatch(/no ward lead is granted this ward/);
      // The ward that reported today is not in it.
      const filed = (await lead.get(`/api/sites/${siteId}/usage-status`)).body.wards
        .filter((x: { reportId: number | null }) => x.reportId !== null)
        .map((x: { name: string }) => x.name);
      for (const name of filed) expect(mine!.wards).not.toContain(name);
      const stored: { subject: string; mail_to: string }[] = await app.ds.query(
        'SELECT subject, mail_to FROM mail_message WHERE mail_to LIKE ? ORDER BY id DESC LIMIT 1',
        [`%${org.users.ward_lead}%`],
      );
      expect(stored[0].subject).toMatch(/Usage report/);
      expect(await sendDueReminders(new Date(), { siteIds: [siteId] })).toEqual([]);
    } finally {
      setEnv(parseEnv(baseEnv()));
    }
  });
});

// ---------- uploads ----------

describe('uploads: templates and bad files', () => {
  it('round-trips the template of every kind (download, upload unchanged, import)', async () => {
    const t = await tank('Template tank');
    const store = await fm.post(`/api/sites/${siteId}/sources`, {
      name: `Store ${uniq()}`,
      type: 'cylinder_store',
      gasCode: 'O2',
      cylinderTypeId: (
        await app.ds.getRepository(CylinderType).save(
          app.ds.getRepository(CylinderType).create({
            organisationId: org.organisationId,
            gasCode: 'O2',
            waterCapacityL: 10,
            fillPressureBar: 200,
            tareKg: null,
            maxFillingRatioKgPerL: null,
            material: 'steel',
            valveNotes: '',
            active: true,
          }),
        )
      ).id,
    });
    expect(store.status, JSON.stringify(store.body)).toBe(200);
    const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: `Aardvark ward ${uniq()}`, department: 'ward', beds: 4 });
    const targets: Record<string, Record<string, string>> = {
      tank_readings: { sourceId: String(t.id) },
      store_counts: { sourceId: String(store.body.id) },
      flow_meter_totals: { wardId: String(ward.body.id) },
      historic_usage: {},
    };
    for (const kind of Object.keys(targets)) {
      const tpl = await fm.request('GET', `/api/sites/${siteId}/import-template?kind=${kind}`);
      expect(tpl.status).toBe(200);
      expect(tpl.headers.get('content-type')).toMatch(/text\/csv/);
      const up = await upload(fm, siteId, String(tpl.body), { kind, ...targets[kind] }, `${kind}.csv`);
      expect(up.status, JSON.stringify(up.body)).toBe(200);
      const checked = await waitFor(fm, up.body.id, ['ready', 'invalid', 'mapping']);
      expect(checked.status, `${kind}: ${checked.message} ${JSON.stringify(checked.errors)}`).toBe('ready');
      expect(checked.totalRows).toBe(3);
      expect((await fm.post(`/api/imports/${up.body.id}/commit`, {})).status).toBe(200);
      const done = await waitFor(fm, up.body.id, ['done', 'failed']);
      expect(done.status, done.message).toBe('done');
      expect(done.insertedRows).toBe(3);
    }
    expect(await readingsOf(t.id)).toBe(3);
    expect(await readingsOf(store.body.id)).toBe(3);
    expect(await count('SELECT COUNT(*) AS n FROM flow_meter_reading WHERE ward_id = ?', [ward.body.id])).toBe(3);
  });

  it('gives each kind of bad file its own clear message and writes nothing', async () => {
    const t = await tank('Bad files');
    const base = { kind: 'tank_readings', sourceId: String(t.id) };
    const row = (time: string, level: string) => `${time},${level},%\n`;
    const good = (i: number) => local(START + i * 3_600_000);

    // Wrong columns: nothing matches, so the columns must be mapped first.
    const wrong = await upload(fm, siteId, 'foo,bar\n1,2\n', base);
    expect(wrong.status).toBe(200);
    expect(wrong.body.status).toBe('mapping');
    expect(wrong.body.message).toMatch(/Match these columns.*Time, Level/);
    expect((await fm.post(`/api/imports/${wrong.body.id}/commit`, {})).status).toBe(409);

    // A bad number and a bad date: row, column, value and reason.
    const badNum = await upload(fm, siteId, `time,level,unit\n${row(good(0), '61.5')}${row(good(1), 'sixty')}`, base);
    const n = await waitFor(fm, badNum.body.id, ['ready', 'invalid']);
    expect(n.status).toBe('invalid');
    expect(n.errors[0]).toEqual({ row: 3, column: 'Level', value: 'sixty', reason: 'not a number' });
    const badDate = await upload(fm, siteId, `time,level,unit\n${row('2026-02-30 08:00', '61')}`, base);
    const d = await waitFor(fm, badDate.body.id, ['ready', 'invalid']);
    expect(d.errors[0]).toMatchObject({ row: 2, column: 'Time', value: '2026-02-30 08:00', reason: 'not a calendar date' });
    const usDate = await upload(fm, siteId, `time,level,unit\n${row('01/05/2026 08:00', '61')}`, base);
    expect((await waitFor(fm, usDate.body.id, ['ready', 'invalid'])).errors[0].reason).toMatch(/choose the date order/);

    // Duplicate rows: the second names the first.
    const dup = await upload(fm, siteId, `time,level,unit\n${row(good(0), '61')}${row(good(1), '60')}${row(good(0), '59')}`, base);
    const du = await waitFor(fm, dup.body.id, ['ready', 'invalid']);
    expect(du.errors[0]).toMatchObject({ row: 4, column: 'Time', reason: 'repeats row 2 (same tank and time)' });

    // Empty file, header without rows, wrong encoding.
    const empty = await upload(fm, siteId, '', base);
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toMatch(/empty/);
    const headerOnly = await upload(fm, siteId, 'time,level,unit\n', base);
    expect(headerOnly.body.error.message).toMatch(/header row but no data rows/);
    const latin1 = Buffer.concat([Buffer.from('time,level,unit,note\n'), Buffer.from(`${good(0)},61,%,caf`), Buffer.from([0xe9]), Buffer.from('\n')]);
    const enc = await upload(fm, siteId, latin1, base);
    expect(enc.status).toBe(400);
    expect(enc.body.error.message).toMatch(/not UTF-8.*line 2.*0xE9.*CSV UTF-8/);
    const utf16 = await upload(fm, siteId, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('time,level\n', 'utf16le')]), base);
    expect(utf16.body.error.message).toMatch(/UTF-16/);

    // Over the size limit (1 MB for this check).
    setEnv(parseEnv({ ...baseEnv(), UPLOAD_MAX_MB: '1' }));
    try {
      const big = await upload(fm, siteId, telemetryCsv(60_000), base);
      expect(big.status).toBe(413);
      expect(big.body.error.message).toMatch(/larger than the 1 MB upload limit/);
    } finally {
      setEnv(parseEnv(baseEnv()));
    }
    expect(await readingsOf(t.id)).toBe(0);
  });

  it('reads a semicolon file with a BOM, decimal commas, other headers (mapped) and offsets', async () => {
    const t = await tank('Semicolons');
    const csv = '\uFEFFZeitpunkt;Füllstand (%);Bemerkung\n2026-07-01 10:00;61,5;\n2026-07-01T10:00:00Z;61,2;mit Offset\n';
    const up = await upload(fm, siteId, csv, {
      kind: 'tank_readings',
      sourceId: String(t.id),
      mapping: JSON.stringify({ time: 'Zeitpunkt', level: 'Füllstand (%)', note: 'Bemerkung' }),
    });
    expect(up.status, JSON.stringify(up.body)).toBe(200);
    expect(up.body.options.separator).toBe(';');
    expect(up.body.options.headerUnit).toBe('%');
    const ready = await waitFor(fm, up.body.id, ['ready', 'invalid', 'mapping']);
    expect(ready.status, JSON.stringify(ready.errors)).toBe('ready');
    await fm.post(`/api/imports/${up.body.id}/commit`, {});
    await waitFor(fm, up.body.id, ['done']);
    const rows: { taken_at: Date; value: number; contents: number; method: string }[] = await app.ds.query(
      'SELECT taken_at, value, contents, method FROM source_reading WHERE source_id = ? ORDER BY taken_at',
      [t.id],
    );
    // 10:00 in London in July is 09:00 UTC (BST = UTC+1, UK Summer Time); the second row carries Z.
    expect(rows.map((r) => new Date(r.taken_at).toISOString())).toEqual(['2026-07-01T09:00:00.000Z', '2026-07-01T10:00:00.000Z']);
    expect(rows[0].value).toBe(61.5);
    expect(rows[0].contents).toBeCloseTo(6150, 9);
    expect(rows[0].method).toBe('import');
  });

  it('catches the same file uploaded twice, and imports it again only when confirmed (for another tank)', async () => {
    const a = await tank('Twice A');
    const b = await tank('Twice B');
    const csv = `time,level,unit,note\n${[0, 1, 2, 3].map((i) => `${local(START + i * 3_600_000)},${55 - i / 10},%,${uniq()}`).join('\n')}\n`;
    const first = await upload(fm, siteId, csv, { kind: 'tank_readings', sourceId: String(a.id) });
    await waitFor(fm, first.body.id, ['ready']);
    await fm.post(`/api/imports/${first.body.id}/commit`, {});
    await waitFor(fm, first.body.id, ['done']);
    const again = await upload(fm, siteId, csv, { kind: 'tank_readings', sourceId: String(a.id) });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('duplicate_file');
    expect(again.body.error.message).toMatch(new RegExp(`imported already \\(upload #${first.body.id}`));
    // Confirmed, for the same tank: every row is stored already.
    const same = await upload(fm, siteId, csv, { kind: 'tank_readings', sourceId: String(a.id), confirmDuplicate: 'true' });
    const s = await waitFor(fm, same.body.id, ['ready', 'invalid']);
    expect(s.status).toBe('invalid');
    expect(s.errors[0].reason).toMatch(/stored already/);
    // Confirmed, for another tank: imported.
    const other = await upload(fm, siteId, csv, { kind: 'tank_readings', sourceId: String(b.id), confirmDuplicate: 'true' });
    await waitFor(fm, other.body.id, ['ready']);
    await fm.post(`/api/imports/${other.body.id}/commit`, {});
    await waitFor(fm, other.body.id, ['done']);
    expect(await readingsOf(a.id)).toBe(4);
    expect(await readingsOf(b.id)).toBe(4);
  });

  it('neutralises formula cells in exports (OWASP CSV injection) and reads its own exports back', async () => {
    const t = await tank('Formulas');
    const csv = `time,level,unit,note\n${local(START)},50,%,=HYPERLINK("http://x.example")\n${local(START + 3_600_000)},49.9,%,+SUM(A1)\n${local(START + 7_200_000)},49.8,%,@cmd\n`;
    const up = await upload(fm, siteId, csv, { kind: 'tank_readings', sourceId: String(t.id) });
    await waitFor(fm, up.body.id, ['ready']);
    await fm.post(`/api/imports/${up.body.id}/commit`, {});
    await waitFor(fm, up.body.id, ['done']);
    const exp = await fm.request('GET', `/api/sites/${siteId}/export?table=readings`);
    expect(exp.status).toBe(200);
    const text = String(exp.body);
    expect(text).toContain(`"'=HYPERLINK(""http://x.example"")"`);
    expect(text).toContain("'+SUM(A1)");
    expect(text).toContain("'@cmd");
    expect(text).not.toMatch(/,=HYPERLINK|,\+SUM|,@cmd/);
    const wardRes = await fm.post(`/api/sites/${siteId}/wards`, { name: `Formula ward ${uniq()}`, department: 'ward', beds: 2 });
    await fm.post(`/api/wards/${wardRes.body.id}/usage-reports`, {
      date: DateTime.now().setZone('Europe/London').toISODate(),
      devices: [],
      cylinders: [],
      note: '-1+1',
    });
    const reports = String((await fm.request('GET', `/api/sites/${siteId}/export?table=usage_reports`)).body);
    expect(reports).toContain("'-1+1");
  });
});

describe('uploads: large files, failure and cancel', () => {
  it('rolls everything back when row 400,000 fails during the import', { timeout: 240_000 }, async () => {
    const t = await tank('Row 400k', { capacityKg: 10_000 });
    const csv = telemetryCsv(400_000, 5000, { row: 400_000, kg: 9500 });
    const up = await upload(fm, siteId, csv, { kind: 'tank_readings', sourceId: String(t.id) });
    expect(up.status, JSON.stringify(up.body)).toBe(200);
    const ready = await waitFor(fm, up.body.id, ['ready', 'invalid'], 180_000);
    expect(ready.status, JSON.stringify(ready.errors)).toBe('ready');
    // The tank is re-rated after the check: row 400,000 (9,500 kg) is now above its capacity.
    const src = (await fm.get(`/api/sources/${t.id}?draws=0`)).body.source;
    const put = await fm.put(`/api/sources/${t.id}`, { ...src, capacityKg: 9000 });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    const auditBefore = await count("SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'import_job' AND action = 'import' AND entity_id = ?", [
      String(up.body.id),
    ]);
    await fm.post(`/api/imports/${up.body.id}/commit`, {});
    const failed = await waitFor(fm, up.body.id, ['done', 'failed'], 180_000);
    expect(failed.status).toBe('failed');
    // Line 400,001 of the file is data row 400,000 (the header is line 1).
    expect(failed.errors[0]).toMatchObject({ row: 400_001, column: 'Level', value: '9500' });
    expect(failed.message).toMatch(/rolled back: nothing was written/);
    expect(await readingsOf(t.id)).toBe(0);
    expect(await count("SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'import_job' AND action = 'import' AND entity_id = ?", [String(up.body.id)])).toBe(
      auditBefore,
    );
  });

  it('cancels a running import and leaves nothing behind; the progress lives in the database', { timeout: 240_000 }, async () => {
    const t = await tank('Cancel me');
    const up = await upload(fm, siteId, telemetryCsv(525_600), { kind: 'tank_readings', sourceId: String(t.id) });
    await waitFor(fm, up.body.id, ['ready'], 180_000);
    await fm.post(`/api/imports/${up.body.id}/commit`, {});
    let seen = await waitFor(fm, up.body.id, ['running', 'done'], 60_000);
    const until = Date.now() + 60_000;
    while (seen.status === 'running' && seen.processedRows === 0 && Date.now() < until) {
      await new Promise((r) => setTimeout(r, 20));
      seen = (await fm.get(`/api/imports/${up.body.id}`)).body;
    }
    expect(seen.status).toBe('running');
    expect(seen.progress).toBeGreaterThan(0);
    expect(seen.progress).toBeLessThan(1);
    const cancel = await fm.post(`/api/imports/${up.body.id}/cancel`, {});
    expect(cancel.status).toBe(200);
    const end = await waitFor(fm, up.body.id, ['cancelled', 'done', 'failed'], 120_000);
    expect(end.status).toBe('cancelled');
    expect(end.message).toMatch(/rolled back and nothing was written/);
    expect(await readingsOf(t.id)).toBe(0);
  });
});

// ---------- reconciliation ----------

describe('reconciliation', () => {
  it('measures a tank’s use across refills within 1 %, compares it with the model and records an accepted correction', { timeout: 120_000 }, async () => {
    const t = await tank('Reconciled', { capacityKg: 10_000, evaporationPercentPerDay: 0.2 });
    const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: `Model ward ${uniq()}`, department: 'ward', beds: 20 });
    await fm.put(`/api/wards/${ward.body.id}/feeds`, { feeds: [{ sourceId: t.id, gasCode: 'O2', role: 'primary' }] });
    // Model: 100 L/min all day = 144,000 L/day of free gas.
    await fm.put(`/api/wards/${ward.body.id}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 10, flowLMin: 10 }] });
    // Readings: hourly for 20 days up to now, real use 10 % above the model, two tanker drops.
    const kgPerL = 1 / freeGasLitresPerKg('O2', '15C');
    const useKgPerH = 100 * 1.1 * 60 * kgPerL;
    const end = DateTime.now().startOf('hour').toMillis();
    const hours = 20 * 24;
    let kg = 6000;
    const lines = ['time,level,unit'];
    for (let h = 0; h <= hours; h++) {
      const at = end - (hours - h) * 3_600_000;
      lines.push(`${new Date(at).toISOString().slice(0, 19)}Z,${kg.toFixed(3)},kg`);
      kg -= useKgPerH;
      if (h === 150) kg += 3500;
      if (h === 330) kg += 3000;
    }
    const up = await upload(fm, siteId, lines.join('\n') + '\n', { kind: 'tank_readings', sourceId: String(t.id) });
    const ready = await waitFor(fm, up.body.id, ['ready', 'invalid']);
    expect(ready.status, JSON.stringify(ready.errors)).toBe('ready');
    await fm.post(`/api/imports/${up.body.id}/commit`, {});
    await waitFor(fm, up.body.id, ['done']);

    const rec = await fm.get(`/api/sources/${t.id}/reconciliation?days=28`);
    expect(rec.status, JSON.stringify(rec.body)).toBe(200);
    const s = rec.body.source;
    // Known by construction: 110 L/min = 158,400 L/day; model 144,000 L/day.
    expect(Math.abs(s.measuredLPerDay - 158_400) / 158_400).toBeLessThan(0.01);
    expect(s.modelledLPerDay).toBeCloseTo(144_000, 6);
    expect(s.refills).toHaveLength(2);
    expect(s.suggestedFactor).toBe(1.1);
    expect(s.daily.length).toBeGreaterThanOrEqual(18);
    // Constant use: the measured day-to-day CV is at its floor, and the forecast's band uses it.
    expect(s.demandCv).toMatchObject({ measured: true, cv: 0.02 });
    const forecast = await fm.get(`/api/sources/${t.id}?draws=0`);
    expect(forecast.body.method.text.join(' ')).toMatch(/coefficient of variation 0\.02, measured/);

    const accept = await fm.post(`/api/sources/${t.id}/correction`, { factor: s.suggestedFactor, basis: 'scaled' });
    expect(accept.status).toBe(200);
    const after = await fm.get(`/api/sources/${t.id}/reconciliation?days=28`);
    expect(after.body.source.acceptedFactor).toBe(1.1);
    expect(after.body.source.correctedLPerDay).toBeCloseTo(158_400, 6);
    expect(after.body.corrections[0]).toMatchObject({ factor: 1.1, basis: 'scaled', previousFactor: 1 });
    // Reversible: back to 1 with the model.
    expect((await fm.post(`/api/sources/${t.id}/correction`, { factor: 1, basis: 'model' })).status).toBe(200);

    const site = await lead.get(`/api/sites/${siteId}/reconciliation?days=28`);
    expect(site.status).toBe(200);
    expect(site.body.sources.find((x: { id: number }) => x.id === t.id).measuredLPerDay).toBeCloseTo(s.measuredLPerDay, 6);
    expect(site.body.wards.find((x: { id: number }) => x.id === ward.body.id).modelledLPerDay).toBeCloseTo(144_000, 6);
  });
});
