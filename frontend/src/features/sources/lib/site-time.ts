import { DateTime } from 'luxon';

/**
 * Times people type are wall-clock times at the site (the store round, the delivery slot); the API
 * wants an instant with its offset. These turn one into the other in the site's IANA zone.
 */

const LOCAL_FORMAT = "yyyy-MM-dd'T'HH:mm";

/** The value a datetime-local input shows for an instant, in the site's zone. */
export function toLocalInput(at: Date | string, timeZone: string): string {
  const dt = typeof at === 'string' ? DateTime.fromISO(at, { zone: 'utc' }) : DateTime.fromJSDate(at);
  return dt.setZone(timeZone).toFormat(LOCAL_FORMAT);
}

/**
 * A datetime-local value read in the site's zone, as ISO 8601 with its offset ("…T08:30:00.000+01:00").
 * Null when the text is not a date and time, or names a wall-clock time the zone skips (the spring
 * change), which luxon would otherwise move silently.
 */
export function localInputToIso(local: string, timeZone: string): string | null {
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/.test(local)) return null;
  const dt = DateTime.fromFormat(local, LOCAL_FORMAT, { zone: timeZone });
  if (!dt.isValid || dt.toFormat(LOCAL_FORMAT) !== local) return null;
  return dt.toISO();
}

/** Short date for chart ticks: "4 Jan". */
export function formatTick(ms: number, timeZone: string): string {
  return DateTime.fromMillis(ms, { zone: timeZone }).setLocale('en-GB').toFormat('d LLL');
}

/** Local midnights between two instants, about `count` of them evenly spaced in whole days. */
export function dayTicks(startMs: number, endMs: number, count: number, timeZone: string): number[] {
  if (!(endMs > startMs)) return [];
  const days = (endMs - startMs) / 86_400_000;
  const step = Math.max(1, Math.ceil(days / Math.max(1, count)));
  const ticks: number[] = [];
  let t = DateTime.fromMillis(startMs, { zone: timeZone }).startOf('day').plus({ days: 1 });
  while (t.toMillis() <= endMs) {
    ticks.push(t.toMillis());
    t = t.plus({ days: step });
  }
  return ticks;
}
