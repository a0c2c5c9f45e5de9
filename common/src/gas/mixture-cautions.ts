import type { GasCode } from './gases';

/**
 * Cautions that travel with results for the premixed 50:50 nitrous oxide/oxygen.
 *
 * Below about −6 °C (sources give −5.5 to −7 °C) nitrous oxide condenses out of the mixture in
 * the cylinder: the cylinder then delivers oxygen-rich gas first and nearly pure nitrous oxide
 * later, a hypoxic hazard (the Poynting effect; anaesthesia teaching notes and sports-medicine
 * gas guidance). Practice: store above 10 °C; a cylinder that has been cold is kept lying flat at
 * 5 °C or more for at least 24 h and inverted several times before use (Bracken, Broughton & Hill,
 * BMJ 1968;3:715; inversion: sports-medicine gas guidance).
 */

/** Temperature below which the 50:50 N2O/O2 mixture can separate, °C. */
export const N2O_O2_SEPARATION_TEMPERATURE_C = -6;
/** Recommended minimum storage temperature of the 50:50 N2O/O2 mixture, °C. */
export const N2O_O2_MIN_STORAGE_TEMPERATURE_C = 10;

export const PLANNING_CAUTION =
  'Planning estimate only: it does not replace the site’s authorised person for medical gases, local codes and the supplier’s figures and instructions.';

/** Cautions for a gas held or used at `temperatureC` (°C); empty for most gases and temperatures. */
export function mixtureCautions(gas: GasCode, temperatureC: number): string[] {
  if (gas !== 'N2O_O2_50') return [];
  const cautions: string[] = [];
  if (temperatureC < N2O_O2_SEPARATION_TEMPERATURE_C) {
    cautions.push(
      `Below about ${N2O_O2_SEPARATION_TEMPERATURE_C} °C nitrous oxide can condense out of the 50:50 mixture: the cylinder would deliver oxygen-rich gas first and then nearly pure nitrous oxide (hypoxic hazard). Before use, keep the cylinder lying flat at 5 °C or more for at least 24 hours and invert it several times. The contents shown assume a single, well-mixed phase.`,
    );
  } else if (temperatureC < N2O_O2_MIN_STORAGE_TEMPERATURE_C) {
    cautions.push(
      `Store 50:50 nitrous oxide/oxygen above ${N2O_O2_MIN_STORAGE_TEMPERATURE_C} °C; below about ${N2O_O2_SEPARATION_TEMPERATURE_C} °C the mixture can separate (hypoxic hazard).`,
    );
  }
  return cautions;
}
