import { InvalidInputError } from '../api/errors';
import { GAS_INFO, MAX_PRESSURE_BAR_ABS, R_J_MOL_K, isGasCode, isLiquefiedGas, type GasCode, type LiquefiedGasCode } from './gases';
import { compressibility, molarDensityMolM3, pressureFromMolarDensity, validateState } from './eos';
import { REFERENCE_CONDITIONS, idealReferenceMolarVolumeLMol, isReferenceCode, referenceMolarVolumeLMol, type ReferenceCode } from './reference-conditions';
import { criticalTemperatureK, saturatedLiquidDensityKgM3, saturatedVapourDensityKgM3, vapourPressureBarAbs } from './saturation';
import { mixtureCautions } from './mixture-cautions';
import { STANDARD_ATMOSPHERE_BAR } from './units';
import { fail, requireFinite, requireInRange, requireNonNegative, requirePositive } from './validate-input';

/**
 * Physically meaningful input ranges (beyond them the arithmetic overflows into Infinity or gives
 * absurd figures): water capacity 0.01–5,000 L (the smallest medical cylinders hold ~0.2 L, a
 * tube-trailer tube a few thousand L: common practice); flow 0.01–100,000 L/min (low-flow meters read
 * down to a few hundredths of a L/min; a whole hospital draws a few thousand); weights up to 2,000 kg.
 */
export const WATER_CAPACITY_RANGE_L = { min: 0.01, max: 5000 } as const;
export const FLOW_RANGE_L_MIN = { min: 0.01, max: 100_000 } as const;
export const MAX_CYLINDER_MASS_KG = 2000;

/**
 * Cylinder contents from gauge pressure (compressed gases) or weight (liquefied gases), durations
 * and the pressure the same contents show at another temperature.
 *
 * Real gas throughout: n = p·V/(Z·R·T) with p absolute = gauge + atmospheric, Z from eos.ts.
 * Free gas = what the cylinder delivers when emptied to atmospheric pressure at the same
 * temperature (the gas left inside at 0 bar gauge is not counted), stated as its real volume at the
 * reference conditions: n·Z(T_ref, p_ref)·R·T_ref/p_ref.
 */

export interface CompressedContentsInput {
  gas: GasCode;
  /** Water (internal) capacity of the cylinder, L. */
  waterCapacityL: number;
  /** Gauge reading, bar(g). Give this or pressureBarAbs. */
  gaugeBar?: number;
  /** Absolute pressure, bar(a). */
  pressureBarAbs?: number;
  /** Gas temperature, °C. */
  temperatureC: number;
  /** Local atmospheric pressure, bar abs (default 1.01325). */
  atmosphericBar?: number;
  /** Reference conditions of the free-gas volume (default 15C). */
  reference?: ReferenceCode;
  /**
   * CO2 and N2O only: the person states that the liquid is gone (the cylinder has been drawn past the
   * point where its pressure starts to fall). Without it a gauge reading of a liquefied gas is refused.
   */
  liquidGone?: boolean;
}

/**
 * A gauge reading of a liquefied gas (CO2, N2O) below its critical temperature is accepted only when the
 * liquid is stated gone AND the absolute pressure is at most this share of the vapour pressure at the
 * stated temperature. 0.8 × p_sat is about the vapour pressure 10 °C colder (N2O: 0.8 × 45.0 = 36.0 bar
 * abs at 15 °C against p_sat(5 °C) ≈ 36.4 bar abs, Lemmon & Span 2006 ancillary), which covers a
 * liquid cooled by drawing below the stated temperature and a gauge of class 2.5 read near the top of
 * its scale. Between that and p_sat liquid may still be present and the gauge says nothing. Common
 * practice is simply to weigh: the margin is the engine's own choice.
 */
export const LIQUEFIED_VAPOUR_ONLY_FRACTION = 0.8;

export const WEIGH_LIQUEFIED_MESSAGE = 'weigh the cylinder: gross − tare';

/**
 * Refuses a pressure reading of CO2 or N2O unless it can only be vapour (see LIQUEFIED_VAPOUR_ONLY_FRACTION).
 * Above the critical temperature there is one phase and the pressure does fix the contents.
 */
export function checkLiquefiedGaugeReading(gas: GasCode, temperatureK: number, pressureBarAbs: number, liquidGone: boolean | undefined, path: string): void {
  if (!isLiquefiedGas(gas)) return;
  const tc = criticalTemperatureK(gas);
  if (!(temperatureK < tc)) return;
  const ps = vapourPressureBarAbs(gas, temperatureK);
  const name = GAS_INFO[gas].name;
  if (liquidGone !== true) {
    fail(
      path,
      `${WEIGH_LIQUEFIED_MESSAGE} (liquefied gas: while liquid is present the gauge shows the vapour pressure, not the contents)`,
      `${name} is a liquefied gas: while any liquid is left the gauge shows the vapour pressure (${(ps - STANDARD_ATMOSPHERE_BAR).toFixed(1)} bar g at ${(temperatureK - 273.15).toFixed(1)} °C) whatever the contents, so a gauge reading cannot give them: ${WEIGH_LIQUEFIED_MESSAGE}. A gauge is accepted only with liquid_gone and a reading clearly below the vapour pressure.`,
    );
  }
  const limit = LIQUEFIED_VAPOUR_ONLY_FRACTION * ps;
  if (pressureBarAbs > limit) {
    fail(
      path,
      `${WEIGH_LIQUEFIED_MESSAGE}: at or above ${limit.toFixed(1)} bar abs (${LIQUEFIED_VAPOUR_ONLY_FRACTION * 100} % of the vapour pressure) liquid may still be present`,
      `${name} at ${pressureBarAbs.toFixed(1)} bar abs is too close to its vapour pressure (${ps.toFixed(1)} bar abs at ${(temperatureK - 273.15).toFixed(1)} °C) to be only vapour: liquid may still be present and the gauge says nothing about the contents. ${WEIGH_LIQUEFIED_MESSAGE}. A gauge is taken as vapour only at or below ${LIQUEFIED_VAPOUR_ONLY_FRACTION * 100} % of the vapour pressure (${limit.toFixed(1)} bar abs).`,
    );
  }
}

export interface CompressedContents {
  /** Whole content, mol (n = pV/(ZRT)). */
  moles: number;
  massKg: number;
  /** Deliverable gas down to atmospheric pressure, real volume at the reference conditions, L. */
  freeGasL: number;
  /** The same by pV = nRT throughout. */
  idealFreeGasL: number;
  /** Z at the cylinder state. */
  Z: number;
  /** Gauge pressure the same contents would show at the reference temperature, bar(g). */
  equivalentGaugeBarAtReferenceTemperature: number;
  pressureBarAbs: number;
  gaugeBar: number;
  reference: ReferenceCode;
  method: string;
  cautions: string[];
}

interface CylinderState {
  gas: GasCode;
  volumeM3: number;
  temperatureK: number;
  pressureBarAbs: number;
  atmosphericBar: number;
  reference: ReferenceCode;
}

function checkGas(gas: unknown): GasCode {
  if (!isGasCode(gas)) throw new InvalidInputError(`Unknown gas "${String(gas)}"`, [{ path: 'gas', message: 'unknown gas code' }]);
  return gas;
}

function checkReference(reference: unknown): ReferenceCode {
  if (reference === undefined) return '15C';
  if (!isReferenceCode(reference)) {
    throw new InvalidInputError(`Unknown reference conditions "${String(reference)}"`, [{ path: 'reference', message: 'expected 15C, 21C or 0C' }]);
  }
  return reference;
}

function readCylinderState(input: CompressedContentsInput): CylinderState {
  const gas = checkGas(input.gas);
  requireInRange('waterCapacityL', input.waterCapacityL, WATER_CAPACITY_RANGE_L.min, WATER_CAPACITY_RANGE_L.max, 'L', 'Water capacity');
  const atmosphericBar = input.atmosphericBar ?? STANDARD_ATMOSPHERE_BAR;
  requirePositive('atmosphericBar', atmosphericBar, 'Atmospheric pressure');
  if (atmosphericBar < 0.5 || atmosphericBar > 1.1) {
    fail('atmosphericBar', 'must be between 0.5 and 1.1 bar abs', `Atmospheric pressure ${atmosphericBar} bar is implausible (0.5–1.1 bar abs)`);
  }
  const hasGauge = input.gaugeBar !== undefined;
  const hasAbs = input.pressureBarAbs !== undefined;
  if (hasGauge === hasAbs) {
    fail('gaugeBar', 'give exactly one of gauge pressure and absolute pressure', 'Give either the gauge pressure or the absolute pressure (exactly one)');
  }
  const pressureBarAbs = hasGauge
    ? requireFinite('gaugeBar', input.gaugeBar!, 'Gauge pressure') + atmosphericBar
    : requireFinite('pressureBarAbs', input.pressureBarAbs!, 'Absolute pressure');
  if (pressureBarAbs <= 0) {
    fail(
      hasGauge ? 'gaugeBar' : 'pressureBarAbs',
      'absolute pressure must be greater than zero',
      `Absolute pressure must be greater than zero (got ${pressureBarAbs} bar abs)`,
    );
  }
  requireFinite('temperatureC', input.temperatureC, 'Temperature');
  const temperatureK = input.temperatureC + 273.15;
  validateStateAt(gas, temperatureK, pressureBarAbs, 'temperatureC', hasGauge ? 'gaugeBar' : 'pressureBarAbs');
  checkLiquefiedGaugeReading(gas, temperatureK, pressureBarAbs, input.liquidGone, hasGauge ? 'gaugeBar' : 'pressureBarAbs');
  return { gas, volumeM3: input.waterCapacityL / 1000, temperatureK, pressureBarAbs, atmosphericBar, reference: checkReference(input.reference) };
}

/** Runs the EOS range check with the caller's field names in the error details. */
function validateStateAt(gas: GasCode, temperatureK: number, pressureBarAbs: number, temperaturePath: string, pressurePath: string): void {
  try {
    validateState(gas, temperatureK, pressureBarAbs);
  } catch (e) {
    if (e instanceof InvalidInputError) {
      const details = e.details.map((d) => ({
        path: d.path === 'temperatureK' ? temperaturePath : d.path === 'pressureBarAbs' ? pressurePath : d.path,
        message: d.message,
      }));
      throw new InvalidInputError(e.message, details);
    }
    throw e;
  }
}

/** Molar density at (T, p), mol/m³, that also accepts p ≤ 0 (empty) as zero. */
function densityOrZero(gas: GasCode, temperatureK: number, pressureBarAbs: number): number {
  return pressureBarAbs > 0 ? molarDensityMolM3(gas, temperatureK, pressureBarAbs) : 0;
}

/** Real moles the cylinder delivers from p1 down to p2 (both abs, same T). */
function deliveredMoles(s: CylinderState, fromBarAbs: number, downToBarAbs: number): number {
  if (fromBarAbs <= downToBarAbs) return 0;
  return s.volumeM3 * (densityOrZero(s.gas, s.temperatureK, fromBarAbs) - densityOrZero(s.gas, s.temperatureK, downToBarAbs));
}

function idealDeliveredMoles(s: CylinderState, fromBarAbs: number, downToBarAbs: number): number {
  if (fromBarAbs <= downToBarAbs) return 0;
  return (s.volumeM3 * (fromBarAbs - downToBarAbs) * 1e5) / (R_J_MOL_K * s.temperatureK);
}

/**
 * Contents of a compressed-gas cylinder from its pressure (real gas, n = pV/(ZRT), Z from the
 * engine's Helmholtz-energy equations, see eos.ts).
 * @param input.waterCapacityL L; input.gaugeBar bar(g) or input.pressureBarAbs bar(a);
 *   input.temperatureC °C; input.atmosphericBar bar abs (default 1.01325); input.reference (default 15C)
 */
export function compressedContents(input: CompressedContentsInput): CompressedContents {
  const s = readCylinderState(input);
  const z = compressibility(s.gas, s.temperatureK, s.pressureBarAbs);
  const rho = z.densityKgM3 / GAS_INFO[s.gas].molarMassKgMol;
  const moles = rho * s.volumeM3;
  const delivered = deliveredMoles(s, s.pressureBarAbs, s.atmosphericBar);
  const idealDelivered = idealDeliveredMoles(s, s.pressureBarAbs, s.atmosphericBar);
  const refT = REFERENCE_CONDITIONS[s.reference].temperatureK;
  const equivalentAbs = pressureOfContentsAt(s.gas, rho, refT);
  const cautions = mixtureCautions(s.gas, input.temperatureC);
  if (s.pressureBarAbs < s.atmosphericBar) cautions.push('The pressure is below atmospheric: the cylinder delivers no gas.');
  if (equivalentAbs > MAX_PRESSURE_BAR_ABS) cautions.push(beyondRangeCaution(equivalentAbs));
  return {
    moles,
    massKg: moles * GAS_INFO[s.gas].molarMassKgMol,
    freeGasL: delivered * referenceMolarVolumeLMol(s.gas, s.reference),
    idealFreeGasL: idealDelivered * idealReferenceMolarVolumeLMol(s.reference),
    Z: z.Z,
    equivalentGaugeBarAtReferenceTemperature: equivalentAbs - s.atmosphericBar,
    pressureBarAbs: s.pressureBarAbs,
    gaugeBar: s.pressureBarAbs - s.atmosphericBar,
    reference: s.reference,
    method: z.method,
    cautions,
  };
}

function beyondRangeCaution(pressureBarAbs: number): string {
  return `The same contents would be at ${pressureBarAbs.toFixed(0)} bar abs, above the ${MAX_PRESSURE_BAR_ABS} bar the engine is validated for: an extrapolated estimate, and above the working pressure of most cylinders.`;
}

/**
 * Absolute pressure, bar, that a fixed molar density shows at another temperature. For CO2 and N2O
 * below the critical temperature, contents denser than the saturated vapour would be partly liquid,
 * so the pressure is the vapour pressure.
 */
function pressureOfContentsAt(gas: GasCode, molarDensity: number, temperatureK: number): number {
  if (isLiquefiedGas(gas) && temperatureK < criticalTemperatureK(gas)) {
    const rhoVap = saturatedVapourDensityKgM3(gas, temperatureK) / GAS_INFO[gas].molarMassKgMol;
    if (molarDensity >= rhoVap) return vapourPressureBarAbs(gas, temperatureK);
  }
  return pressureFromMolarDensity(gas, temperatureK, molarDensity);
}

export interface PressureAtTemperatureInput {
  gas: GasCode;
  /** CO2 and N2O: the liquid is stated gone (see CompressedContentsInput.liquidGone). */
  liquidGone?: boolean;
  gaugeBar?: number;
  pressureBarAbs?: number;
  /** Temperature of the reading, °C. */
  temperatureC: number;
  /** Temperature to find the pressure at, °C. */
  newTemperatureC: number;
  atmosphericBar?: number;
}

/**
 * The pressure the same contents (same molar density in a rigid cylinder) show at another
 * temperature: ρ from (T₁, p₁) by the EOS, then p(T₂, ρ) from the EOS.
 * @param input pressures in bar (gauge or abs), temperatures in °C, atmosphericBar bar abs
 * @returns pressureBarAbs and gaugeBar at newTemperatureC
 */
export function pressureAtTemperature(input: PressureAtTemperatureInput): { pressureBarAbs: number; gaugeBar: number; cautions: string[] } {
  const s = readCylinderState({ ...input, waterCapacityL: 1 });
  requireFinite('newTemperatureC', input.newTemperatureC, 'New temperature');
  const newTemperatureK = input.newTemperatureC + 273.15;
  const info = GAS_INFO[s.gas];
  if (newTemperatureK < info.minTemperatureK || newTemperatureK > info.maxTemperatureK) {
    fail(
      'newTemperatureC',
      `must be between ${(info.minTemperatureK - 273.15).toFixed(2)} and ${(info.maxTemperatureK - 273.15).toFixed(2)} °C`,
      `New temperature ${input.newTemperatureC} °C is outside the supported range for ${info.name}`,
    );
  }
  const rho = molarDensityMolM3(s.gas, s.temperatureK, s.pressureBarAbs);
  const pressureBarAbs = pressureOfContentsAt(s.gas, rho, newTemperatureK);
  // the reading itself may have been taken cold: the colder of the two temperatures decides
  const cautions = mixtureCautions(s.gas, Math.min(input.temperatureC, input.newTemperatureC));
  if (pressureBarAbs > MAX_PRESSURE_BAR_ABS) cautions.push(beyondRangeCaution(pressureBarAbs));
  return { pressureBarAbs, gaugeBar: pressureBarAbs - s.atmosphericBar, cautions };
}

export interface LiquefiedContentsInput {
  gas: LiquefiedGasCode;
  grossKg: number;
  tareKg: number;
  waterCapacityL: number;
  temperatureC: number;
  reference?: ReferenceCode;
  atmosphericBar?: number;
}

export interface LiquefiedContents {
  massKg: number;
  /** Gas delivered down to atmospheric pressure, real volume at the reference conditions, L. */
  freeGasL: number;
  fillingRatioKgPerL: number;
  /** Vapour pressure at the cylinder temperature, bar abs; null above the critical temperature. */
  vapourPressureBarAbs: number | null;
  /** Pressure in the cylinder, bar abs (vapour pressure while liquid is present; EOS otherwise; null if liquid-full). */
  pressureBarAbs: number | null;
  liquidPresent: boolean;
  /** Share of the cylinder volume taken by liquid, 0–1. */
  liquidVolumeFraction: number;
  reference: ReferenceCode;
  cautions: string[];
}

/** Filling ratios (kg of gas per L of water capacity) that are usual for temperate and hot climates. */
export const FILLING_RATIO_TEMPERATE_KG_PER_L = 0.75;
export const FILLING_RATIO_HOT_CLIMATE_KG_PER_L = 0.67;

/** Temperature range for weighed liquefied-gas cylinders, °C. */
export const LIQUEFIED_MIN_TEMPERATURE_C = -40;
export const LIQUEFIED_MAX_TEMPERATURE_C = 65;

/**
 * Contents of a CO2 or N2O cylinder from its weight (gross − tare). While liquid is present the
 * pressure is the vapour pressure (Span & Wagner 1996; Lemmon & Span 2006 ancillaries), so only the
 * weight tells the contents. Free gas as for compressed gases: what is delivered down to
 * atmospheric pressure, real volume at the reference conditions.
 * @param input.grossKg, input.tareKg kg; input.waterCapacityL L; input.temperatureC °C
 */
export function liquefiedContents(input: LiquefiedContentsInput): LiquefiedContents {
  const gas = checkGas(input.gas);
  if (!isLiquefiedGas(gas))
    fail('gas', 'weighed contents apply to CO2 and N2O only', `${GAS_INFO[gas].name} is not a liquefied gas: use the pressure-based contents`);
  requirePositive('grossKg', input.grossKg, 'Gross weight');
  requirePositive('tareKg', input.tareKg, 'Tare weight');
  requireInRange('grossKg', input.grossKg, 0, MAX_CYLINDER_MASS_KG, 'kg', 'Gross weight');
  requireInRange('tareKg', input.tareKg, 0, MAX_CYLINDER_MASS_KG, 'kg', 'Tare weight');
  requireInRange('waterCapacityL', input.waterCapacityL, WATER_CAPACITY_RANGE_L.min, WATER_CAPACITY_RANGE_L.max, 'L', 'Water capacity');
  requireFinite('temperatureC', input.temperatureC, 'Temperature');
  if (input.temperatureC < LIQUEFIED_MIN_TEMPERATURE_C || input.temperatureC > LIQUEFIED_MAX_TEMPERATURE_C) {
    fail(
      'temperatureC',
      `must be between ${LIQUEFIED_MIN_TEMPERATURE_C} and ${LIQUEFIED_MAX_TEMPERATURE_C} °C`,
      `Temperature ${input.temperatureC} °C is outside the supported range for weighed cylinders`,
    );
  }
  const atmosphericBar = input.atmosphericBar ?? STANDARD_ATMOSPHERE_BAR;
  requirePositive('atmosphericBar', atmosphericBar, 'Atmospheric pressure');
  const reference = checkReference(input.reference);
  const massKg = input.grossKg - input.tareKg;
  requireNonNegative('grossKg', massKg, 'Gross minus tare weight');
  const temperatureK = input.temperatureC + 273.15;
  const M = GAS_INFO[gas].molarMassKgMol;
  const fillingRatioKgPerL = massKg / input.waterCapacityL;
  const meanDensityKgM3 = fillingRatioKgPerL * 1000;
  const cautions: string[] = [];
  const tc = criticalTemperatureK(gas);
  let vapourPressure: number | null = null;
  let pressureBarAbs: number | null;
  let liquidPresent = false;
  let liquidVolumeFraction = 0;
  if (temperatureK < tc) {
    vapourPressure = vapourPressureBarAbs(gas, temperatureK);
    const rhoV = saturatedVapourDensityKgM3(gas, temperatureK);
    const rhoL = saturatedLiquidDensityKgM3(gas, temperatureK);
    if (meanDensityKgM3 >= rhoL) {
      liquidPresent = true;
      liquidVolumeFraction = 1;
      pressureBarAbs = null;
      cautions.push(
        `Liquid-full: at ${input.temperatureC} °C the liquid (${(rhoL / 1000).toFixed(3)} kg/L) would fill the whole cylinder at this filling ratio, so the pressure is no longer the vapour pressure and rises steeply with any further warming. Keep the cylinder cool (no more than about 50 °C) and check the weights.`,
      );
    } else if (meanDensityKgM3 > rhoV) {
      liquidPresent = true;
      liquidVolumeFraction = (meanDensityKgM3 - rhoV) / (rhoL - rhoV);
      pressureBarAbs = vapourPressure;
    } else {
      pressureBarAbs = meanDensityKgM3 > 0 ? pressureFromMolarDensity(gas, temperatureK, meanDensityKgM3 / M) : 0;
      cautions.push('No liquid left: the pressure now falls as gas is drawn, and the cylinder is nearly empty.');
    }
  } else {
    pressureBarAbs = meanDensityKgM3 > 0 ? pressureFromMolarDensity(gas, temperatureK, meanDensityKgM3 / M) : 0;
    cautions.push(
      `Above the critical temperature (${(tc - 273.15).toFixed(1)} °C) there is no liquid and no vapour pressure; the pressure rises steeply with temperature.`,
    );
  }
  if (fillingRatioKgPerL > FILLING_RATIO_TEMPERATE_KG_PER_L) {
    cautions.push(
      `Filling ratio ${fillingRatioKgPerL.toFixed(3)} kg/L is above the usual ${FILLING_RATIO_TEMPERATE_KG_PER_L} kg/L: check the weights and the stamped tare.`,
    );
  } else if (fillingRatioKgPerL > FILLING_RATIO_HOT_CLIMATE_KG_PER_L) {
    cautions.push(`Filling ratio ${fillingRatioKgPerL.toFixed(3)} kg/L is above the ${FILLING_RATIO_HOT_CLIMATE_KG_PER_L} kg/L used for hot climates.`);
  }
  // what stays inside at 0 bar gauge (gas at atmospheric pressure) is not delivered
  const residualKg = (input.waterCapacityL / 1000) * molarDensityMolM3(gas, temperatureK, atmosphericBar) * M;
  const deliveredKg = Math.max(0, massKg - residualKg);
  return {
    massKg,
    freeGasL: (deliveredKg / M) * referenceMolarVolumeLMol(gas, reference),
    fillingRatioKgPerL,
    vapourPressureBarAbs: vapourPressure,
    pressureBarAbs,
    liquidPresent,
    liquidVolumeFraction,
    reference,
    cautions,
  };
}

/**
 * Residual a compressed-gas cylinder is changed at when none is given, bar(g): 200 psi = 13.8 bar, the
 * residual US EMS oxygen-cylinder guidance subtracts in duration sums (about 10 % of a 137–200 bar fill).
 * No standard sets one (UK sports-medicine guidance changes at a quarter full): editable, and stated
 * beside every result that uses it.
 */
export const DEFAULT_RESERVE_GAUGE_BAR = 200 * 0.0689475729;
export const DEFAULT_RESERVE_SOURCE = '200 psi (13.8 bar) residual, as US EMS oxygen-cylinder guidance subtracts in duration sums';

/**
 * Residual of a cylinder type when none is set: 10 % of the nominal fill pressure (US EMS guidance: about
 * 200 psi of a 2,000–2,200 psi fill). Common practice, editable per cylinder type.
 */
export const DEFAULT_RESIDUAL_FRACTION_OF_FILL = 0.1;
export const DEFAULT_RESIDUAL_SOURCE =
  'default 10 % of the fill pressure (US EMS oxygen-cylinder guidance: about 200 psi of a 2,000–2,200 psi fill; common practice)';

export interface DurationOptions {
  /** Flow of free gas at the same reference conditions, L/min. */
  flowLMin: number;
  /** Pressure left in the cylinder when it is changed, bar(g) (default DEFAULT_RESERVE_GAUGE_BAR, stated in the result). */
  reserveGaugeBar?: number;
  /** Liquefied gases: mass kept in the cylinder, kg (default 0). */
  reserveKg?: number;
}

export interface DurationResult {
  minutes: number;
  usableFreeGasL: number;
  reference: ReferenceCode;
  cautions: string[];
  /** Compressed gases: the reserve used, bar(g), and where it came from (given, or the stated default). */
  reserveGaugeBar: number;
  reserveBasis: string;
}

/**
 * Cylinder duration: usable free gas above the reserve ÷ flow. Compressed gases: gas delivered
 * between the present pressure and the reserve gauge pressure at the same temperature (real gas).
 * Liquefied gases: weighed mass less what stays at the reserve pressure and the reserve mass.
 * @param flowLMin free gas at the same reference conditions, L/min; reserveGaugeBar bar(g); reserveKg kg
 */
export function cylinderDuration(input: (CompressedContentsInput | LiquefiedContentsInput) & DurationOptions): DurationResult {
  requirePositive('flowLMin', input.flowLMin, 'Flow');
  requireInRange('flowLMin', input.flowLMin, FLOW_RANGE_L_MIN.min, FLOW_RANGE_L_MIN.max, 'L/min', 'Flow');
  const weighed = 'grossKg' in input && input.grossKg !== undefined;
  // liquefied gases: the reserve is a mass (reserveKg) and the gas left at atmospheric pressure
  const reserveGiven = input.reserveGaugeBar !== undefined;
  const reserveGaugeBar = input.reserveGaugeBar ?? (weighed ? 0 : DEFAULT_RESERVE_GAUGE_BAR);
  const reserveBasis = reserveGiven
    ? 'reserve as given'
    : weighed
      ? 'no reserve mass given: run until the gas left is at atmospheric pressure'
      : `no reserve given: ${DEFAULT_RESERVE_SOURCE}`;
  requireNonNegative('reserveGaugeBar', reserveGaugeBar, 'Reserve pressure');
  requireInRange('reserveGaugeBar', reserveGaugeBar, 0, MAX_PRESSURE_BAR_ABS, 'bar', 'Reserve pressure');
  const reserveKg = input.reserveKg ?? 0;
  requireNonNegative('reserveKg', reserveKg, 'Reserve mass');
  requireInRange('reserveKg', reserveKg, 0, MAX_CYLINDER_MASS_KG, 'kg', 'Reserve mass');
  if (weighed) {
    const c = liquefiedContents(input as LiquefiedContentsInput);
    const gas = input.gas as LiquefiedGasCode;
    const temperatureK = input.temperatureC + 273.15;
    const atm = input.atmosphericBar ?? STANDARD_ATMOSPHERE_BAR;
    const M = GAS_INFO[gas].molarMassKgMol;
    let reserveAbs = reserveGaugeBar + atm;
    const cautions = [...c.cautions];
    if (temperatureK < criticalTemperatureK(gas)) {
      const ps = vapourPressureBarAbs(gas, temperatureK);
      if (reserveAbs > ps) {
        reserveAbs = ps;
        cautions.push('The reserve pressure is above the vapour pressure: the reserve is taken as the moment the liquid runs out.');
      }
    }
    const retainedKg = (input.waterCapacityL / 1000) * molarDensityMolM3(gas, temperatureK, reserveAbs) * M + reserveKg;
    const usableKg = Math.max(0, c.massKg - retainedKg);
    const usableFreeGasL = (usableKg / M) * referenceMolarVolumeLMol(gas, c.reference);
    return { minutes: usableFreeGasL / input.flowLMin, usableFreeGasL, reference: c.reference, cautions, reserveGaugeBar, reserveBasis };
  }
  const ci = input as CompressedContentsInput;
  const s = readCylinderState(ci);
  const reserveAbs = reserveGaugeBar + s.atmosphericBar;
  const cautions = mixtureCautions(s.gas, ci.temperatureC);
  if (s.pressureBarAbs <= reserveAbs) cautions.push('The cylinder is at or below the reserve pressure: no usable gas.');
  else validateStateAt(s.gas, s.temperatureK, reserveAbs, 'temperatureC', 'reserveGaugeBar');
  const usableMoles = deliveredMoles(s, s.pressureBarAbs, reserveAbs);
  const usableFreeGasL = usableMoles * referenceMolarVolumeLMol(s.gas, s.reference);
  if (!reserveGiven)
    cautions.push(`Duration to a reserve of ${reserveGaugeBar.toFixed(1)} bar g (${DEFAULT_RESERVE_SOURCE}); give your own reserve to change it.`);
  return { minutes: usableFreeGasL / input.flowLMin, usableFreeGasL, reference: s.reference, cautions, reserveGaugeBar, reserveBasis };
}
