import type { ValueTransformer } from 'typeorm';

/**
 * Money sums in BIGINT columns (a quantity times a unit price passes 2^31 − 1 minor units). TypeORM runs
 * mysql2 with `supportBigNumbers` and `bigNumberStrings`, so a BIGINT comes back as a decimal string; this
 * reads it as a number, and refuses one past 2^53 − 1 (where a double would silently round) rather than
 * return a wrong amount. The schemas bound quantities and prices so no sum gets near it.
 */
export function bigintToNumber(v: unknown): number | null {
  if (v === null || v === undefined) return null;
  const n = typeof v === 'number' ? v : typeof v === 'string' && /^-?\d+$/.test(v) ? Number(v) : NaN;
  if (!Number.isSafeInteger(n)) throw new Error(`A money amount read from the database is not a safe integer: ${String(v).slice(0, 40)}`);
  return n;
}

/** The transformer of BIGINT money columns: numbers in, numbers out. */
export const bigintMoney: ValueTransformer = {
  to: (v: unknown) => v,
  from: (v: unknown) => bigintToNumber(v),
};
