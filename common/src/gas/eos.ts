import { InvalidInputError } from '../api/errors';
import { GAS_INFO, MAX_PRESSURE_BAR_ABS, PURE_FLUIDS, R_J_MOL_K, isGasCode, isLiquefiedGas, type GasCode } from './gases';
import { pengRobinsonZ } from './peng-robinson';
import { criticalTemperatureK, vapourPressureBarAbs } from './saturation';

/**
 * Real-gas engine entry points: compressibility factor and density of every Plenum gas from (T, p).
 * PLACEHOLDER: Peng–Robinson (1976) until the fitted Helmholtz-energy equations land.
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
    throw new InvalidInputError(`Temperature must be a finite number, got ${String(temperatureK)}`, [{ path: 'temperatureK', message: 'expected a finite number' }]);
  }
  if (typeof pressureBarAbs !== 'number' || !Number.isFinite(pressureBarAbs)) {
    throw new InvalidInputError(`Pressure must be a finite number, got ${String(pressureBarAbs)}`, [{ path: 'pressureBarAbs', message: 'expected a finite number' }]);
  }
  if (temperatureK < info.minTemperatureK || temperatureK > info.maxTemperatureK) {
    throw new InvalidInputError(
      `Temperature ${round(temperatureK, 3)} K is outside the supported range for ${info.name} (${info.minTemperatureK}–${info.maxTemperatureK} K)`,
      [{ path: 'temperatureK', message: `must be between ${info.minTemperatureK} and ${info.maxTemperatureK} K` }],
    );
  }
  if (pressureBarAbs <= 0) {
    throw new InvalidInputError(`Absolute pressure must be greater than zero, got ${pressureBarAbs} bar`, [{ path: 'pressureBarAbs', message: 'must be greater than zero (absolute)' }]);
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
        `${info.name} at ${round(temperatureK, 2)} K and ${round(pressureBarAbs, 3)} bar abs is liquid (vapour pressure ${round(ps, 3)} bar abs); the gas-phase equation does not apply`,
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
  const M = GAS_INFO[gas].molarMassKgMol;
  const Z = pengRobinsonZ(gas, temperatureK, pressureBarAbs);
  const idealDensityKgM3 = (pressureBarAbs * 1e5 * M) / (R_J_MOL_K * temperatureK);
  const pc = pseudoCritical(gas);
  return {
    Z,
    densityKgM3: idealDensityKgM3 / Z,
    idealDensityKgM3,
    phase: temperatureK > pc.temperatureK && pressureBarAbs > pc.pressureBarAbs ? 'supercritical' : 'gas',
    method: 'Peng–Robinson 1976 (placeholder)',
  };
}

/** Molar density, mol/m³, at (T, p). Arguments as for compressibility(). */
export function molarDensityMolM3(gas: GasCode, temperatureK: number, pressureBarAbs: number): number {
  const { densityKgM3 } = compressibility(gas, temperatureK, pressureBarAbs);
  return densityKgM3 / GAS_INFO[gas].molarMassKgMol;
}

/**
 * Absolute pressure, bar, of a gas at temperature T and molar density ρ (the inverse of
 * molarDensityMolM3). Placeholder: secant iteration on the PR density.
 */
export function pressureFromMolarDensity(gas: GasCode, temperatureK: number, molarDensityMolM3_: number): number {
  let p = (molarDensityMolM3_ * R_J_MOL_K * temperatureK) / 1e5;
  for (let i = 0; i < 50; i++) {
    const z = pengRobinsonZ(gas, temperatureK, p);
    const next = (molarDensityMolM3_ * z * R_J_MOL_K * temperatureK) / 1e5;
    if (Math.abs(next - p) < 1e-10 * p) return next;
    p = next;
  }
  return p;
}
