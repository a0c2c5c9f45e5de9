import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { createTestOrg, signedIn, startTestApp, type Client, type TestApp, type TestOrg } from '../support/test-app';
import { freeGasLitresPerKg } from '@common/gas/reference-conditions';

let app: TestApp;
let org: TestOrg;
let fm: Client;
let admin: Client;
let siteId: number;

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
  siteId = org.siteIds[0];
  fm = await signedIn(app, org.users.facilities_manager);
  admin = await signedIn(app, org.users.administrator);
});
afterAll(async () => {
  await app.close();
});

// 20 patients at 10 L/min = 12,000 L/h of free gas; O2 at 15 °C and 1.01325 bar is 1.35436 kg/m³ (reference
// EOS, tests/reference table), so 16.25 kg/h of liquid, above the tank's evaporation of 0.5 %/day × 10,000 kg.
const kgPerH = () => 12_000 / freeGasLitresPerKg('O2', '15C');

async function tankFeedingWard(name: string, extra: Record<string, unknown> = {}) {
  const src = await fm.post(`/api/sites/${siteId}/sources`, {
    name,
    type: 'bulk_liquid',
    gasCode: 'O2',
    capacityKg: 10_000,
    evaporationPercentPerDay: 0.5,
    leadTimeHours: 48,
    ...extra,
  });
  expect(src.status).toBe(200);
  const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: `${name} ward`, department: 'ward', beds: 20 });
  expect((await fm.put(`/api/wards/${ward.body.id}/feeds`, { feeds: [{ sourceId: src.body.id, gasCode: 'O2', role: 'primary' }] })).status).toBe(200);
  expect(
    (await fm.put(`/api/wards/${ward.body.id}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 20, flowLMin: 10, label: 'constant' }] }))
      .status,
  ).toBe(200);
  return { sourceId: src.body.id as number, wardId: ward.body.id as number };
}

const hoursAgo = (h: number) => DateTime.utc().startOf('hour').minus({ hours: h }).toISO()!;

describe('cached forecast answers are never stale', () => {
  it('a reading saved shows in the source detail and the overview on the very next request', async () => {
    const { sourceId } = await tankFeedingWard('Cache tank A');
    expect((await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 60, takenAt: hoursAgo(2) })).status).toBe(200);
    const first = await fm.get(`/api/sources/${sourceId}?draws=20`);
    expect(first.status).toBe(200);
    // Asked twice: the second answer is the cached one, identical.
    const again = await fm.get(`/api/sources/${sourceId}?draws=20`);
    expect(again.body.outlook).toEqual(first.body.outlook);
    expect(again.body.computedAt).toBe(first.body.computedAt);
    await fm.get('/api/overview');

    // A new reading of 80 % = 8,000 kg now: empty at 8,000 / 16.25 h from it (hand calculation).
    const takenAt = hoursAgo(0);
    expect((await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 80, takenAt })).status).toBe(200);
    const next = await fm.get(`/api/sources/${sourceId}?draws=20`);
    expect(next.body.method.startedFrom).toBe(new Date(takenAt).toISOString());
    const expectedEmpty = new Date(takenAt).getTime() + (8000 / kgPerH()) * 3_600_000;
    expect(Math.abs(new Date(next.body.outlook.emptyAt).getTime() - expectedEmpty)).toBeLessThan(60_000);
    expect(next.body.readings[0].contents).toBeCloseTo(8000, 6);
    const row = (await fm.get('/api/overview')).body.sites.find((s: { id: number }) => s.id === siteId).sources.find((s: { id: number }) => s.id === sourceId);
    expect(row.emptyAt).toBe(next.body.outlook.emptyAt);
    // The CSV export follows as well: its first hour is the hour after the new reading.
    const csv = await fm.request('GET', `/api/sources/${sourceId}/forecast.csv`);
    const firstRow = String(csv.body).split('\r\n')[1].split(',');
    expect(firstRow[0]).toBe(new Date(new Date(takenAt).getTime() + 3_600_000).toISOString());
    expect(Number(firstRow[1])).toBeCloseTo(8000 - kgPerH(), 2);
    // The chart's columns: the same hours as the CSV, contents rounded to 0.1 kg.
    const csvRows = String(csv.body).trimEnd().split('\r\n').slice(1);
    expect(next.body.series.startAt).toBe(firstRow[0]);
    expect(next.body.series.stepHours).toBe(1);
    expect(next.body.series.contents).toHaveLength(csvRows.length);
    expect(Math.abs(next.body.series.contents[0] - Number(firstRow[1]))).toBeLessThanOrEqual(0.05);
    const last = csvRows[csvRows.length - 1].split(',');
    expect(Math.abs(next.body.series.contents.at(-1) - Number(last[1]))).toBeLessThanOrEqual(0.05);
  });

  it('a therapy-line change shows in the ward detail and its source on the very next request', async () => {
    const { sourceId, wardId } = await tankFeedingWard('Cache tank B');
    await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 60, takenAt: hoursAgo(1) });
    const before = await fm.get(`/api/wards/${wardId}`);
    expect(before.status).toBe(200);
    // 20 × 10 L/min × 1440 min = 288,000 L/day (no leakage entered).
    expect(before.body.perGas[0].modelledLPerDay).toBeCloseTo(288_000, 6);
    await fm.get(`/api/sources/${sourceId}?draws=0`);
    expect(
      (await fm.put(`/api/wards/${wardId}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 5, flowLMin: 10, label: 'fewer' }] })).status,
    ).toBe(200);
    const after = await fm.get(`/api/wards/${wardId}`);
    // 5 × 10 × 1440 = 72,000 L/day.
    expect(after.body.perGas[0].modelledLPerDay).toBeCloseTo(72_000, 6);
    expect(after.body.therapy).toHaveLength(1);
    expect(after.body.therapy[0].patients).toBe(5);
    const detail = await fm.get(`/api/sources/${sourceId}?draws=0`);
    expect(detail.body.method.demandLines[0].flowLMin).toBeCloseTo(50, 9);
  });

  it("a supplier's lead time change reaches the source detail at once (catalogue writes bump every site)", async () => {
    const sup = await admin.post('/api/suppliers', { name: 'Cache supplier', orderEmail: 'orders@example.test', leadTimeHours: 24, currency: 'GBP' });
    expect(sup.status).toBe(200);
    const { sourceId } = await tankFeedingWard('Cache tank C', { leadTimeHours: null, supplierId: sup.body.id });
    await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 60, takenAt: hoursAgo(1) });
    expect((await fm.get(`/api/sources/${sourceId}?draws=0`)).body.outlook.leadTimeHours).toBe(24);
    expect(
      (await admin.put(`/api/suppliers/${sup.body.id}`, { name: 'Cache supplier', orderEmail: 'orders@example.test', leadTimeHours: 72, currency: 'GBP' }))
        .status,
    ).toBe(200);
    const after = await fm.get(`/api/sources/${sourceId}?draws=0`);
    expect(after.body.outlook.leadTimeHours).toBe(72);
    expect(after.body.method.leadTimeHours).toBe(72);
  });

  it("the chart's reorder line is the engine's level: 30 % of a 10,000 kg tank = 3,000 kg", async () => {
    const { sourceId } = await tankFeedingWard('Cache tank D', { reorderMode: 'percent', reorderLevel: 30, orderUpTo: 9000 });
    await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 60, takenAt: hoursAgo(1) });
    const d = await fm.get(`/api/sources/${sourceId}?draws=0`);
    expect(d.body.reorderLevel).toBeCloseTo(3000, 9);
    // The first order is placed when contents reach it: (6,000 − 3,000) / 16.25 kg/h ≈ 184.6 h after the reading.
    const placed = new Date(d.body.orders[0].placedAt).getTime();
    const expected = new Date(hoursAgo(1)).getTime() + Math.ceil(3000 / kgPerH()) * 3_600_000;
    expect(placed).toBe(expected);
  });

  it('another organisation cannot read a cached detail', async () => {
    const { sourceId, wardId } = await tankFeedingWard('Cache tank E');
    await fm.post(`/api/sources/${sourceId}/readings`, { kind: 'level_percent', value: 60, takenAt: hoursAgo(1) });
    expect((await fm.get(`/api/sources/${sourceId}`)).status).toBe(200);
    expect((await fm.get(`/api/wards/${wardId}`)).status).toBe(200);
    const other = await createTestOrg(app.ds);
    const stranger = await signedIn(app, other.users.facilities_manager);
    expect((await stranger.get(`/api/sources/${sourceId}`)).status).toBe(404);
    expect((await stranger.get(`/api/wards/${wardId}`)).status).toBe(404);
    expect((await stranger.request('GET', `/api/sources/${sourceId}/forecast.csv`)).status).toBe(404);
  });
});
