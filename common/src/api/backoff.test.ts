import { describe, expect, it } from 'vitest';
import { backoffMs } from './backoff';

// Hand arithmetic: base 30 s doubles per attempt (30, 60, 120, 240 s …) until the 15-minute cap.
describe('backoffMs', () => {
  it('doubles from the base and stops at the cap', () => {
    const mid = () => 0.5; // the middle of the jitter range: no jitter
    expect([1, 2, 3, 4, 5, 6].map((a) => backoffMs(a, { baseMs: 30_000, maxMs: 900_000, random: mid }))).toEqual([
      30_000, 60_000, 120_000, 240_000, 480_000, 900_000,
    ]);
    expect(backoffMs(80, { baseMs: 30_000, maxMs: 900_000, random: mid })).toBe(900_000);
  });
  it('spreads by ±25 % or, with full jitter, anywhere from 0 to the delay', () => {
    expect(backoffMs(2, { baseMs: 100, maxMs: 10_000, random: () => 0 })).toBe(150);
    expect(backoffMs(2, { baseMs: 100, maxMs: 10_000, random: () => 1 })).toBe(250);
    expect(backoffMs(3, { baseMs: 20, maxMs: 1_000, jitter: 'full', random: () => 0 })).toBe(0);
    expect(backoffMs(3, { baseMs: 20, maxMs: 1_000, jitter: 'full', random: () => 1 })).toBe(80);
    expect(backoffMs(9, { baseMs: 20, maxMs: 1_000, jitter: 'full', random: () => 1 })).toBe(1_000);
  });
});
