import { InvalidInputError } from '../api/errors';
import { freeGasLitresPerKg, type ReferenceCode } from './reference-conditions';
import { OXYGEN_SATURATION_MAX_BAR_ABS, oxygenSaturationAtPressure } from './oxygen-saturation';
import { requireFinite, requireInRange, requireNonNegative, requirePositive, fail } from './validate-input';

/**
 * Bulk liquid oxygen (vacuum-insulated evaporators). Quantities go through mass: litres of liquid
 * depend on the liquid's temperature, litres of gas on the reference conditions.
 */

/**
 * Density of saturated liquid oxygen at the normal boiling point (90.188 K, 1.01325 bar), kg/L:
 * 1141.17 kg/m³ from the reference equation of state for oxygen (Schmidt & Wagner 1985), by
 * solving its phase equilibrium at 1.01325 bar (scripts/fit-eos.ts prints it); the usual handbook
 * figure is 1.141 kg/L.
 * Warm liquid in a working tank is lighter (≈ 0.97 kg/L at ~120 K), so litres read from a tank
 * gauge calibrated for boiling-point liquid overstate the mass.
 */
export const LOX_DENSITY_KG_PER_L = 1.14117;

/**
 * Working pressure of a bulk oxygen tank when none is set, bar(g): 7 bar, the usual UK relief setting
 * of a vacuum-insulated evaporator (anaesthesia revision notes: relief ~7 bar, line regulator ~4 bar), so
 * about the highest the working pressure reaches without venting. Warmer, higher-pressure liquid is
 * lighter, so this gives the smallest mass per litre of the usual range: the cautious choice.
 */
export const DEFAULT_TANK_OPERATING_GAUGE_BAR = 7;
export const DEFAULT_TANK_OPERATING_SOURCE =
  'default 7 bar g: the usual UK relief setting of a bulk tank (anaesthesia revision notes), the lightest liquid of the usual working range';

const densityCache = new Map<number, number>();

/**
 * Density of the saturated liquid in a tank at its operating pressure, kg/L, from the engine's phase
 * equilibrium of the reference equation for oxygen (oxygen-saturation.ts): 1.141 kg/L at 0 bar g,
 * about 0.976 kg/L at 9 bar g (10 bar abs, 119.6 K).
 * @param operatingGaugeBar tank pressure, bar(g); @param atmosphericBar bar abs (default 1.01325)
 */
export function loxDensityAtTankPressureKgPerL(operatingGaugeBar: number = DEFAULT_TANK_OPERATING_GAUGE_BAR, atmosphericBar = 1.01325): number {
  requireInRange('operatingGaugeBar', operatingGaugeBar, 0, OXYGEN_SATURATION_MAX_BAR_ABS - 1.1, 'bar', 'Tank operating pressure');
  const abs = Math.round((operatingGaugeBar + atmosphericBar) * 1e4) / 1e4;
  let d = densityCache.get(abs);
  if (d === undefined) {
    d = oxygenSaturationAtPressure(abs).liquidDensityKgM3 / 1000;
    if (densityCache.size > 200) densityCache.clear();
    densityCache.set(abs, d);
  }
  return d;
}

/** Litres of liquid oxygen at the normal boiling point → kg. @param litres L of liquid */
export function loxLitresToKg(litres: number, densityKgPerL: number = LOX_DENSITY_KG_PER_L): number {
  requireNonNegative('litres', litres, 'Liquid volume');
  requirePositive('densityKgPerL', densityKgPerL, 'Liquid density');
  return litres * densityKgPerL;
}

/** kg of oxygen → litres of liquid at the normal boiling point. @param kg mass, kg */
export function kgToLoxLitres(kg: number, densityKgPerL: number = LOX_DENSITY_KG_PER_L): number {
  requireNonNegative('kg', kg, 'Mass');
  requirePositive('densityKgPerL', densityKgPerL, 'Liquid density');
  return kg / densityKgPerL;
}

/**
 * Free gas (real volume at the reference conditions) from litres of boiling-point liquid, L.
 * About 842 L per L at 15 °C and 860 L per L at 70 °F.
 */
export function loxLitresToFreeGasL(litres: number, reference: ReferenceCode = '15C'): number {
  return loxLitresToKg(litres) * freeGasLitresPerKg('O2', reference);
}

/** Free gas at the reference conditions → litres of boiling-point liquid. */
export function freeGasLToLoxLitres(freeGasL: number, reference: ReferenceCode = '15C'): number {
  requireNonNegative('freeGasL', freeGasL, 'Gas volume');
  return kgToLoxLitres(freeGasL / freeGasLitresPerKg('O2', reference));
}

/**
 * Mass in a tank from a contents gauge that reads percent of full, kg (linear in mass).
 * @param capacityKg full contents, kg; @param percent reading, 0–100
 */
export function levelPercentToKg(capacityKg: number, percent: number): number {
  requirePositive('capacityKg', capacityKg, 'Tank capacity');
  requireInRange('percent', percent, 0, 100, '%', 'Level');
  return (capacityKg * percent) / 100;
}

export interface CalibrationPoint {
  /** Gauge reading (e.g. inches of water column, percent, mbar differential). */
  reading: number;
  /** Contents at that reading, kg. */
  kg: number;
}

/**
 * Contents from a tank's calibration table by linear interpolation between neighbouring points.
 * The table must have at least two points with strictly increasing readings and non-decreasing
 * contents (sorted here); readings outside the table are rejected, never extrapolated.
 * @param table calibration points (reading → kg); @param reading gauge reading in the table's unit
 * @returns contents, kg
 */
export function contentsFromCalibrationTable(table: readonly CalibrationPoint[], reading: number): number {
  if (!Array.isArray(table) || table.length < 2) {
    throw new InvalidInputError('A calibration table needs at least two points', [{ path: 'table', message: 'at least two points' }]);
  }
  table.forEach((p, i) => {
    requireFinite(`table.${i}.reading`, p?.reading, `Calibration reading ${i}`);
    requireNonNegative(`table.${i}.kg`, p?.kg, `Calibration contents ${i}`);
  });
  requireFinite('reading', reading, 'Reading');
  const points = [...table].sort((a, b) => a.reading - b.reading);
  for (let i = 1; i < points.length; i++) {
    if (points[i].reading === points[i - 1].reading) {
      fail('table', `reading ${points[i].reading} appears twice`, `The calibration table has the reading ${points[i].reading} twice`);
    }
    if (points[i].kg < points[i - 1].kg) {
      fail(
        'table',
        'contents must not fall as the reading rises',
        `The calibration table is not monotone: ${points[i].kg} kg at ${points[i].reading} is below ${points[i - 1].kg} kg at ${points[i - 1].reading}`,
      );
    }
  }
  const lo = points[0];
  const hi = points[points.length - 1];
  if (reading < lo.reading || reading > hi.reading) {
    throw new InvalidInputError(`Reading ${reading} is outside the calibration table (${lo.reading}–${hi.reading})`, [
      { path: 'reading', message: `must be between ${lo.reading} and ${hi.reading}` },
    ]);
  }
  let i = 1;
  while (points[i].reading < reading) i++;
  const a = points[i - 1];
  const b = points[i];
  return a.kg + ((reading - a.reading) / (b.reading - a.reading)) * (b.kg - a.kg);
}
