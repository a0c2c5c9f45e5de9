/**
 * The forecast series as the source screen's chart reads it: one column of contents at a fixed step
 * from a start instant, instead of an object per hour (an hourly 90-day forecast is ~2,200 points; as
 * objects with ISO times that was ~200 kB of JSON). The CSV export keeps the engine's full precision.
 */
export interface ForecastChartSeries {
  /** UTC instant (ISO) of the first value: the end of the hour before now. */
  startAt: string;
  /** Hours between consecutive values. */
  stepHours: number;
  /** Contents at the end of each step in the outlook's unit, rounded for drawing (kg to 0.1, L to 1). */
  contents: number[];
}

const MS_H = 3_600_000;

/** Decimals kept for the chart: a tenth of a kg of liquid, a whole litre of free gas. */
export function chartDecimals(unit: 'kg' | 'L'): number {
  return unit === 'kg' ? 1 : 0;
}

/**
 * Columns from the engine's hourly series: values `from`… of `contents`, where value i is the contents
 * at the end of grid hour i, i.e. at startUtcMs + (i + 1) h.
 */
export function toChartSeries(contents: ArrayLike<number>, startUtcMs: number, from: number, unit: 'kg' | 'L'): ForecastChartSeries {
  const f = 10 ** chartDecimals(unit);
  const out: number[] = [];
  for (let i = Math.max(0, from); i < contents.length; i++) out.push(Math.round(contents[i] * f) / f);
  return { startAt: new Date(startUtcMs + (Math.max(0, from) + 1) * MS_H).toISOString(), stepHours: 1, contents: out };
}

/** The series as points in time (ms since the epoch) for drawing. */
export function chartPoints(s: ForecastChartSeries): { t: number; contents: number }[] {
  const t0 = Date.parse(s.startAt);
  const step = s.stepHours * MS_H;
  return s.contents.map((contents, i) => ({ t: t0 + i * step, contents }));
}

/** The instant (ISO) of the last value, or null for an empty series. */
export function chartSeriesEnd(s: ForecastChartSeries): string | null {
  if (s.contents.length === 0) return null;
  return new Date(Date.parse(s.startAt) + (s.contents.length - 1) * s.stepHours * MS_H).toISOString();
}
