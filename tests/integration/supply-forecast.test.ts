import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { createTestOrg, signedIn, startTestApp, type Client, type TestApp, type TestOrg } from '../support/test-app';
import { freeGasLitresPerKg } from '@common/gas/reference-conditions';

let app: TestApp;
let org: TestOrg;
let fm: Client;
let siteId: number;

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
  siteId = org.siteIds[0];
  fm = await signedIn(app, org.users.facilities_manager);
});
afterAll(async () => {
  await app.close();
});

const tank = (name: string, extra: Record<string, unknown> = {}) => ({
  name,
  type: 'bulk_liquid',
  gasCode: 'O2',
  capacityKg: 10_000,
  evaporationPercentPerDay: 0.5,
  leadTimeHours: 48,
  ...extra,
});

async function count(table: string, where: string, params: unknown[]) {
  const rows: { n: string }[] = await app.ds.query(`SELECT COUNT(*) AS n FROM ${table} WHERE ${where}`, params);
  return Number(rows[0].n);
}

describe('supply sources and readings', () => {
  it('creates a tank, takes a level reading and forecasts it from the reading at constant ward demand', async () => {
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank A'));
    expect(src.status).toBe(200);
    const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: 'Ward A', department: 'ward', beds: 20 });
    expect(ward.status).toBe(200);
    expect((await fm.put(`/api/wards/${ward.body.id}/feeds`, { feeds: [{ sourceId: src.body.id, gasCode: 'O2', role: 'primary' }] })).status).toBe(200);
    // 20 patients at 10 L/min = 200 L/min of free gas at 15 °C, every hour.
    expect(
      (await fm.put(`/api/wards/${ward.body.id}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 20, flowLMin: 10, label: 'constant' }] }))
        .status,
    ).toBe(200);
    const takenAt = DateTime.utc().startOf('hour').minus({ hours: 2 }).toISO()!;
    const reading = await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'level_percent', value: 60, takenAt });
    expect(reading.status).toBe(200);
    expect(reading.body.contents).toBeCloseTo(6000, 6); // 60 % of 10,000 kg

    const detail = await fm.get(`/api/sources/${src.body.id}?draws=50`);
    expect(detail.status).toBe(200);
    // 200 L/min × 60 = 12,000 L/h; at 15 °C and 1.01325 bar oxygen is 1.35436 kg/m³ (reference EOS, tests/reference
    // table), so 12 m³/h = 16.25 kg/h; evaporation 0.5 %/day × 10,000 kg = 2.08 kg/h is below demand, so
    // demand alone empties 6,000 kg in 6,000 / 16.25 = 369.2 h from the reading.
    const kgPerH = 12_000 / freeGasLitresPerKg('O2', '15C');
    expect(kgPerH).toBeCloseTo(16.25, 1);
    const emptyMs = new Date(detail.body.outlook.emptyAt).getTime();
    const expectedMs = new Date(takenAt).getTime() + (6000 / kgPerH) * 3_600_000;
    expect(Math.abs(emptyMs - expectedMs)).toBeLessThan(60_000);
    // Days of stock now: contents now ÷ daily use (390 kg/day).
    expect(detail.body.outlook.daysOfStock).toBeCloseTo((6000 - 2 * kgPerH) / (kgPerH * 24), 1);
    expect(detail.body.band.p10 <= detail.body.band.p50 && detail.body.band.p50 <= detail.body.band.p90).toBe(true);
    expect(detail.body.method.demandLines[0].flowLMin).toBeCloseTo(200, 9);
    expect(detail.body.method.caution).toMatch(/Planning estimate/);

    const overview = await fm.get('/api/overview');
    const row = overview.body.sites.find((s: { id: number }) => s.id === siteId).sources.find((s: { id: number }) => s.id === src.body.id);
    expect(row.status).toBe('ok');
    expect(row.trend).toHaveLength(15);

    const csv = await fm.request('GET', `/api/sources/${src.body.id}/forecast.csv`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/);
    expect(String(csv.body).split('\r\n')[0]).toBe('time_utc,contents_kg,demand_L_free_gas');
  });

  it('marks a source "reorder" when its reorder level is crossed inside the lead time', async () => {
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank B', { reorderMode: 'percent', reorderLevel: 30, orderUpTo: 9000 }));
    const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: 'Ward B', department: 'ward', beds: 20 });
    await fm.put(`/api/wards/${ward.body.id}/feeds`, { feeds: [{ sourceId: src.body.id, gasCode: 'O2', role: 'primary' }] });
    await fm.put(`/api/wards/${ward.body.id}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 20, flowLMin: 10 }] });
    // 32 % = 3,200 kg: 200 kg above the 3,000 kg reorder level, i.e. ~12 h at 16.25 kg/h, inside the 48 h lead time.
    await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'level_percent', value: 32, takenAt: new Date().toISOString() });
    const detail = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    expect(detail.body.outlook.status).toBe('reorder');
    expect(detail.body.orders[0].quantityUnit).toBe('kg');
    // The order fills to 9,000 kg on arrival (48 h after placing).
    const placed = new Date(detail.body.orders[0].placedAt).getTime();
    expect(new Date(detail.body.orders[0].arrivesAt).getTime() - placed).toBe(48 * 3_600_000);
  });

  it('a manifold read by its bank gauges counts real-gas contents, corrected for the store temperature', async () => {
    const types = await (await signedIn(app, org.users.administrator)).post('/api/cylinder-types', { gasCode: 'O2', waterCapacityL: 50, fillPressureBar: 200 });
    const src = await fm.post(`/api/sites/${siteId}/sources`, {
      name: 'Manifold M',
      type: 'manifold',
      gasCode: 'O2',
      cylinderTypeId: types.body.id,
      cylindersPerBank: 2,
      temperatureC: 15,
    });
    expect(src.status).toBe(200);
    const r = await fm.post(`/api/sources/${src.body.id}/readings`, {
      kind: 'bank_gauges',
      dutyBar: 200,
      standbyBar: 200,
      spareFull: 0,
      takenAt: new Date().toISOString(),
    });
    expect(r.status).toBe(200);
    // Four full 50 L cylinders at 200 bar(g), 15 °C: each holds ≈ 4 × nominal… compare with the catalogue's own nominal figure.
    expect(r.body.contents).toBeCloseTo(4 * types.body.nominal.freeGasL, -1);
  });

  it('a N2O cylinder store: in-use gauges are refused ("weigh the cylinder"), net weights are counted', async () => {
    const types = await (
      await signedIn(app, org.users.administrator)
    ).post('/api/cylinder-types', { gasCode: 'N2O', waterCapacityL: 10, fillPressureBar: 44, tareKg: 14, maxFillingRatioKgPerL: 0.75 });
    expect(types.status).toBe(200);
    const src = await fm.post(`/api/sites/${siteId}/sources`, {
      name: 'N2O store',
      type: 'cylinder_store',
      gasCode: 'N2O',
      cylinderTypeId: types.body.id,
      temperatureC: 15,
    });
    expect(src.status).toBe(200);
    const before = await count('source_reading', 'source_id = ?', [src.body.id]);
    // 44 bar g at 15 °C is the vapour pressure of N2O (45.037 bar abs, saturation table in tests/reference): full or nearly empty alike
    const refused = await fm.post(`/api/sources/${src.body.id}/readings`, {
      kind: 'store_count',
      full: 2,
      inUseGaugeBar: [44],
      takenAt: new Date().toISOString(),
    });
    expect(refused.status).toBe(400);
    expect(refused.body.error.code).toBe('invalid_input');
    expect(refused.body.error.message).toMatch(/weigh the cylinder: gross − tare/);
    expect(await count('source_reading', 'source_id = ?', [src.body.id])).toBe(before);
    const ok = await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'store_count', full: 2, inUseNetKg: [3], takenAt: new Date().toISOString() });
    expect(ok.status).toBe(200);
    // 2 × 7.5 kg (0.75 kg/L × 10 L) + 3 kg = 18 kg; N2O 1.872814 kg/m³ at 15 °C, 1.01325 bar (Lemmon & Span 2006, z-grid in tests/reference)
    expect(ok.body.contents / ((18 / 1.872814) * 1000)).toBeCloseTo(1, 3);
  });

  it('a 50:50 N2O/O2 store at −6 °C: the reading and the forecast method carry the separation caution', async () => {
    const types = await (
      await signedIn(app, org.users.administrator)
    ).post('/api/cylinder-types', { gasCode: 'N2O_O2_50', waterCapacityL: 10, fillPressureBar: 137 });
    expect(types.status).toBe(200);
    const src = await fm.post(`/api/sites/${siteId}/sources`, {
      name: 'Cold 50:50 store',
      type: 'cylinder_store',
      gasCode: 'N2O_O2_50',
      cylinderTypeId: types.body.id,
      temperatureC: -6,
    });
    expect(src.status).toBe(200);
    const r = await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'store_count', full: 3, inUseGaugeBar: [100], takenAt: new Date().toISOString() });
    expect(r.status).toBe(200);
    // N2O condenses out of the 50:50 mixture below about −5.5 to −7 °C (BMJ 1968;3:715; anaesthesia teaching notes)
    expect(r.body.cautions.join(' ')).toMatch(/hypoxic hazard/);
    const detail = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    expect(detail.status).toBe(200);
    expect(detail.body.method.cautions.join(' ')).toMatch(/−5\.5 to −7 °C/);
  });

  it('a cylinder store is forecast to its cylinder type’s residual (default 10 % of fill, stated in the method)', async () => {
    const admin = await signedIn(app, org.users.administrator);
    const types = await admin.post('/api/cylinder-types', { gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 230 });
    expect(types.status).toBe(200);
    // default: 10 % of the fill pressure (US EMS guidance keeps about 200 psi of a 2,000–2,200 psi fill; common practice)
    expect(types.body.residual.gaugeBar).toBeCloseTo(23, 9);
    expect(types.body.residual.basis).toMatch(/10 % of the fill pressure/);
    const src = await fm.post(`/api/sites/${siteId}/sources`, {
      name: 'O2 store R',
      type: 'cylinder_store',
      gasCode: 'O2',
      cylinderTypeId: types.body.id,
      temperatureC: 15,
    });
    await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'store_count', full: 2, takenAt: new Date().toISOString() });
    const detail = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    expect(detail.body.method.residual.gaugeBar).toBeCloseTo(23, 9);
    const defaultContents = detail.body.outlook.contents;
    expect(defaultContents).toBeLessThan(2 * types.body.nominal.freeGasL);
    const edited = await admin.put(`/api/cylinder-types/${types.body.id}`, { gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 230, residualGaugeBar: 50 });
    expect(edited.status).toBe(200);
    expect(edited.body.residual.basis).toMatch(/set for this cylinder type/);
    expect(
      (await admin.put(`/api/cylinder-types/${types.body.id}`, { gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 230, residualGaugeBar: 230 })).status,
    ).toBe(400);
  });

  it('litres of liquid oxygen are converted at the saturated-liquid density of the tank’s working pressure', async () => {
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank L', { operatingPressureBar: 9 }));
    expect(src.status).toBe(200);
    expect(src.body.operatingPressureBar).toBe(9);
    const r = await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'litres_liquid', value: 1000, takenAt: new Date().toISOString() });
    expect(r.status).toBe(200);
    // warm liquid in a working tank: ≈ 974 kg/m³ at about 120 K, 10 bar (liquid-oxygen reference page), not the
    // 1,141 kg/m³ of the normal boiling point (which would overstate the stock by 17 %)
    expect(Math.abs(r.body.contents / 974 - 1)).toBeLessThan(0.005);
    const byDefault = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank L2'));
    const r2 = await fm.post(`/api/sources/${byDefault.body.id}/readings`, { kind: 'litres_liquid', value: 1000, takenAt: new Date().toISOString() });
    // the 7 bar g default lies between 10 bar abs (≈ 974 kg/m³) and the boiling point (1,141 kg/m³)
    expect(r2.body.contents).toBeGreaterThan(974);
    expect(r2.body.contents).toBeLessThan(1141 * 0.9);
  });

  it('refuses bad readings with field messages and writes nothing', async () => {
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank C'));
    const before = await count('source_reading', 'source_id = ?', [src.body.id]);
    const cases = [
      [{ kind: 'level_percent', value: 130, takenAt: new Date().toISOString() }, 'value'],
      [{ kind: 'level_percent', value: 50, takenAt: 'yesterday' }, 'takenAt'],
      [{ kind: 'kg', value: 12_000, takenAt: new Date().toISOString() }, 'value'],
      [{ kind: 'bank_gauges', dutyBar: 100, standbyBar: 100, takenAt: new Date().toISOString() }, 'kind'],
      [{ kind: 'level_percent', value: 50, takenAt: new Date(Date.now() + 86_400_000).toISOString() }, 'takenAt'],
    ] as const;
    for (const [body, path] of cases) {
      const res = await fm.post(`/api/sources/${src.body.id}/readings`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(path);
    }
    expect(await count('source_reading', 'source_id = ?', [src.body.id])).toBe(before);
  });

  it('refuses a source without what its type needs, and an unknown time zone in a scenario date', async () => {
    const res = await fm.post(`/api/sites/${siteId}/sources`, { name: 'Tank D', type: 'bulk_liquid', gasCode: 'O2' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['capacityKg', 'evaporationPercentPerDay']);
    const sc = await fm.post(`/api/sites/${siteId}/scenarios`, { name: 'Bad', multiplier: 1.2, fromLocal: '2027-03-28T01:30' });
    // 01:30 on 28 March 2027 does not exist in Europe/London (clocks go forward at 01:00).
    expect(sc.status).toBe(400);
    expect(sc.body.error.details[0].path).toBe('fromLocal');
  });

  it('a scenario changes the forecast without touching the baseline', async () => {
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank E'));
    const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: 'Ward E', department: 'ward', beds: 20 });
    await fm.put(`/api/wards/${ward.body.id}/feeds`, { feeds: [{ sourceId: src.body.id, gasCode: 'O2', role: 'primary' }] });
    await fm.put(`/api/wards/${ward.body.id}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 20, flowLMin: 10 }] });
    await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'kg', value: 6000, takenAt: new Date().toISOString() });
    const from = DateTime.now().setZone('Europe/London').startOf('hour').toFormat("yyyy-MM-dd'T'HH:mm");
    const sc = await fm.post(`/api/sites/${siteId}/scenarios`, { name: `Double ${Date.now()}`, multiplier: 2, fromLocal: from });
    expect(sc.status).toBe(200);
    const base = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    const doubled = await fm.get(`/api/sources/${src.body.id}?draws=0&scenario=${sc.body.id}`);
    const hBase = (new Date(base.body.outlook.emptyAt).getTime() - Date.now()) / 3_600_000;
    const hDouble = (new Date(doubled.body.outlook.emptyAt).getTime() - Date.now()) / 3_600_000;
    // Twice the demand empties in about half the time (evaporation is below demand in both).
    expect(hDouble / hBase).toBeGreaterThan(0.47);
    expect(hDouble / hBase).toBeLessThan(0.53);
    const again = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    expect(again.body.outlook.emptyAt).toBe(base.body.outlook.emptyAt);
  });

  it('flags a vaporiser whose derated rating is below the peak hourly demand', async () => {
    // 20 patients × 10 L/min = 12 m³/h; a 15 m³/h vaporiser derated to 0.7 carries 10.5 m³/h: overload.
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank V', { vaporiserM3H: 15, vaporiserDerating: 0.7 }));
    const ward = await fm.post(`/api/sites/${siteId}/wards`, { name: 'Ward V', department: 'ward', beds: 20 });
    await fm.put(`/api/wards/${ward.body.id}/feeds`, { feeds: [{ sourceId: src.body.id, gasCode: 'O2', role: 'primary' }] });
    await fm.put(`/api/wards/${ward.body.id}/therapy`, { lines: [{ gasCode: 'O2', device: 'custom', patients: 20, flowLMin: 10 }] });
    await fm.post(`/api/sources/${src.body.id}/readings`, { kind: 'kg', value: 8000, takenAt: new Date().toISOString() });
    const detail = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    expect(detail.body.outlook.firstRisk.code).toBe('vaporiser_overload');
    expect(detail.body.outlook.status).toBe('critical');
    // With a 20 m³/h vaporiser (14 m³/h derated) there is no such risk.
    await fm.put(`/api/sources/${src.body.id}`, tank('Tank V', { vaporiserM3H: 20, vaporiserDerating: 0.7 }));
    const ok = await fm.get(`/api/sources/${src.body.id}?draws=0`);
    expect(ok.body.outlook.firstRisk?.code ?? null).not.toBe('vaporiser_overload');
  });

  it('records every write in the audit log with before and after', async () => {
    const admin = await signedIn(app, org.users.administrator);
    const src = await fm.post(`/api/sites/${siteId}/sources`, tank('Tank F'));
    await fm.put(`/api/sources/${src.body.id}`, tank('Tank F renamed'));
    const log = await admin.get(`/api/audit?entity=supply_source&q=${src.body.id}`);
    const update = log.body.items.find((i: { action: string }) => i.action === 'update');
    expect(update.before.name).toBe('Tank F');
    expect(update.after.name).toBe('Tank F renamed');
  });
});
