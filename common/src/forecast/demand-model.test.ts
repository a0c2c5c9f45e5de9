import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { buildDemandLinesFromTherapy, DEVICE_DEFAULTS, meanDailyDemandL, oxygenShareOfBlendLMin, WHO_PLANNING_FLOW_L_MIN } from './demand-model';

describe('device defaults', () => {
  it('sit inside the clinical ranges they cite', () => {
    // Ranges: clinical device summaries (cannula 1–4, max ~6; simple mask 5–10; non-rebreather 10–15;
    // Venturi 35 % 8–12), HFNC ≤ 60 total (PMC5359952), CPAP cap 30 (Health Estate Journal, Jun 2021).
    expect(DEVICE_DEFAULTS.nasal_cannula.flowLMin).toBe(2);
    expect(DEVICE_DEFAULTS.simple_mask.flowLMin).toBeGreaterThanOrEqual(5);
    expect(DEVICE_DEFAULTS.non_rebreather.flowLMin).toBe(15);
    expect(DEVICE_DEFAULTS.venturi_35.flowLMin).toBe(8);
    expect(DEVICE_DEFAULTS.hfno.flowLMin).toBeLessThanOrEqual(60);
    expect(DEVICE_DEFAULTS.cpap.flowLMin).toBe(30);
    for (const d of Object.values(DEVICE_DEFAULTS)) {
      expect(d.flowLMin).toBeGreaterThanOrEqual(d.rangeLMin[0]);
      expect(d.flowLMin).toBeLessThanOrEqual(d.rangeLMin[1]);
    }
  });
});

describe('oxygenShareOfBlendLMin', () => {
  it('follows the air/oxygen mole balance', () => {
    // FiO2 1.0 → all oxygen; FiO2 = air → none; 60 L/min at FiO2 0.6 → 60 × (0.6 − 0.2096)/(1 − 0.2096) = 29.64 L/min.
    expect(oxygenShareOfBlendLMin(60, 1)).toBeCloseTo(60, 10);
    expect(oxygenShareOfBlendLMin(60, 0.2096)).toBeCloseTo(0, 10);
    expect(oxygenShareOfBlendLMin(60, 0.6)).toBeCloseTo(29.636, 3);
    expect(() => oxygenShareOfBlendLMin(60, 1.2)).toThrow(InvalidInputError);
  });
});

describe('buildDemandLinesFromTherapy', () => {
  it('reproduces WE-5: 30 severe + 10 critical patients at WHO flows = 600 L/min = 864 m³/day ≈ 1,026 L LOX', () => {
    // worked example WE-5 (WHO interim guidance 2020: severe 10 L/min, critical 30 L/min): 30 × 10 + 10 × 30 = 600 L/min; × 1,440 min = 864,000 L/day;
    // ÷ 842 L gas per L of boiling-point LOX at 15 °C = 1,026 L LOX/day.
    const lines = buildDemandLinesFromTherapy([
      { device: 'custom', patients: 30, flow_L_min: WHO_PLANNING_FLOW_L_MIN.severe },
      { device: 'custom', patients: 10, flow_L_min: WHO_PLANNING_FLOW_L_MIN.critical },
    ]);
    const total = lines.reduce((s, l) => s + l.flow_L_min, 0);
    expect(total).toBe(600);
    expect(meanDailyDemandL(lines)).toBe(864_000);
    expect(Math.round(meanDailyDemandL(lines) / 842)).toBe(1026);
  });

  it('reproduces WE-3: 201 L/min over 10 hours a day = 120,600 L/day, with a leakage allowance on top', () => {
    // WE-3 (HTM 02-01 method as quoted): 201 L/min × 60 × 10 h = 120,600 L/day.
    const hours = [8, 9, 10, 11, 12, 13, 14, 15, 16, 17];
    const lines = buildDemandLinesFromTherapy([{ device: 'custom', patients: 1, flow_L_min: 201, hours }]);
    expect(meanDailyDemandL(lines)).toBe(120_600);
    const leaky = buildDemandLinesFromTherapy([{ device: 'custom', patients: 1, flow_L_min: 201, hours }], { leakagePercent: 5 });
    expect(meanDailyDemandL(leaky)).toBeCloseTo(120_600 * 1.05, 6);
  });

  it('uses device defaults and weekday schedules: 12 cannula patients on weekdays = 2 × 12 × 60 × 24 × 5/7 L/day', () => {
    const lines = buildDemandLinesFromTherapy([{ device: 'nasal_cannula', patients: 12, weekdays: [1, 2, 3, 4, 5] }]);
    expect(lines[0].flow_L_min).toBe(24);
    expect(meanDailyDemandL(lines)).toBeCloseTo((24 * 60 * 24 * 5) / 7, 6);
  });

  it('rejects a custom line without flow and negative patients', () => {
    expect(() => buildDemandLinesFromTherapy([{ device: 'custom', patients: 1 }])).toThrow(InvalidInputError);
    expect(() => buildDemandLinesFromTherapy([{ device: 'cpap', patients: -1 }])).toThrow(InvalidInputError);
  });
});
