import { hasKey } from '../api/lookup';
import { requireFinite, requirePositive, fail } from './validate-input';

/**
 * Unit conversions for pressures, volumes and temperatures.
 *
 * The factors are the exact definitions (1 psi = 6894.757293168 Pa from 1 lbf/in² with the
 * international pound and inch; 1 ft³ = 0.028316846592 m³; °F and K by definition). The convert-units
 * package (2.3.4) rounds these (psi→bar 0.0689476 instead of 0.068947573, ft³→L 28.316832 instead of
 * 28.316847, both ~5e-7 relative) and looks units up by name on every call, so the engine uses
 * the exact constants; units.test.ts cross-checks them against convert-units.
 *
 * Gauge and absolute pressure differ by the local atmospheric pressure, which every conversion
 * between them takes explicitly.
 */

export const PA_PER_BAR = 1e5;
export const PA_PER_PSI = 6894.757293168361;
export const BAR_PER_PSI = PA_PER_PSI / PA_PER_BAR;
export const LITRES_PER_CUBIC_FOOT = 28.316846592;
export const LITRES_PER_CUBIC_METRE = 1000;
export const STANDARD_ATMOSPHERE_BAR = 1.01325;

export type PressureUnit = 'bar_g' | 'bar_a' | 'psi_g' | 'psi_a' | 'kPa_g' | 'kPa_a' | 'MPa_g' | 'MPa_a';
export type VolumeUnit = 'L' | 'm3' | 'ft3';
export type TemperatureUnit = 'C' | 'F' | 'K';

export const PRESSURE_UNITS: readonly PressureUnit[] = ['bar_g', 'bar_a', 'psi_g', 'psi_a', 'kPa_g', 'kPa_a', 'MPa_g', 'MPa_a'];
export const VOLUME_UNITS: readonly VolumeUnit[] = ['L', 'm3', 'ft3'];
export const TEMPERATURE_UNITS: readonly TemperatureUnit[] = ['C', 'F', 'K'];

const BAR_PER_PRESSURE_UNIT: Record<string, number> = { bar: 1, psi: BAR_PER_PSI, kPa: 0.01, MPa: 10 };

/** Gauge → absolute, bar: p_abs = p_gauge + p_atm. @param atmosphericBar local atmospheric pressure, bar abs. */
export function gaugeToAbsoluteBar(gaugeBar: number, atmosphericBar: number = STANDARD_ATMOSPHERE_BAR): number {
  requireFinite('gaugeBar', gaugeBar, 'Gauge pressure');
  requirePositive('atmosphericBar', atmosphericBar, 'Atmospheric pressure');
  return gaugeBar + atmosphericBar;
}

/** Absolute → gauge, bar. @param atmosphericBar local atmospheric pressure, bar abs. */
export function absoluteToGaugeBar(absoluteBar: number, atmosphericBar: number = STANDARD_ATMOSPHERE_BAR): number {
  requireFinite('absoluteBar', absoluteBar, 'Absolute pressure');
  requirePositive('atmosphericBar', atmosphericBar, 'Atmospheric pressure');
  return absoluteBar - atmosphericBar;
}

/** psi → bar (same reference, gauge or absolute). */
export function psiToBar(psi: number): number {
  return requireFinite('psi', psi, 'Pressure') * BAR_PER_PSI;
}

/** bar → psi (same reference, gauge or absolute). */
export function barToPsi(bar: number): number {
  return requireFinite('bar', bar, 'Pressure') / BAR_PER_PSI;
}

export function kPaToBar(kPa: number): number {
  return requireFinite('kPa', kPa, 'Pressure') / 100;
}
export function barToKPa(bar: number): number {
  return requireFinite('bar', bar, 'Pressure') * 100;
}
export function mPaToBar(mPa: number): number {
  return requireFinite('MPa', mPa, 'Pressure') * 10;
}
export function barToMPa(bar: number): number {
  return requireFinite('bar', bar, 'Pressure') / 10;
}

/**
 * Converts a pressure between any of bar, psi, kPa and MPa, gauge (`_g`) or absolute (`_a`).
 * @param atmosphericBar local atmospheric pressure, bar abs; required whenever gauge and absolute meet
 */
export function convertPressure(value: number, from: PressureUnit, to: PressureUnit, atmosphericBar?: number): number {
  requireFinite('value', value, 'Pressure');
  const [fromUnit, fromRef] = splitPressureUnit(from, 'from');
  const [toUnit, toRef] = splitPressureUnit(to, 'to');
  let bar = value * BAR_PER_PRESSURE_UNIT[fromUnit];
  if (fromRef !== toRef) {
    if (atmosphericBar === undefined) {
      fail('atmosphericBar', 'needed to convert between gauge and absolute pressure', `Converting ${from} to ${to} needs the atmospheric pressure`);
    }
    requirePositive('atmosphericBar', atmosphericBar, 'Atmospheric pressure');
    bar = fromRef === 'g' ? bar + atmosphericBar : bar - atmosphericBar;
  }
  return bar / BAR_PER_PRESSURE_UNIT[toUnit];
}

function splitPressureUnit(unit: PressureUnit, path: string): [string, 'g' | 'a'] {
  if (!(PRESSURE_UNITS as readonly string[]).includes(unit)) fail(path, `unknown pressure unit "${String(unit)}"`);
  const [u, ref] = unit.split('_');
  return [u, ref as 'g' | 'a'];
}

const LITRES_PER_VOLUME_UNIT: Record<VolumeUnit, number> = { L: 1, m3: LITRES_PER_CUBIC_METRE, ft3: LITRES_PER_CUBIC_FOOT };

/** Converts a volume between L, m³ and ft³ (same reference conditions on both sides). */
export function convertVolume(value: number, from: VolumeUnit, to: VolumeUnit): number {
  requireFinite('value', value, 'Volume');
  if (!hasKey(LITRES_PER_VOLUME_UNIT, from)) fail('from', `unknown volume unit "${String(from)}"`);
  if (!hasKey(LITRES_PER_VOLUME_UNIT, to)) fail('to', `unknown volume unit "${String(to)}"`);
  return (value * LITRES_PER_VOLUME_UNIT[from]) / LITRES_PER_VOLUME_UNIT[to];
}

export function litresToCubicFeet(litres: number): number {
  return convertVolume(litres, 'L', 'ft3');
}
export function cubicFeetToLitres(cubicFeet: number): number {
  return convertVolume(cubicFeet, 'ft3', 'L');
}
export function litresToCubicMetres(litres: number): number {
  return convertVolume(litres, 'L', 'm3');
}
export function cubicMetresToLitres(cubicMetres: number): number {
  return convertVolume(cubicMetres, 'm3', 'L');
}

/** °C → K. Rejects temperatures below absolute zero. */
export function celsiusToKelvin(celsius: number): number {
  return convertTemperature(celsius, 'C', 'K');
}
/** K → °C. */
export function kelvinToCelsius(kelvin: number): number {
  return convertTemperature(kelvin, 'K', 'C');
}
/** °F → °C. */
export function fahrenheitToCelsius(fahrenheit: number): number {
  return convertTemperature(fahrenheit, 'F', 'C');
}
/** °C → °F. */
export function celsiusToFahrenheit(celsius: number): number {
  return convertTemperature(celsius, 'C', 'F');
}

/** Converts a temperature between °C, °F and K; rejects values below absolute zero. */
export function convertTemperature(value: number, from: TemperatureUnit, to: TemperatureUnit): number {
  requireFinite('value', value, 'Temperature');
  let kelvin: number;
  if (from === 'K') kelvin = value;
  else if (from === 'C') kelvin = value + 273.15;
  else if (from === 'F') kelvin = ((value - 32) * 5) / 9 + 273.15;
  else fail('from', `unknown temperature unit "${String(from)}"`);
  if (kelvin < 0) fail('value', 'below absolute zero', `Temperature ${value} ${from} is below absolute zero`);
  if (to === 'K') return kelvin;
  if (to === 'C') return kelvin - 273.15;
  if (to === 'F') return ((kelvin - 273.15) * 9) / 5 + 32;
  fail('to', `unknown temperature unit "${String(to)}"`);
}
