import { compressedContents } from '../gas/contents';
import { freeGasLitresPerKg } from '../gas/reference-conditions';
import { isGasCode, isLiquefiedGas } from '../gas/gases';

/** Our name for a cylinder type: water capacity and fill pressure, e.g. "10 L · 200 bar". */
export function cylinderTypeName(waterCapacityL: number, fillPressureBar: number): string {
  const l = Number.isInteger(waterCapacityL) ? String(waterCapacityL) : waterCapacityL.toFixed(1);
  return `${l} L · ${Math.round(fillPressureBar)} bar`;
}

export interface NominalContents {
  /** Free gas at 15 °C and 1.01325 bar, litres: real gas. */
  freeGasL: number;
  /** The same by the ideal-gas law, to show the difference. */
  idealFreeGasL: number | null;
  /** Mass of gas, kg. */
  massKg: number;
  basis: string;
}

/**
 * Nominal contents of a full cylinder, computed by the gas engine (never typed in): compressed gases at
 * the nominal fill pressure (gauge) and 15 °C; liquefied gases at the maximum filling ratio.
 */
export function nominalContents(input: {
  gas: string;
  waterCapacityL: number;
  fillPressureBar: number;
  maxFillingRatioKgPerL: number | null;
}): NominalContents | null {
  const { gas } = input;
  if (!isGasCode(gas)) return null;
  try {
    if (isLiquefiedGas(gas)) {
      if (!input.maxFillingRatioKgPerL) return null;
      const massKg = input.maxFillingRatioKgPerL * input.waterCapacityL;
      return {
        freeGasL: massKg * freeGasLitresPerKg(gas, '15C'),
        idealFreeGasL: null,
        massKg,
        basis: `${input.maxFillingRatioKgPerL} kg/L filling ratio; free gas at 15 °C, 1.01325 bar`,
      };
    }
    const c = compressedContents({ gas, waterCapacityL: input.waterCapacityL, gaugeBar: input.fillPressureBar, temperatureC: 15, reference: '15C' });
    return {
      freeGasL: c.freeGasL,
      idealFreeGasL: c.idealFreeGasL,
      massKg: c.massKg,
      basis: `${input.fillPressureBar} bar gauge at 15 °C; free gas at 15 °C, 1.01325 bar`,
    };
  } catch {
    return null;
  }
}
