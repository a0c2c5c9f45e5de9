import { describe, expect, it } from 'vitest';
import { bigintToNumber } from './bigint-money';

describe('bigintToNumber (BIGINT money as the driver returns it)', () => {
  it('reads decimal strings beyond the 32-bit range as exact numbers', () => {
    // 2^31 − 1 = 2,147,483,647 is the largest INT; 10^10 minor units (£100,000,000.00) is past it.
    expect(bigintToNumber('10000000000')).toBe(10_000_000_000);
    expect(bigintToNumber('2147483648')).toBe(2 ** 31);
    expect(bigintToNumber('-250')).toBe(-250);
    expect(bigintToNumber('0')).toBe(0);
    expect(bigintToNumber(13_000)).toBe(13_000);
    expect(bigintToNumber(null)).toBeNull();
  });

  it('accepts the largest safe integer, 2^53 − 1 = 9,007,199,254,740,991, and refuses the next', () => {
    expect(bigintToNumber('9007199254740991')).toBe(Number.MAX_SAFE_INTEGER);
    // 2^53 + 1 has no exact double: Number() would round it to 2^53 without a word.
    expect(() => bigintToNumber('9007199254740993')).toThrow(/not a safe integer/);
    expect(() => bigintToNumber('9007199254740992')).toThrow(/not a safe integer/);
  });

  it('refuses what is not a whole number', () => {
    expect(() => bigintToNumber('12.5')).toThrow(/not a safe integer/);
    expect(() => bigintToNumber('')).toThrow(/not a safe integer/);
    expect(() => bigintToNumber('1e3')).toThrow(/not a safe integer/);
  });
});
