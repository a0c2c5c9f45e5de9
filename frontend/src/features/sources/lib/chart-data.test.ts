import { describe, expect, it } from 'vitest';
import { niceAxis, thinSeries, type ChartPoint } from './chart-data';

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

describe('a round value axis', () => {
  it('ends a 10,000 kg tank at its capacity in steps of 2,500', () => {
    expect(niceAxis(10_000)).toEqual({ top: 10_000, ticks: [0, 2_500, 5_000, 7_500, 10_000] });
  });

  it('rounds an odd maximum up to the next whole step', () => {
    // 309,439 L / 4 ≈ 77,360 → step 100,000 (the next of 1, 2, 2.5, 5 × 10^k)
    expect(niceAxis(309_439)).toEqual({ top: 400_000, ticks: [0, 100_000, 200_000, 300_000, 400_000] });
  });

  it('copes with an empty source', () => {
    expect(niceAxis(0).top).toBeGreaterThan(0);
  });
});
