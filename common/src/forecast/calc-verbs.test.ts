import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { freeGasLitresPerKg } from '../gas/reference-conditions';
import { forecastVerb } from './calc-verbs';

type Out = {
  hours_to_empty: number | null;
  empty_at: string | null;
  reorder_at: string | null;
  days_of_stock_at_start: number | null;
  orders: { placed_at: string; arrives_at: string; quantity: number | null; quantity_unit: string }[];
  series: { at: string; contents: number; offset: string }[];
  unit: string;
  quantity_unit: string;
  contents_at_start: number;
  bands?: { hours_to_empty: { p10: number | null; p50: number | null; p90: number | null } };
  manifold_events?: { kind: string; at: string; bank: string }[];
};

const EXAMPLE = {
  start: '2027-01-04T00:00',
  timezone: 'Europe/London',
  horizon_days: 60,
  reference: '15C',
  source: {
    type: 'bulk_liquid',
    gas: 'O2',
    capacity_kg: 10000,
    contents_kg: 6000,
    evaporation_percent_per_day: 0.5,
    reorder_level_kg: 2500,
    order_up_to_kg: 9500,
    lead_time_hours: 48,
  },
  demand: [{ flow_L_min: 100 }, { flow_L_min: 200, hours: [8, 9, 10, 11, 12, 13, 14, 15, 16, 17], weekdays: [1, 2, 3, 4, 5] }],
  deliveries: [{ at: '2027-01-10T06:00', kg: 4000 }],
  draws: 0,
  demand_cv: 0.2,
  seed: 1,
};

const run = (input: unknown) => forecastVerb(input) as Out;
const clone = <T>(v: T): T => structuredClone(v);

// O2 density at 15 °C, 1.01325 bar: 1.35436 kg/m³ (tests/reference/README.md, Schmidt & Wagner 1985).
const RHO_O2_15C = 1.35436;

describe('calc forecast: the worked example', () => {
  it('returns the contract shape with one series entry per elapsed hour', () => {
    const out = run(EXAMPLE);
    expect(out.unit).toBe('kg');
    expect(out.quantity_unit).toBe('kg');
    // 60 days from 2027-01-04 (GMT throughout) = 1,440 hours; first entry is the end of the first hour.
    expect(out.series).toHaveLength(1440);
    expect(out.series[0].at).toBe('2027-01-04T01:00');
    expect(out.series.at(-1)!.at).toBe('2027-03-05T00:00');
    expect(out.bands).toBeUndefined();
    expect(out.series.every((s) => s.contents >= 0 && s.contents <= 10_000)).toBe(true);
    // Days of stock: weekday demand in the first 7 days (Mon–Sun) = 100 L/min always + 200 L/min × 10 h × 5 d:
    // (144,000 + 120,000 × 5/7) L/day ÷ 738.36 L/kg = 311.1 kg/day (boil-off 50 kg/day is below demand
    // in every hour); 6,000 kg ÷ 311.1 = 19.28 days.
    const lPerKg = freeGasLitresPerKg('O2', '15C');
    expect(out.days_of_stock_at_start!).toBeCloseTo(6000 / ((144_000 + (120_000 * 5) / 7) / lPerKg), 3);
    expect(out.days_of_stock_at_start!).toBeCloseTo(19.28, 1);
    // Reorder: a first order placed when contents cross 2,500 kg, arriving 48 h later.
    expect(out.reorder_at).toBe(out.orders[0].placed_at);
    const placedIdx = out.series.findIndex((s) => s.at === out.orders[0].placed_at);
    expect(out.series[placedIdx].contents).toBeLessThanOrEqual(2500);
    expect(out.series[placedIdx - 1].contents).toBeGreaterThan(2500);
    const arriveIdx = out.series.findIndex((s) => s.at === out.orders[0].arrives_at);
    expect(arriveIdx - placedIdx).toBe(48);
    // The order fills to 9,500 kg: the next hour ends 9,500 minus one hour of use (at most
    // (100 + 200) L/min × 60 ÷ 738.36 L/kg = 24.4 kg).
    expect(out.series[arriveIdx + 1].contents).toBeGreaterThan(9_500 - 24.5);
    expect(out.series[arriveIdx + 1].contents).toBeLessThan(9_500);
    expect(out.orders[0].quantity! + out.series[arriveIdx].contents).toBeCloseTo(9500, 2);
    expect(out.hours_to_empty).toBeNull();
    expect(out.empty_at).toBeNull();
  });

  it('adds a scheduled delivery at its local time', () => {
    const without = run({ ...clone(EXAMPLE), deliveries: [] });
    const withIt = run(EXAMPLE);
    // Delivery at 2027-01-10T06:00 = hour 150: the entry ending 07:00 shows +4,000 kg.
    const i = withIt.series.findIndex((s) => s.at === '2027-01-10T07:00');
    expect(i).toBe(150);
    expect(withIt.series[i].contents - without.series[i].contents).toBeCloseTo(4000, 2);
    expect(withIt.series[i - 1].contents - without.series[i - 1].contents).toBeCloseTo(0, 6);
  });
});

describe('calc forecast: analytic cases', () => {
  it('constant 100 L/min O2 at 15C empties 1,000 kg in 1000 × 738.36 / 6000 = 123.06 h', () => {
    const out = run({
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 10,
      source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 2000, contents_kg: 1000 },
      demand: [{ flow_L_min: 100 }],
    });
    // 1000 L/m³ ÷ 1.35436 kg/m³ = 738.356 L/kg; 6,000 L/h ÷ 738.356 = 8.1262 kg/h.
    expect(out.hours_to_empty!).toBeCloseTo((1000 * 1000) / RHO_O2_15C / 6000, 1);
    // 123.06 h after Monday 00:00 = Saturday 2027-01-09 03:0x (the minute is the floor of the exact instant).
    const minutes = Math.floor((out.hours_to_empty! - 123) * 60);
    expect(out.empty_at).toBe(`2027-01-09T03:${String(minutes).padStart(2, '0')}`);
    expect(out.series[0].contents).toBeCloseTo(1000 - (6000 * RHO_O2_15C) / 1000, 2);
  });

  it('a tank whose boil-off exceeds demand empties at the boil-off rate', () => {
    // 20,000 kg tank at 2 %/day = 400 kg/day = 16.667 kg/h; demand 10 L/min = 0.81 kg/h < boil-off:
    // 1,000 kg last 1000 / 16.667 = 60 h.
    const out = run({
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 5,
      source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 20_000, contents_kg: 1000, evaporation_percent_per_day: 2 },
      demand: [{ flow_L_min: 10 }],
    });
    expect(out.hours_to_empty).toBeCloseTo(60, 6);
    expect(out.empty_at).toBe('2027-01-06T12:00');
  });

  it('weekday-only demand across the spring change: 167 entries, repeated-hour-free labels', () => {
    const out = run({
      start: '2027-03-22T00:00',
      timezone: 'Europe/London',
      horizon_days: 7,
      source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 20_000, contents_kg: 10_000 },
      demand: [{ flow_L_min: 200, hours: [8, 9, 10, 11, 12, 13, 14, 15, 16, 17], weekdays: [1, 2, 3, 4, 5] }],
    });
    expect(out.series).toHaveLength(167);
    // 01:00 → 02:00 local is skipped on Sunday 28 March: the hour ending 00:00 GMT is followed by the
    // hour ending 01:00 UTC, which is 02:00 BST; no entry reads 01:00.
    const i = out.series.findIndex((s) => s.at === '2027-03-28T00:00');
    expect(out.series[i + 1]).toMatchObject({ at: '2027-03-28T02:00', offset: '+01:00' });
    expect(out.series.some((s) => s.at === '2027-03-28T01:00')).toBe(false);
    // Used: 200 L/min × 600 min × 5 days = 600,000 L ÷ 738.36 L/kg = 812.6 kg.
    expect(10_000 - out.series.at(-1)!.contents).toBeCloseTo((600_000 * RHO_O2_15C) / 1000, 0);
  });

  it('the autumn day has 25 entries and repeats the local hour 01:00', () => {
    const out = run({
      start: '2027-10-31T00:00',
      timezone: 'Europe/London',
      horizon_days: 1,
      source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 1000, contents_kg: 1000 },
      demand: [{ flow_L_min: 100 }],
    });
    expect(out.series).toHaveLength(25);
    expect(out.series.slice(0, 2).map((s) => [s.at, s.offset])).toEqual([
      ['2027-10-31T01:00', '+01:00'],
      ['2027-10-31T01:00', '+00:00'],
    ]);
  });

  it('a cylinder store counts free gas per full cylinder from the gas engine and orders whole cylinders', () => {
    // HTM 02-01 Part A Table 22: a 47 L cylinder at 137 bar holds about 6,800 L of O2 (nominal figure).
    const out = run({
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 10,
      source: {
        type: 'cylinders',
        gas: 'O2',
        water_capacity_L: 47,
        fill_gauge_bar: 137,
        fill_temperature_C: 15,
        full: 10,
        in_use_gauge_bar: [],
        reorder_level_cylinders: 4,
        order_up_to_cylinders: 12,
        lead_time_hours: 24,
        residual_gauge_bar: 0, // HTM's nominal contents are to empty
      },
      demand: [{ flow_L_min: 10 }],
    });
    expect(out.unit).toBe('L');
    expect(out.quantity_unit).toBe('cylinders');
    const perCyl = out.contents_at_start / 10;
    expect(Math.abs(perCyl / 6800 - 1)).toBeLessThan(0.05);
    // 10 → 4 cylinders' worth at 600 L/h takes 6 × perCyl / 600 ≈ 70 h (first whole hour at or below);
    // 24 h later the order brings the store to 12 minus the equivalents left: floor(12 − 1.9) = 10.
    const o = out.orders[0];
    const crossH = Math.ceil((6 * perCyl) / 600);
    const leftAtArrival = (10 * perCyl - (crossH + 24) * 600) / perCyl;
    expect(leftAtArrival).toBeGreaterThan(0);
    expect(o.quantity).toBe(Math.floor(12 - leftAtArrival));
    expect(o.quantity).toBe(10);
  });

  it('takes a reorder level in days of stock and a surge scenario from a date', () => {
    const lPerKg = freeGasLitresPerKg('O2', '15C');
    const kgPerHour = 6000 / lPerKg; // 100 L/min × 60 ÷ L/kg ≈ 8.126 kg/h
    const base = {
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 10,
      source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 2000, contents_kg: 1000, reorder_level_days: 2, lead_time_hours: 1000 },
      demand: [{ flow_L_min: 100 }],
    };
    // Level = 2 days × 24 × 8.126 kg/h = 390.1 kg; crossed in the hour ending ceil((1000 − 390.1) / 8.126) = 76 h
    // after the start: Thursday 2027-01-07 04:00.
    const hoursToLevel = Math.ceil((1000 - 48 * kgPerHour) / kgPerHour);
    expect(hoursToLevel).toBe(76);
    expect(run(base).reorder_at).toBe('2027-01-07T04:00');
    // Doubling demand from 2027-01-05 00:00: 24 h at 8.126 kg/h, then (1000 − 195.0) kg at 16.25 kg/h.
    const surge = run({ ...base, scenarios: [{ name: 'surge', from: '2027-01-05T00:00', multiplier: 2 }] });
    expect(surge.hours_to_empty!).toBeCloseTo(24 + (1000 - 24 * kgPerHour) / (2 * kgPerHour), 3);
  });

  it('a manifold reports its changeovers', () => {
    const out = run({
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 2,
      source: {
        type: 'manifold',
        gas: 'O2',
        water_capacity_L: 47,
        fill_gauge_bar: 137,
        fill_temperature_C: 15,
        cylinders_per_bank: 10,
        duty_bank_gauge_bar: 137,
        standby_bank_gauge_bar: 137,
      },
      demand: [{ flow_L_min: 201 }],
    });
    // WE-3 manifold: each bank of 10 full cylinders at 201 L/min lasts 10 × perCyl / 12,060 h (~5.6–5.8 h).
    const changeover = out.manifold_events!.find((e) => e.kind === 'changeover')!;
    expect(changeover.bank).toBe('B');
    const perCyl = out.contents_at_start / 20;
    expect(out.hours_to_empty!).toBeCloseTo((20 * perCyl) / 12_060, 3);
  });

  it('Monte Carlo: same seed → same bands, ordered, and cv 0 → the deterministic value', () => {
    const base = {
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 30,
      source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 5000, contents_kg: 3000 },
      demand: [{ flow_L_min: 100 }, { flow_L_min: 200, hours: [8, 9, 10, 11, 12, 13, 14, 15, 16, 17] }],
    };
    const a = run({ ...base, draws: 200, demand_cv: 0.25, seed: 5 });
    const b = run({ ...base, draws: 200, demand_cv: 0.25, seed: 5 });
    expect(a.bands).toEqual(b.bands);
    const { p10, p50, p90 } = a.bands!.hours_to_empty;
    expect(p10!).toBeLessThanOrEqual(p50!);
    expect(p50!).toBeLessThanOrEqual(p90!);
    const flat = run({ ...base, draws: 50, demand_cv: 0 });
    expect(flat.bands!.hours_to_empty).toEqual({ p10: flat.hours_to_empty, p50: flat.hours_to_empty, p90: flat.hours_to_empty });
  });
});

describe('calc forecast: bad input', () => {
  const pathOf = (mutate: (v: Record<string, any>) => void): string => {
    const input = clone(EXAMPLE) as Record<string, any>;
    mutate(input);
    try {
      forecastVerb(input);
    } catch (e) {
      expect(e).toBeInstanceOf(InvalidInputError);
      return (e as InvalidInputError).details.map((d) => d.path).join(',');
    }
    throw new Error('expected InvalidInputError');
  };

  it.each([
    ['unknown gas', (v: any) => (v.source.gas = 'XE'), 'source.gas'],
    ['negative flow', (v: any) => (v.demand[0].flow_L_min = -5), 'demand.0.flow_L_min'],
    ['contents above capacity', (v: any) => (v.source.contents_kg = 12_000), 'source.contents_kg'],
    ['hour outside 0–23', (v: any) => (v.demand[1].hours = [8, 24]), 'demand.1.hours.1'],
    ['weekday outside 1–7', (v: any) => (v.demand[1].weekdays = [0, 1]), 'demand.1.weekdays.0'],
    ['unknown time zone', (v: any) => (v.timezone = 'Europe/Atlantis'), 'timezone'],
    ['start skipped by the clock change', (v: any) => (v.start = '2027-03-28T01:30'), 'start'],
    ['start not a date', (v: any) => (v.start = '2027-02-30T00:00'), 'start'],
    ['horizon 0', (v: any) => (v.horizon_days = 0), 'horizon_days'],
    ['horizon above 3 years', (v: any) => (v.horizon_days = 1200), 'horizon_days'],
    ['draws above 10,000', (v: any) => (v.draws = 10_001), 'draws'],
  ])('%s → invalid_input at its field', (_name, mutate, path) => {
    expect(pathOf(mutate)).toContain(path);
  });
});

describe('calc forecast: liquefied gases are known by weight, not by gauge', () => {
  const n2oStore = (source: Record<string, unknown>) => ({
    start: '2027-01-04T00:00',
    timezone: 'Europe/London',
    horizon_days: 10,
    source: { type: 'cylinders', gas: 'N2O', water_capacity_L: 10, fill_gauge_bar: 44, fill_temperature_C: 15, full: 4, ...source },
    demand: [{ flow_L_min: 5 }],
  });
  const errorOf = (input: unknown): InvalidInputError => {
    try {
      forecastVerb(input);
    } catch (e) {
      expect(e).toBeInstanceOf(InvalidInputError);
      return e as InvalidInputError;
    }
    throw new Error('expected InvalidInputError');
  };

  it('refuses a N2O store with no fill mass, and any in-use gauge reading, with "weigh the cylinder"', () => {
    expect(errorOf(n2oStore({})).details[0].path).toBe('source.fill_kg');
    const e = errorOf(n2oStore({ fill_kg: 7.5, in_use_gauge_bar: [40] }));
    expect(e.message).toMatch(/weigh the cylinder: gross − tare/);
    expect(e.details[0].path).toBe('source.in_use_gauge_bar.0');
    // a manifold's bank gauges of a liquefied gas say nothing about contents either
    const m = errorOf({
      ...n2oStore({}),
      source: {
        type: 'manifold',
        gas: 'N2O',
        water_capacity_L: 10,
        fill_gauge_bar: 44,
        fill_kg: 7.5,
        cylinders_per_bank: 2,
        duty_bank_gauge_bar: 44,
        standby_bank_gauge_bar: 44,
      },
    });
    expect(m.message).toMatch(/weigh/);
  });

  it('counts full cylinders by fill_kg and part-used ones by their net weight', () => {
    // reference equation of state for N2O (Lemmon & Span, 2006), z-grid in tests/reference: 1.872814 kg/m³
    // at 288.15 K, 1.01325 bar → 1000 / 1.872814 = 533.96 L of gas per kg; 4 × 7.5 kg + 2.5 kg = 32.5 kg
    const out = run(n2oStore({ fill_kg: 7.5, in_use_net_kg: [2.5] }));
    expect(Math.abs(out.contents_at_start / (32.5 * 533.96) - 1)).toBeLessThan(0.001);
  });
});

describe('calc forecast: the 50:50 N2O/O2 separation caution', () => {
  const entonox = (source: Record<string, unknown>) => ({
    start: '2027-01-04T00:00',
    timezone: 'Europe/London',
    horizon_days: 5,
    source: { type: 'cylinders', gas: 'N2O_O2_50', water_capacity_L: 10, fill_gauge_bar: 137, fill_temperature_C: 15, full: 4, ...source },
    demand: [{ flow_L_min: 5 }],
  });
  const cautionsOf = (input: unknown) => ((forecastVerb(input) as { cautions: string[] }).cautions ?? []).join(' ');

  it('appears when the store or the in-use temperature is at or below −5.5 °C (sources: −5.5 to −7 °C; BMJ 1968;3:715)', () => {
    expect(cautionsOf(entonox({ in_use_temperature_C: -5.5 }))).toMatch(/hypoxic hazard\)\. Before use/);
    expect(cautionsOf(entonox({ fill_temperature_C: -7, in_use_temperature_C: 15 }))).toMatch(/store temperature/);
    expect(cautionsOf(entonox({ in_use_temperature_C: 18 }))).toBe('');
    // an oxygen store at −10 °C has no such caution
    expect(cautionsOf({ ...entonox({ in_use_temperature_C: -10 }), source: { ...entonox({}).source, gas: 'O2', in_use_temperature_C: -10 } })).toBe('');
  });

  it('a mixture store carries its hours to empty across the mixture Z range (Peng–Robinson 1976 as the second method)', () => {
    const out = forecastVerb(entonox({ in_use_temperature_C: 18, residual_gauge_bar: 0 })) as Out & {
      hours_to_empty_range: { low: number; high: number; method: string };
    };
    // 4 × 10 L at 137 bar g ≈ 4 × 1,900 L of free gas at 5 L/min: about 25 h, inside the 5-day horizon
    expect(out.hours_to_empty).not.toBeNull();
    expect(out.hours_to_empty_range.low).toBeLessThanOrEqual(out.hours_to_empty!);
    expect(out.hours_to_empty_range.high).toBeGreaterThanOrEqual(out.hours_to_empty!);
    expect(out.hours_to_empty_range.high - out.hours_to_empty_range.low).toBeGreaterThan(0);
    expect(out.hours_to_empty_range.method).toMatch(/Peng–Robinson/);
    const o2 = forecastVerb({ ...entonox({}), source: { ...entonox({}).source, gas: 'O2' } }) as Record<string, unknown>;
    expect(o2.hours_to_empty_range).toBeUndefined();
  });

  it('refuses a bulk_liquid source of a mixture (50:50, heliox)', () => {
    for (const gas of ['N2O_O2_50', 'HE_O2_79']) {
      const input = { ...EXAMPLE, source: { ...EXAMPLE.source, gas } };
      expect(() => forecastVerb(input)).toThrow(/not held as bulk liquid/);
    }
  });
});

describe('calc forecast: cylinders are changed at a stated residual, not drained flat', () => {
  it('defaults to 10 % of the fill pressure, says so, and counts only the gas above it', () => {
    const input = (residual?: number) => ({
      start: '2027-01-04T00:00',
      timezone: 'Europe/London',
      horizon_days: 5,
      source: {
        type: 'cylinders',
        gas: 'O2',
        water_capacity_L: 50,
        fill_gauge_bar: 200,
        fill_temperature_C: 15,
        full: 4,
        in_use_gauge_bar: [],
        ...(residual === undefined ? {} : { residual_gauge_bar: residual }),
      },
      demand: [{ flow_L_min: 10 }],
    });
    const flat = forecastVerb(input(0)) as Out & { residual: { gauge_bar: number; basis: string } };
    const kept = forecastVerb(input()) as Out & { residual: { gauge_bar: number; basis: string } };
    expect(kept.residual.gauge_bar).toBe(20);
    expect(kept.residual.basis).toMatch(/10 % of the fill pressure/);
    // Hand calculation with Z of oxygen at 288.15 K from the z-grid in tests/reference (Schmidt & Wagner 1985):
    // Z(20 bar) = 0.9854, Z(1.01325 bar) ≈ 0.9993. Gas a 50 L cylinder holds between 21.01 and 1.01 bar abs:
    // 50 × (21.013/0.9856 − 1.013/0.9993) / 1.01325 × 0.9993 ≈ 1,001 L of free gas at 15 °C, 1.01325 bar.
    const perCylDrop = (flat.contents_at_start - kept.contents_at_start) / 4;
    expect(Math.abs(perCylDrop / 1001 - 1)).toBeLessThan(0.01);
  });

  it('refuses a residual at or above the fill pressure', () => {
    expect(() =>
      forecastVerb({
        start: '2027-01-04T00:00',
        timezone: 'Europe/London',
        source: { type: 'cylinders', gas: 'O2', water_capacity_L: 50, fill_gauge_bar: 200, full: 1, residual_gauge_bar: 200 },
      }),
    ).toThrow(InvalidInputError);
  });
});

describe('calc forecast: command line', () => {
  const repo = fileURLToPath(new URL('../../../', import.meta.url));
  const calc = (input: string) =>
    spawnSync('node', ['--import', 'tsx', 'scripts/calc.ts', 'forecast'], { cwd: repo, input, encoding: 'utf8', timeout: 60_000 });

  it('exits 0 with the contract shape, and 2 with invalid_input for bad input', () => {
    const ok = calc(JSON.stringify(EXAMPLE));
    expect(ok.status).toBe(0);
    const out = JSON.parse(ok.stdout) as Out;
    expect(Object.keys(out)).toEqual(
      expect.arrayContaining(['hours_to_empty', 'empty_at', 'reorder_at', 'days_of_stock_at_start', 'orders', 'series', 'unit']),
    );
    expect(out.series).toHaveLength(1440);
    expect(out.orders[0]).toEqual({ placed_at: expect.any(String), arrives_at: expect.any(String), quantity: expect.any(Number), quantity_unit: 'kg' });

    const badInput = clone(EXAMPLE) as Record<string, any>;
    badInput.demand[0].flow_L_min = -1;
    const bad = calc(JSON.stringify(badInput));
    expect(bad.status).toBe(2);
    const err = JSON.parse(bad.stdout) as { error: { code: string; details: { path: string }[] } };
    expect(err.error.code).toBe('invalid_input');
    expect(err.error.details.map((d) => d.path)).toContain('demand.0.flow_L_min');
  }, 60_000);
});
