import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import {
  applyAverageDayRule,
  applyFourHourRule,
  computeDailyDemandL,
  computeDurationH,
  computeVaporiserCapacityLMin,
  sizeCylinderManifold,
} from './supply-capacity';

describe('WE-3 manifold sizing (HTM 02-01 method as applied in a published hospital calculation)', () => {
  // WE-3: 201 L/min × 60 × 10 h = 120,600 L/day; ÷ 6,800 L (47 L · 137 bar O2, HTM 02-01 Part A Table 22)
  // = 17.7 cylinders → 2 × 10 manifold; secondary at 4 h: 48,240 L → 8 cylinders.
  const m = sizeCylinderManifold({ flowLMin: 201, hoursPerDay: 10, cylinderFreeGasL: 6800 });

  it('daily demand 120,600 L and 17.7 cylinders a day', () => {
    expect(m.dailyDemandL).toBe(120600);
    expect(m.cylindersPerDay).toBeCloseTo(17.7, 1);
  });

  it('chooses a 2 × 10 manifold', () => {
    expect(m.cylindersNeeded).toBe(18);
    expect(m.cylindersPerBankNeeded).toBe(9);
    expect(m.label).toBe('2 × 10');
  });

  it('bank duration, changeover interval and cylinders per week follow from the bank', () => {
    // one bank: 10 × 6,800 = 68,000 L; at 201 L/min: 68,000 / 201 / 60 = 5.64 h; 68,000 / 120,600 = 0.564 days
    expect(m.bankFreeGasL).toBe(68000);
    expect(m.bankDurationAtFlowH).toBeCloseTo(5.6385, 4);
    expect(m.changeoverIntervalDays).toBeCloseTo(0.5638, 4);
    // 7 × 17.735 = 124.1 cylinders a week
    expect(m.cylindersPerWeek).toBeCloseTo(124.15, 2);
  });

  it('secondary supply at 4 h: 48,240 L, 8 cylinders', () => {
    const s = applyFourHourRule(201, { cylinderFreeGasL: 6800 });
    expect(s.requiredFreeGasL).toBe(48240);
    expect(s.cylindersRequired).toBe(8);
    expect(s.source).toMatch(/HTM 02-01/);
  });

  it('an offered-size list without a big enough bank is refused', () => {
    expect(() => sizeCylinderManifold({ flowLMin: 201, hoursPerDay: 10, cylinderFreeGasL: 6800, bankSizes: [2, 4, 6] })).toThrow(/bulk liquid/);
  });
});

describe('reserve rules', () => {
  it('4-hour rule: a 6 × 6,800 L reserve covers 201 L/min for 3.38 h and fails', () => {
    // 40,800 / 201 / 60 = 3.383 h < 4 h (HTM 02-01 secondary supply ≥ 4 h)
    const r = applyFourHourRule(201, { heldFreeGasL: 40800 });
    expect(r.covers).toBeCloseTo(3.383, 3);
    expect(r.meets).toBe(false);
  });

  it('average-day rule: 100,000 L against 120,600 L/day covers 0.83 days and fails', () => {
    // NFPA 99 (2002) §5.1.3.4.13: in-building emergency reserve ≥ one average day
    const r = applyAverageDayRule(120600, { heldFreeGasL: 100000, cylinderFreeGasL: 6800 });
    expect(r.covers).toBeCloseTo(0.8292, 4);
    expect(r.meets).toBe(false);
    expect(r.cylindersRequired).toBe(18);
    expect(r.source).toMatch(/NFPA 99/);
  });
});

describe('vaporiser and duration arithmetic', () => {
  it('derated vaporiser: 60 m³/h × 0.7 = 700 L/min', () => {
    // 60 × 0.7 × 1000 / 60; derating 30 % for an alternating pair in continuous duty (practitioners' forum, 2020)
    expect(computeVaporiserCapacityLMin(60)).toBeCloseTo(700, 9);
    expect(computeVaporiserCapacityLMin(60, 0.5)).toBeCloseTo(500, 9);
  });

  it('WE-5: the 600 L/min surge is 36 m³/h, beyond a 50 m³/h vaporiser derated to 35 m³/h', () => {
    // WE-5: 30 × 10 + 10 × 30 = 600 L/min = 36 m³/h (WHO flows)
    expect(computeDailyDemandL(600, 24) / 1000).toBeCloseTo(864, 9); // 864 m³/day (WE-5)
    expect(computeVaporiserCapacityLMin(50)).toBeLessThan(600);
  });

  it('duration = volume ÷ flow', () => {
    // 6,800 L at 10 L/min: 680 min = 11.33 h
    expect(computeDurationH(6800, 10)).toBeCloseTo(11.3333, 4);
  });

  it('refuses nonsense', () => {
    expect(() => computeDurationH(6800, 0)).toThrow(InvalidInputError);
    expect(() => computeDailyDemandL(100, 25)).toThrow(InvalidInputError);
    expect(() => computeVaporiserCapacityLMin(60, 1.5)).toThrow(InvalidInputError);
    expect(() => sizeCylinderManifold({ flowLMin: 201, hoursPerDay: 10, cylinderFreeGasL: 0 })).toThrow(InvalidInputError);
  });
});
