import { hasKey } from '../api/lookup';
import { InvalidInputError, type FieldIssue } from '../api/errors';
import type { DemandLine } from './demand-lines';

/** Oxygen delivery devices with a default per-patient flow. */
export type OxygenDevice = 'nasal_cannula' | 'simple_mask' | 'non_rebreather' | 'venturi_35' | 'hfno' | 'cpap' | 'ventilator';

export const OXYGEN_DEVICES: readonly OxygenDevice[] = ['nasal_cannula', 'simple_mask', 'non_rebreather', 'venturi_35', 'hfno', 'cpap', 'ventilator'];

export interface DeviceDefault {
  label: string;
  /** Default oxygen flow per patient, L/min of free gas. Editable: a planning default, not a prescription. */
  flowLMin: number;
  /** Usual clinical range, L/min of oxygen. */
  rangeLMin: readonly [number, number];
  /** Where the figure comes from. */
  source: string;
}

/**
 * Per-patient oxygen flows used to turn patients on devices into demand. Planning defaults only: the
 * prescribed flow of each patient rules, and sites should edit these to what their wards really use.
 */
export const DEVICE_DEFAULTS: Record<OxygenDevice, DeviceDefault> = {
  // 1–4 L/min (max ~6), FiO2 0.24–0.44: clinical summaries of oxygen devices.
  nasal_cannula: { label: 'Nasal cannula', flowLMin: 2, rangeLMin: [1, 6], source: 'clinical summaries: 1–4 L/min, max ~6' },
  // 5–10 L/min, never below 5 (CO2 rebreathing): clinical summaries.
  simple_mask: { label: 'Simple face mask', flowLMin: 6, rangeLMin: [5, 10], source: 'clinical summaries: 5–10 L/min, never < 5' },
  // 10–15 L/min, FiO2 > 0.60: clinical summaries; planning takes the top of the range.
  non_rebreather: { label: 'Reservoir (non-rebreather) mask', flowLMin: 15, rangeLMin: [10, 15], source: 'clinical summaries: 10–15 L/min' },
  // Venturi 35 %: 8–12 L/min per the BTS-based device tables in clinical summaries; the minimum is the default.
  venturi_35: { label: 'Venturi mask 35 %', flowLMin: 8, rangeLMin: [8, 12], source: 'clinical summaries (BTS-based): 35 % valve at 8–12 L/min' },
  // HFNC: up to 60 L/min total gas, the oxygen share set by FiO2 (review PMC5359952). 40 L/min of O2 is
  // the O2 share of 60 L/min total at FiO2 ≈ 0.74 (blend mass balance, see oxygenShareOfBlendLMin).
  hfno: {
    label: 'High-flow nasal oxygen',
    flowLMin: 40,
    rangeLMin: [0, 60],
    source: 'review PMC5359952: ≤ 60 L/min total gas; 40 L/min O2 share is a planning default',
  },
  // CPAP: up to 60 L/min per outlet, later capped at 30 in the 2020–21 surge (Health Estate Journal, Jun 2021).
  cpap: { label: 'CPAP', flowLMin: 30, rangeLMin: [15, 60], source: 'Health Estate Journal, Jun 2021: ≤ 60 per outlet, later capped at 30' },
  // Ventilator: oxygen share of minute volume plus bias flow, about 6 L/min — from memory (the US
  // military design handbook gives "about 6" for surgery); PROXY-COVID measured a median 2.9 L/min.
  ventilator: { label: 'Ventilator (O2 share)', flowLMin: 6, rangeLMin: [2, 15], source: 'from memory (~6 L/min); PROXY-COVID median 2.9 L/min' },
};

/** WHO planning flows per patient (WHO interim guidance, Apr 2020; "Foundations of medical oxygen systems", 2023). */
export const WHO_PLANNING_FLOW_L_MIN = { severe: 10, critical: 30 } as const;

/**
/** O2 mole fraction of dry air: 20.96 % (the air composition of the reference tables in tests/reference; clinically "21 %"). */
export const AIR_OXYGEN_FRACTION = 0.2096;

/**
 * Oxygen share of an air/oxygen blend, L/min: total × (FiO2 − x_air)/(1 − x_air), x_air = 0.2096. Mole
 * balance of mixing dry air with pure oxygen (free-gas litres ∝ moles at one reference state).
 * @param totalFlowLMin total gas flow, L/min
 * @param fio2 delivered oxygen fraction, x_air…1
 */
export function oxygenShareOfBlendLMin(totalFlowLMin: number, fio2: number): number {
  if (!(totalFlowLMin >= 0) || !(fio2 >= AIR_OXYGEN_FRACTION && fio2 <= 1)) {
    throw new InvalidInputError('Blend needs total flow ≥ 0 and FiO2 between 0.21 and 1', [{ path: 'fio2', message: 'must be between 0.2096 and 1' }]);
  }
  return (totalFlowLMin * (fio2 - AIR_OXYGEN_FRACTION)) / (1 - AIR_OXYGEN_FRACTION);
}

/**
 * One therapy line of a ward: patients on a device (or at a custom flow), by local clock hour and ISO
 * weekday, optionally within a local date window.
 */
export interface TherapyLine {
  device: OxygenDevice | 'custom';
  patients: number;
  /** Per-patient oxygen flow, L/min; defaults to DEVICE_DEFAULTS[device]. Required for 'custom'. */
  flow_L_min?: number;
  hours?: readonly number[];
  weekdays?: readonly number[];
  from?: string;
  until?: string;
  label?: string;
}

export interface DemandModelOptions {
  /**
   * Leakage allowance of the pipeline, % added to every line (a site figure: pipeline leakage is
   * measured by the pressure-decay test; common practice carries a few per cent).
   */
  leakagePercent?: number;
}

/**
 * Turns therapy lines into demand lines: flow = patients × per-patient flow × (1 + leakage/100), run in
 * the line's hours and weekdays. Method: additive device model (patients × device flow × hours), as in
 * WHO oxygen planning; devices default per DEVICE_DEFAULTS.
 * @param therapy therapy lines (patients ≥ 0, flows L/min ≥ 0)
 * @param options leakagePercent (%, ≥ 0)
 */
export function buildDemandLinesFromTherapy(therapy: readonly TherapyLine[], options: DemandModelOptions = {}): DemandLine[] {
  const leak = options.leakagePercent ?? 0;
  const issues: FieldIssue[] = [];
  if (!(leak >= 0 && leak <= 100)) issues.push({ path: 'leakage_percent', message: 'must be between 0 and 100 %' });
  therapy.forEach((t, k) => {
    if (!(Number.isFinite(t.patients) && t.patients >= 0)) issues.push({ path: `therapy.${k}.patients`, message: 'must be a number ≥ 0' });
    if (t.device === 'custom' && t.flow_L_min === undefined) issues.push({ path: `therapy.${k}.flow_L_min`, message: 'a custom line needs its flow' });
    else if (t.device !== 'custom' && !hasKey(DEVICE_DEFAULTS, t.device))
      issues.push({ path: `therapy.${k}.device`, message: `unknown device; one of ${OXYGEN_DEVICES.join(', ')}, custom` });
    if (t.flow_L_min !== undefined && !(Number.isFinite(t.flow_L_min) && t.flow_L_min >= 0))
      issues.push({ path: `therapy.${k}.flow_L_min`, message: 'must be ≥ 0 L/min' });
  });
  if (issues.length > 0) throw new InvalidInputError(`Invalid demand model: ${issues[0].path}: ${issues[0].message}`, issues);
  const factor = 1 + leak / 100;
  return therapy.map((t) => {
    const perPatient = t.flow_L_min ?? DEVICE_DEFAULTS[t.device as OxygenDevice].flowLMin;
    const line: DemandLine = { flow_L_min: t.patients * perPatient * factor };
    if (t.hours) line.hours = [...t.hours];
    if (t.weekdays) line.weekdays = [...t.weekdays];
    if (t.from) line.from = t.from;
    if (t.until) line.until = t.until;
    line.label = t.label ?? (t.device === 'custom' ? 'custom' : DEVICE_DEFAULTS[t.device].label);
    return line;
  });
}

/**
 * Mean daily demand of demand lines, L/day of free gas, averaged over a week (each line's flow × its
 * hours per week × 60 ÷ 7). Ignores from/until windows. For sizing and days-of-stock figures.
 */
export function meanDailyDemandL(lines: readonly DemandLine[]): number {
  let perWeek = 0;
  for (const l of lines) {
    const days = l.weekdays && l.weekdays.length > 0 ? new Set(l.weekdays).size : 7;
    const hours = l.hours && l.hours.length > 0 ? new Set(l.hours).size : 24;
    perWeek += l.flow_L_min * 60 * hours * days;
  }
  return perWeek / 7;
}
