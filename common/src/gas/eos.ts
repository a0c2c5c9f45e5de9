import { InvalidInputError } from '../api/errors';
import { GAS_INFO, MAX_PRESSURE_BAR_ABS, PURE_FLUIDS, isGasCode, isLiquefiedGas, type GasCode } from './gases';
import { criticalTemperatureK, saturatedVapourDensityKgM3, vapourPressureBarAbs } from './saturation';
import { equationFor } from './equations';
import { solution, solveGasDensity, zFromDensity } from './helmholtz-model';
import { REFERENCE_EOS, referenceGasDensityMolM3, referenceZ, refineGasDensityMolM3 } from './reference-eos';

/**
 * Real-gas engine entry points: compressibility factor and density of every Plenum gas from (T, p),
 * computed at run time from short Helmholtz-energy equations (see equations.ts for which equation
 * serves which gas, coefficients.ts for how the fitted ones were made).
 *
 * Supported: 200–400 K (CO2 from 220 K, the 50:50 N2O/O2 mixture from 233.15 K), 0 < p ≤ 350 bar
 * abs, gas and supercritical states. CO2 and N2O above their vapour pressure below the critical
 * temperature are liquid and rejected. Accuracy against the reference equations over 233–333 K,
 * 1–300 bar: see the unit tests (≤ 0.1 % in Z for O2, N2, air, Ar, He; ≤ 0.5 % for CO2 and N2O
 * outside the critical region). Mixtures: GERG-2008 mixing, no reference values to check against.
 * CO2 within 10 K and 20 bar of its critical point: the full Span & Wagner (1996) equation.
 */

export type Phase = 'gas' | 'supercritical' | 'liquid';

export interface CompressibilityResult {
  /** Compressibility factor Z = p/(ρ·R·T). */
  Z: number;
  densityKgM3: number;
  /** p·M/(R·T) */
  idealDensityKgM3: number;
  phase: Exclude<Phase, 'liquid'>;
  method: string;
}

function pseudoCritical(gas: GasCode): { temperatureK: number; pressureBarAbs: number } {
  const info = GAS_INFO[gas];
  const parts = info.components ?? [{ gas: gas as keyof typeof PURE_FLUIDS, moleFraction: 1 }];
  let t = 0;
  let p = 0;
  for (const c of parts) {
    t += c.moleFraction * PURE_FLUIDS[c.gas].criticalTemperatureK;
    p += c.moleFraction * PURE_FLUIDS[c.gas].criticalPressureBarAbs;
  }
  return { temperatureK: t, pressureBarAbs: p };
}

/** Checks gas, temperature and pressure against the supported range; throws InvalidInputError. */
export function validateState(gas: GasCode, temperatureK: number, pressureBarAbs: number): void {
  if (!isGasCode(gas)) {
    throw new InvalidInputError(`Unknown gas "${String(gas)}"`, [{ path: 'gas', message: 'unknown gas code' }]);
  }
  const info = GAS_INFO[gas];
  if (typeof temperatureK !== 'number' || !Number.isFinite(temperatureK)) {
    throw new InvalidInputError(`Temperature must be a finite number, got ${String(temperatureK)}`, [
      { path: 'temperatureK', message: 'expected a finite number' },
    ]);
  }
  if (typeof pressureBarAbs !== 'number' || !Number.isFinite(pressureBarAbs)) {
    throw new InvalidInputError(`Pressure must be a finite number, got ${String(pressureBarAbs)}`, [
      { path: 'pressureBarAbs', message: 'expected a finite number' },
    ]);
  }
  if (temperatureK < info.minTemperatureK || temperatureK > info.maxTemperatureK) {
    throw new InvalidInputError(
      `Temperature ${round(temperatureK, 3)} K (${round(temperatureK - 273.15, 2)} °C) is outside the supported range for ${info.name}: ${info.minTemperatureK}–${info.maxTemperatureK} K (${round(info.minTemperatureK - 273.15, 2)} to ${round(info.maxTemperatureK - 273.15, 2)} °C)`,
      [{ path: 'temperatureK', message: `must be between ${info.minTemperatureK} and ${info.maxTemperatureK} K` }],
    );
  }
  if (pressureBarAbs <= 0) {
    throw new InvalidInputError(`Absolute pressure must be greater than zero, got ${pressureBarAbs} bar`, [
      { path: 'pressureBarAbs', message: 'must be greater than zero (absolute)' },
    ]);
  }
  if (pressureBarAbs > MAX_PRESSURE_BAR_ABS) {
    throw new InvalidInputError(`Pressure ${pressureBarAbs} bar abs is above the supported maximum of ${MAX_PRESSURE_BAR_ABS} bar abs`, [
      { path: 'pressureBarAbs', message: `must be at most ${MAX_PRESSURE_BAR_ABS} bar abs` },
    ]);
  }
  if (isLiquefiedGas(gas) && temperatureK < criticalTemperatureK(gas)) {
    const ps = vapourPressureBarAbs(gas, temperatureK);
    if (pressureBarAbs > ps) {
      throw new InvalidInputError(
        `${info.name} at ${round(temperatureK - 273.15, 2)} °C and ${round(pressureBarAbs, 3)} bar abs is liquid (vapour pressure ${round(ps, 3)} bar abs): the gas-phase equation does not apply; weigh liquefied-gas cylinders instead`,
        [{ path: 'pressureBarAbs', message: `liquid state: above the vapour pressure ${round(ps, 3)} bar abs` }],
      );
    }
  }
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/**
 * Compressibility factor and density of a gas at (T, p).
 * @param temperatureK absolute temperature, K (range per gas, GAS_INFO)
 * @param pressureBarAbs absolute pressure, bar (0 < p ≤ 350)
 * Throws InvalidInputError for NaN, non-positive pressure, out-of-range temperature or a liquid state.
 */
export function compressibility(gas: GasCode, temperatureK: number, pressureBarAbs: number): CompressibilityResult {
  validateState(gas, temperatureK, pressureBarAbs);
  const Z = solveZ(gas, temperatureK, pressureBarAbs);
  const eq = equationFor(gas);
  const method = gas === 'CO2' && inCo2CriticalRegion(temperatureK, pressureBarAbs) ? CO2_CRITICAL_METHOD : eq.method;
  const M = GAS_INFO[gas].molarMassKgMol;
  // the equation's own gas constant keeps Z = p/(ρRT) exactly as the reference equation defines it
  const idealDensityKgM3 = (pressureBarAbs * 1e5 * M) / (eq.gasConstant * temperatureK);
  const pc = pseudoCritical(gas);
  return {
    Z,
    densityKgM3: idealDensityKgM3 / Z,
    idealDensityKgM3,
    phase: temperatureK > pc.temperatureK && pressureBarAbs > pc.pressureBarAbs ? 'supercritical' : 'gas',
    method,
  };
}

const CO2_CRITICAL = { temperatureK: 304.1282, pressureBarAbs: 73.773 };
const CO2_CRITICAL_METHOD = 'Span & Wagner (1996) reference equation of state (CO2 critical region: within 10 K and 20 bar of the critical point)';

/**
 * Near its critical point CO2 is so compressible that no short form follows it (the fitted one is
 * several % off there and can even loop), so these rare states use the full reference equation.
 */
function inCo2CriticalRegion(temperatureK: number, pressureBarAbs: number): boolean {
  return Math.abs(temperatureK - CO2_CRITICAL.temperatureK) <= 10 && Math.abs(pressureBarAbs - CO2_CRITICAL.pressureBarAbs) <= 20;
}

/** Z at (T, p) without input checks (callers validate); throws if no gas-side root exists. */
function solveZ(gas: GasCode, temperatureK: number, pressureBarAbs: number): number {
  if (gas === 'CO2' && inCo2CriticalRegion(temperatureK, pressureBarAbs)) return co2CriticalRegionZ(temperatureK, pressureBarAbs);
  solveGasDensity(equationFor(gas), temperatureK, pressureBarAbs * 1e5);
  if (!solution.converged) {
    throw new InvalidInputError(
      `No gas-phase state of ${GAS_INFO[gas].name} at ${round(temperatureK, 2)} K and ${round(pressureBarAbs, 3)} bar abs (too close to condensation or the critical point)`,
      [{ path: 'pressureBarAbs', message: 'no gas-phase solution at this state' }],
    );
  }
  return solution.Z;
}

/**
 * CO2 near its critical point from the Span & Wagner (1996) equation: Newton from the short
 * equation's density (a few % off here), or a bracketing march where that start fails. Below the
 * critical temperature the root must stay on the vapour side of saturation.
 */
function co2CriticalRegionZ(temperatureK: number, pressureBarAbs: number): number {
  const eos = REFERENCE_EOS.CO2;
  const pressurePa = pressureBarAbs * 1e5;
  solveGasDensity(equationFor('CO2'), temperatureK, pressurePa);
  let rho: number | null = null;
  if (solution.converged) {
    rho = refineGasDensityMolM3(eos, temperatureK, pressurePa, solution.delta * equationFor('CO2').reducingDensityMolM3);
    if (rho !== null && temperatureK < CO2_CRITICAL.temperatureK) {
      const vapourSide = (1.02 * saturatedVapourDensityKgM3('CO2', temperatureK)) / eos.molarMassKgMol;
      if (rho > vapourSide) rho = null;
    }
  }
  if (rho === null) rho = referenceGasDensityMolM3(eos, temperatureK, pressurePa);
  return referenceZ(eos, temperatureK, rho);
}

/** Z only, validated (the fast path for callers that need no density). Arguments as compressibility(). */
export function compressibilityFactor(gas: GasCode, temperatureK: number, pressureBarAbs: number): number {
  validateState(gas, temperatureK, pressureBarAbs);
  return solveZ(gas, temperatureK, pressureBarAbs);
}

/** Molar density, mol/m³, at (T, p). Arguments as for compressibility(). */
export function molarDensityMolM3(gas: GasCode, temperatureK: number, pressureBarAbs: number): number {
  const Z = compressibilityFactor(gas, temperatureK, pressureBarAbs);
  return (pressureBarAbs * 1e5) / (Z * equationFor(gas).gasConstant * temperatureK);
}

/**
 * Absolute pressure, bar, of a gas at temperature T and molar density ρ: p = ρ·R·T·Z(T, ρ), straight
 * from the equation (no iteration), the inverse of molarDensityMolM3.
 * @param temperatureK K (range per gas); @param molarDensity mol/m³ (≥ 0)
 */
export function pressureFromMolarDensity(gas: GasCode, temperatureK: number, molarDensity: number): number {
  if (!isGasCode(gas)) throw new InvalidInputError(`Unknown gas "${String(gas)}"`, [{ path: 'gas', message: 'unknown gas code' }]);
  const info = GAS_INFO[gas];
  if (!Number.isFinite(temperatureK) || temperatureK < info.minTemperatureK || temperatureK > info.maxTemperatureK) {
    throw new InvalidInputError(`Temperature ${temperatureK} K is outside the supported range for ${info.name}`, [
      { path: 'temperatureK', message: `must be between ${info.minTemperatureK} and ${info.maxTemperatureK} K` },
    ]);
  }
  if (!Number.isFinite(molarDensity) || molarDensity < 0) {
    throw new InvalidInputError(`Density must be a non-negative finite number, got ${molarDensity}`, [{ path: 'molarDensity', message: 'must be ≥ 0' }]);
  }
  const eq = equationFor(gas);
  const p = (molarDensity * eq.gasConstant * temperatureK * zFromDensity(eq, temperatureK, molarDensity)) / 1e5;
  if (gas === 'CO2' && inCo2CriticalRegion(temperatureK, p)) {
    return (molarDensity * eq.gasConstant * temperatureK * referenceZ(REFERENCE_EOS.CO2, temperatureK, molarDensity)) / 1e5;
  }
  return p;
}
