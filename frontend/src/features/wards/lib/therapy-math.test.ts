import { describe, expect, it } from 'vitest';
import { lineLitresPerDay } from './therapy-math';

describe('daily use of a therapy line', () => {
  it('six patients on nasal cannula at 2 L/min all day use 17,280 L/day', () => {
    // hand arithmetic: 6 × 2 L/min × 1,440 min = 17,280 L
    expect(lineLitresPerDay(6, 2, null, null, 0)).toBeCloseTo(17_280, 6);
  });

  it('adds the leakage allowance on top', () => {
    // hand arithmetic: 17,280 L × 1.03 = 17,798.4 L
    expect(lineLitresPerDay(6, 2, null, null, 3)).toBeCloseTo(17_798.4, 6);
  });

  it('a 08:00–18:00 weekday line averages its five days over the week', () => {
    // hand arithmetic: 1 × 15 L/min × 60 × 10 h × 5/7 = 6,428.57 L/day
    expect(lineLitresPerDay(1, 15, [8, 9, 10, 11, 12, 13, 14, 15, 16, 17], [1, 2, 3, 4, 5], 0)).toBeCloseTo(6_428.571, 2);
  });
});
