import { IANAZone } from 'luxon';
import { InvalidInputError } from '../api/errors';

/**
 * The hour grid of a forecast: real (elapsed) hours from a local start time in an IANA time zone.
 *
 * Hour `i` spans the real interval [startUtcMs + i·1 h, startUtcMs + (i+1)·1 h). Its demand is chosen by
 * the local clock hour and ISO weekday at the START of the hour. Days of 23 and 25 hours at clock
 * changes are therefore real: the spring day has 23 entries, the autumn day 25 (one local hour twice).
 *
 * Everything the hot loops need is precomputed here once per (zone, start, horizon) into typed arrays,
 * so the projection never calls luxon per hour.
 */
export interface HourIndex {
  readonly timeZone: string;
  /** The local start as given, `yyyy-MM-ddTHH:mm`. */
  readonly startLocal: string;
  readonly startUtcMs: number;
  /** Number of elapsed hours in the horizon. */
  readonly hours: number;
  /** UTC offset in minutes at every hour boundary 0…hours (length hours + 1). */
  readonly offsetMinutes: Int16Array;
  /** (isoWeekday − 1)·24 + local clock hour at the start of each hour: 0…167. */
  readonly weekSlot: Uint8Array;
  /** Local calendar day of each hour, counted from the start's local date (0-based). */
  readonly dayOfRun: Uint16Array;
  /** Number of local calendar days the horizon touches (max dayOfRun + 1). */
  readonly days: number;
}

const MS_PER_HOUR = 3_600_000;
const MS_PER_DAY = 86_400_000;
const LOCAL_RE = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/;

/** Longest horizon the engine accepts: three years including a leap day. */
export const MAX_HORIZON_DAYS = 1096;

const knownZones = new Map<string, boolean>();

/** True if `zone` is an IANA time-zone name the runtime knows (memoised: the Intl probe is slow). */
export function isValidTimeZone(zone: string): boolean {
  if (typeof zone !== 'string' || zone.length === 0) return false;
  let ok = knownZones.get(zone);
  if (ok === undefined) {
    ok = IANAZone.isValidZone(zone);
    if (knownZones.size < 1000) knownZones.set(zone, ok);
  }
  return ok;
}

function zoneOf(timeZone: string, path: string): IANAZone {
  if (!isValidTimeZone(timeZone)) {
    throw new InvalidInputError(`Unknown time zone "${timeZone}"`, [{ path, message: 'expected an IANA time-zone name such as Europe/London' }]);
  }
  return IANAZone.create(timeZone);
}

/**
 * Resolves a local wall-clock time (`yyyy-MM-ddTHH:mm[:ss]`) in an IANA zone to UTC milliseconds, or
 * null if it does not exist there (the skipped hour at the spring change) or is not a calendar time.
 * An ambiguous time (the repeated autumn hour) resolves to its FIRST occurrence, which is what people
 * mean by "01:30 on that day" in most planning contexts. Method: the wall clock read as UTC, minus each
 * candidate offset around it, kept only if the zone's offset at the result reproduces the wall clock.
 */
export function resolveLocalTimeUtcMs(local: string, timeZone: string): number | null {
  const m = LOCAL_RE.exec(local);
  if (!m || !isValidTimeZone(timeZone)) return null;
  const [y, mo, d, h, mi, s] = [m[1], m[2], m[3], m[4], m[5], m[6] ?? '0'].map(Number);
  const wallMs = Date.UTC(y, mo - 1, d, h, mi, s);
  const check = new Date(wallMs);
  if (check.getUTCFullYear() !== y || check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d || h > 23 || mi > 59 || s > 59) {
    return null;
  }
  const zone = IANAZone.create(timeZone);
  const candidates = new Set<number>();
  for (const probe of [wallMs - 14 * MS_PER_HOUR, wallMs, wallMs + 14 * MS_PER_HOUR]) {
    candidates.add(zone.offset(probe));
  }
  let best: number | null = null;
  for (const off of candidates) {
    const utc = wallMs - off * 60_000;
    if (zone.offset(utc) === off && (best === null || utc < best)) best = utc;
  }
  return best;
}

/** Formats a UTC instant as local wall-clock `yyyy-MM-ddTHH:mm` given its offset in minutes (minutes truncated). */
export function formatWallClock(utcMs: number, offsetMinutes: number): string {
  return new Date(Math.floor((utcMs + offsetMinutes * 60_000) / 60_000) * 60_000).toISOString().slice(0, 16);
}

/** Local wall-clock `yyyy-MM-ddTHH:mm` of any instant in the zone (luxon's zone offset; not for hot loops). */
export function formatLocalAt(utcMs: number, timeZone: string): string {
  return formatWallClock(utcMs, IANAZone.create(timeZone).offset(utcMs));
}

/** Local wall-clock label of hour boundary `b` (0…hours): boundary b+1 is the END of hour b. */
export function boundaryLabel(index: HourIndex, boundary: number): string {
  return formatWallClock(index.startUtcMs + boundary * MS_PER_HOUR, index.offsetMinutes[boundary]);
}

/** ISO offset string such as `+01:00` for boundary `b`. */
export function boundaryOffset(index: HourIndex, boundary: number): string {
  const m = index.offsetMinutes[boundary];
  const sign = m < 0 ? '-' : '+';
  const a = Math.abs(m);
  return `${sign}${String(Math.floor(a / 60)).padStart(2, '0')}:${String(a % 60).padStart(2, '0')}`;
}

/**
 * First hour boundary at or after a UTC instant (events land on the grid at the boundary where they have
 * certainly happened: a delivery at 06:30 on a grid of whole hours counts from 07:00).
 */
export function boundaryAtOrAfter(index: HourIndex, utcMs: number): number {
  return Math.ceil((utcMs - index.startUtcMs) / MS_PER_HOUR - 1e-9);
}

const cache = new Map<string, HourIndex>();
const CACHE_LIMIT = 32;

/**
 * Builds (or returns the cached) hour grid for a local start in an IANA zone over `horizonDays` local
 * calendar days. The horizon ends at the same local wall-clock time `horizonDays` days later
 * (luxon-style calendar arithmetic), so its hour count is the real elapsed time: 7 days across the
 * spring change = 167 hours. Offsets come from the IANA database via luxon (computed once per boundary).
 * @param timeZone IANA name, e.g. "Europe/London"
 * @param startLocal local wall-clock start, `yyyy-MM-ddTHH:mm`
 * @param horizonDays length in local days, > 0 and ≤ MAX_HORIZON_DAYS (fractions allowed)
 */
export function buildHourIndex(timeZone: string, startLocal: string, horizonDays: number): HourIndex {
  const key = `${timeZone}|${startLocal}|${horizonDays}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const zone = zoneOf(timeZone, 'timezone');
  if (!(horizonDays > 0) || horizonDays > MAX_HORIZON_DAYS) {
    throw new InvalidInputError(`horizon_days must be > 0 and ≤ ${MAX_HORIZON_DAYS}`, [
      { path: 'horizon_days', message: `must be greater than 0 and at most ${MAX_HORIZON_DAYS} days (3 years)` },
    ]);
  }
  const startUtcMs = resolveLocalTimeUtcMs(startLocal, timeZone);
  if (startUtcMs === null) {
    throw new InvalidInputError(`start "${startLocal}" is not a valid local time in ${timeZone}`, [
      { path: 'start', message: 'not a valid local wall-clock time in this time zone (format yyyy-MM-ddTHH:mm; times skipped by a clock change do not exist)' },
    ]);
  }
  // End: same wall clock N days later (whole days), plus any fraction of a day in real hours.
  const wholeDays = Math.floor(horizonDays);
  const startWall = startUtcMs + zone.offset(startUtcMs) * 60_000;
  const endWallMs = startWall + wholeDays * MS_PER_DAY;
  const endLocal = new Date(endWallMs).toISOString().slice(0, 19);
  let endUtcMs = resolveLocalTimeUtcMs(endLocal, timeZone);
  // The end wall time can fall in a skipped hour: then use the same offset as before the gap.
  if (endUtcMs === null) endUtcMs = endWallMs - zone.offset(endWallMs - 12 * MS_PER_HOUR) * 60_000;
  endUtcMs += (horizonDays - wholeDays) * MS_PER_DAY;
  const hours = Math.max(1, Math.floor((endUtcMs - startUtcMs) / MS_PER_HOUR + 1e-9));

  const offsetMinutes = new Int16Array(hours + 1);
  const weekSlot = new Uint8Array(hours);
  const dayOfRun = new Uint16Array(hours);
  const startDay = Math.floor(startWall / MS_PER_DAY);
  // One zone lookup per boundary, once per grid (luxon caches its Intl formatter): a few ms for 90 days.
  for (let b = 0; b <= hours; b++) offsetMinutes[b] = zone.offset(startUtcMs + b * MS_PER_HOUR);
  for (let i = 0; i < hours; i++) {
    const wall = startUtcMs + i * MS_PER_HOUR + offsetMinutes[i] * 60_000;
    const epochDay = Math.floor(wall / MS_PER_DAY);
    const hour = Math.floor((wall - epochDay * MS_PER_DAY) / MS_PER_HOUR);
    // 1970-01-01 was a Thursday (ISO weekday 4).
    const isoWeekday = ((((epochDay + 3) % 7) + 7) % 7) + 1;
    weekSlot[i] = (isoWeekday - 1) * 24 + hour;
    dayOfRun[i] = epochDay - startDay;
  }
  const index: HourIndex = {
    timeZone,
    startLocal,
    startUtcMs,
    hours,
    offsetMinutes,
    weekSlot,
    dayOfRun,
    days: hours > 0 ? dayOfRun[hours - 1] + 1 : 0,
  };
  if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  cache.set(key, index);
  return index;
}

/**
 * Hour index (0…hours−1) at which a local wall-clock time falls, rounded UP to the next boundary
 * (see boundaryAtOrAfter), or throws InvalidInputError naming `path` if it is not a valid local time.
 */
export function boundaryOfLocalTime(index: HourIndex, local: string, path: string): number {
  const utc = resolveLocalTimeUtcMs(local, index.timeZone);
  if (utc === null) {
    throw new InvalidInputError(`${path}: "${local}" is not a valid local time in ${index.timeZone}`, [
      { path, message: 'not a valid local wall-clock time in this time zone (format yyyy-MM-ddTHH:mm)' },
    ]);
  }
  return boundaryAtOrAfter(index, utc);
}
