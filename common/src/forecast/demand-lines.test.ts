import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { applyScenarios, buildHourlyDemand, type DemandLine } from './demand-lines';
import { buildHourIndex } from './hour-index';
import { DEVICE_DEFAULTS } from './demand-model';

const sum = (a: Float64Array, from = 0, to = a.length) => a.subarray(from, to).reduce((s, v) => s + v, 0);

describe('buildHourlyDemand', () => {
  it('adds lines and applies weekday-only hours across the spring clock change (London, week of 2027-03-22)', () => {
    const idx = buildHourIndex('Europe/London', '2027-03-22T00:00', 7);
    const lines: DemandLine[] = [{ flow_L_min: 100 }, { flow_L_min: 200, hours: [8, 9, 10, 11, 12, 13, 14, 15, 16, 17], weekdays: [1, 2, 3, 4, 5] }];
    const d = buildHourlyDemand(lines, idx);
    expect(d).toHaveLength(167);
    // Constant line: 100 L/min × 60 = 6,000 L/h over 167 real hours = 1,002,000 L (one hour short of 168).
    // Day line: 200 × 60 = 12,000 L/h × 10 h × 5 weekdays = 600,000 L (the change falls on a Sunday).
    expect(sum(d)).toBeCloseTo(1_002_000 + 600_000, 6);
    // Monday 08:00 (hour 8) carries both lines: 18,000 L; Monday 07:00 only the constant one.
    expect(d[8]).toBe(18_000);
    expect(d[7]).toBe(6_000);
    // Sunday (hours 144–166): 23 real hours × 6,000 L.
    expect(sum(d, 144, 167)).toBe(23 * 6_000);
  });

  it('charges the repeated autumn hour twice: 25 hours of demand on 2027-10-31', () => {
    const idx = buildHourIndex('Europe/London', '2027-10-31T00:00', 1);
    const d = buildHourlyDemand([{ flow_L_min: 10 }, { flow_L_min: 5, hours: [1] }], idx);
    // 10 L/min × 60 × 25 h = 15,000 L; the 01:00 line runs in both 01:00 hours: 2 × 300 L.
    expect(sum(d)).toBe(15_000 + 600);
  });

  it('limits a line to its from/until window (local times)', () => {
    const idx = buildHourIndex('Europe/London', '2027-01-04T00:00', 3);
    const d = buildHourlyDemand([{ flow_L_min: 1, from: '2027-01-05T00:00', until: '2027-01-05T12:00' }], idx);
    // 12 hours × 60 L
    expect(sum(d)).toBe(720);
    expect(d[23]).toBe(0);
    expect(d[24]).toBe(60);
    expect(d[36]).toBe(0);
  });

  it('rejects a negative flow, an hour outside 0–23 and a weekday outside 1–7 with their paths', () => {
    const idx = buildHourIndex('Europe/London', '2027-01-04T00:00', 1);
    const pathOf = (lines: DemandLine[]) => {
      try {
        buildHourlyDemand(lines, idx);
        return null;
      } catch (e) {
        expect(e).toBeInstanceOf(InvalidInputError);
        return (e as InvalidInputError).details[0].path;
      }
    };
    expect(pathOf([{ flow_L_min: -1 }])).toBe('demand.0.flow_L_min');
    expect(pathOf([{ flow_L_min: 1 }, { flow_L_min: 1, hours: [3, 24] }])).toBe('demand.1.hours.1');
    expect(pathOf([{ flow_L_min: 1, weekdays: [0] }])).toBe('demand.0.weekdays.0');
  });
});

describe('applyScenarios', () => {
  const idx = buildHourIndex('Europe/London', '2027-01-04T00:00', 4);
  const base: DemandLine[] = [{ flow_L_min: 100 }, { flow_L_min: 50, hours: [8, 9, 10, 11] }];

  it('scales every line by a surge multiplier from a date, without touching the baseline', () => {
    const snapshot = structuredClone(base);
    const lines = applyScenarios(base, [{ name: 'winter surge', from: '2027-01-06T00:00', multiplier: 1.5 }]);
    expect(base).toEqual(snapshot);
    const d = buildHourlyDemand(lines, idx);
    const plain = buildHourlyDemand(base, idx);
    // Days 1–2 unchanged: (100 × 24 + 50 × 4) × 60 = 156,000 L/day; days 3–4 × 1.5 = 234,000 L/day.
    expect(sum(d, 0, 48)).toBeCloseTo(2 * 156_000, 6);
    expect(sum(d, 48, 96)).toBeCloseTo(2 * 234_000, 6);
    expect(sum(plain)).toBeCloseTo(4 * 156_000, 6);
  });

  it('adds extra high-flow beds at 40 L/min from a date, inside an end date', () => {
    // 10 extra HFNO beds × 40 L/min (device default) from day 2 00:00 until day 3 12:00: 36 h × 24,000 L/h.
    const hfno = DEVICE_DEFAULTS.hfno.flowLMin;
    expect(hfno).toBe(40);
    const lines = applyScenarios(base, [{ from: '2027-01-05T00:00', until: '2027-01-06T12:00', extra_lines: [{ flow_L_min: 10 * hfno }] }]);
    const extra = sum(buildHourlyDemand(lines, idx)) - sum(buildHourlyDemand(base, idx));
    expect(extra).toBeCloseTo(36 * 10 * 40 * 60, 6);
    expect(lines).toHaveLength(3);
  });

  it('applies scenarios in order: a later multiplier also scales earlier extra lines', () => {
    const lines = applyScenarios([{ flow_L_min: 10 }], [{ extra_lines: [{ flow_L_min: 20 }] }, { multiplier: 2 }]);
    // (10 + 20) × 2 = 60 L/min all along: 60 × 60 × 96 h
    expect(sum(buildHourlyDemand(lines, idx))).toBeCloseTo(60 * 60 * 96, 6);
  });

  it('rejects a negative multiplier', () => {
    expect(() => applyScenarios(base, [{ multiplier: -1 }])).toThrow(InvalidInputError);
  });
});
