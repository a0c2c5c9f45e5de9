import { InvalidInputError } from '../api/errors';
import { prepareDepletionModel, runDepletionKernel, type DepletionModel, type PreparedModel } from './project-depletion';

/**
 * mulberry32: a 32-bit seeded PRNG (Tommy Ettinger, public domain, 2017). Period 2^32, fast, good
 * enough for forecast bands; the same seed gives the same sequence in every JS engine.
 * @param seed any integer (taken modulo 2^32)
 * @returns a function returning uniform numbers in [0, 1)
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Fills `out` with lognormal day multipliers of mean 1 and coefficient of variation `cv`:
 * m = exp(μ + σ·z), σ² = ln(1 + cv²), μ = −σ²/2 (so E[m] = 1, CV[m] = cv exactly), z standard normal by
 * the Box–Muller transform (Box & Muller 1958). Lognormal rather than normal: a day's demand cannot be
 * negative and busy days skew high; it needs no clamping at 0. cv = 0 gives exactly 1.
 * @param rng uniform [0,1) source
 * @param cv coefficient of variation of daily demand (≥ 0, dimensionless)
 */
export function fillLognormalDayMultipliers(rng: () => number, cv: number, out: Float64Array): void {
  if (cv === 0) {
    out.fill(1);
    return;
  }
  const sigma2 = Math.log(1 + cv * cv);
  const sigma = Math.sqrt(sigma2);
  const mu = -sigma2 / 2;
  for (let i = 0; i < out.length; i += 2) {
    // 1 − u keeps the log argument in (0, 1].
    const u1 = 1 - rng();
    const u2 = rng();
    const r = Math.sqrt(-2 * Math.log(u1));
    out[i] = Math.exp(mu + sigma * r * Math.cos(2 * Math.PI * u2));
    if (i + 1 < out.length) out[i + 1] = Math.exp(mu + sigma * r * Math.sin(2 * Math.PI * u2));
  }
}

/**
 * Fills `out` with day multipliers whose logarithms follow a stationary first-order autoregressive
 * process (AR(1), Box & Jenkins): x₀ = σ·z₀, x_d = φ·x_{d−1} + √(1 − φ²)·σ·z_d, m_d = exp(μ + x_d), with
 * σ² = ln(1 + cv²), μ = −σ²/2. Every day keeps the lognormal marginal of fillLognormalDayMultipliers
 * (mean 1, CV = cv), but a busy day is followed by busy days: corr(ln m_d, ln m_{d+k}) = φᵏ. φ = 0 gives
 * independent days.
 * @param phi day-to-day persistence, 0 ≤ φ < 1
 */
export function fillPersistentDayMultipliers(rng: () => number, cv: number, phi: number, out: Float64Array): void {
  if (phi === 0) {
    fillLognormalDayMultipliers(rng, cv, out);
    return;
  }
  // standard normal innovations first, then the recursion
  fillLognormalDayMultipliers(rng, Math.sqrt(Math.E - 1), out); // σ = 1, μ = −1/2: ln(out) + 1/2 is N(0, 1)
  if (cv === 0) {
    out.fill(1);
    return;
  }
  const sigma2 = Math.log(1 + cv * cv);
  const sigma = Math.sqrt(sigma2);
  const mu = -sigma2 / 2;
  const innovation = Math.sqrt(1 - phi * phi);
  let x = 0;
  for (let d = 0; d < out.length; d++) {
    const z = Math.log(out[d]) + 0.5;
    x = d === 0 ? sigma * z : phi * x + innovation * sigma * z;
    out[d] = Math.exp(mu + x);
  }
}

/**
 * Day-to-day persistence used when too few measured days exist to fit it. Patients on oxygen stay for
 * days (WHO interim guidance, 2020: critical patients often need it for more than a week), so busy days
 * come in runs; 0.7 is the engine's own choice (a run of busy days fades to half in about two days), not
 * a published figure, and is replaced by the fit below once 14 measured days exist.
 */
export const DEFAULT_DEMAND_PERSISTENCE = 0.7;
export const MAX_DEMAND_PERSISTENCE = 0.95;
/** Whole measured days needed before the persistence is fitted. */
export const MIN_DAYS_FOR_PERSISTENCE = 14;

/**
 * Fits the AR(1) persistence φ of daily use: the lag-1 autocorrelation of ln(use per day) about its mean
 * (the Yule–Walker estimate, Box & Jenkins), clamped to [0, 0.95]. Days with no use are left out.
 * @param perDay use per day, any unit, in date order (gaps allowed only where days are missing)
 * @returns φ, or null with fewer than MIN_DAYS_FOR_PERSISTENCE usable days
 */
export function fitDailyPersistence(perDay: readonly number[]): number | null {
  const logs = perDay.filter((v) => v > 0 && Number.isFinite(v)).map(Math.log);
  const n = logs.length;
  if (n < MIN_DAYS_FOR_PERSISTENCE) return null;
  const mean = logs.reduce((a, b) => a + b, 0) / n;
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < n; i++) {
    const d = logs[i] - mean;
    c0 += d * d;
    if (i > 0) c1 += d * (logs[i - 1] - mean);
  }
  if (c0 <= 1e-12 * n) return 0; // constant use: no variation to persist
  return Math.min(MAX_DEMAND_PERSISTENCE, Math.max(0, c1 / c0));
}

/**
 * Percentile of ascending values by linear interpolation between order statistics (Hyndman & Fan 1996,
 * definition 7 — the spreadsheet PERCENTILE.INC rule). Values may be +Infinity (a draw that outlasts the
 * horizon); a percentile that needs one of those returns null ("beyond the horizon").
 * @param sorted ascending values
 * @param p fraction 0…1
 */
export function percentileOfSorted(sorted: ArrayLike<number>, p: number): number | null {
  const n = sorted.length;
  if (n === 0) return null;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const frac = h - lo;
  const a = sorted[lo];
  if (!Number.isFinite(a)) return null;
  if (frac === 0 || lo + 1 >= n) return a;
  const b = sorted[lo + 1];
  if (!Number.isFinite(b)) return null;
  return a + frac * (b - a);
}

export interface MonteCarloOptions {
  /** Number of draws, 1…10,000. */
  draws: number;
  /** Coefficient of variation of daily demand (≥ 0). */
  demandCv: number;
  /** PRNG seed (integer). */
  seed: number;
  /** Day-to-day persistence φ of the AR(1) day multipliers, 0 ≤ φ ≤ 0.95 (default 0: independent days). */
  persistence?: number;
}

export interface HoursToEmptyBands {
  p10: number | null;
  p50: number | null;
  p90: number | null;
  draws: number;
  /** Draws that did not run empty within the horizon. */
  drawsOutlastingHorizon: number;
}

/** Largest number of draws the engine accepts. */
export const MAX_DRAWS = 10_000;

/**
 * P10/P50/P90 of hours to empty by Monte Carlo (seeded). Model: every local calendar day of the grid
 * gets a lognormal demand multiplier (mean 1, CV = demandCv) applied to all of that day's hourly demand,
 * the days linked by an AR(1) persistence φ (options.persistence; see fillPersistentDayMultipliers), so
 * busy spells last several days as real surges do; evaporation, deliveries and the reorder rule are
 * unchanged and act as in the deterministic run. A draw that outlasts the horizon counts as +∞: a
 * percentile that falls on such draws is reported as null (beyond the horizon), never as the horizon.
 * @param model the deterministic model (units as in projectDepletion)
 * @param dayOfRun local day of each grid hour (HourIndex.dayOfRun) and `days` its count
 */
export function estimateHoursToEmptyBands(
  model: DepletionModel | PreparedModel,
  dayOfRun: Uint16Array,
  days: number,
  options: MonteCarloOptions,
): HoursToEmptyBands {
  const { draws, demandCv, seed } = options;
  const persistence = options.persistence ?? 0;
  if (!(persistence >= 0 && persistence <= MAX_DEMAND_PERSISTENCE)) {
    throw new InvalidInputError(`demand_persistence must be between 0 and ${MAX_DEMAND_PERSISTENCE}`, [
      { path: 'demand_persistence', message: `must be between 0 and ${MAX_DEMAND_PERSISTENCE}` },
    ]);
  }
  if (!Number.isInteger(draws) || draws < 1 || draws > MAX_DRAWS) {
    throw new InvalidInputError(`draws must be an integer 1–${MAX_DRAWS}`, [{ path: 'draws', message: `must be an integer between 1 and ${MAX_DRAWS}` }]);
  }
  if (!(demandCv >= 0) || !Number.isFinite(demandCv)) {
    throw new InvalidInputError('demand_cv must be ≥ 0', [{ path: 'demand_cv', message: 'must be a finite number ≥ 0' }]);
  }
  const p = 'deliveryBoundary' in model ? model : prepareDepletionModel(model);
  if (dayOfRun.length < p.hours) {
    throw new InvalidInputError('dayOfRun shorter than the demand series', [{ path: 'dayOfRun', message: 'one entry per grid hour needed' }]);
  }
  const rng = mulberry32(seed);
  const mult = new Float64Array(Math.max(1, days));
  const results = new Float64Array(draws);
  let outlasting = 0;
  for (let k = 0; k < draws; k++) {
    fillPersistentDayMultipliers(rng, demandCv, persistence, mult);
    const h = runDepletionKernel(p, null, null, mult, dayOfRun, true);
    if (h < 0) {
      results[k] = Infinity;
      outlasting++;
    } else {
      results[k] = h;
    }
  }
  results.sort();
  return {
    p10: percentileOfSorted(results, 0.1),
    p50: percentileOfSorted(results, 0.5),
    p90: percentileOfSorted(results, 0.9),
    draws,
    drawsOutlastingHorizon: outlasting,
  };
}
