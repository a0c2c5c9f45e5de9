/**
 * Therapy lines and demand lines run in some local clock hours (0–23) and ISO weekdays (1 = Monday);
 * an empty or missing list means all of them. These put such lists in words.
 */

const WEEKDAY_SHORT = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

/** Runs of consecutive integers: [8,9,10,14] → [[8,10],[14,14]]. */
function runs(values: readonly number[]): [number, number][] {
  const sorted = [...new Set(values)].sort((a, b) => a - b);
  const out: [number, number][] = [];
  for (const v of sorted) {
    const last = out[out.length - 1];
    if (last && v === last[1] + 1) last[1] = v;
    else out.push([v, v]);
  }
  return out;
}

const hh = (h: number) => `${String(h).padStart(2, '0')}:00`;

/** [8…17] → "08:00–18:00"; null or all 24 → "all day". */
export function formatHours(hours: readonly number[] | null | undefined): string {
  if (!hours || hours.length === 0 || new Set(hours).size >= 24) return 'all day';
  return runs(hours)
    .map(([a, b]) => `${hh(a)}–${hh((b + 1) % 24)}`)
    .join(', ');
}

/** [1…5] → "Mon–Fri"; null or all seven → "every day". */
export function formatWeekdays(days: readonly number[] | null | undefined): string {
  if (!days || days.length === 0 || new Set(days).size >= 7) return 'every day';
  return runs(days)
    .map(([a, b]) =>
      a === b ? WEEKDAY_SHORT[a - 1] : b === a + 1 ? `${WEEKDAY_SHORT[a - 1]}, ${WEEKDAY_SHORT[b - 1]}` : `${WEEKDAY_SHORT[a - 1]}–${WEEKDAY_SHORT[b - 1]}`,
    )
    .join(', ');
}

export const WEEKDAYS = WEEKDAY_SHORT.map((label, i) => ({ value: i + 1, label }));
