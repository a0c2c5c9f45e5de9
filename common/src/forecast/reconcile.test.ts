import { describe, expect, it } from 'vitest';
import { mulberry32 } from './monte-carlo';
import {
  coefficientOfVariation,
  consumptionBetweenReadings,
  dailyRates,
  demandCvFromDays,
  detectRefills,
  hourlyRates,
  isoWeekOf,
  meterConsumption,
  meterCurve,
  orderedSeries,
  refillThreshold,
  stepNoise,
  suggestCorrectionFactor,
  usedBetween,
  weeklyTotals,
  type ContentsPoint,
} from './reconcile';

const H = 3_600_000;
const T0 = Date.UTC(2027, 0, 4, 0, 0); // Monday 4 January 2027, 00:00 UTC

/**
 * A synthetic tank: use at a known rate that varies by day and by hour, deliveries at known instants
 * in the middle of reading intervals, readings every `stepMs` with uniform noise of ±noise kg. The true
 * use between the first and last reading is the integral of the rate (exact by construction).
 */
function syntheticTank(opts: {
  days: number;
  stepMs: number;
  noise: number;
  deliveries: { atMs: number; kg: number; durationMs?: number }[];
  startKg: number;
  seed: number;
}) {
  const rnd = mulberry32(opts.seed);
  const rateKgPerH = (t: number) => {
    const day = Math.floor((t - T0) / (24 * H));
    const hour = new Date(t).getUTCHours();
    return 16 * (1 + 0.15 * Math.sin(day * 1.3)) * (hour >= 8 && hour < 20 ? 1.2 : 0.8);
  };
  const points: ContentsPoint[] = [];
  let kg = opts.startKg;
  let trueUse = 0;
  const dt = 60_000; // integrate in 1-minute steps
  const end = T0 + opts.days * 24 * H;
  for (let t = T0; t <= end; t += dt) {
    if ((t - T0) % opts.stepMs === 0) points.push({ atMs: t, contents: kg + (rnd() * 2 - 1) * opts.noise });
    const use = (rateKgPerH(t) * dt) / H;
    kg -= use;
    if (t + dt <= end) trueUse += use;
    for (const d of opts.deliveries) {
      const dur = d.durationMs ?? dt;
      if (t >= d.atMs && t < d.atMs + dur) kg += (d.kg * dt) / dur;
    }
  }
  return { points, trueUse };
}

describe('detectRefills and consumptionBetweenReadings', () => {
  it('recovers a known consumption within 1 % across two refills on hourly readings with sensor noise', () => {
    // Exact by construction: 30 days of use at 12.8–19.2 kg/h ±15 % by day, two tanker drops mid-interval.
    const deliveries = [
      { atMs: T0 + (9 * 24 + 10.5) * H, kg: 5000 },
      { atMs: T0 + (21 * 24 + 14.33) * H, kg: 4500 },
    ];
    const { points, trueUse } = syntheticTank({ days: 30, stepMs: H, noise: 4, deliveries, startKg: 8000, seed: 7 });
    const refills = detectRefills(points, { minRise: 200 });
    expect(refills).toHaveLength(2);
    expect(refills[0].fromMs).toBe(T0 + (9 * 24 + 10) * H);
    expect(refills[1].fromMs).toBe(T0 + (21 * 24 + 14) * H);
    // The delivered amount is rise + use during the hour: within 1 % of what was put in.
    expect(Math.abs(refills[0].delivered - 5000) / 5000).toBeLessThan(0.01);
    expect(Math.abs(refills[1].delivered - 4500) / 4500).toBeLessThan(0.01);
    const c = consumptionBetweenReadings(points, refills);
    expect(Math.abs(c.used - trueUse) / trueUse).toBeLessThan(0.01);
    expect(c.segments).toHaveLength(3);
    expect(c.spanHours).toBe(30 * 24);
    // The mass balance closes: first − last + delivered = used (same arithmetic, different route).
    const balance = points[0].contents - points[points.length - 1].contents + refills[0].delivered + refills[1].delivered;
    expect(c.used).toBeCloseTo(balance, 6);
  });

  it('counts a tanker fill seen over 40 minutes of 1-minute telemetry as one refill', () => {
    const deliveries = [{ atMs: T0 + 30 * H, kg: 6000, durationMs: 40 * 60_000 }];
    const { points, trueUse } = syntheticTank({ days: 3, stepMs: 60_000, noise: 1.5, deliveries, startKg: 3000, seed: 11 });
    const refills = detectRefills(points, { minRise: 200 });
    expect(refills).toHaveLength(1);
    expect(refills[0].toMs - refills[0].fromMs).toBeGreaterThanOrEqual(39 * 60_000);
    const c = consumptionBetweenReadings(points, refills);
    expect(Math.abs(c.used - trueUse) / trueUse).toBeLessThan(0.01);
  });

  it('does not mistake noise for deliveries, and noise does not inflate use (signed differences)', () => {
    const { points, trueUse } = syntheticTank({ days: 7, stepMs: H, noise: 8, deliveries: [], startKg: 9000, seed: 3 });
    expect(detectRefills(points, { minRise: 100 })).toHaveLength(0);
    const c = consumptionBetweenReadings(points, []);
    // Signed: error is at most the noise at the two ends (±8 kg each) on ~2,700 kg.
    expect(Math.abs(c.used - trueUse)).toBeLessThan(16.01);
    // A sum of falls only would count every downward wobble: noticeably more.
    let falls = 0;
    for (let i = 1; i < points.length; i++) falls += Math.max(0, points[i - 1].contents - points[i].contents);
    expect(falls).toBeGreaterThan(c.used);
  });

  it('estimates step noise near the true spread (MAD of a uniform ±a difference, Rousseeuw & Croux 1993)', () => {
    // Difference of two uniform(−a, a) is triangular on (−2a, 2a); its MAD is 2a(1 − 1/√2) ≈ 0.586a,
    // so 1.4826 × MAD ≈ 0.868a (derived from the triangular distribution).
    const { points } = syntheticTank({ days: 20, stepMs: H, noise: 10, deliveries: [], startKg: 9500, seed: 5 });
    expect(stepNoise(points)).toBeGreaterThan(0.868 * 10 * 0.85);
    expect(stepNoise(points)).toBeLessThan(0.868 * 10 * 1.25);
  });

  it('refuses readings out of time order', () => {
    expect(() =>
      detectRefills(
        [
          { atMs: 2, contents: 1 },
          { atMs: 1, contents: 1 },
        ],
        { minRise: 1 },
      ),
    ).toThrow(/time order/);
  });
});

describe('hourlyRates and dailyRates', () => {
  const constant = (fromMs: number, hours: number, kgPerH: number): ContentsPoint[] =>
    Array.from({ length: hours + 1 }, (_, i) => ({ atMs: fromMs + i * H, contents: 5000 - i * kgPerH }));

  it('gives the constant rate for every whole hour and day', () => {
    const pts = constant(T0 + 30 * 60_000, 72, 10);
    const c = consumptionBetweenReadings(pts, []);
    const hours = hourlyRates(c.curve);
    expect(hours).toHaveLength(71);
    for (const h of hours) expect(h.used).toBeCloseTo(10, 9);
    const days = dailyRates(c.curve, 'UTC');
    expect(days.map((d) => d.date)).toEqual(['2027-01-05', '2027-01-06']);
    for (const d of days) expect(d.used).toBeCloseTo(240, 9);
    expect(usedBetween(c.curve, T0 + H, T0 + 2.5 * H)).toBeCloseTo(15, 9);
  });

  it('reads days in the site time zone: the spring-forward day in London has 23 hours', () => {
    // UK clocks go forward on the last Sunday of March: 28 March 2027 01:00 GMT (IANA tz database).
    const from = Date.UTC(2027, 2, 26, 0, 0);
    const pts = constant(from, 24 * 5, 10);
    const days = dailyRates(consumptionBetweenReadings(pts, []).curve, 'Europe/London');
    const spring = days.find((d) => d.date === '2027-03-28')!;
    expect(spring.hours).toBe(23);
    expect(spring.used).toBeCloseTo(230, 9);
    expect(spring.perDay).toBeCloseTo(240, 9);
    const after = days.find((d) => d.date === '2027-03-29')!;
    expect(after.hours).toBe(24);
  });
});

describe('coefficientOfVariation, demandCvFromDays, weeks and the correction factor', () => {
  it('matches the textbook example 2,4,4,4,5,5,7,9 (mean 5, sample s = √(32/7))', () => {
    // Classic worked example of the standard deviation (population σ = 2; sample s = 2.138).
    expect(coefficientOfVariation([2, 4, 4, 4, 5, 5, 7, 9])).toBeCloseTo(Math.sqrt(32 / 7) / 5, 12);
    expect(coefficientOfVariation([3])).toBeNull();
    expect(coefficientOfVariation([0, 0])).toBeNull();
  });

  it('feeds the Monte Carlo only with enough whole days, clamped to 0.02–1', () => {
    const days = (vals: number[]) => vals.map((v, i) => ({ date: `2027-01-${String(i + 1).padStart(2, '0')}`, used: v, hours: 24, perDay: v }));
    expect(demandCvFromDays(days([100, 110, 90]))).toEqual({ cv: 0.2, measured: false, days: 3 });
    const week = demandCvFromDays(days([100, 110, 90, 105, 95, 100, 100]));
    expect(week.measured).toBe(true);
    expect(week.cv).toBeCloseTo(coefficientOfVariation([100, 110, 90, 105, 95, 100, 100])!, 12);
    expect(demandCvFromDays(days([100, 100, 100, 100, 100, 100, 100])).cv).toBe(0.02);
  });

  it('numbers ISO weeks (ISO 8601: the week with the year’s first Thursday is week 1)', () => {
    expect(isoWeekOf('2008-12-29')).toBe('2009-W01'); // ISO 8601 worked example
    expect(isoWeekOf('2027-01-01')).toBe('2026-W53'); // 2026 starts on a Thursday: 53 weeks
    expect(isoWeekOf('2027-01-04')).toBe('2027-W01');
    const w = weeklyTotals([
      { date: '2027-01-03', amount: 5 },
      { date: '2027-01-04', amount: 10 },
      { date: '2027-01-05', amount: 20 },
    ]);
    expect(w).toEqual([
      { week: '2026-W53', total: 5, days: 1, perDay: 5 },
      { week: '2027-W01', total: 30, days: 2, perDay: 15 },
    ]);
  });

  it('suggests measured ÷ modelled, and nothing for a mismatch too large to be a factor', () => {
    expect(suggestCorrectionFactor(10_800, 10_000)).toBe(1.08);
    expect(suggestCorrectionFactor(100, 1000)).toBeNull();
    expect(suggestCorrectionFactor(null, 1000)).toBeNull();
    expect(suggestCorrectionFactor(500, 0)).toBeNull();
  });
});

describe('meter totals', () => {
  it('sums increases and treats a fall as a meter reset', () => {
    const totals = [100, 150, 210, 5, 45].map((v, i) => ({ atMs: T0 + i * 24 * H, contents: v }));
    expect(meterConsumption(totals)).toEqual({ used: 150, resets: 1 });
    const curve = meterCurve(totals);
    expect(Array.from(curve.used)).toEqual([0, 50, 110, 110, 150]);
  });
});

describe('orderedSeries and refillThreshold', () => {
  it('sorts readings and keeps the last of two at one instant', () => {
    const s = orderedSeries([
      { atMs: 3, contents: 30 },
      { atMs: 1, contents: 10 },
      { atMs: 3, contents: 31 },
    ]);
    expect(s).toEqual([
      { atMs: 1, contents: 10 },
      { atMs: 3, contents: 31 },
    ]);
  });
  it('takes 2 % of a tank (at least 50 kg) or half a cylinder', () => {
    expect(refillThreshold({ capacity: 10_000, fullCylinder: null })).toBe(200);
    expect(refillThreshold({ capacity: 1000, fullCylinder: null })).toBe(50);
    expect(refillThreshold({ capacity: null, fullCylinder: 2000 })).toBe(1000);
  });
});
