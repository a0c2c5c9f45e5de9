import type { GasCode } from './gases';

/**
 * Cautions that travel with results for the premixed 50:50 nitrous oxide/oxygen.
 *
 * At or below about −5.5 °C (sources give −5.5 to −7 °C) nitrous oxide condenses out of the mixture in
 * the cylinder: the cylinder then delivers oxygen-rich gas first and nearly pure nitrous oxide
 * later, a hypoxic hazard (the Poynting effect; anaesthesia teaching notes and sports-medicine
 * gas guidance). Practice: store above 10 °C; a cylinder that has been cold is kept lying flat at
 * 5 °C or more for at least 24 h and inverted several times before use (Bracken, Broughton & Hill,
 * BMJ 1968;3:715; inversion: sports-medicine gas guidance).
 */

/**
 * Temperature at or below which the 50:50 N2O/O2 mixture can separate, °C. Sources put the onset
 * between about −5.5 and −7 °C (anaesthesia teaching notes; sports-medicine gas guidance; BMJ 1968): the
 * warmest of them is used, and the threshold is inclusive, so a cylinder at exactly −5.5 °C is cautioned.
 */
export const N2O_O2_SEPARATION_TEMPERATURE_C = -5.5;
/** The range the sources give for the separation onset, °C (stated with the caution). */
export const N2O_O2_SEPARATION_RANGE_C = { warmest: -5.5, coldest: -7 } as const;
/** Recommended minimum storage temperature of the 50:50 N2O/O2 mixture, °C. */
export const N2O_O2_MIN_STORAGE_TEMPERATURE_C = 10;

export const PLANNING_CAUTION =
  'Planning estimate only: it does not replace the site’s authorised person for medical gases, local codes and the supplier’s figures and instructions.';

/** True where the 50:50 mixture may have separated: at or below the threshold (inclusive). */
export function mayHaveSeparated(gas: GasCode, temperatureC: number): boolean {
  return gas === 'N2O_O2_50' && temperatureC <= N2O_O2_SEPARATION_TEMPERATURE_C;
}

/** The separation caution; `where` says which temperature was cold (e.g. "The store temperature"). */
export function separationCaution(temperatureC: number, where = 'At this temperature'): string {
  return `${where} (${formatC(temperatureC)} °C) is at or below ${formatC(N2O_O2_SEPARATION_TEMPERATURE_C)} °C, where nitrous oxide can condense out of the 50:50 mixture (sources give about ${formatC(N2O_O2_SEPARATION_RANGE_C.warmest)} to ${formatC(N2O_O2_SEPARATION_RANGE_C.coldest)} °C): the cylinder would deliver oxygen-rich gas first and then nearly pure nitrous oxide (hypoxic hazard). Before use, keep the cylinder lying flat at 5 °C or more for at least 24 hours and invert it several times. The contents shown assume a single, well-mixed phase.`;
}

function formatC(t: number): string {
  return (Math.round(t * 10) / 10).toString().replace('-', '−');
}

/** Cautions for a gas held or used at `temperatureC` (°C); empty for most gases and temperatures. */
export function mixtureCautions(gas: GasCode, temperatureC: number, where?: string): string[] {
  if (gas !== 'N2O_O2_50') return [];
  const cautions: string[] = [];
  if (mayHaveSeparated(gas, temperatureC)) {
    cautions.push(separationCaution(temperatureC, where));
  } else if (temperatureC < N2O_O2_MIN_STORAGE_TEMPERATURE_C) {
    cautions.push(
      `Store 50:50 nitrous oxide/oxygen above ${N2O_O2_MIN_STORAGE_TEMPERATURE_C} °C; at or below about ${formatC(N2O_O2_SEPARATION_TEMPERATURE_C)} °C (sources: ${formatC(N2O_O2_SEPARATION_RANGE_C.warmest)} to ${formatC(N2O_O2_SEPARATION_RANGE_C.coldest)} °C) the mixture can separate (hypoxic hazard).`,
    );
  }
  return cautions;
}

/** Whether a gas code is a premixed mixture (50:50 N2O/O2, heliox): never held as bulk liquid. */
export function isPremixedMixture(gas: string): boolean {
  return gas === 'N2O_O2_50' || gas.startsWith('HE_O2');
}
