import { InvalidInputError } from '@common/api/errors';
import {
  DEFAULT_RESERVE_GAUGE_BAR,
  DEFAULT_RESERVE_SOURCE,
  compressedContents,
  cylinderDuration,
  liquefiedContents,
  type CompressedContents,
  type LiquefiedContents,
} from '@common/gas/contents';
import { methodFor } from '@common/gas/equations';
import { GAS_INFO, MAX_PRESSURE_BAR_ABS, isGasCode, isLiquefiedGas, type GasCode, type LiquefiedGasCode } from '@common/gas/gases';
import { mixtureCautions } from '@common/gas/mixture-cautions';
import { mixtureZRange } from '@common/gas/mixture-uncertainty';
import { REFERENCE_CONDITIONS, isReferenceCode, type ReferenceCode } from '@common/gas/reference-conditions';
import { BAR_PER_PSI, celsiusToFahrenheit, fahrenheitToCelsius } from '@common/gas/units';

/**
 * The cylinder check, computed in the browser with the same engine as the server: the person's typed
 * values (strings, in the site's units) in, either results or a message per field out. Nothing here
 * returns NaN: a value that cannot be computed becomes a field message.
 */

/** International pound, exact by definition (1959 agreement). */
export const KG_PER_LB = 0.45359237;

export interface CheckSite {
  unitSystem: string;
  referenceCode: string;
  atmosphericBar: number;
  storeTemperatureC: number;
}

export interface CheckValues {
  gasCode: string;
  waterCapacityL: string;
  /** Gauge reading in the site's pressure unit (bar or psi). */
  gauge: string;
  /** Gas temperature in the site's temperature unit (°C or °F). */
  temperature: string;
  flowLMin: string;
  /** Change-over pressure, gauge, in the site's pressure unit. */
  reserve: string;
  /** Liquefied gases: weights in the site's mass unit (kg or lb). */
  gross: string;
  tare: string;
}

export type CheckField = keyof CheckValues;

export interface Units {
  us: boolean;
  pressure: 'bar' | 'psi';
  temperature: '°C' | '°F';
  mass: 'kg' | 'lb';
  reference: ReferenceCode;
  atmosphericBar: number;
}

export interface ChartPoint {
  /** Gauge pressure in the site's unit. */
  pressure: number;
  realL: number;
  idealL: number;
}

interface Common {
  gas: GasCode;
  units: Units;
  temperatureC: number;
  waterCapacityL: number;
  flowLMin: number;
  minutes: number;
  usableFreeGasL: number;
  cautions: string[];
  method: string;
}

export interface CompressedCheck extends Common {
  kind: 'compressed';
  contents: CompressedContents;
  reserveBar: number;
  /** Where the reserve came from when the default was used (blank field), else null. */
  reserveBasis: string | null;
  /** Mixtures: minutes across the Z range of the mixture (mixture-uncertainty.ts), with the method; else null. */
  minutesRange: { low: number; high: number; method: string } | null;
  /** Gauge pressure the same contents show at the reference temperature, site unit. */
  equivalentGauge: number;
  chart: ChartPoint[];
}

export interface LiquefiedCheck extends Common {
  kind: 'liquefied';
  contents: LiquefiedContents;
}

export type CheckOutcome =
  { ok: true; result: CompressedCheck | LiquefiedCheck } | { ok: false; errors: Partial<Record<CheckField, string>>; missing: CheckField[]; general?: string };

export function unitsFor(site: CheckSite): Units {
  const us = site.unitSystem === 'us';
  return {
    us,
    pressure: us ? 'psi' : 'bar',
    temperature: us ? '°F' : '°C',
    mass: us ? 'lb' : 'kg',
    reference: isReferenceCode(site.referenceCode) ? site.referenceCode : '15C',
    atmosphericBar: Number.isFinite(site.atmosphericBar) && site.atmosphericBar > 0 ? site.atmosphericBar : 1.01325,
  };
}

/** The store temperature as the starting value of the temperature field, in the site's unit. */
export function defaultTemperature(site: CheckSite): string {
  const c = Number.isFinite(site.storeTemperatureC) ? site.storeTemperatureC : 15;
  return String(site.unitSystem === 'us' ? Math.round(celsiusToFahrenheit(c)) : c);
}

/** Reads a typed number: decimal comma accepted, blank is "missing", anything else unreadable is NaN. */
export function readNumber(text: string): number | null {
  const t = text.trim();
  if (t === '') return null;
  const normalised = t.includes('.') ? t.replace(/,/g, '') : t.replace(',', '.');
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(normalised)) return NaN;
  return Number(normalised);
}

const ENGINE_PATH_TO_FIELD: Record<string, CheckField> = {
  waterCapacityL: 'waterCapacityL',
  gaugeBar: 'gauge',
  pressureBarAbs: 'gauge',
  temperatureC: 'temperature',
  temperatureK: 'temperature',
  flowLMin: 'flowLMin',
  reserveGaugeBar: 'reserve',
  grossKg: 'gross',
  tareKg: 'tare',
  gas: 'gasCode',
};

const MAX_FLOW_L_MIN = 200;

export function evaluateCylinderCheck(values: CheckValues, site: CheckSite): CheckOutcome {
  const units = unitsFor(site);
  const errors: Partial<Record<CheckField, string>> = {};
  const missing: CheckField[] = [];

  if (!isGasCode(values.gasCode)) return { ok: false, errors: { gasCode: 'choose the gas' }, missing: [] };
  const gas = values.gasCode;
  const liquefied = isLiquefiedGas(gas);

  const need = (field: CheckField, what: string, check: (n: number) => string | null): number => {
    const n = readNumber(values[field]);
    if (n === null) {
      missing.push(field);
      return NaN;
    }
    if (!Number.isFinite(n)) {
      errors[field] = `${what} must be a number, e.g. ${field === 'flowLMin' ? '2' : field === 'temperature' ? '15' : '137'}`;
      return NaN;
    }
    const problem = check(n);
    if (problem) errors[field] = problem;
    return n;
  };

  const waterCapacityL = need('waterCapacityL', 'Water capacity', (n) =>
    n <= 0 ? 'must be more than 0 L' : n > 150 ? 'above 150 L is not a cylinder: check the figure' : null,
  );
  const temperatureTyped = need('temperature', 'Temperature', () => null);
  const temperatureC = Number.isFinite(temperatureTyped) ? (units.us ? fahrenheitToCelsius(temperatureTyped) : temperatureTyped) : NaN;
  if (Number.isFinite(temperatureC) && (temperatureC < -40 || temperatureC > 65)) {
    errors.temperature = units.us ? 'must be between −40 and 149 °F' : 'must be between −40 and 65 °C';
  }
  const flowLMin = need('flowLMin', 'Flow', (n) =>
    n <= 0 ? 'must be more than 0 L/min' : n > MAX_FLOW_L_MIN ? `above ${MAX_FLOW_L_MIN} L/min: check the figure` : null,
  );

  const toBar = (p: number) => (units.us ? p * BAR_PER_PSI : p);
  const fromBar = (bar: number) => (units.us ? bar / BAR_PER_PSI : bar);
  const maxGauge = fromBar(MAX_PRESSURE_BAR_ABS - units.atmosphericBar);

  let gaugeBar = NaN;
  let reserveBar = 0;
  let reserveDefaulted = false;
  let grossKg = NaN;
  let tareKg = NaN;
  if (liquefied) {
    const toKg = (m: number) => (units.us ? m * KG_PER_LB : m);
    const gross = need('gross', 'Gross weight', (n) => (n <= 0 ? 'must be more than 0' : null));
    const tare = need('tare', 'Tare weight', (n) => (n <= 0 ? 'must be more than 0' : null));
    grossKg = toKg(gross);
    tareKg = toKg(tare);
    if (Number.isFinite(gross) && Number.isFinite(tare) && !errors.gross && !errors.tare && gross < tare) {
      errors.gross = 'is less than the tare: weigh again, or check the stamped tare';
    }
  } else {
    const gauge = need('gauge', 'Gauge reading', (n) =>
      n < 0 ? 'cannot be below 0 on the gauge' : n > maxGauge ? `above ${Math.round(maxGauge)} ${units.pressure}: check the reading` : null,
    );
    gaugeBar = toBar(gauge);
    // blank: the stated default residual (200 psi, 13.8 bar), shown beside the result
    reserveDefaulted = values.reserve.trim() === '';
    const reserve = reserveDefaulted ? fromBar(DEFAULT_RESERVE_GAUGE_BAR) : readNumber(values.reserve);
    if (reserve === null || !Number.isFinite(reserve)) errors.reserve = 'Reserve: type a number (0 to run to empty)';
    else if (reserve < 0) errors.reserve = 'cannot be below 0';
    else if (!reserveDefaulted && Number.isFinite(gauge) && reserve >= gauge && gauge > 0) errors.reserve = 'must be below the gauge reading';
    else reserveBar = reserveDefaulted ? DEFAULT_RESERVE_GAUGE_BAR : toBar(reserve);
  }

  if (Object.keys(errors).length > 0 || missing.length > 0) return { ok: false, errors, missing };

  try {
    if (liquefied) {
      const input = {
        gas: gas as LiquefiedGasCode,
        grossKg,
        tareKg,
        waterCapacityL,
        temperatureC,
        atmosphericBar: units.atmosphericBar,
        reference: units.reference,
      };
      const contents = liquefiedContents(input);
      const duration = cylinderDuration({ ...input, flowLMin });
      return {
        ok: true,
        result: {
          kind: 'liquefied',
          gas,
          units,
          temperatureC,
          waterCapacityL,
          flowLMin,
          minutes: finiteOr(duration.minutes, 0),
          usableFreeGasL: finiteOr(duration.usableFreeGasL, 0),
          cautions: unique([...contents.cautions, ...duration.cautions]),
          method: `by weight (gross − tare); free gas as real gas by ${methodFor(gas)}; pressure from the vapour-pressure curve`,
          contents,
        },
      };
    }
    const input = { gas, waterCapacityL, gaugeBar, temperatureC, atmosphericBar: units.atmosphericBar, reference: units.reference };
    const contents = compressedContents(input);
    const duration = cylinderDuration({ ...input, flowLMin, reserveGaugeBar: reserveBar });
    return {
      ok: true,
      result: {
        kind: 'compressed',
        gas,
        units,
        temperatureC,
        waterCapacityL,
        flowLMin,
        minutes: finiteOr(duration.minutes, 0),
        usableFreeGasL: finiteOr(duration.usableFreeGasL, 0),
        cautions: unique([...contents.cautions, ...duration.cautions]),
        method: contents.method,
        contents,
        reserveBar,
        reserveBasis: reserveDefaulted ? DEFAULT_RESERVE_SOURCE : null,
        minutesRange: (() => {
          const zr = mixtureZRange(gas, temperatureC + 273.15, contents.pressureBarAbs);
          if (!zr || !(duration.minutes > 0)) return null;
          return { low: (duration.minutes * contents.Z) / zr.high, high: (duration.minutes * contents.Z) / zr.low, method: zr.method };
        })(),
        equivalentGauge: fromBar(contents.equivalentGaugeBarAtReferenceTemperature),
        chart: contentsCurve(
          { gas, waterCapacityL, temperatureC, atmosphericBar: units.atmosphericBar, reference: units.reference },
          toBar(roundUp(fromBar(Math.max(gaugeBar, 200)), units.us ? 500 : 50)),
          fromBar,
        ),
      },
    };
  } catch (e) {
    if (e instanceof InvalidInputError) {
      const fieldErrors: Partial<Record<CheckField, string>> = {};
      for (const d of e.details) {
        const field = ENGINE_PATH_TO_FIELD[d.path.split('.')[0]];
        if (field) fieldErrors[field] = d.message;
      }
      return Object.keys(fieldErrors).length > 0
        ? { ok: false, errors: fieldErrors, missing: [], general: e.message }
        : { ok: false, errors: {}, missing: [], general: e.message };
    }
    return { ok: false, errors: {}, missing: [], general: 'These values cannot be computed. Check them and try again.' };
  }
}

/**
 * Free gas against gauge pressure, real and ideal, from 0 to `maxGaugeBar` at the given temperature
 * (about 30 points): the gap between the curves is what the ideal-gas law gets wrong.
 */
export function contentsCurve(
  input: { gas: GasCode; waterCapacityL: number; temperatureC: number; atmosphericBar: number; reference: ReferenceCode },
  maxGaugeBar: number,
  fromBar: (bar: number) => number = (b) => b,
  points = 30,
): ChartPoint[] {
  const top = Math.min(maxGaugeBar, MAX_PRESSURE_BAR_ABS - input.atmosphericBar);
  const out: ChartPoint[] = [];
  for (let i = 0; i < points; i++) {
    const gaugeBar = (top * i) / (points - 1);
    try {
      const c = compressedContents({ ...input, gaugeBar });
      if (Number.isFinite(c.freeGasL) && Number.isFinite(c.idealFreeGasL))
        out.push({ pressure: fromBar(gaugeBar), realL: c.freeGasL, idealL: c.idealFreeGasL });
    } catch {
      // a state the engine cannot compute (near condensation) is left out of the curve
    }
  }
  return out;
}

/** Cautions for the temperature alone (the 50:50 mixture), shown even before the other fields are filled. */
export function temperatureCautions(gasCode: string, temperatureText: string, site: CheckSite): string[] {
  if (!isGasCode(gasCode)) return [];
  const t = readNumber(temperatureText);
  if (t === null || !Number.isFinite(t)) return [];
  return mixtureCautions(gasCode, site.unitSystem === 'us' ? fahrenheitToCelsius(t) : t);
}

export function referenceLabel(reference: ReferenceCode): string {
  return REFERENCE_CONDITIONS[reference].label;
}

export function referenceTemperatureC(units: Units): number {
  return REFERENCE_CONDITIONS[units.reference].temperatureK - 273.15;
}

export function referenceTemperatureLabel(units: Units): string {
  const k = REFERENCE_CONDITIONS[units.reference].temperatureK;
  return units.us ? `${Math.round(celsiusToFahrenheit(k - 273.15))} °F` : `${Math.round((k - 273.15) * 10) / 10} °C`;
}

export function gasLabel(gas: GasCode): string {
  return GAS_INFO[gas].name;
}

/** The next multiple of `step` at or above `value`, so the chart's axis ends on a round figure. */
function roundUp(value: number, step: number): number {
  return Math.ceil(value / step - 1e-9) * step;
}

function finiteOr(n: number, fallback: number): number {
  return Number.isFinite(n) ? n : fallback;
}

function unique(list: string[]): string[] {
  return [...new Set(list)];
}
