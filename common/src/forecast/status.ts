import { z } from 'zod';

/**
 * The status of a supply source: the one place that decides it from a forecast, ranks it and words it.
 * The server decides; the overview, the source page, the alerts and the order requests show it.
 */

/** Every status, worst first: the order of the overview and of its counts. */
export const SOURCE_STATUSES = ['critical', 'reorder', 'watch', 'unknown', 'ok'] as const;
export const sourceStatusSchema = z.enum(SOURCE_STATUSES);
export type SourceStatus = z.infer<typeof sourceStatusSchema>;

/** The semantic colour tokens of the theme a status is shown in (always beside its words). */
export type StatusTone = 'critical' | 'warn' | 'watch' | 'neutral' | 'ok';

export interface StatusWords {
  /** Short label of the badge and the count tiles. */
  label: string;
  /** One line of what it means for the person planning. */
  text: string;
  tone: StatusTone;
}

export const SOURCE_STATUS: Readonly<Record<SourceStatus, StatusWords>> = {
  critical: { label: 'Critical', text: 'Runs out before a delivery', tone: 'critical' },
  reorder: { label: 'Reorder now', text: 'Reorder now', tone: 'warn' },
  watch: { label: 'Watch', text: 'Reorder within a week', tone: 'watch' },
  unknown: { label: 'No forecast', text: 'No reading yet', tone: 'neutral' },
  ok: { label: 'OK', text: 'Enough stock', tone: 'ok' },
};

/** The line shown for a source that has a reading but cannot be forecast (settings, liquefied-gas cylinders). */
export const NO_FORECAST_TEXT = 'No forecast';

/** Position of a status in the worst-first order (0 = worst); anything not a status ranks with `unknown`. */
export function statusRank(status: string): number {
  const i = (SOURCE_STATUSES as readonly string[]).indexOf(status);
  return i < 0 ? SOURCE_STATUSES.indexOf('unknown') : i;
}

/** Comparator for sorting worst first by status alone. */
export function compareStatus(a: string, b: string): number {
  return statusRank(a) - statusRank(b);
}

/** The line of words of a status; `unknown` says whether a reading is missing or only the forecast. */
export function statusText(status: SourceStatus, hasReading: boolean): string {
  return status === 'unknown' && hasReading ? NO_FORECAST_TEXT : SOURCE_STATUS[status].text;
}

/** Counts of sources per status, every status present (zero where none). */
export function countByStatus(sources: readonly { status: SourceStatus }[]): Record<SourceStatus, number> {
  const counts = Object.fromEntries(SOURCE_STATUSES.map((s) => [s, 0])) as Record<SourceStatus, number>;
  for (const s of sources) if (Object.hasOwn(counts, s.status)) counts[s.status] += 1;
  return counts;
}

export interface StatusFacts {
  /** False when there is no forecast (no reading, or settings that cannot be forecast). */
  forecast: boolean;
  /** Delivery lead time, h. */
  leadTimeHours: number;
  /** Hours from now until the projection reaches empty, null when it does not in the horizon. */
  hoursToEmpty: number | null;
  /** Hours from now until the first order must be placed (0 when already due), null when none falls due. */
  hoursToReorder: number | null;
  /** Days of stock at the current rate of loss, null when nothing is drawn. */
  daysOfStock: number | null;
  /** The reserve is reached within the lead time. */
  reserveTouchedWithinLead: boolean;
  /** A vaporiser is overloaded within the next 24 h. */
  vaporiserOverloadWithinDay: boolean;
}

/**
 * The status of a source from its forecast (common practice of reorder planning): critical when it runs
 * empty (or into its reserve) before a delivery ordered now could arrive, or a vaporiser is overloaded
 * within a day; reorder when the order falls due within the lead time; watch when it falls due within a
 * week; critical also when the days of stock are shorter than the lead time; otherwise ok.
 */
export function decideStatus(f: StatusFacts): SourceStatus {
  if (!f.forecast) return 'unknown';
  const lead = f.leadTimeHours;
  if ((f.hoursToEmpty !== null && f.hoursToEmpty <= lead) || f.reserveTouchedWithinLead) return 'critical';
  if (f.vaporiserOverloadWithinDay) return 'critical';
  if (f.hoursToReorder !== null && f.hoursToReorder <= lead) return 'reorder';
  if (f.hoursToReorder !== null && f.hoursToReorder <= 7 * 24) return 'watch';
  if (f.daysOfStock !== null && f.daysOfStock * 24 <= lead) return 'critical';
  return 'ok';
}
