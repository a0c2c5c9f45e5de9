import { InvalidInputError } from '../api/errors';

/**
 * The pure depletion core. It knows nothing about gases or time zones: contents, demand and losses are
 * plain numbers in ONE unit (kg for a bulk liquid tank, litres of free gas for cylinders), hours are
 * elapsed real hours on a grid (see hour-index.ts), events sit on hour boundaries. The gas engine and
 * the calendar are applied outside, once, so the loop stays a tight typed-array recurrence.
 *
 * Timing convention. Boundary b is the instant startUtc + b hours; hour i runs from boundary i to i+1.
 * At each boundary, in order: scheduled deliveries land, the reorder rule may place an order (none while
 * one is outstanding), an order due at that boundary arrives; then hour i's loss is taken. `series[i]` is the contents at the END of hour
 * i (boundary i+1), before that boundary's events.
 */
export interface DepletionModel {
  /** Contents at the start, in the model unit. */
  contentsStart: number;
  /** Most the source can hold (bulk tank capacity), model unit; Infinity when unbounded. */
  capacity: number;
  /** Demand per elapsed hour, model unit per hour (one value per grid hour). */
  demandPerHour: Float64Array;
  /**
   * Evaporation (boil-off) per hour, model unit. The hour's loss is max(demand, evaporation): boil-off
   * feeds the pipeline, and only its excess over demand vents (common practice for vacuum-insulated
   * vessels; loss = max(0, NER − demand) vented). 0 for cylinders. The comparison is hour by hour, as
   * the forecast contract requires: with demand only in the daytime, night-time boil-off counts as lost,
   * which overstates the loss of a tank whose overnight pressure rise is taken by the next day's draw
   * (with no draw at all a vessel vents only after about a week). A daily comparison would show none.
   */
  evaporationPerHour: number;
  /** Scheduled deliveries: boundary index and amount in the model unit (never filled above capacity). */
  deliveries?: readonly { boundary: number; amount: number }[];
  reorder?: ReorderRule;
  /** Contents at or below which the source is "in its reserve" (risk only), model unit. */
  reserveLevel?: number;
}

/**
 * Reorder (order-up-to) rule in the model unit. When contents are at or below `level` at a boundary and
 * no order is outstanding, an order is placed; it arrives `leadTimeHours` later (on the first boundary at
 * or after that instant) and brings contents up to `orderUpTo` (never above capacity). With `lotSize`
 * > 0 the order is whole lots (cylinders): floor((orderUpTo − contents)/lotSize) lots, so the store
 * never ends above order-up-to, matching the bulk rule.
 */
export interface ReorderRule {
  level: number;
  orderUpTo: number;
  leadTimeHours: number;
  /** 0 for a continuous quantity (kg); the unit content of one lot (one full cylinder, L) otherwise. */
  lotSize: number;
}

export interface DepletionOrder {
  /** Boundary index and elapsed hours at which the order is placed. */
  placedBoundary: number;
  placedHours: number;
  /** Elapsed hours at which it arrives (placed + lead time) and the boundary at which it is counted. */
  arrivesHours: number;
  arrivalBoundary: number;
  /** Amount added, model unit; null when the order arrives after the horizon. */
  amount: number | null;
  /** Lots (cylinders) when lotSize > 0, else equal to amount; null after the horizon. */
  quantity: number | null;
}

export type ForecastRiskKind = 'below_reorder_level_at_start' | 'empty_before_delivery' | 'reserve_touched' | 'runs_empty';

export interface ForecastRisk {
  kind: ForecastRiskKind;
  /** Elapsed hours at which the risk shows. */
  atHours: number;
  message: string;
}

export interface DepletionResult {
  /** Contents at the end of each hour, model unit, ≥ 0 (length = grid hours). */
  series: Float64Array;
  /** Elapsed hours until contents first reach zero (linear within the hour); null if never within the horizon. */
  hoursToEmpty: number | null;
  orders: DepletionOrder[];
  /** Elapsed hours of the first order placement; null if none. */
  firstOrderHours: number | null;
  /** See daysOfStock. */
  daysOfStockAtStart: number | null;
  /** The earliest risk, or null. */
  firstRisk: ForecastRisk | null;
}

/** Prepared, validated model: sorted delivery arrays, so repeated runs (Monte Carlo) pay nothing. */
export interface PreparedModel {
  readonly model: DepletionModel;
  readonly hours: number;
  readonly deliveryBoundary: Int32Array;
  readonly deliveryAmount: Float64Array;
  readonly leadBoundaries: number;
}

function bad(path: string, message: string): never {
  throw new InvalidInputError(`${path}: ${message}`, [{ path, message }]);
}

/** Validates a depletion model and sorts its events (throws InvalidInputError). */
export function prepareDepletionModel(model: DepletionModel): PreparedModel {
  const H = model.demandPerHour.length;
  if (H < 1) bad('demandPerHour', 'needs at least one hour');
  if (!(model.capacity > 0)) bad('capacity', 'must be > 0');
  if (!(model.contentsStart >= 0)) bad('contentsStart', 'must be ≥ 0');
  if (model.contentsStart > model.capacity * (1 + 1e-12)) bad('contentsStart', 'contents above capacity');
  if (!(model.evaporationPerHour >= 0) || !Number.isFinite(model.evaporationPerHour)) bad('evaporationPerHour', 'must be ≥ 0');
  for (let i = 0; i < H; i++) {
    const d = model.demandPerHour[i];
    if (!(d >= 0) || !Number.isFinite(d)) bad(`demandPerHour.${i}`, 'demand must be a finite number ≥ 0');
  }
  const r = model.reorder;
  let leadBoundaries = 0;
  if (r) {
    if (!(r.level >= 0)) bad('reorder.level', 'must be ≥ 0');
    if (!(r.orderUpTo > r.level)) bad('reorder.orderUpTo', 'must be above the reorder level');
    if (!(r.leadTimeHours >= 0) || !Number.isFinite(r.leadTimeHours)) bad('reorder.leadTimeHours', 'must be ≥ 0');
    if (!(r.lotSize >= 0)) bad('reorder.lotSize', 'must be ≥ 0');
    leadBoundaries = Math.ceil(r.leadTimeHours - 1e-9);
  }
  const del = [...(model.deliveries ?? [])].filter((d) => d.boundary <= H).sort((a, b) => a.boundary - b.boundary);
  del.forEach((d, k) => {
    if (!(d.amount >= 0)) bad(`deliveries.${k}.amount`, 'must be ≥ 0');
    if (d.boundary < 0) bad(`deliveries.${k}.boundary`, 'delivery before the start of the forecast');
  });
  return {
    model,
    hours: H,
    deliveryBoundary: Int32Array.from(del.map((d) => d.boundary)),
    deliveryAmount: Float64Array.from(del.map((d) => d.amount)),
    leadBoundaries,
  };
}

/**
 * The recurrence itself. Returns hours to empty (−1 if never). Optional outputs: `series` (contents at the
 * end of each hour) and `orders`. `dayMultiplier`/`dayOfRun` scale each hour's DEMAND (not evaporation)
 * by its day's multiplier (Monte Carlo). `stopAtEmpty` ends the run at the first empty (Monte Carlo only
 * needs that). One pass, no allocation per hour.
 */
export function runDepletionKernel(
  p: PreparedModel,
  series: Float64Array | null,
  orders: DepletionOrder[] | null,
  dayMultiplier: Float64Array | null,
  dayOfRun: Uint16Array | null,
  stopAtEmpty: boolean,
): number {
  const m = p.model;
  const H = p.hours;
  const demand = m.demandPerHour;
  const evap = m.evaporationPerHour;
  const cap = m.capacity;
  const dB = p.deliveryBoundary;
  const dA = p.deliveryAmount;
  const nD = dB.length;
  const r = m.reorder;
  const hasReorder = r !== undefined;
  const level = r ? r.level : 0;
  const upTo = r ? r.orderUpTo : 0;
  const lot = r ? r.lotSize : 0;
  const lead = p.leadBoundaries;
  const leadH = r ? r.leadTimeHours : 0;
  let c = m.contentsStart;
  let hte = -1;
  let di = 0;
  let arrival = -1;
  let current: DepletionOrder | null = null;
  for (let b = 0; b <= H; b++) {
    while (di < nD && dB[di] === b) {
      c += dA[di++];
      if (c > cap) c = cap;
    }
    if (hasReorder && arrival < 0 && c <= level) {
      arrival = b + lead;
      if (orders !== null) {
        current = { placedBoundary: b, placedHours: b, arrivesHours: b + leadH, arrivalBoundary: arrival, amount: null, quantity: null };
        orders.push(current);
      }
    }
    // After placement, so that a zero lead time lands at once; a new order waits for the next boundary.
    if (arrival === b) {
      let amount = (upTo < cap ? upTo : cap) - c;
      let qty = amount;
      if (lot > 0) {
        qty = Math.floor(amount / lot + 1e-9);
        if (qty < 0) qty = 0;
        amount = qty * lot;
      } else if (amount < 0) {
        amount = 0;
        qty = 0;
      }
      c += amount;
      arrival = -1;
      if (current !== null) {
        current.amount = amount;
        current.quantity = qty;
        current = null;
      }
    }
    if (b === H) break;
    if (c <= 0 && hte < 0) {
      hte = b;
      if (stopAtEmpty) return hte;
    }
    let d = demand[b];
    if (dayMultiplier !== null) d *= dayMultiplier[dayOfRun![b]];
    const loss = d > evap ? d : evap;
    if (loss >= c) {
      if (hte < 0 && loss > 0) {
        hte = b + c / loss;
        if (stopAtEmpty) return hte;
      }
      c = 0;
    } else {
      c -= loss;
    }
    if (series !== null) series[b] = c;
  }
  return hte;
}

/**
 * Days of stock at the start: contents at the start ÷ mean daily LOSS over the first 7 days of the grid
 * (or the whole grid if shorter), where each hour's loss is max(demand, evaporation) — so a bulk tank's
 * venting boil-off counts — and a day is 24 elapsed hours. Deliveries and orders are ignored (it is a
 * "stock cover" figure, not the time to empty). Null when there is no loss at all.
 */
export function daysOfStock(model: DepletionModel): number | null {
  const n = Math.min(168, model.demandPerHour.length);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const d = model.demandPerHour[i];
    sum += d > model.evaporationPerHour ? d : model.evaporationPerHour;
  }
  if (!(sum > 0)) return null;
  return model.contentsStart / (sum / (n / 24));
}

function findFirstRisk(model: DepletionModel, series: Float64Array, orders: DepletionOrder[], hoursToEmpty: number | null): ForecastRisk | null {
  const risks: ForecastRisk[] = [];
  const r = model.reorder;
  if (r && model.contentsStart <= r.level) {
    risks.push({ kind: 'below_reorder_level_at_start', atHours: 0, message: 'Contents are at or below the reorder level at the start: order now.' });
  }
  for (const o of orders) {
    // Contents reach zero while the order is on its way: the level left less than the lead time.
    const last = Math.min(o.arrivalBoundary, series.length);
    for (let b = o.placedBoundary; b < last; b++) {
      if (series[b] <= 0) {
        risks.push({
          kind: 'empty_before_delivery',
          atHours: o.placedHours,
          message: 'The reorder level is crossed with less than the lead time left before the source runs empty.',
        });
        break;
      }
    }
  }
  if (model.reserveLevel !== undefined) {
    const rl = model.reserveLevel;
    let prev = model.contentsStart;
    for (let i = 0; i < series.length; i++) {
      if (series[i] <= rl && prev > rl) {
        const drop = prev - series[i];
        risks.push({ kind: 'reserve_touched', atHours: i + (drop > 0 ? (prev - rl) / drop : 1), message: 'Contents fall into the reserve.' });
        break;
      }
      if (prev <= rl && i === 0) {
        risks.push({ kind: 'reserve_touched', atHours: 0, message: 'Contents are in the reserve at the start.' });
        break;
      }
      prev = series[i];
    }
  }
  if (hoursToEmpty !== null && !risks.some((x) => x.kind === 'empty_before_delivery')) {
    risks.push({ kind: 'runs_empty', atHours: hoursToEmpty, message: 'The source runs empty within the horizon.' });
  }
  if (risks.length === 0) return null;
  return risks.reduce((a, b) => (b.atHours < a.atHours ? b : a));
}

/**
 * Projects a source hour by hour (method: explicit hourly mass balance with an order-up-to (s, S)
 * reorder rule — the classic periodic-review inventory model on an hourly review period).
 * @param model contents, capacity, demand and evaporation in ONE unit (kg or L), hours on the grid
 */
export function projectDepletion(model: DepletionModel): DepletionResult {
  const p = prepareDepletionModel(model);
  const series = new Float64Array(p.hours);
  const orders: DepletionOrder[] = [];
  const hte = runDepletionKernel(p, series, orders, null, null, false);
  const hoursToEmpty = hte < 0 ? null : hte;
  return {
    series,
    hoursToEmpty,
    orders,
    firstOrderHours: orders.length > 0 ? orders[0].placedHours : null,
    daysOfStockAtStart: daysOfStock(model),
    firstRisk: findFirstRisk(model, series, orders, hoursToEmpty),
  };
}
