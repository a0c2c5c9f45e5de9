import type { LiquefiedGasCode } from './gases';
import { requireFinite, fail } from './validate-input';

/**
 * Saturation (liquid–vapour) ancillary equations of the liquefied medical gases.
 *
 * CO2: Span & Wagner (1996), J. Phys. Chem. Ref. Data 25, 1509, Eqs. 3.13–3.15 (vapour pressure,
 *   saturated liquid and vapour density), Tc = 304.1282 K, pc = 7.3773 MPa, ρc = 467.6 kg/m³.
 * N2O: the ancillary equations published with the Lemmon & Span (2006) short equation of state
 *   (J. Chem. Eng. Data 51, 785; ancillaries by E. W. Lemmon, as distributed with the equation's
 *   fluid file), Tc = 309.52 K, pc = 7.245 MPa, ρc = 10.27 mol/dm³ = 452.01 kg/m³.
 * Both agree with the full equations of state (equal pressure and Gibbs energy of both phases) to
 * better than 0.01 % in pressure and 0.03 % in density over 253–303 K (reference table in tests/reference).
 */

interface Ancillary {
  n: readonly number[];
  t: readonly number[];
}

interface SaturationSet {
  criticalTemperatureK: number;
  criticalPressureBarAbs: number;
  criticalDensityKgM3: number;
  minTemperatureK: number;
  /** ln(p/pc) = (Tc/T)·Σ nᵢθ^tᵢ, θ = 1 − T/Tc */
  vapourPressure: Ancillary;
  liquidDensity: Ancillary;
  liquidDensityForm: 'exp' | 'linear';
  /** ln(ρ''/ρc) = Σ nᵢθ^tᵢ */
  vapourDensity: Ancillary;
}

const SATURATION: Record<LiquefiedGasCode, SaturationSet> = {
  CO2: {
    criticalTemperatureK: 304.1282,
    criticalPressureBarAbs: 73.773,
    criticalDensityKgM3: 467.6,
    minTemperatureK: 216.592, // triple point
    vapourPressure: { n: [-7.0602087, 1.9391218, -1.6463597, -3.2995634], t: [1, 1.5, 2, 4] },
    // ln(ρ'/ρc) = Σ nᵢθ^tᵢ
    liquidDensity: { n: [1.9245108, -0.62385555, -0.32731127, 0.39245142], t: [0.34, 0.5, 10 / 6, 11 / 6] },
    liquidDensityForm: 'exp',
    vapourDensity: { n: [-1.7074879, -0.8227467, -4.6008549, -10.111178, -29.742252], t: [0.34, 0.5, 1, 7 / 3, 14 / 3] },
  },
  N2O: {
    criticalTemperatureK: 309.52,
    criticalPressureBarAbs: 72.45,
    criticalDensityKgM3: 10.27 * 44.0128,
    minTemperatureK: 182.33, // triple point
    vapourPressure: { n: [-6.9078, 2.662, -2.2386, -3.8002, 0.76922], t: [1, 1.5, 1.9, 4.8, 5.8] },
    // ρ'/ρc = 1 + Σ nᵢθ^tᵢ
    liquidDensity: { n: [6.7919, -16.069, 25.632, -20.755, 7.1963], t: [0.47, 0.72, 1, 1.3, 1.6] },
    liquidDensityForm: 'linear',
    vapourDensity: { n: [-3.1287, -77.651, 214.42, -478.09, 751.85, -462.79], t: [0.409, 1.91, 2.33, 3, 3.6, 4] },
  },
};

function sumPowers(a: Ancillary, theta: number): number {
  let s = 0;
  for (let i = 0; i < a.n.length; i++) s += a.n[i] * Math.pow(theta, a.t[i]);
  return s;
}

function theta(gas: LiquefiedGasCode, temperatureK: number): number {
  const s = SATURATION[gas];
  requireFinite('temperatureK', temperatureK, 'Temperature');
  if (temperatureK < s.minTemperatureK || temperatureK > s.criticalTemperatureK) {
    fail(
      'temperatureK',
      `saturation exists only between the triple point (${s.minTemperatureK} K) and the critical point (${s.criticalTemperatureK} K)`,
      `No liquid–vapour saturation for ${gas} at ${temperatureK} K (range ${s.minTemperatureK}–${s.criticalTemperatureK} K)`,
    );
  }
  return 1 - temperatureK / s.criticalTemperatureK;
}

/** Critical temperature of a liquefied gas, K. */
export function criticalTemperatureK(gas: LiquefiedGasCode): number {
  return SATURATION[gas].criticalTemperatureK;
}

/** Critical pressure of a liquefied gas, bar abs. */
export function criticalPressureBarAbs(gas: LiquefiedGasCode): number {
  return SATURATION[gas].criticalPressureBarAbs;
}

/**
 * Vapour pressure, bar abs (Wagner-type ancillary: Span & Wagner 1996 for CO2; Lemmon & Span 2006
 * ancillary for N2O). @param temperatureK between the triple and the critical point, K.
 */
export function vapourPressureBarAbs(gas: LiquefiedGasCode, temperatureK: number): number {
  const th = theta(gas, temperatureK);
  const s = SATURATION[gas];
  return s.criticalPressureBarAbs * Math.exp((s.criticalTemperatureK / temperatureK) * sumPowers(s.vapourPressure, th));
}

/** Saturated liquid density, kg/m³ (ancillary equations as above). @param temperatureK K. */
export function saturatedLiquidDensityKgM3(gas: LiquefiedGasCode, temperatureK: number): number {
  const th = theta(gas, temperatureK);
  const s = SATURATION[gas];
  const sum = sumPowers(s.liquidDensity, th);
  return s.criticalDensityKgM3 * (s.liquidDensityForm === 'exp' ? Math.exp(sum) : 1 + sum);
}

/** Saturated vapour density, kg/m³ (ancillary equations as above). @param temperatureK K. */
export function saturatedVapourDensityKgM3(gas: LiquefiedGasCode, temperatureK: number): number {
  const th = theta(gas, temperatureK);
  const s = SATURATION[gas];
  return s.criticalDensityKgM3 * Math.exp(sumPowers(s.vapourDensity, th));
}
