/**
 * Supply-source arithmetic: cylinder-manifold sizing and bank duration, reserve rules, vaporiser
 * derating. Free-gas volumes are litres at the site's reference conditions; the caller passes a
 * cylinder's free-gas content as a number (from the gas engine or a supplier's figure).
 */
import { InvalidInputError, type FieldIssue } from '../api/errors';

function check(issues: FieldIssue[], path: string, value: number, what: string, allowZero = false): void {
  if (!Number.isFinite(value) || value < 0 || (!allowZero && value === 0)) {
    issues.push({ path, message: `${what} must be ${allowZero ? '≥ 0' : '> 0'} (got ${value})` });
  }
}

function throwIf(issues: FieldIssue[], what: string): void {
  if (issues.length > 0) throw new InvalidInputError(`Cannot compute ${what}: ${issues[0].message}`, issues);
}

/** Source string of the secondary-supply rule. */
export const FOUR_HOUR_RULE_SOURCE = 'HTM 02-01: secondary supply (e.g. emergency reserve manifold) holds at least 4 h of consumption at design flow';
/** Source string of the average-day rule. */
export const AVERAGE_DAY_RULE_SOURCE =
  "NFPA 99 (2002) §5.1.3.4.13: the in-building emergency reserve holds at least one average day's supply (it does not replace the bulk reserve, §5.1.3.4.11.4)";
/** Source of the manifold sizing method. */
export const MANIFOLD_SIZING_SOURCE =
  'HTM 02-01 method as applied in a published hospital cylinder calculation: daily demand = peak flow × 60 × operating hours; cylinders = demand ÷ cylinder contents; both banks together hold a day';

/**
 * Cylinders per bank offered on common manifolds, smallest first. From memory, not a standard:
 * use the sizes the supplier offers.
 */
export const DEFAULT_BANK_SIZES = [1, 2, 3, 4, 5, 6, 8, 10, 12, 15, 20];

/**
 * Continuous-duty derating of an ambient vaporiser: nameplate ratings assume about 8 h at 21 °C,
 * 70 % RH; for continuous duty derate by about 30 % (alternating pair) to 50 % (single), more in
 * frost (US medical-gas practitioners' forum, Mar 2020). Default: alternating pair, 0.7.
 */
export const VAPORISER_DERATING = { alternating: 0.7, single: 0.5 } as const;
export const VAPORISER_DERATING_SOURCE =
  "Medical-gas practitioners' forum (Mar 2020): continuous duty derates an ambient vaporiser by ~30 % (alternating) to ~50 % (single), more in frost";

/**
 * Daily demand in free-gas litres: flow × 60 × operating hours.
 * @param flowLMin peak (or design) flow, L/min free gas
 * @param hoursPerDay hours per day at that flow (e.g. 10 for 08:00–18:00)
 */
export function computeDailyDemandL(flowLMin: number, hoursPerDay: number): number {
  const issues: FieldIssue[] = [];
  check(issues, 'flow_L_min', flowLMin, 'The flow', true);
  check(issues, 'hours_per_day', hoursPerDay, 'The hours per day');
  if (hoursPerDay > 24) issues.push({ path: 'hours_per_day', message: 'a day has at most 24 hours' });
  throwIf(issues, 'the daily demand');
  return flowLMin * 60 * hoursPerDay;
}

export interface ManifoldSizingInput {
  /** peak flow on the manifold, L/min free gas */
  flowLMin: number;
  /** operating hours per day at that flow */
  hoursPerDay: number;
  /** free-gas content of one full cylinder, L (e.g. 6,800 L for 47 L at 137 bar O2) */
  cylinderFreeGasL: number;
  /** days of demand both banks together must hold (default 1) */
  daysOnManifold?: number;
  /** days per week the demand runs (default 7) */
  daysPerWeek?: number;
  /** cylinders per bank available, smallest first (default DEFAULT_BANK_SIZES) */
  bankSizes?: number[];
}

export interface ManifoldSizing {
  dailyDemandL: number;
  cylindersPerDay: number;
  cylindersNeeded: number;
  cylindersPerBankNeeded: number;
  /** chosen cylinders per bank (two banks: duty and standby) */
  cylindersPerBank: number;
  label: string;
  bankFreeGasL: number;
  /** hours one bank lasts at the given flow, running continuously */
  bankDurationAtFlowH: number;
  /** days between changeovers at the daily demand */
  changeoverIntervalDays: number;
  cylindersPerWeek: number;
  source: string;
}

/**
 * Sizes a duty/standby cylinder manifold from the peak daily demand: cylinders for `daysOnManifold`
 * days split over two banks, each rounded up to an offered bank size; with bank duration, changeover
 * interval and weekly cylinder use. Method: HTM 02-01 as applied in a published hospital calculation.
 */
export function sizeCylinderManifold(input: ManifoldSizingInput): ManifoldSizing {
  const issues: FieldIssue[] = [];
  check(issues, 'flow_L_min', input.flowLMin, 'The flow');
  check(issues, 'hours_per_day', input.hoursPerDay, 'The hours per day');
  check(issues, 'cylinder_free_gas_L', input.cylinderFreeGasL, 'The cylinder content');
  check(issues, 'days_on_manifold', input.daysOnManifold ?? 1, 'The days on the manifold');
  check(issues, 'days_per_week', input.daysPerWeek ?? 7, 'The days per week');
  if ((input.daysPerWeek ?? 7) > 7) issues.push({ path: 'days_per_week', message: 'a week has at most 7 days' });
  throwIf(issues, 'the manifold size');
  const dailyDemandL = computeDailyDemandL(input.flowLMin, input.hoursPerDay);
  const cylindersPerDay = dailyDemandL / input.cylinderFreeGasL;
  const cylindersNeeded = Math.ceil(cylindersPerDay * (input.daysOnManifold ?? 1) - 1e-9);
  const cylindersPerBankNeeded = Math.ceil(cylindersNeeded / 2);
  const sizes = [...(input.bankSizes ?? DEFAULT_BANK_SIZES)].sort((a, b) => a - b);
  const chosen = sizes.find((s) => s >= cylindersPerBankNeeded);
  if (chosen === undefined) {
    throw new InvalidInputError(
      `${cylindersPerBankNeeded} cylinders per bank exceed the largest offered bank (${sizes[sizes.length - 1]}): consider a bulk liquid supply or compressor plant`,
      [{ path: 'bank_sizes', message: 'no offered bank is large enough' }],
    );
  }
  const bankFreeGasL = chosen * input.cylinderFreeGasL;
  return {
    dailyDemandL,
    cylindersPerDay,
    cylindersNeeded,
    cylindersPerBankNeeded,
    cylindersPerBank: chosen,
    label: `2 × ${chosen}`,
    bankFreeGasL,
    bankDurationAtFlowH: computeDurationH(bankFreeGasL, input.flowLMin),
    changeoverIntervalDays: bankFreeGasL / dailyDemandL,
    cylindersPerWeek: cylindersPerDay * (input.daysPerWeek ?? 7),
    source: MANIFOLD_SIZING_SOURCE,
  };
}

/**
 * Hours a quantity of free gas lasts at a flow: volume ÷ flow ÷ 60.
 * @param freeGasL free-gas litres
 * @param flowLMin L/min free gas (> 0)
 */
export function computeDurationH(freeGasL: number, flowLMin: number): number {
  const issues: FieldIssue[] = [];
  check(issues, 'free_gas_L', freeGasL, 'The gas volume', true);
  check(issues, 'flow_L_min', flowLMin, 'The flow');
  throwIf(issues, 'the duration');
  return freeGasL / flowLMin / 60;
}

export interface ReserveRuleResult {
  rule: 'four_hour_secondary' | 'average_day';
  requiredFreeGasL: number;
  /** cylinders of the given content to hold it (when a cylinder content was given) */
  cylindersRequired?: number;
  /** reserve held, when given */
  heldFreeGasL?: number;
  /** hours (four-hour rule) or days (average-day rule) the held reserve covers */
  covers?: number;
  meets?: boolean;
  source: string;
}

/**
 * The 4-hour rule: a secondary/emergency reserve supply holds ≥ 4 h at design flow (HTM 02-01).
 * @param designFlowLMin design flow, L/min free gas
 * @param options cylinderFreeGasL to count cylinders; heldFreeGasL to check a reserve
 */
export function applyFourHourRule(designFlowLMin: number, options: { cylinderFreeGasL?: number; heldFreeGasL?: number } = {}): ReserveRuleResult {
  const issues: FieldIssue[] = [];
  check(issues, 'design_flow_L_min', designFlowLMin, 'The design flow');
  if (options.cylinderFreeGasL !== undefined) check(issues, 'cylinder_free_gas_L', options.cylinderFreeGasL, 'The cylinder content');
  if (options.heldFreeGasL !== undefined) check(issues, 'reserve_free_gas_L', options.heldFreeGasL, 'The reserve', true);
  throwIf(issues, 'the 4-hour reserve');
  const requiredFreeGasL = designFlowLMin * 60 * 4;
  const result: ReserveRuleResult = { rule: 'four_hour_secondary', requiredFreeGasL, source: FOUR_HOUR_RULE_SOURCE };
  if (options.cylinderFreeGasL !== undefined) result.cylindersRequired = Math.ceil(requiredFreeGasL / options.cylinderFreeGasL - 1e-9);
  if (options.heldFreeGasL !== undefined) {
    result.heldFreeGasL = options.heldFreeGasL;
    result.covers = computeDurationH(options.heldFreeGasL, designFlowLMin);
    result.meets = options.heldFreeGasL >= requiredFreeGasL;
  }
  return result;
}

/**
 * The average-day rule: an emergency reserve holds ≥ one average day's consumption (NFPA 99).
 * @param averageDailyConsumptionL average daily consumption, L free gas (measured, not design flow)
 * @param options cylinderFreeGasL to count cylinders; heldFreeGasL to check a reserve
 */
export function applyAverageDayRule(averageDailyConsumptionL: number, options: { cylinderFreeGasL?: number; heldFreeGasL?: number } = {}): ReserveRuleResult {
  const issues: FieldIssue[] = [];
  check(issues, 'average_daily_consumption_L', averageDailyConsumptionL, 'The average daily consumption');
  if (options.cylinderFreeGasL !== undefined) check(issues, 'cylinder_free_gas_L', options.cylinderFreeGasL, 'The cylinder content');
  if (options.heldFreeGasL !== undefined) check(issues, 'reserve_free_gas_L', options.heldFreeGasL, 'The reserve', true);
  throwIf(issues, 'the average-day reserve');
  const result: ReserveRuleResult = { rule: 'average_day', requiredFreeGasL: averageDailyConsumptionL, source: AVERAGE_DAY_RULE_SOURCE };
  if (options.cylinderFreeGasL !== undefined) result.cylindersRequired = Math.ceil(averageDailyConsumptionL / options.cylinderFreeGasL - 1e-9);
  if (options.heldFreeGasL !== undefined) {
    result.heldFreeGasL = options.heldFreeGasL;
    result.covers = options.heldFreeGasL / averageDailyConsumptionL;
    result.meets = options.heldFreeGasL >= averageDailyConsumptionL;
  }
  return result;
}

/**
 * Continuous flow an ambient vaporiser can carry, L/min free gas: nameplate m³/h × derating × 1000/60.
 * @param ratingM3H nameplate rating, m³/h free gas at the site's reference conditions
 * @param deratingFactor fraction of nameplate usable in continuous duty (default 0.7, alternating pair)
 */
export function computeVaporiserCapacityLMin(ratingM3H: number, deratingFactor: number = VAPORISER_DERATING.alternating): number {
  const issues: FieldIssue[] = [];
  check(issues, 'rating_m3_h', ratingM3H, 'The vaporiser rating');
  if (!(deratingFactor > 0 && deratingFactor <= 1)) issues.push({ path: 'derating_factor', message: `must lie in (0, 1] (got ${deratingFactor})` });
  throwIf(issues, 'the vaporiser capacity');
  return (ratingM3H * deratingFactor * 1000) / 60;
}
