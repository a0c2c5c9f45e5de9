import { describe, expect, it } from 'vitest';
import { dayTicks, localInputToIso, toLocalInput } from './site-time';

describe('site time: wall-clock input ↔ instant', () => {
  it('reads a winter time in London as GMT (+00:00)', () => {
    // IANA tz database: Europe/London is UTC+0 in January
    expect(localInputToIso('2027-01-04T08:30', 'Europe/London')).toBe('2027-01-04T08:30:00.000+00:00');
  });

  it('reads a summer time in London as BST (+01:00)', () => {
    // IANA tz database: British Summer Time, UTC+1, from the last Sunday of March
    expect(localInputToIso('2027-07-01T08:30', 'Europe/London')).toBe('2027-07-01T08:30:00.000+01:00');
  });

  it('refuses a wall-clock time the spring change skips', () => {
    // IANA tz database: on 28 Mar 2027 London clocks go from 01:00 straight to 02:00
    expect(localInputToIso('2027-03-28T01:30', 'Europe/London')).toBeNull();
  });

  it('refuses text that is not a date and time', () => {
    expect(localInputToIso('', 'Europe/London')).toBeNull();
    expect(localInputToIso('2027-13-01T08:00', 'Europe/London')).toBeNull();
  });

  it('shows an instant as the site’s wall clock', () => {
    // IANA tz database: America/New_York is UTC−5 in January
    expect(toLocalInput('2027-01-04T13:30:00Z', 'America/New_York')).toBe('2027-01-04T08:30');
  });

  it('puts chart ticks on local midnights', () => {
    const start = Date.parse('2027-01-04T10:00:00Z');
    const ticks = dayTicks(start, start + 10 * 86_400_000, 5, 'Europe/London');
    expect(ticks[0]).toBe(Date.parse('2027-01-05T00:00:00Z'));
    expect(ticks[1] - ticks[0]).toBe(2 * 86_400_000);
  });
});
