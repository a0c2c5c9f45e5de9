import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import {
  computeAs2896DesignFlowLMin,
  computeAs2896Factor,
  computeBinomialDesignFlowLMin,
  computeBinomialProbabilities,
  computeSimultaneousOutlets,
} from './simultaneous-use';

/** Direct count: walk all 2^n on/off states of n outlets and add up the probability of each count. */
function enumerateCounts(n: number, p: number): number[] {
  const byCount = new Array<number>(n + 1).fill(0);
  for (let state = 0; state < 1 << n; state++) {
    let on = 0;
    let prob = 1;
    for (let i = 0; i < n; i++) {
      if (state & (1 << i)) {
        on++;
        prob *= p;
      } else prob *= 1 - p;
    }
    byCount[on] += prob;
  }
  return byCount;
}

describe('binomial method against a direct count of all 2^n states', () => {
  it('probabilities agree for n ≤ 12', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 12 }), fc.double({ min: 0, max: 1, noNaN: true }), (n, p) => {
        const direct = enumerateCounts(n, p);
        const pmf = computeBinomialProbabilities(n, p);
        pmf.forEach((x, k) => expect(x).toBeCloseTo(direct[k], 12));
      }),
      { numRuns: 200 },
    );
  });

  it('design count is the smallest k with P(X ≤ k) ≥ confidence', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        fc.double({ min: 0.001, max: 0.999, noNaN: true }),
        fc.double({ min: 0.5, max: 0.9999, noNaN: true }),
        (n, p, confidence) => {
          const direct = enumerateCounts(n, p);
          let cum = 0;
          let k = 0;
          for (; k <= n; k++) {
            cum += direct[k];
            if (cum >= confidence) break;
          }
          // Skip draws that sit on a tie within rounding of the two summation orders.
          fc.pre(Math.abs(cum - confidence) > 1e-12 && k <= n);
          expect(computeSimultaneousOutlets(n, p, confidence).outletsInUse).toBe(k);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('binomial table value: n = 20, p = 0.1, 95 % → 4 outlets (P(X ≤ 4) = 0.9568)', () => {
    // cumulative binomial table, n = 20, p = 0.10: P(X ≤ 3) = 0.8670, P(X ≤ 4) = 0.9568
    const r = computeSimultaneousOutlets(20, 0.1, 0.95);
    expect(r.outletsInUse).toBe(4);
    expect(r.cumulativeProbability).toBeCloseTo(0.9568, 4);
    // 4 outlets × 10 L/min (UFC 4-510-01 patient-room O2 outlet: 10 L/min at 10 % use)
    expect(computeBinomialDesignFlowLMin(20, 0.1, 0.95, 10)).toBe(40);
  });

  it('large zones do not underflow: n = 2000, p = 0.5 sums to 1 with the median at 1000', () => {
    const pmf = computeBinomialProbabilities(2000, 0.5);
    expect(pmf.reduce((s, x) => s + x, 0)).toBeCloseTo(1, 9);
    expect(computeSimultaneousOutlets(2000, 0.5, 0.5).outletsInUse).toBe(1000);
  });

  it('edge probabilities: p = 0 needs no outlet, p = 1 needs all, confidence 1 needs all', () => {
    expect(computeSimultaneousOutlets(8, 0, 0.99).outletsInUse).toBe(0);
    expect(computeSimultaneousOutlets(8, 1, 0.99).outletsInUse).toBe(8);
    expect(computeSimultaneousOutlets(8, 0.3, 1).outletsInUse).toBe(8);
  });

  it('refuses bad input', () => {
    expect(() => computeBinomialProbabilities(0, 0.5)).toThrow(InvalidInputError);
    expect(() => computeBinomialProbabilities(3, 1.2)).toThrow(InvalidInputError);
    expect(() => computeSimultaneousOutlets(3, 0.2, 0)).toThrow(InvalidInputError);
    expect(() => computeBinomialDesignFlowLMin(3, 0.2, 0.9, 0)).toThrow(InvalidInputError);
  });
});

describe('AS 2896-style factor F = 1.3/log10(10n), capped at 1', () => {
  it('0.65 at n = 10 and 0.43 at n = 100', () => {
    // IHEA seminar paper on AS 2896: 0.65 at 10, 0.43 at 100
    expect(computeAs2896Factor(10)).toBeCloseTo(0.65, 12);
    expect(computeAs2896Factor(100)).toBeCloseTo(0.43, 2);
  });

  it('0.325 at n = 1000', () => {
    // computed: 1.3 / log10(10000) = 1.3 / 4 = 0.325
    expect(computeAs2896Factor(1000)).toBeCloseTo(0.325, 12);
  });

  it('is capped at 1 for a single outlet and never exceeds 1', () => {
    // 1.3/log10(10) = 1.3 > 1 → capped
    expect(computeAs2896Factor(1)).toBe(1);
    fc.assert(fc.property(fc.integer({ min: 1, max: 100000 }), (n) => computeAs2896Factor(n) <= 1));
  });

  it('design flow = n × flow × F: 10 outlets of 10 L/min → 65 L/min', () => {
    // F(10) = 0.65 (IHEA seminar paper)
    expect(computeAs2896DesignFlowLMin(10, 10)).toBeCloseTo(65, 9);
  });
});
