import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { boundaryLabel, boundaryOffset, buildHourIndex, formatLocalAt, resolveLocalTimeUtcMs } from './hour-index';

// UK clock changes follow the EU summer-time rule (Directive 2000/84/EC; UK Summer Time Order 2002):
// clocks go forward at 01:00 UTC on the last Sunday of March and back at 01:00 UTC on the last Sunday of
// October. In 2027 those Sundays are 28 March and 31 October.

describe('buildHourIndex', () => {
  it('counts 167 real hours in the London week that contains the spring change (2027-03-22 … 29)', () => {
    const idx = buildHourIndex('Europe/London', '2027-03-22T00:00', 7);
    // 7 × 24 − 1 skipped hour = 167
    expect(idx.hours).toBe(167);
    expect(idx.days).toBe(7);
    // The start is a Monday (ISO 1) at 00:00 → slot 0; 2027-03-22 is a Monday (calendar).
    expect(idx.weekSlot[0]).toBe(0);
    // Sunday 28 March: 00:00 GMT is hour 144, 01:00 GMT is hour 145, then 02:00 BST … (01:00–02:00 local skipped).
    expect(idx.weekSlot[144]).toBe(6 * 24 + 0);
    expect(idx.weekSlot[145]).toBe(6 * 24 + 2);
    expect(boundaryOffset(idx, 0)).toBe('+00:00');
    expect(boundaryOffset(idx, 167)).toBe('+01:00');
    // The grid ends at the same wall-clock time a week later.
    expect(boundaryLabel(idx, 167)).toBe('2027-03-29T00:00');
  });

  it('has a 25-hour day in autumn where the local hour 01 occurs twice (2027-10-31)', () => {
    const idx = buildHourIndex('Europe/London', '2027-10-31T00:00', 1);
    expect(idx.hours).toBe(25);
    const localHours = Array.from(idx.weekSlot, (s) => s % 24);
    expect(localHours.filter((h) => h === 1)).toHaveLength(2);
    // END labels of hours 0 and 1 are both 01:00, first in BST then in GMT.
    expect(boundaryLabel(idx, 1)).toBe('2027-10-31T01:00');
    expect(boundaryLabel(idx, 2)).toBe('2027-10-31T01:00');
    expect(boundaryOffset(idx, 1)).toBe('+01:00');
    expect(boundaryOffset(idx, 2)).toBe('+00:00');
  });

  it('counts whole days of 24 h without a change, and one hour less over 90 days across 28 March', () => {
    // 2027-01-04 + 60 days = 2027-03-05 (GMT all along); + 90 days = 2027-04-04 (after the spring change).
    expect(buildHourIndex('Europe/London', '2027-01-04T00:00', 60).hours).toBe(60 * 24);
    expect(buildHourIndex('Europe/London', '2027-01-04T00:00', 90).hours).toBe(90 * 24 - 1);
  });

  it('numbers local days for the per-day Monte Carlo multiplier', () => {
    // New York: EST (UTC−5) in January (IANA tz database).
    const idx = buildHourIndex('America/New_York', '2027-01-04T06:00', 2);
    expect(idx.hours).toBe(48);
    expect(idx.dayOfRun[17]).toBe(0); // 23:00 on day 0
    expect(idx.dayOfRun[18]).toBe(1); // 00:00 next day
    expect(idx.days).toBe(3);
  });

  it('rejects an unknown zone, a bad horizon and a start skipped by the clock change', () => {
    expect(() => buildHourIndex('Mars/Olympus', '2027-01-04T00:00', 1)).toThrow(InvalidInputError);
    expect(() => buildHourIndex('Europe/London', '2027-01-04T00:00', 0)).toThrow(InvalidInputError);
    expect(() => buildHourIndex('Europe/London', '2027-01-04T00:00', 1097)).toThrow(InvalidInputError);
    // 01:30 on 2027-03-28 does not exist in London (clocks jump 01:00 → 02:00).
    try {
      buildHourIndex('Europe/London', '2027-03-28T01:30', 1);
      expect.unreachable();
    } catch (e) {
      expect((e as InvalidInputError).details[0].path).toBe('start');
    }
  });
});

describe('resolveLocalTimeUtcMs', () => {
  it('returns null for skipped and impossible times, the first occurrence for a repeated one', () => {
    expect(resolveLocalTimeUtcMs('2027-03-28T01:30', 'Europe/London')).toBeNull();
    expect(resolveLocalTimeUtcMs('2027-02-30T00:00', 'Europe/London')).toBeNull();
    expect(resolveLocalTimeUtcMs('2027-01-04T24:00', 'Europe/London')).toBeNull();
    // 01:30 on 2027-10-31 happens at 00:30 UTC (BST) and again at 01:30 UTC (GMT): the first is taken.
    expect(resolveLocalTimeUtcMs('2027-10-31T01:30', 'Europe/London')).toBe(Date.UTC(2027, 9, 31, 0, 30));
    expect(formatLocalAt(Date.UTC(2027, 6, 1, 12, 0), 'Europe/London')).toBe('2027-07-01T13:00');
  });
});
