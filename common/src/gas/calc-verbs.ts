import { z } from 'zod';
import type { CalcVerb } from '../calc/verbs';
import { InvalidInputError, parseOrThrow, type FieldIssue } from '../api/errors';
import { GAS_CODES, isLiquefiedGas, type GasCode, type LiquefiedGasCode } from './gases';
import { compressibility } from './eos';
import { REFERENCE_CODES, type ReferenceCode } from './reference-conditions';
import { compressedContents, cylinderDuration, liquefiedContents, pressureAtTemperature } from './contents';
import { PLANNING_CAUTION, mixtureCautions } from './mixture-cautions';
import { mixtureZRange } from './mixture-uncertainty';

/** Z range fields of a mixture result (absent for pure gases): see mixture-uncertainty.ts. */
function zRangeFields(gas: GasCode, temperatureC: number, pressureBarAbs: number): Record<string, unknown> {
  const r = mixtureZRange(gas, temperatureC + 273.15, pressureBarAbs);
  return r ? { Z_range: { low: r.low, high: r.high, method: r.method } } : {};
}

/**
 * A quantity proportional to 1/Z at the cylinder pressure (free gas, minutes) carried across a mixture's
 * Z range: [q·Z/high, q·Z/low]. The gas left at the reserve is at near-ideal pressure, so this slightly
 * overstates the spread (errs wide).
 */
function scaledRange(q: number, z: number, gas: GasCode, temperatureC: number, pressureBarAbs: number): { low: number; high: number } | null {
  const r = mixtureZRange(gas, temperatureC + 273.15, pressureBarAbs);
  return r ? { low: (q * z) / r.high, high: (q * z) / r.low } : null;
}

/**
 * Calc verbs of the gas module (`npm run --silent calc -- VERB`, JSON in, JSON out). Field names
 * are a public contract: snake_case with units.
 */

const gasSchema = z.enum(GAS_CODES as [GasCode, ...GasCode[]]);
const referenceSchema = z.enum(REFERENCE_CODES as [ReferenceCode, ...ReferenceCode[]]);
const num = z.number();

const zItemSchema = z.object({ gas: gasSchema, temperature_C: num, pressure_bar_abs: num });

const compressedSchema = z.object({
  gas: gasSchema,
  water_capacity_L: num,
  gauge_bar: num.optional(),
  pressure_bar_abs: num.optional(),
  temperature_C: num,
  atmospheric_bar: num.optional(),
  reference: referenceSchema.optional(),
  /** CO2/N2O from a gauge: true only when the liquid is known to be gone (see contents.ts). */
  liquid_gone: z.boolean().optional(),
});

const liquefiedSchema = z.object({
  gas: z.enum(['CO2', 'N2O']),
  gross_kg: num,
  tare_kg: num,
  water_capacity_L: num,
  temperature_C: num,
  atmospheric_bar: num.optional(),
  reference: referenceSchema.optional(),
});

const durationExtra = z.object({ flow_L_min: num, reserve_gauge_bar: num.optional(), reserve_kg: num.optional() });

const pressureAtSchema = z.object({
  gas: gasSchema,
  gauge_bar: num.optional(),
  pressure_bar_abs: num.optional(),
  temperature_C: num,
  new_temperature_C: num,
  atmospheric_bar: num.optional(),
  liquid_gone: z.boolean().optional(),
});

function isWeighed(item: unknown): boolean {
  return typeof item === 'object' && item !== null && 'gross_kg' in item;
}

/** The engine's argument names → the calc contract's field names, for error paths. */
const FIELD_NAMES: Record<string, string> = {
  waterCapacityL: 'water_capacity_L',
  gaugeBar: 'gauge_bar',
  pressureBarAbs: 'pressure_bar_abs',
  temperatureC: 'temperature_C',
  temperatureK: 'temperature_C',
  newTemperatureC: 'new_temperature_C',
  atmosphericBar: 'atmospheric_bar',
  grossKg: 'gross_kg',
  tareKg: 'tare_kg',
  flowLMin: 'flow_L_min',
  reserveGaugeBar: 'reserve_gauge_bar',
  reserveKg: 'reserve_kg',
  liquidGone: 'liquid_gone',
};

function renamePaths(e: InvalidInputError, prefix: string): InvalidInputError {
  const details: FieldIssue[] = e.details.map((d) => {
    const [head, ...rest] = d.path.split('.');
    return { path: prefix + [FIELD_NAMES[head] ?? head, ...rest].join('.'), message: d.message };
  });
  return new InvalidInputError(
    prefix ? `Item ${prefix.slice(0, -1)}: ${e.message}` : e.message,
    details.length ? details : [{ path: prefix.slice(0, -1) || '(root)', message: e.message }],
  );
}

/** Runs `fn` on one item, naming error paths as the contract does and prefixing the item's index for arrays. */
function withIndex<T>(index: number | null, fn: () => T): T {
  try {
    return fn();
  } catch (e) {
    if (e instanceof InvalidInputError) throw renamePaths(e, index === null ? '' : `${index}.`);
    throw e;
  }
}

function oneOrMany(input: unknown, fn: (item: unknown) => unknown): unknown {
  if (Array.isArray(input)) {
    if (input.length === 0) throw new InvalidInputError('Empty array: give at least one cylinder', [{ path: '(root)', message: 'empty array' }]);
    return input.map((item, i) => withIndex(i, () => fn(item)));
  }
  if (typeof input !== 'object' || input === null) {
    throw new InvalidInputError('Expected an object or an array of objects', [{ path: '(root)', message: 'expected an object or an array of objects' }]);
  }
  return withIndex(null, () => fn(input));
}

function contentsOf(item: unknown): Record<string, unknown> {
  if (isWeighed(item)) {
    const v = parseOrThrow(liquefiedSchema, item, 'liquefied-gas cylinder');
    const r = liquefiedContents({
      gas: v.gas as LiquefiedGasCode,
      grossKg: v.gross_kg,
      tareKg: v.tare_kg,
      waterCapacityL: v.water_capacity_L,
      temperatureC: v.temperature_C,
      atmosphericBar: v.atmospheric_bar,
      reference: v.reference,
    });
    return {
      mass_kg: r.massKg,
      free_gas_L: r.freeGasL,
      filling_ratio_kg_per_L: r.fillingRatioKgPerL,
      vapour_pressure_bar_abs: r.vapourPressureBarAbs,
      pressure_bar_abs: r.pressureBarAbs,
      liquid_present: r.liquidPresent,
      liquid_volume_fraction: r.liquidVolumeFraction,
      reference: r.reference,
      cautions: [...r.cautions, PLANNING_CAUTION],
    };
  }
  const v = parseOrThrow(compressedSchema, item, 'cylinder');
  if (isLiquefiedGas(v.gas) && v.gauge_bar === undefined && v.pressure_bar_abs === undefined) {
    throw new InvalidInputError(`${v.gas} is liquefied: give gross_kg, tare_kg, water_capacity_L and temperature_C`, [
      { path: 'gross_kg', message: 'required for a liquefied gas' },
    ]);
  }
  const r = compressedContents({
    gas: v.gas,
    waterCapacityL: v.water_capacity_L,
    gaugeBar: v.gauge_bar,
    pressureBarAbs: v.pressure_bar_abs,
    temperatureC: v.temperature_C,
    atmosphericBar: v.atmospheric_bar,
    reference: v.reference,
    liquidGone: v.liquid_gone,
  });
  return {
    moles: r.moles,
    mass_kg: r.massKg,
    free_gas_L: r.freeGasL,
    ideal_free_gas_L: r.idealFreeGasL,
    Z: r.Z,
    equivalent_gauge_bar_at_reference_temperature: r.equivalentGaugeBarAtReferenceTemperature,
    pressure_bar_abs: r.pressureBarAbs,
    gauge_bar: r.gaugeBar,
    reference: r.reference,
    method: r.method,
    ...zRangeFields(v.gas, v.temperature_C, r.pressureBarAbs),
    ...(() => {
      const fr = scaledRange(r.freeGasL, r.Z, v.gas, v.temperature_C, r.pressureBarAbs);
      return fr ? { free_gas_L_range: fr } : {};
    })(),
    cautions: [...r.cautions, PLANNING_CAUTION],
  };
}

function durationOf(item: unknown): Record<string, unknown> {
  const extra = parseOrThrow(durationExtra, item, 'duration input');
  let r;
  if (isWeighed(item)) {
    const v = parseOrThrow(liquefiedSchema, item, 'liquefied-gas cylinder');
    r = cylinderDuration({
      gas: v.gas as LiquefiedGasCode,
      grossKg: v.gross_kg,
      tareKg: v.tare_kg,
      waterCapacityL: v.water_capacity_L,
      temperatureC: v.temperature_C,
      atmosphericBar: v.atmospheric_bar,
      reference: v.reference,
      flowLMin: extra.flow_L_min,
      reserveGaugeBar: extra.reserve_gauge_bar,
      reserveKg: extra.reserve_kg,
    });
  } else {
    const v = parseOrThrow(compressedSchema, item, 'cylinder');
    r = cylinderDuration({
      gas: v.gas,
      waterCapacityL: v.water_capacity_L,
      gaugeBar: v.gauge_bar,
      pressureBarAbs: v.pressure_bar_abs,
      temperatureC: v.temperature_C,
      atmosphericBar: v.atmospheric_bar,
      reference: v.reference,
      liquidGone: v.liquid_gone,
      flowLMin: extra.flow_L_min,
      reserveGaugeBar: extra.reserve_gauge_bar,
    });
  }
  let ranges: Record<string, unknown> = {};
  if (!isWeighed(item)) {
    const v = parseOrThrow(compressedSchema, item, 'cylinder');
    const atm = v.atmospheric_bar ?? 1.01325;
    const pAbs = v.pressure_bar_abs ?? (v.gauge_bar ?? 0) + atm;
    if (r.usableFreeGasL > 0 && pAbs > 0) {
      const zNow = compressibility(v.gas, v.temperature_C + 273.15, pAbs).Z;
      const u = scaledRange(r.usableFreeGasL, zNow, v.gas, v.temperature_C, pAbs);
      const m = scaledRange(r.minutes, zNow, v.gas, v.temperature_C, pAbs);
      if (u && m) ranges = { usable_free_gas_L_range: u, minutes_range: m, Z_range_method: mixtureZRange(v.gas, v.temperature_C + 273.15, pAbs)!.method };
    }
  }
  return {
    minutes: r.minutes,
    usable_free_gas_L: r.usableFreeGasL,
    ...ranges,
    reference: r.reference,
    reserve_gauge_bar: r.reserveGaugeBar,
    reserve_basis: r.reserveBasis,
    cautions: [...r.cautions, PLANNING_CAUTION],
  };
}

/**
 * z: one result per state, in order. Bad input is refused as a whole (exit 2 / 400, as the calc contract
 * says for every verb): when any item fails, the error names every failing item by its index
 * ("1.pressure_bar_abs"), so a script can mend them all at once.
 */
const zVerb: CalcVerb = (input) => {
  if (!Array.isArray(input)) {
    throw new InvalidInputError('Expected an array of {gas, temperature_C, pressure_bar_abs}', [{ path: '(root)', message: 'expected an array' }]);
  }
  if (input.length === 0) throw new InvalidInputError('Empty array: give at least one state', [{ path: '(root)', message: 'empty array' }]);
  const failures: InvalidInputError[] = [];
  const out = input.map((item, i) => {
    try {
      return withIndex(i, () => {
        const v = parseOrThrow(zItemSchema, item, 'state');
        const r = compressibility(v.gas, v.temperature_C + 273.15, v.pressure_bar_abs);
        return {
          Z: r.Z,
          density_kg_m3: r.densityKgM3,
          ideal_density_kg_m3: r.idealDensityKgM3,
          phase: r.phase,
          method: r.method,
          ...zRangeFields(v.gas, v.temperature_C, v.pressure_bar_abs),
          cautions: mixtureCautions(v.gas, v.temperature_C),
        };
      });
    } catch (e) {
      if (e instanceof InvalidInputError) {
        failures.push(e);
        return null;
      }
      throw e;
    }
  });
  if (failures.length === 1) throw failures[0];
  if (failures.length > 1) {
    throw new InvalidInputError(
      `${failures.length} of ${input.length} states are invalid: ${failures.map((f) => f.message).join('; ')}`,
      failures.flatMap((f) => f.details),
    );
  }
  return out;
};

const pressureAtVerb: CalcVerb = (input) =>
  oneOrMany(input, (item) => {
    const v = parseOrThrow(pressureAtSchema, item, 'pressure-at-temperature input');
    const r = pressureAtTemperature({
      gas: v.gas,
      gaugeBar: v.gauge_bar,
      pressureBarAbs: v.pressure_bar_abs,
      temperatureC: v.temperature_C,
      newTemperatureC: v.new_temperature_C,
      atmosphericBar: v.atmospheric_bar,
      liquidGone: v.liquid_gone,
    });
    return { pressure_bar_abs: r.pressureBarAbs, gauge_bar: r.gaugeBar, cautions: [...r.cautions, PLANNING_CAUTION] };
  });

/** Calc verbs of the gas module. */
export const gasCalcVerbs: Record<string, CalcVerb> = {
  z: zVerb,
  contents: (input) => oneOrMany(input, contentsOf),
  duration: (input) => oneOrMany(input, durationOf),
  pressure_at_temperature: pressureAtVerb,
};
