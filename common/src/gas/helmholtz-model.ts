/**
 * Evaluation and density solution of short Helmholtz-energy equations of the form of
 * Span & Wagner (2003): α^r(δ, τ) = Σ nᵢ δ^dᵢ τ^tᵢ exp(−δ^lᵢ), Z = 1 + δ ∂α^r/∂δ.
 *
 * A multi-fluid mixture (Kunz & Wagner 2012) shares one δ and one τ across its components, so it
 * compiles into the same flat term list with each nᵢ multiplied by the component's mole fraction
 * and the mixture's reducing temperature and density. Pure gases and mixtures then run the same
 * loop.
 */

export interface TermList {
  n: readonly number[];
  d: readonly number[];
  t: readonly number[];
  l: readonly number[];
}

export interface CompiledEquation {
  method: string;
  reducingTemperatureK: number;
  reducingDensityMolM3: number;
  gasConstant: number;
  size: number;
  n: Float64Array;
  d: Float64Array;
  t: Float64Array;
  l: Float64Array;
  /** index into the exp(−δ^l) table for each term (0 = no exponential) */
  lSlot: Int32Array;
  /** distinct l values > 0, slot k+1 holds exp(−δ^lValues[k]) */
  lValues: number[];
  maxD: number;
  /** nᵢ τ^tᵢ for the last τ, refreshed by setTemperature */
  a: Float64Array;
  lastTau: number;
}

/** Compiles one or more term lists (weights = mole fractions) into one equation. */
export function compileEquation(
  method: string,
  reducingTemperatureK: number,
  reducingDensityMolM3: number,
  gasConstant: number,
  parts: readonly { terms: TermList; weight: number }[],
): CompiledEquation {
  const n: number[] = [];
  const d: number[] = [];
  const t: number[] = [];
  const l: number[] = [];
  for (const { terms, weight } of parts) {
    for (let i = 0; i < terms.n.length; i++) {
      n.push(terms.n[i] * weight);
      d.push(terms.d[i]);
      t.push(terms.t[i]);
      l.push(terms.l[i]);
    }
  }
  const lValues = [...new Set(l.filter((v) => v > 0))].sort((x, y) => x - y);
  for (const v of d) if (!Number.isInteger(v) || v < 1) throw new Error(`density exponent ${v} must be a positive integer`);
  for (const v of lValues) if (!Number.isInteger(v)) throw new Error(`exponential exponent ${v} must be an integer`);
  return {
    method,
    reducingTemperatureK,
    reducingDensityMolM3,
    gasConstant,
    size: n.length,
    n: Float64Array.from(n),
    d: Float64Array.from(d),
    t: Float64Array.from(t),
    l: Float64Array.from(l),
    lSlot: Int32Array.from(l.map((v) => (v > 0 ? lValues.indexOf(v) + 1 : 0))),
    lValues,
    maxD: Math.max(...d, ...lValues),
    a: new Float64Array(n.length),
    lastTau: NaN,
  };
}

function setTemperature(eq: CompiledEquation, temperatureK: number): void {
  const tau = eq.reducingTemperatureK / temperatureK;
  if (tau === eq.lastTau) return;
  const { n, t, a, size } = eq;
  const lnTau = Math.log(tau);
  for (let i = 0; i < size; i++) a[i] = t[i] === 0 ? n[i] : n[i] * Math.exp(t[i] * lnTau);
  eq.lastTau = tau;
}

// scratch space shared by all equations (the engine is single-threaded)
const powers = new Float64Array(64);
const expSlot = new Float64Array(16);
const uSlot = new Float64Array(16);
let s1 = 0; // δ ∂α^r/∂δ
let s2 = 0; // δ² ∂²α^r/∂δ²

function evaluateDerivatives(eq: CompiledEquation, delta: number, wantSecond: boolean): void {
  const maxD = eq.maxD;
  powers[0] = 1;
  for (let k = 1; k <= maxD; k++) powers[k] = powers[k - 1] * delta;
  const lv = eq.lValues;
  expSlot[0] = 1;
  uSlot[0] = 0;
  for (let k = 0; k < lv.length; k++) {
    const u = powers[lv[k]];
    uSlot[k + 1] = u;
    expSlot[k + 1] = Math.exp(-u);
  }
  const { a, d, l, lSlot, size } = eq;
  let first = 0;
  let second = 0;
  for (let i = 0; i < size; i++) {
    const slot = lSlot[i];
    const b = a[i] * powers[d[i]] * expSlot[slot];
    const lu = l[i] * uSlot[slot];
    const g = d[i] - lu;
    first += b * g;
    if (wantSecond) second += b * (g * (g - 1) - l[i] * lu);
  }
  s1 = first;
  s2 = second;
}

/** Z at reduced density δ and the equation's current temperature. */
function zAt(eq: CompiledEquation, delta: number): number {
  evaluateDerivatives(eq, delta, false);
  return 1 + s1;
}

const MAX_REDUCED_DENSITY = 4;

/** Result slots of solveGasDensity (no allocation on the hot path). */
export const solution = { delta: 0, Z: 1, converged: false };

/**
 * Gas-side (vapour or supercritical) root of p = ρRT(1 + δ ∂α^r/∂δ) at (T, p): Newton on δ from a
 * second-virial start, kept inside a bracket that is narrowed on every step and bisected when
 * Newton leaves it or meets a non-positive slope (beyond the vapour spinodal).
 * Writes delta, Z and converged into `solution`.
 */
export function solveGasDensity(eq: CompiledEquation, temperatureK: number, pressurePa: number): void {
  setTemperature(eq, temperatureK);
  const target = pressurePa / (eq.reducingDensityMolM3 * eq.gasConstant * temperatureK);
  // virial start: Z ≈ 1 + b·δ + c·δ² from the low-density expansion of the terms, solved by two
  // Newton steps on the cubic (cheap: no exponentials)
  let b0 = 0;
  let c0 = 0;
  const { a, d, l, size } = eq;
  for (let i = 0; i < size; i++) {
    if (d[i] === 1) {
      b0 += a[i];
      if (l[i] === 1) c0 -= 2 * a[i];
    } else if (d[i] === 2) c0 += 2 * a[i];
  }
  const disc = 1 + 4 * b0 * target;
  let delta = b0 !== 0 && disc > 0 ? (2 * target) / (1 + Math.sqrt(disc)) : target;
  for (let k = 0; k < 2; k++) {
    const g = delta * (1 + delta * (b0 + delta * c0)) - target;
    const gp = 1 + delta * (2 * b0 + 3 * c0 * delta);
    if (gp <= 0) break;
    const next = delta - g / gp;
    if (!(next > 0 && next < MAX_REDUCED_DENSITY)) break;
    delta = next;
  }
  let lo = 0;
  // no supported state is denser than 4 ρ_r (liquid CO2 at its triple point is 2.5 ρ_c); the bracket
  // keeps Newton out of the far, unfitted range where the short forms mean nothing
  let hi = MAX_REDUCED_DENSITY;
  solution.converged = false;
  for (let k = 0; k < 60; k++) {
    evaluateDerivatives(eq, delta, true);
    const f = delta * (1 + s1) - target;
    const slope = 1 + 2 * s1 + s2;
    if (f === 0 && slope > 0) {
      solution.delta = delta;
      solution.Z = 1 + s1;
      solution.converged = true;
      return;
    }
    if (f > 0) hi = delta;
    else lo = delta;
    let next: number;
    if (slope <= 0) {
      // past the spinodal: the gas root lies at lower density
      hi = delta;
      next = 0.5 * (lo + hi);
    } else {
      next = delta - f / slope;
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    }
    if (Math.abs(next - delta) <= 1e-9 * delta) {
      // Newton converges quadratically: the error of `next` is far below 1e-15, and at the root
      // δ·Z = p/(ρ_r R T) holds exactly, so Z needs no further evaluation
      solution.delta = next;
      solution.Z = target / next;
      solution.converged = slope > 0;
      return;
    }
    delta = next;
  }
  solution.delta = delta;
  solution.Z = zAt(eq, delta);
}

/** Z from the equation at (T, ρ). @param molarDensityMolM3 mol/m³ */
export function zFromDensity(eq: CompiledEquation, temperatureK: number, molarDensityMolM3: number): number {
  setTemperature(eq, temperatureK);
  return zAt(eq, molarDensityMolM3 / eq.reducingDensityMolM3);
}

/** (∂p/∂ρ)_T / (RT) = 1 + 2δα^r_δ + δ²α^r_δδ at (T, ρ): positive on the gas side of the spinodal. */
export function reducedSlope(eq: CompiledEquation, temperatureK: number, molarDensityMolM3: number): number {
  setTemperature(eq, temperatureK);
  evaluateDerivatives(eq, molarDensityMolM3 / eq.reducingDensityMolM3, true);
  return 1 + 2 * s1 + s2;
}
