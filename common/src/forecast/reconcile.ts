import { InvalidInputError } from '../api/errors';
import { resolveLocalTimeUtcMs } from './hour-index';

/**
 * Measured use from contents readings, and its comparison with the demand model.
 *
 * A series of contents readings (a bulk tank's kg, a store's litres of free gas) falls as gas is used and
 * jumps up when a delivery arrives. Consumption is the fall between readings; a delivery hides the use
 * during the interval in which it happened, which is filled in at the rate measured around it. Summing
 * signed differences (not only the falls) keeps sensor noise from inflating the total: noise up and
 * noise down cancel, while a sum of falls alone counts every downward wobble as use.
 */

export interface ContentsPoint {
  /** Time of the reading, UTC milliseconds. */
  atMs: number;
  /** Contents in the source's unit (kg for a tank, L of free gas for cylinders). */
  contents: number;
}

export interface Refill {
  /** Index of the last reading before the rise. */
  fromIndex: number;
  /** Index of the first reading after the rise (the rise may span several readings). */
  toIndex: number;
  fromMs: number;
  toMs: number;
  before: number;
  after: number;
  /** Net rise seen in the readings (delivered minus what was used meanwhile). */
  rise: number;
  /** Use during the refill interval, estimated at the rate measured around it. */
  usedDuring: number;
  /** Delivered amount implied: rise + use during the interval. */
  delivered: number;
}

function checkSeries(points: readonly ContentsPoint[]): void {
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    if (!Number.isFinite(p.atMs) || !Number.isFinite(p.contents)) {
      throw new InvalidInputError(`Reading ${i} is not a finite time and contents`, [
        { path: `points.${i}`, message: 'time and contents must be finite numbers' },
      ]);
    }
    if (i > 0 && !(p.atMs > points[i - 1].atMs)) {
      throw new InvalidInputError(`Readings must be in time order without repeats (reading ${i})`, [
        { path: `points.${i}.atMs`, message: 'must be later than the reading before' },
      ]);
    }
  }
}

function median(values: number[]): number {
  if (values.length === 0) return 0;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Noise of a contents series: 1.4826 × the median absolute deviation of its steps (the MAD estimate of a
 * normal standard deviation, Rousseeuw & Croux 1993). Steps are in the contents unit; the steady fall
 * of use is removed by taking deviations from the median step.
 * @param points readings in time order
 */
export function stepNoise(points: readonly ContentsPoint[]): number {
  if (points.length < 3) return 0;
  const steps: number[] = [];
  for (let i = 1; i < points.length; i++) steps.push(points[i].contents - points[i - 1].contents);
  const m = median(steps);
  return 1.4826 * median(steps.map((d) => Math.abs(d - m)));
}

/**
 * Finds deliveries in a contents series: runs of consecutive rising steps (each above 3 × the step
 * noise) whose total rise is at least `minRise`. A tanker fill seen by 1-minute telemetry rises over
 * many readings and counts once. Rises smaller than `minRise` are treated as noise, not deliveries.
 * Method: threshold on the net rise of rising runs, noise by MAD (Rousseeuw & Croux 1993).
 * @param points readings in time order (atMs UTC ms; contents kg or L)
 * @param opts.minRise smallest rise that is a delivery, in the contents unit (e.g. 2 % of a tank)
 * @param opts.rateWindowMs window each side of a refill used to estimate the use during it (default 24 h)
 */
export function detectRefills(points: readonly ContentsPoint[], opts: { minRise: number; rateWindowMs?: number }): Refill[] {
  checkSeries(points);
  if (!(opts.minRise > 0)) throw new InvalidInputError('minRise must be above 0', [{ path: 'minRise', message: 'must be > 0' }]);
  const stepMin = Math.max(3 * stepNoise(points), 0);
  const runs: { from: number; to: number }[] = [];
  let i = 1;
  while (i < points.length) {
    if (points[i].contents - points[i - 1].contents > stepMin && points[i].contents > points[i - 1].contents) {
      const from = i - 1;
      while (i < points.length && points[i].contents - points[i - 1].contents > stepMin && points[i].contents > points[i - 1].contents) i++;
      const to = i - 1;
      if (points[to].contents - points[from].contents >= opts.minRise) runs.push({ from, to });
    } else i++;
  }
  const window = opts.rateWindowMs ?? 24 * 3_600_000;
  const inRun = new Uint8Array(points.length);
  for (const r of runs) for (let k = r.from + 1; k <= r.to; k++) inRun[k] = 1;
  return runs.map((r) => {
    const rate = localRate(points, inRun, points[r.from].atMs - window, points[r.to].atMs + window);
    const usedDuring = Math.max(0, rate * (points[r.to].atMs - points[r.from].atMs));
    const rise = points[r.to].contents - points[r.from].contents;
    return {
      fromIndex: r.from,
      toIndex: r.to,
      fromMs: points[r.from].atMs,
      toMs: points[r.to].atMs,
      before: points[r.from].contents,
      after: points[r.to].contents,
      rise,
      usedDuring,
      delivered: rise + usedDuring,
    };
  });
}

/** Mean use rate (contents unit per ms) over ordinary steps inside [fromMs, toMs]; 0 when none. */
function localRate(points: readonly ContentsPoint[], inRun: Uint8Array, fromMs: number, toMs: number): number {
  let used = 0;
  let span = 0;
  for (let k = 1; k < points.length; k++) {
    if (inRun[k] || points[k - 1].atMs < fromMs || points[k].atMs > toMs) continue;
    used += points[k - 1].contents - points[k].contents;
    span += points[k].atMs - points[k - 1].atMs;
  }
  return span > 0 ? used / span : 0;
}

/** Cumulative use at each reading (starts at 0): the curve that hourly and daily rates are read from. */
export interface UseCurve {
  atMs: Float64Array;
  used: Float64Array;
}

export interface Consumption {
  /** Total used from the first reading to the last, contents unit. */
  used: number;
  /** Of which estimated for the intervals in which deliveries arrived. */
  usedDuringRefills: number;
  spanHours: number;
  /** Mean rate, contents unit per day (used ÷ span × 24 h); null below one hour of data. */
  perDay: number | null;
  refills: Refill[];
  /** Runs between deliveries: first and last reading of each and the use over it. */
  segments: { fromMs: number; toMs: number; used: number }[];
  curve: UseCurve;
}

/**
 * Consumption over a contents series: between deliveries, the signed fall from the first to the last
 * reading of each run; across each delivery, the use estimated at the surrounding rate (detectRefills).
 * Method: mass balance of the vessel (use = contents before − contents after + delivered).
 * @param points readings in time order (atMs UTC ms; contents kg or L)
 * @param refills deliveries from detectRefills over the same points
 */
export function consumptionBetweenReadings(points: readonly ContentsPoint[], refills: readonly Refill[]): Consumption {
  checkSeries(points);
  const n = points.length;
  const curve: UseCurve = { atMs: new Float64Array(n), used: new Float64Array(n) };
  const refillAt = new Map<number, Refill>();
  for (const r of refills) refillAt.set(r.fromIndex, r);
  const segments: Consumption['segments'] = [];
  let used = 0;
  let duringRefills = 0;
  let segStart = 0;
  let segUsedStart = 0;
  for (let k = 0; k < n; k++) {
    curve.atMs[k] = points[k].atMs;
    curve.used[k] = used;
    const r = refillAt.get(k);
    if (r && k + 1 < n) {
      if (k > segStart) segments.push({ fromMs: points[segStart].atMs, toMs: points[k].atMs, used: used - segUsedStart });
      // Spread the estimated use across the readings of the rising run, in proportion to time.
      const span = r.toMs - r.fromMs;
      for (let j = k + 1; j <= r.toIndex; j++) {
        curve.atMs[j] = points[j].atMs;
        curve.used[j] = used + (span > 0 ? (r.usedDuring * (points[j].atMs - r.fromMs)) / span : r.usedDuring);
      }
      used += r.usedDuring;
      duringRefills += r.usedDuring;
      k = r.toIndex - 1;
      segStart = r.toIndex;
      segUsedStart = used;
      continue;
    }
    if (k + 1 < n) used += points[k].contents - points[k + 1].contents;
  }
  if (n > 0 && n - 1 > segStart) segments.push({ fromMs: points[segStart].atMs, toMs: points[n - 1].atMs, used: used - segUsedStart });
  const spanHours = n > 1 ? (points[n - 1].atMs - points[0].atMs) / 3_600_000 : 0;
  return { used, usedDuringRefills: duringRefills, spanHours, perDay: spanHours >= 1 ? (used / spanHours) * 24 : null, refills: [...refills], segments, curve };
}

/** Use between two instants read off the cumulative curve (linear between readings); null outside it. */
export function usedBetween(curve: UseCurve, fromMs: number, toMs: number): number | null {
  const n = curve.atMs.length;
  if (n < 2 || fromMs < curve.atMs[0] || toMs > curve.atMs[n - 1] || toMs < fromMs) return null;
  return at(curve, toMs) - at(curve, fromMs);
}

function at(curve: UseCurve, t: number): number {
  const a = curve.atMs;
  let lo = 0;
  let hi = a.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (a[mid] <= t) lo = mid;
    else hi = mid;
  }
  const span = a[hi] - a[lo];
  if (span <= 0) return curve.used[lo];
  return curve.used[lo] + ((curve.used[hi] - curve.used[lo]) * (t - a[lo])) / span;
}

export interface HourRate {
  /** Start of the UTC hour, ms. */
  startMs: number;
  /** Used in that hour, contents unit. */
  used: number;
}

/**
 * Use in each whole clock hour covered by the readings (UTC hours, which are local hours wherever the
 * offset is whole hours), read off the cumulative curve by linear interpolation between readings.
 * @param curve from consumptionBetweenReadings
 */
export function hourlyRates(curve: UseCurve): HourRate[] {
  const n = curve.atMs.length;
  if (n < 2) return [];
  const H = 3_600_000;
  const out: HourRate[] = [];
  for (let t = Math.ceil(curve.atMs[0] / H) * H; t + H <= curve.atMs[n - 1]; t += H) out.push({ startMs: t, used: at(curve, t + H) - at(curve, t) });
  return out;
}

export interface DayRate {
  /** Local calendar date, yyyy-MM-dd. */
  date: string;
  /** Used that local day, contents unit. */
  used: number;
  /** Length of the local day: 24, or 23 / 25 at clock changes. */
  hours: number;
  /** Used per 24 h (a 25-hour day is not counted as a busier day). */
  perDay: number;
}

const MS_DAY = 86_400_000;

const dateFormats = new Map<string, Intl.DateTimeFormat>();
/** Local calendar date `yyyy-MM-dd` of an instant (the en-CA locale formats dates that way). */
function localDateOf(utcMs: number, timeZone: string): string {
  let f = dateFormats.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    if (dateFormats.size < 100) dateFormats.set(timeZone, f);
  }
  return f.format(new Date(utcMs));
}

/** Start of a local day: midnight, or 01:00 where a clock change skips midnight (some zones do). */
function localDayStartMs(date: string, timeZone: string): number | null {
  return resolveLocalTimeUtcMs(`${date}T00:00`, timeZone) ?? resolveLocalTimeUtcMs(`${date}T01:00`, timeZone);
}

function nextLocalMidnight(utcMs: number, timeZone: string, after: boolean): number | null {
  const date = localDateOf(utcMs, timeZone);
  if (!after) return localDayStartMs(date, timeZone);
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return localDayStartMs(d.toISOString().slice(0, 10), timeZone);
}

/**
 * Use in each whole local calendar day covered by the readings, in the site's time zone (days of 23 and
 * 25 hours at clock changes are real; `perDay` scales them to 24 h). Method: the cumulative use curve
 * read at local midnights (IANA time-zone database).
 * @param curve from consumptionBetweenReadings
 * @param timeZone IANA name, e.g. "Europe/London"
 */
export function dailyRates(curve: UseCurve, timeZone: string): DayRate[] {
  const n = curve.atMs.length;
  if (n < 2) return [];
  const first = curve.atMs[0];
  const last = curve.atMs[n - 1];
  let start: number | null;
  try {
    start = nextLocalMidnight(first, timeZone, false);
  } catch {
    start = null;
  }
  if (start === null) throw new InvalidInputError(`Unknown time zone "${timeZone}"`, [{ path: 'timeZone', message: 'an IANA name such as Europe/London' }]);
  if (start < first) start = nextLocalMidnight(first, timeZone, true);
  const out: DayRate[] = [];
  while (start !== null && start + 22 * 3_600_000 <= last) {
    const end = nextLocalMidnight(start + 12 * 3_600_000, timeZone, true);
    if (end === null || end > last) break;
    const hours = Math.round((end - start) / 3_600_000);
    const used = at(curve, end) - at(curve, start);
    const date = localDateOf(start + 3_600_000, timeZone);
    out.push({ date, used, hours, perDay: (used * 24) / hours });
    start = end;
    if (out.length > 20 * 366) break;
  }
  return out;
}

/**
 * Sample coefficient of variation: s / x̄ with s the sample standard deviation (n − 1 denominator).
 * Null below two values or when the mean is not above 0 (no meaningful relative spread).
 * @param values e.g. daily use, any unit
 */
export function coefficientOfVariation(values: readonly number[]): number | null {
  const n = values.length;
  if (n < 2) return null;
  let mean = 0;
  for (const v of values) mean += v;
  mean /= n;
  if (!(mean > 0)) return null;
  let ss = 0;
  for (const v of values) ss += (v - mean) * (v - mean);
  return Math.sqrt(ss / (n - 1)) / mean;
}

/**
 * Day-to-day variability for the forecast's Monte Carlo (`demand_cv`) from measured daily use: the CV of
 * the per-24-h rates when at least `minDays` whole days exist, else the fallback. Clamped to
 * [0.02, 1]: below 2 % the readings are too few to believe, above 100 % the series holds an event
 * (outage, ward closure) rather than ordinary variation.
 * @param days from dailyRates
 */
export function demandCvFromDays(
  days: readonly DayRate[],
  opts: { minDays?: number; fallback?: number } = {},
): { cv: number; measured: boolean; days: number } {
  const minDays = opts.minDays ?? 7;
  const fallback = opts.fallback ?? 0.2;
  const cv = days.length >= minDays ? coefficientOfVariation(days.map((d) => d.perDay)) : null;
  if (cv === null) return { cv: fallback, measured: false, days: days.length };
  return { cv: Math.min(1, Math.max(0.02, cv)), measured: true, days: days.length };
}

/** ISO week (Monday start) of a local date `yyyy-MM-dd`, as `yyyy-Www` (ISO 8601 week-numbering year). */
export function isoWeekOf(date: string): string {
  const d = new Date(`${date}T00:00:00Z`);
  const weekday = (d.getUTCDay() + 6) % 7; // Monday 0
  const thursday = new Date(d.getTime() + (3 - weekday) * MS_DAY);
  const year = thursday.getUTCFullYear();
  const jan1 = Date.UTC(year, 0, 1);
  const week = Math.floor((thursday.getTime() - jan1) / MS_DAY / 7) + 1;
  return `${year}-W${String(week).padStart(2, '0')}`;
}

/**
 * Totals per ISO week of daily amounts (any unit), with the number of days each week holds, in week
 * order. A week with fewer than seven days is a partial week: compare its mean per day, not its total.
 * @param days local dates with an amount each
 */
export function weeklyTotals(days: readonly { date: string; amount: number }[]): { week: string; total: number; days: number; perDay: number }[] {
  const weeks = new Map<string, { total: number; days: number }>();
  for (const d of days) {
    const w = isoWeekOf(d.date);
    const acc = weeks.get(w) ?? { total: 0, days: 0 };
    acc.total += d.amount;
    acc.days += 1;
    weeks.set(w, acc);
  }
  return [...weeks.entries()].sort(([a], [b]) => (a < b ? -1 : 1)).map(([week, v]) => ({ week, total: v.total, days: v.days, perDay: v.total / v.days }));
}

/**
 * The correction factor to apply to modelled demand so it matches measured use: measured ÷ modelled,
 * rounded to 0.01. Null when either figure is missing or not above 0, or when the ratio falls outside
 * 0.2…5 (a mismatch that large is a wrong feed or a missing ward, not a factor to accept).
 * @param measuredPerDay measured use per day (L or kg, same unit as modelled)
 * @param modelledPerDay modelled use per day
 */
export function suggestCorrectionFactor(measuredPerDay: number | null, modelledPerDay: number | null): number | null {
  if (measuredPerDay === null || modelledPerDay === null || !(measuredPerDay > 0) || !(modelledPerDay > 0)) return null;
  const f = measuredPerDay / modelledPerDay;
  if (f < 0.2 || f > 5) return null;
  return Math.round(f * 100) / 100;
}

/**
 * Gas used from counter readings of a meter (a running total): the sum of increases; a fall is a meter
 * reset or exchange and starts a new run (the reading after it counts from there).
 * @param totals meter totals in time order (any volume unit)
 */
export function meterConsumption(totals: readonly ContentsPoint[]): { used: number; resets: number } {
  let used = 0;
  let resets = 0;
  for (let i = 1; i < totals.length; i++) {
    const d = totals[i].contents - totals[i - 1].contents;
    if (d >= 0) used += d;
    else resets++;
  }
  return { used, resets };
}

/**
 * A meter's totals as a cumulative use curve (so dailyRates applies to it): use rises by each increase;
 * after a reset the run continues from the new reading.
 * @param totals meter totals in time order
 */
export function meterCurve(totals: readonly ContentsPoint[]): UseCurve {
  checkSeries(totals);
  const curve: UseCurve = { atMs: new Float64Array(totals.length), used: new Float64Array(totals.length) };
  let used = 0;
  for (let i = 0; i < totals.length; i++) {
    if (i > 0) used += Math.max(0, totals[i].contents - totals[i - 1].contents);
    curve.atMs[i] = totals[i].atMs;
    curve.used[i] = used;
  }
  return curve;
}

/**
 * Readings as a series reconcile functions accept: sorted by time, one point per instant (the last
 * reading given for an instant wins, as when a manual reading repeats a telemetry one).
 * @param points readings in any order (atMs UTC ms; contents any unit)
 */
export function orderedSeries(points: readonly ContentsPoint[]): ContentsPoint[] {
  const sorted = points.map((p, i) => ({ p, i })).sort((a, b) => a.p.atMs - b.p.atMs || a.i - b.i);
  const out: ContentsPoint[] = [];
  for (const { p } of sorted) {
    if (!Number.isFinite(p.atMs) || !Number.isFinite(p.contents)) continue;
    if (out.length && out[out.length - 1].atMs === p.atMs) out[out.length - 1] = p;
    else out.push(p);
  }
  return out;
}

/**
 * Smallest rise that counts as a delivery: half a cylinder for cylinder sources, 2 % of a tank's
 * capacity (at least 50 kg) for bulk tanks — far above gauge noise, far below any tanker drop
 * (common practice: bulk drops are a large part of the tank; cylinders arrive whole).
 * @param opts.capacity tank capacity, kg (bulk) — or null
 * @param opts.fullCylinder free gas of one full cylinder, L (cylinder sources) — or null
 */
export function refillThreshold(opts: { capacity: number | null; fullCylinder: number | null }): number {
  if (opts.fullCylinder && opts.fullCylinder > 0) return 0.5 * opts.fullCylinder;
  return Math.max(50, 0.02 * (opts.capacity ?? 0));
}
