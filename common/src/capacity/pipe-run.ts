/**
 * Pressure drop and flow capacity of one pipe run of a given gas, with real-gas densities from the
 * gas engine (line and reference conditions) and Darcy–Weisbach from pipe-hydraulics.ts.
 */
import { InvalidInputError } from '../api/errors';
import { compressibility } from '../gas/eos';
import type { GasCode } from '../gas/gases';
import type { CapacityGasCode } from './diversity-rules';
import {
  DRAWN_COPPER_ROUGHNESS_MM,
  computeDarcyPressureDrop,
  lookupViscosityPaS,
  type DarcyPressureDropResult,
  type FrictionCorrelation,
} from './pipe-hydraulics';

// The capacity engine's gas list must stay the gas engine's list plus VAC.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const gasListsAgree: Same<Exclude<CapacityGasCode, 'VAC'>, GasCode> = true;
void gasListsAgree;

/** Nominal distribution pressure of O2, N2O, N2O/O2, air and He/O2 pipelines, kPa gauge (HTM 02-01 Part B). */
export const NOMINAL_DISTRIBUTION_PRESSURE_KPA = 400;
/**
 * Default allowed pressure drop of a pipe run: 5 % of the nominal distribution pressure. Common
 * practice, from memory; set the figure your design standard and the site's AP agree.
 */
export const DEFAULT_ALLOWED_DROP_FRACTION = 0.05;
/** Default fittings allowance, % of straight length: common practice (from memory); editable. */
export const DEFAULT_FITTINGS_ALLOWANCE_PERCENT = 20;
/** Default gas temperature in the pipe, K (20 °C). */
export const DEFAULT_LINE_TEMPERATURE_K = 293.15;
/** Default free-gas reference: 15 °C, 1.01325 bar (UK/EU cylinder basis). */
export const DEFAULT_REFERENCE = { temperatureK: 288.15, pressureBarAbs: 1.01325 } as const;

export interface PipeRunSpec {
  gas: GasCode;
  innerDiameterMm: number;
  /** Set when the inner diameter came from the EN 13348 tube table (wall thicknesses from memory). */
  innerDiameterFromTubeTable?: boolean;
  lengthM: number;
  /** % of the straight length; default 20 % unless an equivalent length is given */
  fittingsAllowancePercent?: number;
  fittingsEquivalentLengthM?: number;
  /** line pressure at the start of the run, kPa gauge (default 400) */
  linePressureKPaGauge?: number;
  atmosphericPressureBarAbs?: number;
  gasTemperatureK?: number;
  referenceTemperatureK?: number;
  referencePressureBarAbs?: number;
  /** allowed drop over the run, kPa (default 5 % of the line pressure) */
  allowedDropKPa?: number;
  roughnessMm?: number;
  correlation?: FrictionCorrelation;
  /** overrides the viscosity table, Pa·s */
  viscosityPaS?: number;
}

export interface PipeRunResult extends DarcyPressureDropResult {
  gas: GasCode;
  flowFreeLMin: number;
  inletPressureBarAbs: number;
  meanPressureBarAbs: number;
  outletPressureKPaGauge: number;
  lineDensityKgM3: number;
  lineZ: number;
  referenceDensityKgM3: number;
  viscosityPaS: number;
  allowedDropKPa: number;
  withinAllowance: boolean;
  /** pressure drop ÷ allowed drop */
  utilisation: number;
  assumptions: string[];
  /** Next to the verdict: which from-memory defaults it rests on. */
  verdictNote: string;
}

interface Resolved {
  spec: Required<Omit<PipeRunSpec, 'fittingsEquivalentLengthM' | 'viscosityPaS'>> & { fittingsEquivalentLengthM: number; viscosityPaS: number };
  assumptions: string[];
}

function resolve(spec: PipeRunSpec): Resolved {
  const assumptions: string[] = [];
  const line = spec.linePressureKPaGauge ?? NOMINAL_DISTRIBUTION_PRESSURE_KPA;
  if (!(line > 0) || !Number.isFinite(line)) {
    throw new InvalidInputError(`The line pressure must be above atmospheric (got ${line} kPa gauge)`, [
      { path: 'line_pressure_kPa_gauge', message: 'expected > 0 kPa gauge' },
    ]);
  }
  if (spec.linePressureKPaGauge === undefined)
    assumptions.push(`line pressure ${NOMINAL_DISTRIBUTION_PRESSURE_KPA} kPa gauge (HTM 02-01 nominal distribution pressure)`);
  let fittingsAllowancePercent = spec.fittingsAllowancePercent;
  if (fittingsAllowancePercent === undefined) {
    fittingsAllowancePercent = spec.fittingsEquivalentLengthM === undefined ? DEFAULT_FITTINGS_ALLOWANCE_PERCENT : 0;
    if (spec.fittingsEquivalentLengthM === undefined)
      assumptions.push(`fittings allowance ${DEFAULT_FITTINGS_ALLOWANCE_PERCENT} % of length (common practice, from memory)`);
  }
  const allowedDropKPa = spec.allowedDropKPa ?? DEFAULT_ALLOWED_DROP_FRACTION * line;
  if (spec.allowedDropKPa === undefined)
    assumptions.push(`allowed drop ${DEFAULT_ALLOWED_DROP_FRACTION * 100} % of line pressure (common practice, from memory)`);
  if (!(allowedDropKPa > 0)) {
    throw new InvalidInputError('The allowed pressure drop must be positive', [{ path: 'allowed_drop_kPa', message: 'expected > 0' }]);
  }
  const gasTemperatureK = spec.gasTemperatureK ?? DEFAULT_LINE_TEMPERATURE_K;
  const viscosityPaS = spec.viscosityPaS ?? lookupViscosityPaS(spec.gas, gasTemperatureK);
  if (spec.viscosityPaS === undefined)
    assumptions.push(
      `viscosity at the gas temperature (${(gasTemperatureK - 273.15).toFixed(1)} °C) from a 20 °C table by Sutherland’s law (from memory); mixtures by Wilke 1950`,
    );
  if (spec.innerDiameterFromTubeTable) assumptions.push('inner diameter from the EN 13348 tube sizes (wall thicknesses from memory, not verified)');
  if (spec.roughnessMm === undefined) assumptions.push(`roughness ${DRAWN_COPPER_ROUGHNESS_MM} mm, drawn copper (from memory)`);
  return {
    spec: {
      gas: spec.gas,
      innerDiameterMm: spec.innerDiameterMm,
      innerDiameterFromTubeTable: spec.innerDiameterFromTubeTable ?? false,
      lengthM: spec.lengthM,
      fittingsAllowancePercent,
      fittingsEquivalentLengthM: spec.fittingsEquivalentLengthM ?? 0,
      linePressureKPaGauge: line,
      atmosphericPressureBarAbs: spec.atmosphericPressureBarAbs ?? DEFAULT_REFERENCE.pressureBarAbs,
      gasTemperatureK,
      referenceTemperatureK: spec.referenceTemperatureK ?? DEFAULT_REFERENCE.temperatureK,
      referencePressureBarAbs: spec.referencePressureBarAbs ?? DEFAULT_REFERENCE.pressureBarAbs,
      allowedDropKPa,
      roughnessMm: spec.roughnessMm ?? DRAWN_COPPER_ROUGHNESS_MM,
      correlation: spec.correlation ?? 'colebrook_white',
      viscosityPaS,
    },
    assumptions,
  };
}

/**
 * The words that go next to a pass/fail verdict: which of its inputs are from-memory defaults (the
 * assumptions marked "from memory"), so the verdict is not trusted further than they are.
 */
export function verdictNote(withinAllowance: boolean, assumptions: readonly string[]): string {
  const memory = assumptions.filter((a) => /from memory/.test(a));
  const verdict = withinAllowance ? 'Within the allowed drop' : 'Over the allowed drop';
  if (memory.length === 0) return `${verdict}, from the figures given.`;
  return `${verdict} — resting on from-memory defaults: ${memory.join('; ')}. Check them against the design standard before relying on the verdict.`;
}

function evaluate(r: Resolved, flowFreeLMin: number): PipeRunResult {
  const s = r.spec;
  const reference = compressibility(s.gas, s.referenceTemperatureK, s.referencePressureBarAbs);
  const inletBarAbs = s.linePressureKPaGauge / 100 + s.atmosphericPressureBarAbs;
  let meanBarAbs = inletBarAbs;
  let line = compressibility(s.gas, s.gasTemperatureK, meanBarAbs);
  let drop!: DarcyPressureDropResult;
  // Density at the mean pressure of the run; a few passes settle it because the drop is small.
  for (let pass = 0; pass < 4; pass++) {
    drop = computeDarcyPressureDrop({
      flowFreeLMin,
      referenceDensityKgM3: reference.densityKgM3,
      lineDensityKgM3: line.densityKgM3,
      viscosityPaS: s.viscosityPaS,
      innerDiameterMm: s.innerDiameterMm,
      lengthM: s.lengthM,
      fittingsAllowancePercent: s.fittingsAllowancePercent,
      fittingsEquivalentLengthM: s.fittingsEquivalentLengthM,
      roughnessMm: s.roughnessMm,
      correlation: s.correlation,
    });
    const nextMean = inletBarAbs - drop.pressureDropKPa / 200;
    if (nextMean <= s.atmosphericPressureBarAbs) {
      // The run would lose all its gauge pressure: report the drop as it stands (far above any allowance).
      break;
    }
    if (Math.abs(nextMean - meanBarAbs) < 1e-9 * inletBarAbs) break;
    meanBarAbs = nextMean;
    line = compressibility(s.gas, s.gasTemperatureK, meanBarAbs);
  }
  return {
    ...drop,
    gas: s.gas,
    flowFreeLMin,
    inletPressureBarAbs: inletBarAbs,
    meanPressureBarAbs: meanBarAbs,
    outletPressureKPaGauge: s.linePressureKPaGauge - drop.pressureDropKPa,
    lineDensityKgM3: line.densityKgM3,
    lineZ: line.Z,
    referenceDensityKgM3: reference.densityKgM3,
    viscosityPaS: s.viscosityPaS,
    allowedDropKPa: s.allowedDropKPa,
    withinAllowance: drop.pressureDropKPa <= s.allowedDropKPa,
    utilisation: drop.pressureDropKPa / s.allowedDropKPa,
    assumptions: r.assumptions,
    verdictNote: verdictNote(drop.pressureDropKPa <= s.allowedDropKPa, r.assumptions),
  };
}

/**
 * Pressure drop of one pipe run carrying a free-gas flow: Darcy–Weisbach with Colebrook–White (or
 * Swamee–Jain 1976) friction; gas density from the gas engine's real-gas equation at the run's mean
 * pressure and the line temperature; actual flow = free flow × ρ_ref / ρ_line.
 * @param spec the run (inner diameter mm, length m, line pressure kPa gauge, temperatures K …)
 * @param flowFreeLMin flow as free gas at the reference conditions, L/min
 */
export function computePipeRunPressureDrop(spec: PipeRunSpec, flowFreeLMin: number): PipeRunResult {
  return evaluate(resolve(spec), flowFreeLMin);
}

/**
 * Largest free-gas flow, L/min, the run carries within its allowed pressure drop (bisection on
 * computePipeRunPressureDrop, which rises monotonically with flow), to 1e-6 relative.
 */
export function computePipeRunCapacityLMin(spec: PipeRunSpec): { capacityLMin: number; atCapacity: PipeRunResult } {
  const r = resolve(spec);
  const allowed = r.spec.allowedDropKPa;
  let lo = 0;
  let hi = 100;
  let guard = 0;
  while (evaluate(r, hi).pressureDropKPa < allowed) {
    lo = hi;
    hi *= 2;
    if (++guard > 60)
      throw new InvalidInputError('The pipe run has no practical flow limit with these inputs', [{ path: 'allowed_drop_kPa', message: 'check the inputs' }]);
  }
  while (hi - lo > 1e-6 * hi) {
    const mid = (lo + hi) / 2;
    if (evaluate(r, mid).pressureDropKPa <= allowed) lo = mid;
    else hi = mid;
  }
  return { capacityLMin: lo, atCapacity: evaluate(r, lo) };
}
