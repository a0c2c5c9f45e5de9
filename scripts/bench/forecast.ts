/**
 * Forecast benchmark: one full forecast pass for a generated organisation of 1,000 sources, each fed by
 * 20 wards (3 demand lines per ward), 90 days hourly, through the product entry `forecastSource`
 * (scenario overlay, hourly demand, gas-engine conversion, projection, reorders, risks); then the same
 * with 200 Monte Carlo draws per source. Each figure is compared with a plain typed-array loop doing the
 * same arithmetic (lines → weekly profile → hourly demand → max(demand, boil-off) recurrence; per-day
 * lognormal multipliers and stop-at-empty for the draws) with none of the engine's bookkeeping (checks,
 * deliveries, reorders, risks, days of stock, gas-engine calls): our floor.
 *
 * Prints `name: value unit (target …; ratio …)`, one line per figure.
 */
import { buildHourIndex } from '../../common/src/forecast/hour-index';
import { forecastInputSchema, type ForecastInput } from '../../common/src/forecast/forecast-input.schema';
import { forecastSource } from '../../common/src/forecast/forecast-source';
import { type DemandLine } from '../../common/src/forecast/demand-lines';
import { fillLognormalDayMultipliers, mulberry32 } from '../../common/src/forecast/monte-carlo';
import { freeGasLitresPerKg } from '../../common/src/gas/reference-conditions';
import { compressedContents } from '../../common/src/gas/contents';

const SOURCES = 1000;
const WARDS = 20;
const DAYS = 90;
const DRAWS = 200;
const START = '2027-01-04T00:00';
const ZONE = 'Europe/London';

const DAY_HOURS = [8, 9, 10, 11, 12, 13, 14, 15, 16, 17];
const NIGHT_HOURS = [0, 1, 2, 3, 4, 5, 6, 22, 23];

/** A made-up organisation: wards with a constant base, a weekday day-shift line and a night line. */
function generateOrganisation(): ForecastInput[] {
  const rng = mulberry32(2027);
  const inputs: ForecastInput[] = [];
  for (let s = 0; s < SOURCES; s++) {
    const demand: DemandLine[] = [];
    for (let w = 0; w < WARDS; w++) {
      demand.push({ flow_L_min: 4 + 20 * rng() });
      demand.push({ flow_L_min: 10 * rng(), hours: DAY_HOURS, weekdays: [1, 2, 3, 4, 5] });
      demand.push({ flow_L_min: 3 * rng(), hours: NIGHT_HOURS });
    }
    const withReorder = s % 2 === 0;
    const source =
      s % 5 < 2
        ? {
            type: 'bulk_liquid',
            gas: 'O2',
            capacity_kg: 20_000,
            contents_kg: 5_000 + 15_000 * rng(),
            evaporation_percent_per_day: 0.5,
            ...(withReorder ? { reorder_level_kg: 5_000, order_up_to_kg: 18_000, lead_time_hours: 48 } : {}),
          }
        : {
            type: 'cylinders',
            gas: s % 3 === 0 ? 'AIR' : 'O2',
            water_capacity_L: 50,
            fill_gauge_bar: 200,
            fill_temperature_C: 15,
            full: 200 + Math.floor(400 * rng()),
            in_use_gauge_bar: [150, 90, 40],
            ...(withReorder ? { reorder_level_cylinders: 150, order_up_to_cylinders: 500, lead_time_hours: 24 } : {}),
          };
    inputs.push(
      forecastInputSchema.parse({
        start: START,
        timezone: ZONE,
        horizon_days: DAYS,
        source,
        demand,
        deliveries: s % 7 === 0 ? [{ at: '2027-01-20T06:00', ...(source.type === 'bulk_liquid' ? { kg: 3000 } : { cylinders: 50 }) }] : [],
        draws: 0,
        demand_cv: 0.2,
        seed: s + 1,
      }),
    );
  }
  return inputs;
}

interface FloorSource {
  lines: DemandLine[];
  unitPerL: number;
  contents: number;
  capacity: number;
  evap: number;
  deliveryBoundary: number;
  deliveryAmount: number;
  /** Reorder level, order-up-to (capped by capacity), lead in whole hours, lot size; level −1 = no rule. */
  level: number;
  upTo: number;
  lead: number;
  lot: number;
}

/** The floor's inputs: the same contents, unit factors and rules, prepared outside the timed loop. */
function prepareFloor(inputs: ForecastInput[]): FloorSource[] {
  return inputs.map((inp) => {
    const src = inp.source;
    const delivery = inp.deliveries[0];
    // Every generated delivery sits on a whole hour of a 24-hour day in January (GMT): boundary = hours since start.
    const deliveryBoundary = delivery ? (Date.parse(`${delivery.at}Z`) - Date.parse(`${START}Z`)) / 3_600_000 : -1;
    if (src.type === 'bulk_liquid') {
      const rule = src.reorder_level_kg !== undefined;
      return {
        lines: inp.demand,
        unitPerL: 1 / freeGasLitresPerKg(src.gas, inp.reference),
        contents: src.contents_kg,
        capacity: src.capacity_kg,
        evap: ((src.evaporation_percent_per_day / 100) * src.capacity_kg) / 24,
        deliveryBoundary,
        deliveryAmount: delivery?.kg ?? 0,
        level: rule ? src.reorder_level_kg! : -1,
        upTo: Math.min(src.order_up_to_kg ?? src.capacity_kg, src.capacity_kg),
        lead: Math.ceil(src.lead_time_hours),
        lot: 0,
      };
    }
    if (src.type !== 'cylinders') throw new Error('unexpected source');
    const contents = (g: number) =>
      compressedContents({ gas: src.gas, waterCapacityL: src.water_capacity_L, gaugeBar: g, temperatureC: src.fill_temperature_C }).freeGasL;
    const per = contents(src.fill_gauge_bar);
    const rule = src.reorder_level_cylinders !== undefined;
    return {
      lines: inp.demand,
      unitPerL: 1,
      contents: src.full * per + src.in_use_gauge_bar.reduce((sum, g) => sum + contents(g), 0),
      capacity: Infinity,
      evap: 0,
      deliveryBoundary,
      deliveryAmount: (delivery?.cylinders ?? 0) * per,
      level: rule ? src.reorder_level_cylinders! * per : -1,
      upTo: (src.order_up_to_cylinders ?? 0) * per,
      lead: Math.ceil(src.lead_time_hours),
      lot: per,
    };
  });
}

const ALL_DAYS = [1, 2, 3, 4, 5, 6, 7];
const ALL_HOURS = Array.from({ length: 24 }, (_, h) => h);

/** Weekly profile by plain loops over each line's days and hours (no checks, no de-duplication). */
function floorProfile(lines: DemandLine[], p: Float64Array): Float64Array {
  p.fill(0);
  for (const l of lines) {
    const q = l.flow_L_min * 60;
    for (const d of l.weekdays ?? ALL_DAYS) for (const h of l.hours ?? ALL_HOURS) p[(d - 1) * 24 + h] += q;
  }
  return p;
}

/**
 * The bare recurrence: delivery, order-up-to reorder, max(demand × day multiplier, boil-off). Returns the
 * hour count at the first empty (or H) when `stopAtEmpty`, else the final contents.
 */
function floorRun(
  s: FloorSource,
  demand: Float64Array,
  H: number,
  series: Float64Array | null,
  mult: Float64Array | null,
  dayOfRun: Uint16Array,
  stopAtEmpty: boolean,
): number {
  let c = s.contents;
  let last = c;
  let arrival = -1;
  for (let i = 0; i <= H; i++) {
    if (i === s.deliveryBoundary) c = Math.min(s.capacity, c + s.deliveryAmount);
    if (s.level >= 0 && arrival < 0 && c <= s.level) arrival = i + s.lead;
    if (arrival === i) {
      let q = s.upTo - c;
      if (s.lot > 0) q = Math.floor(q / s.lot + 1e-9) * s.lot;
      if (q > 0) c += q;
      arrival = -1;
    }
    if (i === H) break;
    const d = mult === null ? demand[i] : demand[i] * mult[dayOfRun[i]];
    const loss = d > s.evap ? d : s.evap;
    if (loss >= c) {
      if (stopAtEmpty) return i;
      c = 0;
    } else c -= loss;
    if (series !== null) series[i] = c;
    last = c;
  }
  // The last series value is the contents at the end of the last hour, before that boundary's events.
  return stopAtEmpty ? H : last;
}

function floorPass(srcs: FloorSource[], slot: Uint8Array, dayOfRun: Uint16Array, series: Float64Array, demand: Float64Array, finals: Float64Array): void {
  const H = slot.length;
  const profile = new Float64Array(168);
  srcs.forEach((s, k) => {
    const p = floorProfile(s.lines, profile);
    for (let i = 0; i < H; i++) demand[i] = p[slot[i]] * s.unitPerL;
    finals[k] = floorRun(s, demand, H, series, null, dayOfRun, false);
  });
}

function floorDraws(srcs: FloorSource[], slot: Uint8Array, dayOfRun: Uint16Array, days: number, demand: Float64Array): number {
  let checksum = 0;
  const H = slot.length;
  const mult = new Float64Array(days);
  const profile = new Float64Array(168);
  for (const s of srcs) {
    const p = floorProfile(s.lines, profile);
    for (let i = 0; i < H; i++) demand[i] = p[slot[i]] * s.unitPerL;
    const rng = mulberry32(1);
    for (let k = 0; k < DRAWS; k++) {
      fillLognormalDayMultipliers(rng, 0.2, mult);
      checksum += floorRun(s, demand, H, null, mult, dayOfRun, true);
    }
  }
  return checksum;
}

function seconds(f: () => unknown, repeats: number): number {
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    f();
    times.push((performance.now() - t0) / 1000);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

const fmt = (v: number) => (v < 1 ? v.toFixed(3) : v.toFixed(2));

export async function run(): Promise<void> {
  const inputs = generateOrganisation();
  const index = buildHourIndex(ZONE, START, DAYS);
  const floorSources = prepareFloor(inputs);
  const series = new Float64Array(index.hours);
  const demand = new Float64Array(index.hours);

  let sink = 0;
  const finals = new Float64Array(inputs.length);
  // The floor must compute the same thing: compare final contents with the engine's, source by source.
  const engineFinals = inputs.map((inp) => forecastSource(inp).series.at(-1)!);
  floorPass(floorSources, index.weekSlot, index.dayOfRun, series, demand, finals);
  const worst = engineFinals.reduce((w, v, k) => Math.max(w, Math.abs(v - finals[k]) / Math.max(1, Math.abs(v))), 0);
  if (worst > 1e-9) console.log(`forecast_floor_mismatch: ${worst.toExponential(2)} relative (the floor no longer matches the engine)`);
  const engine = seconds(() => {
    for (const inp of inputs) sink += forecastSource(inp).series.length;
  }, 3);
  const floor = seconds(() => floorPass(floorSources, index.weekSlot, index.dayOfRun, series, demand, finals), 3);
  console.log(
    `forecast_pass_1000_sources_20_wards_90d: ${fmt(engine)} s (target ≤ 1 s; ratio ${(engine / floor).toFixed(1)}× a plain typed-array loop at ${fmt(floor)} s)`,
  );

  const withDraws = inputs.map((inp) => ({ ...inp, draws: DRAWS }));
  const engineMc = seconds(() => {
    for (const inp of withDraws) sink += forecastSource(inp).bands?.p50 ?? 0;
  }, 1);
  const floorMc = seconds(() => (sink += floorDraws(floorSources, index.weekSlot, index.dayOfRun, index.days, demand)), 1);
  console.log(
    `forecast_pass_1000_sources_200_draws: ${fmt(engineMc)} s (target ≤ 20 s; ratio ${(engineMc / floorMc).toFixed(1)}× a plain typed-array loop at ${fmt(floorMc)} s)`,
  );
  if (Number.isNaN(sink)) console.log('(checksum NaN)');
}
