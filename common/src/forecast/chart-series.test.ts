import { describe, expect, it } from 'vitest';
import { chartPoints, chartSeriesEnd, toChartSeries } from './chart-series';

describe('the chart series (columns)', () => {
  const start = Date.UTC(2027, 0, 4, 0, 0);
  const contents = Float64Array.from([1000, 991.87, 983.7449, 975.61, 967.4851]);

  it('starts at the end of hour `from` and keeps one value per hour from there (hand-worked times)', () => {
    const s = toChartSeries(contents, start, 2, 'kg');
    // Value 2 is the contents at the end of hour 2: 2027-01-04 00:00 + 3 h.
    expect(s.startAt).toBe('2027-01-04T03:00:00.000Z');
    expect(s.stepHours).toBe(1);
    expect(s.contents).toEqual([983.7, 975.6, 967.5]);
    expect(chartSeriesEnd(s)).toBe('2027-01-04T05:00:00.000Z');
    expect(chartPoints(s).map((p) => new Date(p.t).toISOString())).toEqual([
      '2027-01-04T03:00:00.000Z',
      '2027-01-04T04:00:00.000Z',
      '2027-01-04T05:00:00.000Z',
    ]);
  });

  it('rounds litres of free gas to whole litres, and is empty past the end', () => {
    expect(toChartSeries(Float64Array.from([6800.4, 6799.6]), start, 0, 'L').contents).toEqual([6800, 6800]);
    const empty = toChartSeries(contents, start, 9, 'L');
    expect(empty.contents).toEqual([]);
    expect(chartSeriesEnd(empty)).toBeNull();
  });

  it('a negative start is read as 0 (a reading in the current hour)', () => {
    expect(toChartSeries(contents, start, -1, 'kg').startAt).toBe('2027-01-04T01:00:00.000Z');
  });
});
