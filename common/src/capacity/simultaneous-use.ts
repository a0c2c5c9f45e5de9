/**
 * How many outlets run at once: the binomial method for small zones and the AS 2896-style
 * diversity factor. Pure functions, no I/O.
 */
import { InvalidInputError } from '../api/errors';

/** Largest outlet count the binomial method accepts: it holds one probability per count, and no zone comes near it. */
export const MAX_OUTLETS = 100_000;

function requireOutletCount(n: number, path = 'outlets'): void {
  if (!Number.isInteger(n) || n < 1) {
    throw new InvalidInputError(`The number of outlets must be a whole number of at least 1 (got ${n})`, [{ path, message: 'expected an integer ≥ 1' }]);
  }
  if (n > MAX_OUTLETS) {
    throw new InvalidInputError(`The number of outlets must be at most ${MAX_OUTLETS} (got ${n})`, [{ path, message: `expected at most ${MAX_OUTLETS}` }]);
  }
}

function requireProbability(p: number, path: string, open = false): void {
  const bad = !Number.isFinite(p) || p < 0 || p > 1 || (open && p === 0);
  if (bad) {
    throw new InvalidInputError(`${path} must lie ${open ? 'in (0, 1]' : 'in [0, 1]'} (got ${p})`, [
      { path, message: open ? 'expected 0 < value ≤ 1' : 'expected 0 ≤ value ≤ 1' },
    ]);
  }
}

/**
 * Binomial probabilities P(X = k), k = 0…n, for n outlets each in use with probability p,
 * independently (the binomial model of simultaneous use; see e.g. "Using probability to determine
 * medical gas flow", PM Engineer). Computed in log space so large n does not underflow.
 * @param n outlets (integer ≥ 1)
 * @param p probability that one outlet is in use at a given moment (0…1)
 */
export function computeBinomialProbabilities(n: number, p: number): number[] {
  requireOutletCount(n);
  requireProbability(p, 'use_probability');
  const pmf = new Array<number>(n + 1).fill(0);
  if (p === 0) {
    pmf[0] = 1;
    return pmf;
  }
  if (p === 1) {
    pmf[n] = 1;
    return pmf;
  }
  const logP = Math.log(p);
  const logQ = Math.log1p(-p);
  let logTerm = n * logQ; // ln P(X = 0)
  pmf[0] = Math.exp(logTerm);
  for (let k = 0; k < n; k++) {
    logTerm += Math.log(n - k) - Math.log(k + 1) + logP - logQ;
    pmf[k + 1] = Math.exp(logTerm);
  }
  return pmf;
}

/** Result of the binomial design count. */
export interface SimultaneousOutlets {
  /** outlets assumed in use at once */
  outletsInUse: number;
  /** P(X ≤ outletsInUse) */
  cumulativeProbability: number;
}

/**
 * Smallest k with P(X ≤ k) ≥ confidence, X ~ Binomial(n, p): the number of outlets to design for
 * so that the design flow is exceeded only with probability 1 − confidence.
 * @param n outlets (integer ≥ 1)
 * @param p use probability per outlet (0…1)
 * @param confidence wanted probability that no more than k run at once (0 < c ≤ 1)
 */
export function computeSimultaneousOutlets(n: number, p: number, confidence: number): SimultaneousOutlets {
  requireProbability(confidence, 'confidence', true);
  const pmf = computeBinomialProbabilities(n, p);
  // The lower tail is summed with Kahan compensation; the last few ulps decide ties at high confidence.
  let sum = 0;
  let carry = 0;
  for (let k = 0; k <= n; k++) {
    const y = pmf[k] - carry;
    const t = sum + y;
    carry = t - sum - y;
    sum = t;
    if (sum >= confidence) return { outletsInUse: k, cumulativeProbability: Math.min(1, sum) };
  }
  // Rounding can leave the full sum a hair under 1: all outlets in use is then the answer.
  return { outletsInUse: n, cumulativeProbability: 1 };
}

/**
 * Design flow by the binomial method: k outlets at full flow, k from computeSimultaneousOutlets.
 * @param n outlets
 * @param p use probability per outlet
 * @param confidence e.g. 0.99
 * @param flowPerOutletLMin design flow of one outlet, L/min free gas
 */
export function computeBinomialDesignFlowLMin(n: number, p: number, confidence: number, flowPerOutletLMin: number): number {
  if (!(flowPerOutletLMin > 0) || !Number.isFinite(flowPerOutletLMin)) {
    throw new InvalidInputError('The flow per outlet must be a positive number of L/min', [{ path: 'flow_per_outlet_L_min', message: 'expected > 0' }]);
  }
  return computeSimultaneousOutlets(n, p, confidence).outletsInUse * flowPerOutletLMin;
}

/**
 * AS 2896-style diversity factor F = 1.3 / log10(10·n), capped at 1 (0.65 at n = 10, 0.43 at 100;
 * as quoted in an IHEA seminar paper). Applied to the undiversified sum n × flow per outlet.
 * @param n outlets (integer ≥ 1)
 */
export function computeAs2896Factor(n: number): number {
  requireOutletCount(n);
  return Math.min(1, 1.3 / Math.log10(10 * n));
}

/**
 * Design flow with the AS 2896-style factor: n × flow per outlet × F(n).
 * @param n outlets
 * @param flowPerOutletLMin design flow of one outlet, L/min free gas
 */
export function computeAs2896DesignFlowLMin(n: number, flowPerOutletLMin: number): number {
  return n * flowPerOutletLMin * computeAs2896Factor(n);
}
