import { GAS_INFO, isLiquefiedGas, type GasCode } from './gases';
import { compressibility } from './eos';
import { pengRobinsonZ } from './peng-robinson';
import { criticalTemperatureK, vapourPressureBarAbs } from './saturation';

/**
 * How uncertain a mixture's Z is. The engine's mixture model (GERG-2008-type mixing, eos.ts) has no
 * reference values to check against here, so the spread to a second, independent published method is
 * shown beside every mixture result: Peng & Robinson (1976) with van der Waals one-fluid mixing
 * (k_ij = 0), each pure component's own Peng–Robinson error at (T, p) taken out by the factor
 * (Z_engine,i / Z_PR,i)^x_i where that component alone is a gas at (T, p) (N2O in the 50:50 mixture at
 * cylinder pressure is not, and is left uncorrected). The range is [min, max] of the two: a spread
 * between methods, not a confidence interval.
 */
export interface MixtureZRange {
  low: number;
  high: number;
  /** Z by the second method. */
  secondMethodZ: number;
  method: string;
}

export const MIXTURE_RANGE_METHOD =
  'spread between the engine’s mixture model and Peng–Robinson (1976, k_ij = 0) corrected by its error on each pure component that is a gas alone at this state';

/** Z range of a mixture at (T, p), or null for a pure gas. Arguments as compressibility(). */
export function mixtureZRange(gas: GasCode, temperatureK: number, pressureBarAbs: number): MixtureZRange | null {
  const parts = GAS_INFO[gas].components;
  if (!parts) return null;
  const z = compressibility(gas, temperatureK, pressureBarAbs).Z;
  let factor = 1;
  for (const c of parts) {
    const pure = c.gas as GasCode;
    if (isLiquefiedGas(pure) && temperatureK < criticalTemperatureK(pure) && pressureBarAbs >= vapourPressureBarAbs(pure, temperatureK)) continue;
    try {
      factor *= Math.pow(compressibility(pure, temperatureK, pressureBarAbs).Z / pengRobinsonZ(pure, temperatureK, pressureBarAbs), c.moleFraction);
    } catch {
      // a component outside the engine's range is left uncorrected
    }
  }
  const second = pengRobinsonZ(gas, temperatureK, pressureBarAbs) * factor;
  return { low: Math.min(z, second), high: Math.max(z, second), secondMethodZ: second, method: MIXTURE_RANGE_METHOD };
}
