import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { buildHourIndex } from './hour-index';
import {
  estimateHoursToEmptyBands,
  fillLognormalDayMultipliers,
  fillPersistentDayMultipliers,
  fitDailyPersistence,
  mulberry32,
  percentileOfSorted,
} from './monte-carlo';
import { projectDepletion, type DepletionModel } from './project-depletion';

describe('mulberry32', () => {
  it('is reproducible and uniform on [0, 1): mean 1/2 and variance 1/12 (uniform distribution)', () => {
    const a = mulberry32(42);
    const b = mulberry32(42);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    let same = true;
    for (let i = 0; i < n; i++) {
      const u = a();
      same &&= u === b() && u >= 0 && u < 1;
      s += u;
      s2 += u * u;
    }
    expect(same).toBe(true);
    const mean = s / n;
    // Standard error of the mean: sqrt(1/12 / n) = 0.00065; allow 5 standard errors.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.0033);
    expect(Math.abs(s2 / n - mean * mean - 1 / 12)).toBeLessThan(0.002);
    expect(mulberry32(1)()).not.toBe(mulberry32(2)());
  });
});

describe('fillLognormalDayMultipliers', () => {
  it('has mean 1 and the requested coefficient of variation (lognormal moments)', () => {
    // For m = exp(μ + σz), σ² = ln(1 + cv²), μ = −σ²/2: E[m] = 1 and SD[m] = cv (lognormal moments).
    const out = new Float64Array(400_000);
    fillLognormalDayMultipliers(mulberry32(7), 0.3, out);
    const mean = out.reduce((s, v) => s + v, 0) / out.length;
    const sd = Math.sqrt(out.reduce((s, v) => s + (v - mean) ** 2, 0) / (out.length - 1));
    // Standard error of the mean ≈ 0.3 / sqrt(400,000) = 0.00047.
    expect(Math.abs(mean - 1)).toBeLessThan(0.003);
    expect(Math.abs(sd - 0.3)).toBeLessThan(0.006);
    expect(out.every((v) => v > 0)).toBe(true);
    fillLognormalDayMultipliers(mulberry32(7), 0, out);
    expect(out.every((v) => v === 1)).toBe(true);
  });
});

describe('percentileOfSorted', () => {
  it('interpolates like PERCENTILE.INC (Hyndman & Fan definition 7)', () => {
    // PERCENTILE.INC({1,2,3,4}, 0.1) = 1.3; 0.5 → 2.5; 0.9 → 3.7 (h = (n − 1)p).
    expect(percentileOfSorted([1, 2, 3, 4], 0.1)).toBeCloseTo(1.3, 12);
    expect(percentileOfSorted([1, 2, 3, 4], 0.5)).toBeCloseTo(2.5, 12);
    expect(percentileOfSorted([1, 2, 3, 4], 0.9)).toBeCloseTo(3.7, 12);
    expect(percentileOfSorted([1, 2, 3, Infinity], 0.9)).toBeNull();
    expect(percentileOfSorted([1, 2, 3, Infinity], 0.5)).toBeCloseTo(2.5, 12);
  });
});

describe('estimateHoursToEmptyBands', () => {
  const idx = buildHourIndex('Europe/London', '2027-01-04T00:00', 30);
  const demand = new Float64Array(idx.hours).fill(10);
  const m: DepletionModel = { contentsStart: 2400, capacity: 5000, evaporationPerHour: 0, demandPerHour: demand };

  it('gives the same bands for the same seed and ordered percentiles', () => {
    const a = estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 300, demandCv: 0.2, seed: 11 });
    const b = estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 300, demandCv: 0.2, seed: 11 });
    const c = estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 300, demandCv: 0.2, seed: 12 });
    expect(a).toEqual(b);
    expect(c.p50).not.toBe(a.p50);
    expect(a.p10!).toBeLessThanOrEqual(a.p50!);
    expect(a.p50!).toBeLessThanOrEqual(a.p90!);
    // 2,400 at 10/h empties in 240 h on average demand; with day-to-day noise the median stays near it
    // (10 days of independent multipliers, CV 0.2: SD of the mean ≈ 0.2/√10 ≈ 6 % → ±15 h).
    expect(Math.abs(a.p50! - 240)).toBeLessThan(20);
    expect(a.p90! - a.p10!).toBeGreaterThan(5);
  });

  it('collapses to the deterministic time to empty when the CV is 0', () => {
    const det = projectDepletion(m).hoursToEmpty;
    const bands = estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 20, demandCv: 0, seed: 3 });
    expect(det).toBe(240);
    expect(bands.p10).toBe(det);
    expect(bands.p50).toBe(det);
    expect(bands.p90).toBe(det);
  });

  it('reports null for percentiles beyond the horizon', () => {
    // 5,000 units at 1 per hour would last 5,000 h, far beyond the 720 h horizon in every draw.
    const slow: DepletionModel = { ...m, contentsStart: 5000, demandPerHour: new Float64Array(idx.hours).fill(1) };
    const bands = estimateHoursToEmptyBands(slow, idx.dayOfRun, idx.days, { draws: 50, demandCv: 0.2, seed: 1 });
    expect(bands).toMatchObject({ p10: null, p50: null, p90: null, drawsOutlastingHorizon: 50 });
  });

  it('rejects more than 10,000 draws', () => {
    expect(() => estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 10_001, demandCv: 0.2, seed: 1 })).toThrow(InvalidInputError);
  });
});

describe('day-to-day persistence (AR(1) day factors)', () => {
  const lag1 = (v: Float64Array | number[]) => {
    const x = Array.from(v, Math.log);
    const mean = x.reduce((a, b) => a + b, 0) / x.length;
    let c0 = 0;
    let c1 = 0;
    for (let i = 0; i < x.length; i++) {
      c0 += (x[i] - mean) ** 2;
      if (i > 0) c1 += (x[i] - mean) * (x[i - 1] - mean);
    }
    return c1 / c0;
  };

  it('keeps the lognormal marginal (mean 1, CV as asked) and gives lag-1 correlation φ of the logs (Box & Jenkins AR(1))', () => {
    const out = new Float64Array(200_000);
    fillPersistentDayMultipliers(mulberry32(5), 0.2, 0.7, out);
    const mean = out.reduce((a, b) => a + b, 0) / out.length;
    const sd = Math.sqrt(out.reduce((a, b) => a + (b - mean) ** 2, 0) / out.length);
    expect(mean).toBeCloseTo(1, 2);
    expect(sd / mean).toBeCloseTo(0.2, 2);
    expect(lag1(out)).toBeCloseTo(0.7, 2);
    const flat = new Float64Array(10);
    fillPersistentDayMultipliers(mulberry32(5), 0, 0.7, flat);
    expect([...flat]).toEqual(new Array(10).fill(1));
  });

  it('fits φ back from a series made with a known φ (Yule–Walker), and refuses to fit fewer than 14 days', () => {
    for (const phi of [0, 0.4, 0.8]) {
      const series = new Float64Array(5000);
      fillPersistentDayMultipliers(mulberry32(99), 0.25, phi, series);
      // sampling error of the lag-1 estimate ≈ √((1 − φ²)/n) ≤ 0.015 here (Bartlett's formula)
      expect(Math.abs(fitDailyPersistence([...series].map((m) => 900 * m))! - phi)).toBeLessThan(0.05);
    }
    expect(fitDailyPersistence(new Array(13).fill(5))).toBeNull();
    expect(fitDailyPersistence(new Array(20).fill(5))).toBe(0);
  });

  it('widens the band as the variance of an AR(1) mean says: 10 days, CV 0.2, φ 0.7 → about twice the independent spread', () => {
    // Hand calculation: the mean of n = 10 AR(1) log-factors has SD σ·√S/n, S = n + 2·Σ_{k=1}^{n−1}(n−k)φᵏ;
    // σ = √ln(1.04) = 0.198; φ = 0 → 0.0626, φ = 0.7 → S = 41.55, 0.128 (2.04 × wider).
    const idx = buildHourIndex('Europe/London', '2027-01-04T00:00', 30);
    const m: DepletionModel = { contentsStart: 2400, capacity: 5000, evaporationPerHour: 0, demandPerHour: new Float64Array(idx.hours).fill(10) };
    const independent = estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 4000, demandCv: 0.2, seed: 7 });
    const persistent = estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 4000, demandCv: 0.2, seed: 7, persistence: 0.7 });
    const width = (b: typeof independent) => (b.p90! - b.p10!) / b.p50!;
    const ratio = width(persistent) / width(independent);
    expect(ratio).toBeGreaterThan(1.7);
    expect(ratio).toBeLessThan(2.4);
    expect(() => estimateHoursToEmptyBands(m, idx.dayOfRun, idx.days, { draws: 10, demandCv: 0.2, seed: 7, persistence: 0.99 })).toThrow(InvalidInputError);
  });
});
