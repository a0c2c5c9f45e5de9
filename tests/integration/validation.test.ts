import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestOrg, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';

let app: TestApp;
let org: TestOrg;

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
});
afterAll(async () => {
  await app.close();
});

async function countRows(table: string, where = '1=1', params: unknown[] = []): Promise<number> {
  const rows: { n: string }[] = await app.ds.query(`SELECT COUNT(*) AS n FROM ${table} WHERE ${where}`, params);
  return Number(rows[0].n);
}

describe('validation: bad bodies get 400 with field messages and change nothing', () => {
  it('site: unknown time zone, bad currency, missing name', async () => {
    const c = await signedIn(app, org.users.administrator);
    const before = await countRows('site', 'organisation_id = ?', [org.organisationId]);
    const res = await c.post('/api/sites', {
      name: '',
      kind: 'hospital',
      timeZone: 'Mars/Olympus',
      referenceCode: '15C',
      unitSystem: 'metric',
      altitudeM: 10,
      currency: 'pounds',
      cylinderColours: 'ISO32',
      storeTemperatureC: 12,
    });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    expect(paths).toEqual(['currency', 'name', 'timeZone']);
    expect(res.body.error.details.find((d: { path: string }) => d.path === 'timeZone').message).toMatch(/time zone/);
    expect(await countRows('site', 'organisation_id = ?', [org.organisationId])).toBe(before);
  });

  it('site: a valid body is created, with atmospheric pressure from altitude (standard atmosphere)', async () => {
    const c = await signedIn(app, org.users.administrator);
    const res = await c.post('/api/sites', {
      name: `Hill clinic ${Date.now()}`,
      kind: 'clinic',
      timeZone: 'America/Denver',
      referenceCode: '21C',
      unitSystem: 'us',
      altitudeM: 1600,
      currency: 'USD',
      cylinderColours: 'CGA_C9',
      storeTemperatureC: 18,
    });
    expect(res.status).toBe(200);
    // ICAO standard atmosphere at 1,600 m: about 835 hPa (common practice; p0·(1 − 2.25577e-5·h)^5.25588).
    expect(res.body.atmosphericBar).toBeCloseTo(0.8352, 3);
    const audit: { n: string }[] = await app.ds.query(`SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'site' AND entity_id = ? AND action = 'create'`, [
      String(res.body.id),
    ]);
    expect(Number(audit[0].n)).toBe(1);
  });

  it('cylinder type: liquefied gas without tare, negative capacity', async () => {
    const c = await signedIn(app, org.users.administrator);
    const before = await countRows('cylinder_type', 'organisation_id = ?', [org.organisationId]);
    const res = await c.post('/api/cylinder-types', { gasCode: 'N2O', waterCapacityL: -3, fillPressureBar: 44 });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    expect(paths).toEqual(['tareKg', 'waterCapacityL']);
    expect(await countRows('cylinder_type', 'organisation_id = ?', [org.organisationId])).toBe(before);
  });

  it('cylinder type: a valid one shows nominal contents from the gas engine, real above ideal for O2 at 200 bar', async () => {
    const c = await signedIn(app, org.users.administrator);
    const res = await c.post('/api/cylinder-types', { gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 200 });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('10 L · 200 bar');
    // Oxygen at 200 bar and 15 °C holds several per cent more than pV = nRT says (reference EOS: Z ≈ 0.93).
    expect(res.body.nominal.freeGasL / res.body.nominal.idealFreeGasL).toBeGreaterThan(1.04);
    expect(res.body.nominal.freeGasL).toBeGreaterThan(2000);
    const dup = await c.post('/api/cylinder-types', { gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 200 });
    expect(dup.status).toBe(409);
  });

  it('supplier: bad e-mail, negative lead time, a price with no cylinder type', async () => {
    const c = await signedIn(app, org.users.administrator);
    const before = await countRows('supplier', 'organisation_id = ?', [org.organisationId]);
    const res = await c.post('/api/suppliers', {
      name: 'Broken',
      orderEmail: 'not-an-email',
      leadTimeHours: -1,
      currency: 'GBP',
      prices: [{ unit: 'cylinder', priceMinor: 100 }],
    });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    expect(paths).toEqual(['leadTimeHours', 'orderEmail', 'prices.0.cylinderTypeId']);
    expect(await countRows('supplier', 'organisation_id = ?', [org.organisationId])).toBe(before);
  });

  it('user: unknown role, short password', async () => {
    const c = await signedIn(app, org.users.administrator);
    const res = await c.post('/api/users', { email: 'new@test.example', name: 'New', roles: ['janitor'], password: 'short' });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    expect(paths).toEqual(['password', 'roles.0']);
    expect(await countRows('app_user', 'email = ?', ['new@test.example'])).toBe(0);
  });

  it('user: created by an administrator can sign in, and the audit log hides the password', async () => {
    const c = await signedIn(app, org.users.administrator);
    const email = `made-${Date.now()}@test.example`;
    const res = await c.post('/api/users', { email, name: 'Made Here', roles: ['ward_lead'], siteIds: [org.siteIds[0]], password: 'a-long-enough-password' });
    expect(res.status).toBe(200);
    const audit = await c.get(`/api/audit?q=${res.body.id}&entity=user`);
    expect(JSON.stringify(audit.body)).not.toContain('a-long-enough-password');
    const other = await signedIn(app, org.users.ward_lead).catch(() => null);
    expect(other).not.toBeNull();
  });

  it('an id that is not a number is a 400, not a 500', async () => {
    const c = await signedIn(app, org.users.administrator);
    const res = await c.get('/api/sites/abc');
    expect(res.status).toBe(400);
  });
});
