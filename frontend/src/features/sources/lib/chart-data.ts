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
