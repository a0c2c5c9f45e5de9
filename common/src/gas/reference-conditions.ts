import { GAS_INFO, R_J_MOL_K, type GasCode } from './gases';
import { molarDensityMolM3 } from './eos';
import { STANDARD_ATMOSPHERE_BAR } from './units';

/**
 * Reference (standard) conditions that free-gas volumes are stated at. Volumes are only comparable
 * on the same basis, so every volume in Plenum carries its reference code.
 * - 15C: 15 °C, 1.01325 bar, the UK/EU cylinder basis (ISO 13443 metric standard conditions).
 * - 21C: 70 °F (294.261 K), 14.696 psia = 1.01325 bar, the US medical-gas "scf" basis.
 * - 0C: 0 °C, 1.01325 bar ("normal" m³, DIN 1343).
 */
export type ReferenceCode = '15C' | '21C' | '0C';

export const REFERENCE_CODES: readonly ReferenceCode[] = ['15C', '21C', '0C'];

export { STANDARD_ATMOSPHERE_BAR };

export const REFERENCE_CONDITIONS: Record<ReferenceCode, { temperatureK: number; pressureBarAbs: number; label: string }> = {
  '15C': { temperatureK: 288.15, pressureBarAbs: STANDARD_ATMOSPHERE_BAR, label: '15 °C, 1.01325 bar' },
  // 70 °F exactly: (70 − 32)·5/9 + 273.15
  '21C': { temperatureK: 273.15 + ((70 - 32) * 5) / 9, pressureBarAbs: STANDARD_ATMOSPHERE_BAR, label: '70 °F (21.1 °C), 14.696 psia' },
  '0C': { temperatureK: 273.15, pressureBarAbs: STANDARD_ATMOSPHERE_BAR, label: '0 °C, 1.01325 bar' },
};

export function isReferenceCode(value: unknown): value is ReferenceCode {
  return typeof value === 'string' && (REFERENCE_CODES as readonly string[]).includes(value);
}

const molarVolumeCache = new Map<string, number>();

/**
 * Real molar volume of a gas at the reference state, L/mol: Z(T_ref, p_ref)·R·T_ref/p_ref, i.e. the
 * inverse of the engine's density there (eos.ts), so moles in and litres out use one equation.
 */
export function referenceMolarVolumeLMol(gas: GasCode, reference: ReferenceCode): number {
  const key = `${gas}|${reference}`;
  let v = molarVolumeCache.get(key);
  if (v === undefined) {
    const ref = REFERENCE_CONDITIONS[reference];
    v = 1000 / molarDensityMolM3(gas, ref.temperatureK, ref.pressureBarAbs);
    molarVolumeCache.set(key, v);
  }
  return v;
}

/** Ideal molar volume at the reference state, L/mol: R·T_ref/p_ref. */
export function idealReferenceMolarVolumeLMol(reference: ReferenceCode): number {
  const ref = REFERENCE_CONDITIONS[reference];
  return ((R_J_MOL_K * ref.temperatureK) / (ref.pressureBarAbs * 1e5)) * 1000;
}

/**
 * Free-gas litres per kilogram of a gas at the reference state (real gas): Z·R·T/(p·M).
 * E.g. oxygen at 15 °C: ≈ 738 L/kg.
 */
export function freeGasLitresPerKg(gas: GasCode, reference: ReferenceCode): number {
  return referenceMolarVolumeLMol(gas, reference) / GAS_INFO[gas].molarMassKgMol;
}
