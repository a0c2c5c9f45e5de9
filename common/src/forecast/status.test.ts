import { describe, expect, it } from 'vitest';
import { compareStatus, countByStatus, decideStatus, SOURCE_STATUS, SOURCE_STATUSES, statusRank, statusText, type StatusFacts } from './status';

// A source with a 48 h delivery lead time whose forecast shows nothing due: the base of each case below.
const calm: StatusFacts = {
  forecast: true,
  leadTimeHours: 48,
  hoursToEmpty: null,
  hoursToReorder: null,
  daysOfStock: 30,
  reserveTouchedWithinLead: false,
  vaporiserOverloadWithinDay: false,
};

describe('decideStatus', () => {
  it('has no status but unknown without a forecast, whatever the figures', () => {
    expect(decideStatus({ ...calm, forecast: false, hoursToEmpty: 1 })).toBe('unknown');
  });

  // Reorder planning, common practice: an order placed now arrives after the lead time, so a source that runs
  // out within the lead time cannot be saved by a normal order.
  it('is critical when the source runs empty within the lead time (47 h ≤ 48 h)', () => {
    expect(decideStatus({ ...calm, hoursToEmpty: 47, hoursToReorder: 0 })).toBe('critical');
    expect(decideStatus({ ...calm, hoursToEmpty: 48 })).toBe('critical');
  });

  it('is not critical when it runs empty just after the lead time and the order falls due now', () => {
    expect(decideStatus({ ...calm, hoursToEmpty: 49, hoursToReorder: 0 })).toBe('reorder');
  });

  it('is critical when the reserve is reached within the lead time, or a vaporiser is overloaded within a day', () => {
    expect(decideStatus({ ...calm, reserveTouchedWithinLead: true })).toBe('critical');
    expect(decideStatus({ ...calm, hoursToReorder: 100, vaporiserOverloadWithinDay: true })).toBe('critical');
  });

  it('is reorder when the order falls due within the lead time, watch within a week (7 × 24 = 168 h)', () => {
    expect(decideStatus({ ...calm, hoursToReorder: 48 })).toBe('reorder');
    expect(decideStatus({ ...calm, hoursToReorder: 49 })).toBe('watch');
    expect(decideStatus({ ...calm, hoursToReorder: 168 })).toBe('watch');
    expect(decideStatus({ ...calm, hoursToReorder: 169 })).toBe('ok');
  });

  it('is critical when the days of stock are shorter than the lead time (1.9 d × 24 = 45.6 h ≤ 48 h)', () => {
    expect(decideStatus({ ...calm, daysOfStock: 1.9 })).toBe('critical');
    expect(decideStatus({ ...calm, daysOfStock: 2.1 })).toBe('ok');
  });
});

describe('the order and the words of the statuses', () => {
  it('ranks worst first, a source with no forecast before those that are fine', () => {
    const shuffled = ['ok', 'unknown', 'watch', 'critical', 'reorder'];
    expect(shuffled.sort(compareStatus)).toEqual(['critical', 'reorder', 'watch', 'unknown', 'ok']);
  });

  it('ranks what is not a status (an inherited key among them) with unknown', () => {
    for (const odd of ['__proto__', 'constructor', 'toString', 'hasOwnProperty', 'valueOf', 'prototype', ''])
      expect(statusRank(odd)).toBe(statusRank('unknown'));
  });

  it('says "No reading yet" for a source with no reading, never "Watch"', () => {
    expect(statusText('unknown', false)).toBe('No reading yet');
    expect(statusText('unknown', true)).toBe('No forecast');
    expect(SOURCE_STATUS.unknown.label).not.toBe(SOURCE_STATUS.watch.label);
  });

  it('words every status differently', () => {
    expect(new Set(SOURCE_STATUSES.map((s) => SOURCE_STATUS[s].label)).size).toBe(SOURCE_STATUSES.length);
    expect(new Set(SOURCE_STATUSES.map((s) => SOURCE_STATUS[s].text)).size).toBe(SOURCE_STATUSES.length);
  });

  it('counts every status, zero where there is none', () => {
    expect(countByStatus([{ status: 'unknown' }, { status: 'ok' }, { status: 'unknown' }])).toEqual({ critical: 0, reorder: 0, watch: 0, unknown: 2, ok: 1 });
  });
});
