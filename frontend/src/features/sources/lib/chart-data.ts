/**
 * Hourly series over 90 days are about 2,200 points: more than a chart can draw crisply on a phone.
 * Each bucket keeps its lowest and highest point, in time order, so the saw-tooth of use and refills
 * (the troughs people plan against, and the jumps of deliveries) survives the thinning.
 */
export interface ChartPoint {
  t: number;
  contents: number;
}

export function thinSeries(points: readonly ChartPoint[], maxPoints = 600): ChartPoint[] {
  if (points.length <= maxPoints) return [...points];
  const bucket = Math.ceil(points.length / Math.floor(maxPoints / 2));
  const out: ChartPoint[] = [points[0]];
  for (let i = 1; i < points.length - 1; i += bucket) {
    const slice = points.slice(i, Math.min(points.length - 1, i + bucket));
    let lo = slice[0];
    let hi = slice[0];
    for (const p of slice) {
      if (p.contents < lo.contents) lo = p;
      if (p.contents > hi.contents) hi = p;
    }
    if (lo === hi) out.push(lo);
    else out.push(...(lo.t < hi.t ? [lo, hi] : [hi, lo]));
  }
  out.push(points[points.length - 1]);
  return out;
}

/**
 * A round top for a value axis and its ticks: steps of 1, 2, 2.5 or 5 × 10^k, about four of them, so the
 * axis reads 0, 2,500, 5,000… rather than stopping at an odd maximum.
 */
export function niceAxis(max: number, count = 4): { top: number; ticks: number[] } {
  if (!(max > 0) || !Number.isFinite(max)) return { top: 1, ticks: [0, 1] };
  const raw = max / count;
  const pow = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * pow).find((s) => s >= raw - 1e-9) ?? 10 * pow;
  const top = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let t = 0; t <= top + step / 2; t += step) ticks.push(Math.round(t * 1e6) / 1e6);
  return { top, ticks };
}
