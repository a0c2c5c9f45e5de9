import { describe, expect, it } from 'vitest';
import { thinSeries, type ChartPoint } from './chart-data';

// A tank used at 10 kg/h that is refilled to 1,000 kg every 50 h: a saw-tooth (common practice for bulk supply).
function sawTooth(hours: number): ChartPoint[] {
  return Array.from({ length: hours }, (_, h) => ({ t: h * 3_600_000, contents: 1000 - 10 * (h % 50) }));
}

describe('thinning the hourly forecast for the chart', () => {
  it('leaves a short series as it is', () => {
    const s = sawTooth(100);
    expect(thinSeries(s, 600)).toEqual(s);
  });

  it('keeps every trough and every refill of a 90-day saw-tooth within the point budget', () => {
    const s = sawTooth(2184);
    const thin = thinSeries(s, 600);
    expect(thin.length).toBeLessThanOrEqual(602);
    const count = (pts: ChartPoint[], v: number) => pts.filter((p) => p.contents === v).length;
    expect(count(thin, 510)).toBe(count(s, 510));
    expect(count(thin, 1000)).toBe(count(s, 1000));
    expect(thin[0]).toEqual(s[0]);
    expect(thin[thin.length - 1]).toEqual(s[s.length - 1]);
    // time order is kept, so the line never doubles back
    for (let i = 1; i < thin.length; i++) expect(thin[i].t).toBeGreaterThan(thin[i - 1].t);
  });
});
