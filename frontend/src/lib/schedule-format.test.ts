import { describe, expect, it } from 'vitest';
import { formatHours, formatWeekdays } from './schedule-format';

describe('hours and weekdays of a therapy line in words', () => {
  it('says "all day" for no list and for all 24 hours', () => {
    expect(formatHours(null)).toBe('all day');
    expect(formatHours(Array.from({ length: 24 }, (_, h) => h))).toBe('all day');
  });

  it('writes a day shift as the clock times it starts and ends', () => {
    // hours 8…17 are the clock hours 08:00 to 18:00 (the hour starting at 17:00 is the last)
    expect(formatHours([8, 9, 10, 11, 12, 13, 14, 15, 16, 17])).toBe('08:00–18:00');
  });

  it('writes split and overnight hours as separate runs', () => {
    expect(formatHours([23, 0, 1, 12])).toBe('00:00–02:00, 12:00–13:00, 23:00–00:00');
  });

  it('names ISO weekdays (1 = Monday, ISO 8601)', () => {
    expect(formatWeekdays([1, 2, 3, 4, 5])).toBe('Mon–Fri');
    expect(formatWeekdays([6, 7])).toBe('Sat, Sun');
    expect(formatWeekdays([1, 3])).toBe('Mon, Wed');
    expect(formatWeekdays(null)).toBe('every day');
  });
});
