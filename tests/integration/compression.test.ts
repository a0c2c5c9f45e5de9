import { request as httpRequest } from 'node:http';
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { createTestOrg, signedIn, startTestApp, type Client, type TestApp, type TestOrg } from '../support/test-app';

let app: TestApp;
let org: TestOrg;
let fm: Client;
let siteId: number;
let sourceId: number;
let wardId: number;

/** A raw GET (fetch would decompress and hide the encoding): status, headers and the bytes as sent. */
function raw(
  c: Client,
  path: string,
  headers: Record<string, string> = {},
): Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: Buffer }> {
  const url = new URL(app.baseUrl + path);
  const cookie = [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: url.hostname, port: url.port, path: url.pathname + url.search, method: 'GET', headers: { cookie, ...headers } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (d: Buffer) => chunks.push(d));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end();
  });
}

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
  siteId = org.siteIds[0];
  fm = await signedIn(app, org.users.facilities_manager);
  const src = await fm.post(`/api/sites/${siteId}/sources`, {
    name: 'Gzip tank',
    type: 'bulk_liquid',
    gasCode: 'O2',
    capacityKg: 10_000,
    evaporationPercentPerDay: 0.5,
    leadTimeHours: 48,
  });
  sourceId = src.body.id;
  const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: 'Gzip ward', department: 'ward', beds: 20 });
  wardId = ward.body.id;
  await fm.put(`/api/wards/${wardId}/feeds`, { feeds: [{ sourceId, gasCode: 'O2', role: 'primary' }] });
  await fm.put(`/api/wards/${wardId}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 20, flowLMin: 10 }] });
  await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 60, takenAt: DateTime.utc().startOf('hour').minus({ hours: 1 }).toISO() });
});
afterAll(async () => {
  await app.close();
});

describe('response compression', () => {
  it('answers gzip when asked and plain when not, with the same JSON', async () => {
    const plain = await raw(fm, `/api/sources/${sourceId}?draws=0`);
    expect(plain.status).toBe(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    const gz = await raw(fm, `/api/sources/${sourceId}?draws=0`, { 'accept-encoding': 'gzip' });
    expect(gz.status).toBe(200);
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(String(gz.headers.vary)).toMatch(/Accept-Encoding/i);
    const json = JSON.parse(gunzipSync(gz.body).toString('utf8'));
    expect(json).toEqual(JSON.parse(plain.body.toString('utf8')));
    expect(gz.body.length).toBeLessThan(plain.body.length / 2);
  });

  it('the forecast CSV and a streamed export arrive whole under gzip', async () => {
    const plain = await raw(fm, `/api/sources/${sourceId}/forecast.csv`);
    const gz = await raw(fm, `/api/sources/${sourceId}/forecast.csv`, { 'accept-encoding': 'gzip' });
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.headers['content-disposition']).toBe(`attachment; filename="forecast-source-${sourceId}.csv"`);
    const text = gunzipSync(gz.body).toString('utf8');
    expect(text).toBe(plain.body.toString('utf8'));
    // 90 days from the hour before now: at least 90 × 24 rows after the header, each ending in CRLF.
    expect(text.split('\r\n').length).toBeGreaterThan(90 * 24);

    // Enough readings that the export is written in several 64 kB chunks with back-pressure.
    const start = Date.now() - 40 * 86_400_000;
    const values: unknown[] = [];
    const rows: string[] = [];
    for (let i = 0; i < 4000; i++) {
      rows.push('(?, ?, ?, ?, ?, ?)');
      values.push(sourceId, new Date(start + i * 600_000), 'level_percent', 50, 5000, 'manual');
    }
    await app.ds.query(`INSERT INTO source_reading (source_id, taken_at, kind, value, contents, method) VALUES ${rows.join(',')}`, values);
    const expPlain = await raw(fm, `/api/sites/${siteId}/export?table=readings`);
    const expGz = await raw(fm, `/api/sites/${siteId}/export?table=readings`, { 'accept-encoding': 'gzip' });
    expect(expGz.status).toBe(200);
    expect(expGz.headers['content-encoding']).toBe('gzip');
    const exported = gunzipSync(expGz.body).toString('utf8');
    expect(exported).toBe(expPlain.body.toString('utf8'));
    expect(exported.length).toBeGreaterThan(3 * 64 * 1024);
    expect(exported.trimEnd().split('\r\n')).toHaveLength(1 + 4001);
  });
});

describe('ETag revalidation of cached answers', () => {
  it('overview, source and ward detail: private, no-cache with an ETag; 304 on If-None-Match; 200 after a write', async () => {
    for (const path of ['/api/overview', `/api/sources/${sourceId}?draws=0`, `/api/wards/${wardId}`]) {
      const first = await raw(fm, path, { 'accept-encoding': 'gzip' });
      expect(first.status).toBe(200);
      expect(first.headers['cache-control']).toBe('private, no-cache');
      const etag = String(first.headers.etag);
      expect(etag).toMatch(/^W\/"/);
      const again = await raw(fm, path, { 'accept-encoding': 'gzip', 'if-none-match': etag });
      expect(again.status).toBe(304);
      expect(again.body.length).toBe(0);
    }
    const etag = String((await raw(fm, `/api/wards/${wardId}`)).headers.etag);
    await fm.put(`/api/wards/${wardId}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 10, flowLMin: 10 }] });
    const changed = await raw(fm, `/api/wards/${wardId}`, { 'if-none-match': etag });
    expect(changed.status).toBe(200);
    expect(JSON.parse(changed.body.toString('utf8')).therapy[0].patients).toBe(10);
  });

  it('other answers stay no-store, and a 304 never crosses users', async () => {
    const me = await raw(fm, '/api/auth/me');
    expect(me.headers['cache-control']).toBe('no-store');
    const first = await raw(fm, `/api/sources/${sourceId}?draws=0`);
    const stranger = await signedIn(app, (await createTestOrg(app.ds)).users.facilities_manager);
    const theirs = await raw(stranger, `/api/sources/${sourceId}?draws=0`, { 'if-none-match': String(first.headers.etag) });
    expect(theirs.status).toBe(404);
  });
});
