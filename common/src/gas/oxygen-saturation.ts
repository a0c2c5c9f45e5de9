import { REFERENCE_EOS, referenceAlphaR, referenceGasDensityMolM3, referencePressurePa, referenceZ } from './reference-eos';
import { fail, requireFinite } from './validate-input';

/**
 * Saturated liquid oxygen from the engine's copy of the reference equation of state for oxygen
 * (Schmidt & Wagner 1985, reference-eos.ts): the phase equilibrium (equal pressure and equal Gibbs
 * energy of liquid and vapour) solved at run time, so no separate ancillary fit is needed.
 * Range: the triple point (54.36 K, 1.46 mbar) up to 50 bar abs (just below the critical point,
 * 154.581 K, 50.43 bar).
 */

const EOS = REFERENCE_EOS.O2;
const TC = EOS.reducingTemperatureK;
const RHO_C = EOS.reducingDensityMolM3;
const T_MIN = 54.36;
/** Highest pressure the saturated-liquid density is given for, bar abs (below the critical 50.43 bar). */
export const OXYGEN_SATURATION_MAX_BAR_ABS = 50;

/** Liquid-side density at (T, p), mol/m³: marches down from a dense liquid until the pressure falls below p, then bisects. */
function liquidDensity(temperatureK: number, pressurePa: number): number {
  let hi = 45_000; // denser than the triple-point liquid (≈ 40,800 mol/m³)
  let rho = hi;
  let lo = NaN;
  for (let k = 0; k < 5000; k++) {
    rho *= 0.998;
    if (rho < RHO_C) break;
    if (referencePressurePa(EOS, temperatureK, rho) < pressurePa) {
      lo = rho;
      break;
    }
    hi = rho;
  }
  if (Number.isNaN(lo)) throw new Error('no liquid root');
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (referencePressurePa(EOS, temperatureK, mid) > pressurePa) hi = mid;
    else lo = mid;
    if (hi - lo < 1e-12 * hi) break;
  }
  return 0.5 * (lo + hi);
}

/** Gibbs energy / RT of one phase at (T, ρ) less the ideal-gas terms common to both phases at the same T. */
function gibbsResidual(temperatureK: number, rho: number): number {
  const delta = rho / RHO_C;
  const tau = TC / temperatureK;
  return Math.log(delta) + referenceAlphaR(EOS, delta, tau) + referenceZ(EOS, temperatureK, rho);
}

/** Vapour pressure (Pa) and saturated densities (mol/m³) at T, by successive substitution on p. */
function saturationAt(temperatureK: number): { pressurePa: number; liquid: number; vapour: number } {
  // first guess: a two-constant vapour-pressure line through the triple and critical points
  let p = 5.043e6 * Math.exp(5.88 * (1 - TC / temperatureK));
  let liquid = 0;
  let vapour = 0;
  for (let k = 0; k < 100; k++) {
    liquid = liquidDensity(temperatureK, p);
    vapour = referenceGasDensityMolM3(EOS, temperatureK, p);
    const dg = (gibbsResidual(temperatureK, liquid) - gibbsResidual(temperatureK, vapour)) * EOS.gasConstant * temperatureK;
    const next = p - dg / (1 / liquid - 1 / vapour);
    if (Math.abs(next - p) < 1e-10 * p) {
      p = next;
      break;
    }
    p = Math.max(p * 0.5, Math.min(p * 1.5, next));
  }
  return { pressurePa: p, liquid, vapour };
}

export interface OxygenSaturation {
  temperatureK: number;
  pressureBarAbs: number;
  liquidDensityKgM3: number;
  vapourDensityKgM3: number;
}

/**
 * Saturated liquid and vapour oxygen at an absolute pressure (the liquid in a tank at its operating
 * pressure sits at this state): T_sat by the secant method on ln p against 1/T.
 * @param pressureBarAbs 0.01–50 bar abs
 */
export function oxygenSaturationAtPressure(pressureBarAbs: number): OxygenSaturation {
  requireFinite('pressureBarAbs', pressureBarAbs, 'Pressure');
  if (pressureBarAbs < 0.01 || pressureBarAbs > OXYGEN_SATURATION_MAX_BAR_ABS) {
    fail(
      'pressureBarAbs',
      `must be between 0.01 and ${OXYGEN_SATURATION_MAX_BAR_ABS} bar abs`,
      `Liquid oxygen is saturated between the triple point and the critical point: ${pressureBarAbs} bar abs is outside 0.01–${OXYGEN_SATURATION_MAX_BAR_ABS} bar abs`,
    );
  }
  const target = Math.log(pressureBarAbs * 1e5);
  let x0 = 1 / 90;
  let x1 = 1 / 120;
  let f0 = Math.log(saturationAt(1 / x0).pressurePa) - target;
  let f1 = Math.log(saturationAt(1 / x1).pressurePa) - target;
  for (let k = 0; k < 50 && Math.abs(f1) > 1e-10; k++) {
    let x2 = x1 - (f1 * (x1 - x0)) / (f1 - f0);
    x2 = Math.min(1 / T_MIN, Math.max(1 / (TC - 0.05), x2));
    x0 = x1;
    f0 = f1;
    x1 = x2;
    f1 = Math.log(saturationAt(1 / x1).pressurePa) - target;
  }
  const s = saturationAt(1 / x1);
  return {
    temperatureK: 1 / x1,
    pressureBarAbs: s.pressurePa / 1e5,
    liquidDensityKgM3: s.liquid * EOS.molarMassKgMol,
    vapourDensityKgM3: s.vapour * EOS.molarMassKgMol,
  };
}
