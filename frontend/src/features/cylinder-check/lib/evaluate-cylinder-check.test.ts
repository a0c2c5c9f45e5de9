import { describe, expect, it } from 'vitest';
import { evaluateCylinderCheck, readNumber, temperatureCautions, type CheckValues } from './evaluate-cylinder-check';

const metric = { unitSystem: 'metric', referenceCode: '15C', atmosphericBar: 1.01325, storeTemperatureC: 15 };
const us = { unitSystem: 'us', referenceCode: '21C', atmosphericBar: 1.01325, storeTemperatureC: 21 };

function values(patch: Partial<CheckValues>): CheckValues {
  return { gasCode: 'O2', waterCapacityL: '10', gauge: '', temperature: '15', flowLMin: '2', reserve: '0', gross: '', tare: '', ...patch };
}

function ok(outcome: ReturnType<typeof evaluateCylinderCheck>) {
  if (!outcome.ok) throw new Error(`expected a result, got ${JSON.stringify(outcome)}`);
  return outcome.result;
}

describe('evaluateCylinderCheck, compressed oxygen', () => {
  it('matches the reference equation of state for 10 L at 200 bar abs and 15 °C', () => {
    // reference EOS for O2 (Schmidt & Wagner 1985), reference table in tests/reference: ρ(288.15 K, 200 bar) = 286.878288 kg/m³,
    // ρ(288.15 K, 1.01325 bar) = 1.354364 kg/m³ → free gas = 10 L × (286.878288 − 1.354364) / 1.354364 = 2108.18 L
    const r = ok(evaluateCylinderCheck(values({ gauge: String(200 - 1.01325) }), metric));
    if (r.kind !== 'compressed') throw new Error('expected compressed');
    expect(r.contents.freeGasL).toBeCloseTo(2108.18, -1);
    expect(Math.abs(r.contents.freeGasL - 2108.18) / 2108.18).toBeLessThan(0.005);
    // pV = nRT by hand: 10 L × (200 − 1.01325) bar / 1.01325 bar at equal temperatures = 1963.86 L
    expect(r.contents.idealFreeGasL).toBeCloseTo(1963.86, 1);
  });

  it('gives the duration as usable free gas over the flow, close to the ideal figure at low pressure', () => {
    // pV = nRT by hand: 10 L × (10 − 2) bar / 1.01325 bar = 78.95 L above a 2 bar reserve; at 2 L/min ≈ 39.5 min.
    // Z(O2, 15 °C) is 0.99–1.00 below 11 bar (reference table in tests/reference), so the real figure is within 1 %.
    const r = ok(evaluateCylinderCheck(values({ gauge: '10', reserve: '2' }), metric));
    expect(Math.abs(r.minutes - 39.48) / 39.48).toBeLessThan(0.01);
  });

  it('draws about 30 chart points from 0 to the fill, with the ideal curve by pV = nRT', () => {
    const r = ok(evaluateCylinderCheck(values({ gauge: '150' }), metric));
    if (r.kind !== 'compressed') throw new Error('expected compressed');
    expect(r.chart.length).toBe(30);
    expect(r.chart[0]).toMatchObject({ pressure: 0, realL: 0, idealL: 0 });
    const last = r.chart[r.chart.length - 1];
    expect(last.pressure).toBeCloseTo(200, 6);
    // pV = nRT by hand: 10 L × 200 bar / 1.01325 bar = 1973.85 L
    expect(last.idealL).toBeCloseTo(1973.85, 1);
    expect(r.chart.every((p) => Number.isFinite(p.realL) && Number.isFinite(p.idealL))).toBe(true);
  });

  it('says a cold cylinder reads low: the equivalent pressure at 15 °C is above the reading at 0 °C', () => {
    const r = ok(evaluateCylinderCheck(values({ gauge: '180', temperature: '0' }), metric));
    if (r.kind !== 'compressed') throw new Error('expected compressed');
    // Gay-Lussac at constant volume, ideal: 181 bar abs × 288.15/273.15 ≈ 191 bar abs; real gas a little more
    expect(r.equivalentGauge).toBeGreaterThan(188);
    expect(r.equivalentGauge).toBeLessThan(200);
  });
});

describe('evaluateCylinderCheck, US units', () => {
  it('reads psi and °F and states volumes at 70 °F', () => {
    // 1 psi = 6894.757293168 Pa (definition) → 2000 psi = 137.895 bar; 59 °F = 15 °C (definition)
    const r = ok(evaluateCylinderCheck(values({ gauge: '2000', temperature: '59' }), us));
    if (r.kind !== 'compressed') throw new Error('expected compressed');
    expect(r.contents.gaugeBar).toBeCloseTo(137.895, 3);
    expect(r.temperatureC).toBeCloseTo(15, 9);
    expect(r.contents.reference).toBe('21C');
  });
});

describe('evaluateCylinderCheck, liquefied gases', () => {
  it('counts nitrous oxide by weight, whatever the gauge says', () => {
    const r = ok(evaluateCylinderCheck(values({ gasCode: 'N2O', gross: '21.5', tare: '14' }), metric));
    expect(r.kind).toBe('liquefied');
    if (r.kind !== 'liquefied') return;
    expect(r.contents.massKg).toBeCloseTo(7.5, 9);
    expect(r.contents.liquidPresent).toBe(true);
    // ideal-gas order of magnitude: 7.5 kg / 0.044 kg/mol × 23.64 L/mol (RT/p at 15 °C) ≈ 4029 L; real N2O a little less
    expect(r.contents.freeGasL).toBeGreaterThan(3800);
    expect(r.contents.freeGasL).toBeLessThan(4100);
  });

  it('converts pounds with the international pound (0.45359237 kg, exact)', () => {
    const r = ok(evaluateCylinderCheck(values({ gasCode: 'CO2', gross: '40', tare: '30', temperature: '59' }), us));
    if (r.kind !== 'liquefied') throw new Error('expected liquefied');
    expect(r.contents.massKg).toBeCloseTo(10 * 0.45359237, 9);
  });

  it('refuses a gross weight below the tare', () => {
    const out = evaluateCylinderCheck(values({ gasCode: 'N2O', gross: '12', tare: '14' }), metric);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors.gross).toMatch(/less than the tare/);
  });
});

describe('evaluateCylinderCheck, bad input never yields NaN', () => {
  it('names the field that is not a number', () => {
    const out = evaluateCylinderCheck(values({ gauge: '1a7' }), metric);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors.gauge).toMatch(/must be a number/);
  });

  it('lists empty fields as missing rather than wrong', () => {
    const out = evaluateCylinderCheck(values({ gauge: '', flowLMin: '' }), metric);
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.missing).toEqual(['flowLMin', 'gauge']);
      expect(out.errors).toEqual({});
    }
  });

  it('refuses a reserve at or above the reading, and a zero flow', () => {
    const out = evaluateCylinderCheck(values({ gauge: '50', reserve: '60', flowLMin: '0' }), metric);
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.errors.reserve).toBeDefined();
      expect(out.errors.flowLMin).toBeDefined();
    }
  });

  it('reads a decimal comma', () => {
    expect(readNumber('2,5')).toBe(2.5);
    expect(readNumber('1,234.5')).toBe(1234.5);
    expect(readNumber(' ')).toBeNull();
    expect(Number.isNaN(readNumber('two'))).toBe(true);
  });
});

describe('temperatureCautions', () => {
  it('warns of separation of 50:50 nitrous oxide/oxygen below about −6 °C', () => {
    // common practice: premixed 50:50 N2O/O2 separates below about −6 °C (Poynting effect)
    expect(temperatureCautions('N2O_O2_50', '-8', metric).join(' ')).toMatch(/condense|separat/i);
    expect(temperatureCautions('N2O_O2_50', '20', metric)).toEqual([]);
    expect(temperatureCautions('O2', '-20', metric)).toEqual([]);
  });
});

describe('evaluateCylinderCheck, mixtures', () => {
  it('shows the minutes of a 50:50 N2O/O2 cylinder with a range from a second method; none for oxygen', () => {
    // second method: Peng & Robinson (1976) with its pure-component error taken out (see mixture-uncertainty.ts)
    const r = ok(evaluateCylinderCheck(values({ gasCode: 'N2O_O2_50', gauge: '137', reserve: '0' }), metric));
    if (r.kind !== 'compressed' || !r.minutesRange) throw new Error('expected a compressed result with a range');
    expect(r.minutesRange.low).toBeLessThanOrEqual(r.minutes);
    expect(r.minutesRange.high).toBeGreaterThanOrEqual(r.minutes);
    expect(r.minutesRange.high).toBeGreaterThan(r.minutesRange.low);
    const o2 = ok(evaluateCylinderCheck(values({ gauge: '137' }), metric));
    expect(o2.kind === 'compressed' && o2.minutesRange).toBe(null);
  });
});
