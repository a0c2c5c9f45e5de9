import { InvalidInputError, type FieldIssue } from '../api/errors';
import type { DepletionOrder } from './project-depletion';

/**
 * A two-bank cylinder manifold with automatic changeover (duty and standby banks): the duty bank feeds
 * the pipeline until it falls to the changeover pressure, then the manifold switches to the standby bank
 * at once and the emptied bank waits to be replaced by full cylinders from the store. Supply is lost
 * when both banks are down to their changeover residual and no bank has been replaced. Method: event
 * stepping within each hour at constant hourly flow (changeover instants are exact, not rounded to the
 * hour). All quantities are litres of free gas at the forecast's reference conditions.
 */
export interface ManifoldConfig {
  cylindersPerBank: number;
  /** Free gas in one full cylinder, L. */
  fullCylinderL: number;
  /** Free gas left in one cylinder when the bank changes over (at the changeover pressure), L; 0 = drawn flat. */
  residualPerCylinderL: number;
  /** Hours after a changeover before staff have replaced the emptied bank from the store (0 = at the next hour boundary). */
  bankReplacementHours: number;
}

export type BankName = 'A' | 'B';

export interface ManifoldState {
  /** Free gas in bank A and B, L. */
  bankL: [number, number];
  /** Cylinders on bank A and B (a bank may be refilled with fewer cylinders than it holds when the store runs short). */
  bankCylinders: [number, number];
  /** Index of the duty bank (0 = A). */
  duty: 0 | 1;
  /** Full cylinders in the store. */
  spareFull: number;
  /** Elapsed hours from which bank 0/1 may be replaced; −1 when it needs no replacement. */
  replaceFromHours: [number, number];
  /** True while both banks are exhausted. */
  supplyLost: boolean;
}

export interface ManifoldEvent {
  kind: 'changeover' | 'bank_replaced' | 'supply_lost' | 'supply_restored';
  /** Elapsed hours of the event. */
  atHours: number;
  /** changeover: the bank that takes over; bank_replaced: the bank refilled; supply_*: the bank concerned. */
  bank: BankName;
  /** bank_replaced: cylinders fitted. */
  cylinders?: number;
}

const NAMES: readonly BankName[] = ['A', 'B'];

function usableBankL(state: ManifoldState, config: ManifoldConfig, bank: 0 | 1): number {
  const u = state.bankL[bank] - state.bankCylinders[bank] * config.residualPerCylinderL;
  return u > 0 ? u : 0;
}

/** Usable free gas of the whole installation, L: both banks above their residual plus the store's full cylinders. */
export function usableManifoldL(state: ManifoldState, config: ManifoldConfig): number {
  return usableBankL(state, config, 0) + usableBankL(state, config, 1) + state.spareFull * (config.fullCylinderL - config.residualPerCylinderL);
}

/** Validates a manifold configuration and initial state (throws InvalidInputError). */
export function checkManifold(config: ManifoldConfig, state: ManifoldState): void {
  const issues: FieldIssue[] = [];
  if (!(Number.isInteger(config.cylindersPerBank) && config.cylindersPerBank >= 1))
    issues.push({ path: 'cylinders_per_bank', message: 'must be an integer ≥ 1' });
  if (!(config.fullCylinderL > 0)) issues.push({ path: 'fullCylinderL', message: 'must be > 0' });
  if (!(config.residualPerCylinderL >= 0 && config.residualPerCylinderL < config.fullCylinderL))
    issues.push({ path: 'changeover', message: 'residual must be ≥ 0 and below a full cylinder' });
  if (!(config.bankReplacementHours >= 0)) issues.push({ path: 'bank_replacement_hours', message: 'must be ≥ 0' });
  state.bankL.forEach((v, i) => {
    if (!(v >= 0)) issues.push({ path: `bank${NAMES[i]}`, message: 'contents must be ≥ 0' });
    if (v > state.bankCylinders[i] * config.fullCylinderL * (1 + 1e-9)) issues.push({ path: `bank${NAMES[i]}`, message: 'contents above a full bank' });
  });
  if (!(Number.isInteger(state.spareFull) && state.spareFull >= 0)) issues.push({ path: 'spare_full', message: 'must be an integer ≥ 0' });
  if (issues.length > 0) throw new InvalidInputError(`Invalid manifold: ${issues[0].path}: ${issues[0].message}`, issues);
}

/** A fresh manifold state: duty bank A, nothing pending. */
export function createManifoldState(dutyBankL: number, standbyBankL: number, cylindersPerBank: number, spareFull = 0): ManifoldState {
  return {
    bankL: [dutyBankL, standbyBankL],
    bankCylinders: [cylindersPerBank, cylindersPerBank],
    duty: 0,
    spareFull,
    replaceFromHours: [-1, -1],
    supplyLost: false,
  };
}

/**
 * Steps a manifold through one hour [hourStart, hourStart + 1) at a constant draw of `demandL` litres in
 * that hour. At the hour boundary, exhausted banks whose replacement is due are refilled from the store
 * (as many full cylinders as it has, up to a bank); then the draw is taken from the duty bank, changing
 * over to the standby bank at the exact instant the duty bank reaches its residual. Mutates `state`,
 * appends to `events`, and returns the litres that could NOT be supplied (0 unless supply was lost).
 * @param demandL free gas drawn in this hour, L (≥ 0)
 * @param hourStart elapsed hours at the start of this hour
 */
export function stepManifold(state: ManifoldState, config: ManifoldConfig, demandL: number, hourStart: number, events: ManifoldEvent[] | null): number {
  const n = config.cylindersPerBank;
  for (const b of [0, 1] as const) {
    const due = state.replaceFromHours[b];
    if (due >= 0 && due <= hourStart + 1e-9 && state.spareFull > 0) {
      const k = Math.min(n, state.spareFull);
      state.spareFull -= k;
      state.bankL[b] = k * config.fullCylinderL;
      state.bankCylinders[b] = k;
      state.replaceFromHours[b] = -1;
      events?.push({ kind: 'bank_replaced', atHours: hourStart, bank: NAMES[b], cylinders: k });
    }
  }
  for (const b of [0, 1] as const) {
    // A bank found exhausted at a boundary (e.g. empty at the start) is queued for replacement too.
    if (state.replaceFromHours[b] < 0 && usableBankL(state, config, b) <= 0) state.replaceFromHours[b] = hourStart + config.bankReplacementHours;
  }
  if (usableBankL(state, config, state.duty) <= 0) {
    const other = (1 - state.duty) as 0 | 1;
    if (usableBankL(state, config, other) > 0) {
      state.duty = other;
      events?.push({ kind: state.supplyLost ? 'supply_restored' : 'changeover', atHours: hourStart, bank: NAMES[other] });
      state.supplyLost = false;
    }
  } else if (state.supplyLost) {
    state.supplyLost = false;
    events?.push({ kind: 'supply_restored', atHours: hourStart, bank: NAMES[state.duty] });
  }
  if (state.supplyLost || demandL <= 0) return state.supplyLost ? demandL : 0;
  let need = demandL;
  let t = hourStart;
  // At most two changeovers fit in one hour (A → B → lost), so the loop is short.
  for (let guard = 0; guard < 3 && need > 0; guard++) {
    const d = state.duty;
    const usable = usableBankL(state, config, d);
    // Strictly greater: a bank drawn exactly flat at the end of the hour changes over at that instant.
    if (usable > need) {
      state.bankL[d] -= need;
      return 0;
    }
    state.bankL[d] -= usable;
    t += usable / demandL;
    need -= usable;
    if (state.replaceFromHours[d] < 0) state.replaceFromHours[d] = t + config.bankReplacementHours;
    const other = (1 - d) as 0 | 1;
    if (usableBankL(state, config, other) > 0) {
      state.duty = other;
      events?.push({ kind: 'changeover', atHours: t, bank: NAMES[other] });
    } else {
      state.supplyLost = true;
      events?.push({ kind: 'supply_lost', atHours: t, bank: NAMES[d] });
      return need;
    }
  }
  return need;
}

export interface ManifoldProjectionInput {
  config: ManifoldConfig;
  /** Duty (A) and standby (B) bank contents at the start, L. */
  dutyBankL: number;
  standbyBankL: number;
  /** Full cylinders in the store at the start. */
  spareFull?: number;
  /** Demand per elapsed hour, L. */
  demandPerHour: Float64Array;
  /** Scheduled deliveries of full cylinders to the store (boundary index on the hour grid). */
  deliveries?: readonly { boundary: number; cylinders: number }[];
  /** Reorder rule in full-cylinder equivalents of usable gas (usable L ÷ usable L per cylinder). */
  reorder?: { levelCylinders: number; orderUpToCylinders: number; leadTimeHours: number };
}

export interface ManifoldProjection {
  /** Usable free gas (banks above residual + store) at the end of each hour, L. */
  series: Float64Array;
  /** Elapsed hours until supply is first lost (both banks exhausted); null if not within the horizon. */
  hoursToEmpty: number | null;
  events: ManifoldEvent[];
  /** Changeover instants only (elapsed hours) — the manifold's duty-cycle for the source screen. */
  changeoverHours: number[];
  orders: DepletionOrder[];
}

/**
 * Projects a two-bank manifold over an hour grid with its store, deliveries and reorder rule (orders go
 * to the store, whole cylinders, up to order-up-to in full-cylinder equivalents; see stepManifold for the
 * banks). Optional `dayMultiplier`/`dayOfRun` scale demand per local day (Monte Carlo).
 */
export function projectManifold(
  input: ManifoldProjectionInput,
  options: { dayMultiplier?: Float64Array; dayOfRun?: Uint16Array; stopAtEmpty?: boolean } = {},
): ManifoldProjection {
  const { config } = input;
  const state = createManifoldState(input.dutyBankL, input.standbyBankL, config.cylindersPerBank, input.spareFull ?? 0);
  checkManifold(config, state);
  const H = input.demandPerHour.length;
  const perCylUsable = config.fullCylinderL - config.residualPerCylinderL;
  const deliveries = [...(input.deliveries ?? [])].sort((a, b) => a.boundary - b.boundary);
  const r = input.reorder;
  if (r && !(r.orderUpToCylinders > r.levelCylinders && r.levelCylinders >= 0 && r.leadTimeHours >= 0)) {
    throw new InvalidInputError('Invalid reorder rule', [{ path: 'source.order_up_to_cylinders', message: 'must be above the reorder level' }]);
  }
  const lead = r ? Math.ceil(r.leadTimeHours - 1e-9) : 0;
  const series = new Float64Array(H);
  const events: ManifoldEvent[] = [];
  const orders: DepletionOrder[] = [];
  let current: DepletionOrder | null = null;
  let arrival = -1;
  let di = 0;
  let hoursToEmpty: number | null = null;
  for (let b = 0; b <= H; b++) {
    while (di < deliveries.length && deliveries[di].boundary <= b) {
      if (deliveries[di].boundary >= 0) state.spareFull += deliveries[di].cylinders;
      di++;
    }
    const fce = usableManifoldL(state, config) / perCylUsable;
    if (r && arrival < 0 && fce <= r.levelCylinders) {
      arrival = b + lead;
      current = { placedBoundary: b, placedHours: b, arrivesHours: b + r.leadTimeHours, arrivalBoundary: arrival, amount: null, quantity: null };
      orders.push(current);
    }
    if (r && arrival === b && current) {
      const qty = Math.max(0, Math.floor(r.orderUpToCylinders - usableManifoldL(state, config) / perCylUsable + 1e-9));
      state.spareFull += qty;
      current.quantity = qty;
      current.amount = qty * config.fullCylinderL;
      current = null;
      arrival = -1;
    }
    if (b === H) break;
    let d = input.demandPerHour[b];
    if (options.dayMultiplier && options.dayOfRun) d *= options.dayMultiplier[options.dayOfRun[b]];
    const before = events.length;
    stepManifold(state, config, d, b, events);
    if (hoursToEmpty === null) {
      for (let k = before; k < events.length; k++) {
        if (events[k].kind === 'supply_lost') {
          hoursToEmpty = events[k].atHours;
          break;
        }
      }
      if (hoursToEmpty !== null && options.stopAtEmpty) break;
    }
    series[b] = usableManifoldL(state, config);
  }
  return {
    series,
    hoursToEmpty,
    events,
    changeoverHours: events.filter((e) => e.kind === 'changeover').map((e) => e.atHours),
    orders,
  };
}
