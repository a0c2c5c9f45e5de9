import { InvalidInputError } from '../api/errors';
import { DEFAULT_RESIDUAL_FRACTION_OF_FILL, DEFAULT_RESIDUAL_SOURCE, compressedContents } from '../gas/contents';
import { isLiquefiedGas, type GasCode } from '../gas/gases';
import { mixtureCautions } from '../gas/mixture-cautions';
import { mixtureZRange } from '../gas/mixture-uncertainty';
import { freeGasLitresPerKg, type ReferenceCode } from '../gas/reference-conditions';
import { applyScenarios, buildHourlyDemand, type DemandLine } from './demand-lines';
import { boundaryAtOrAfter, buildHourIndex, resolveLocalTimeUtcMs, type HourIndex } from './hour-index';
import { projectManifold, type ManifoldEvent } from './manifold';
import { estimateHoursToEmptyBands, fillPersistentDayMultipliers, mulberry32, percentileOfSorted, type HoursToEmptyBands } from './monte-carlo';
import { daysOfStock, projectDepletion, type DepletionModel, type DepletionOrder, type ForecastRisk } from './project-depletion';
import type { CylinderSourceInput, ForecastInput, ManifoldSourceInput } from './forecast-input.schema';

/** The Monte Carlo model in words, shown with every band. */
export const MONTE_CARLO_MODEL_TEXT =
  'The band is the 10th–90th percentile of the empty time over seeded Monte Carlo draws: each local day’s demand is the hour-by-hour forecast times a lognormal day factor (mean 1, coefficient of variation demand_cv), and the day factors persist from one day to the next as a first-order autoregressive process (correlation demand_persistence from one day to the next, fitted from measured daily use where 14 days exist), so busy spells last several days as real surges do.';

/** Shown with every forecast figure. */
export const FORECAST_CAUTION =
  'Planning estimate only: check against the site’s own records, the supplier’s figures and local codes; the site’s authorised person for medical gases decides.';

export interface SourceForecast {
  index: HourIndex;
  /** kg for a bulk liquid tank, L of free gas at the reference conditions for cylinders and manifolds. */
  unit: 'kg' | 'L';
  /** Unit of order quantities: kg (bulk) or cylinders. */
  quantityUnit: 'kg' | 'cylinders';
  /** Contents at the start, in `unit`. */
  contentsStart: number;
  /** Contents at the end of every grid hour, in `unit`. */
  series: Float64Array;
  /** Demand per grid hour, L of free gas (after scenarios). */
  demandLPerHour: Float64Array;
  hoursToEmpty: number | null;
  orders: DepletionOrder[];
  firstOrderHours: number | null;
  daysOfStockAtStart: number | null;
  firstRisk: ForecastRisk | null;
  bands: HoursToEmptyBands | null;
  /** Manifold events (changeovers, bank replacements), elapsed hours; empty for other sources. */
  manifoldEvents: ManifoldEvent[];
  /**
   * Contents at which the reorder rule places an order, in `unit` (the chart's reorder line); null without
   * a reorder rule. For a manifold: the level in full-cylinder equivalents × usable gas per cylinder.
   */
  reorderLevel: number | null;
  /**
   * Cautions that travel with the forecast: the 50:50 N2O/O2 separation caution when the fill (store)
   * or in-use temperature is at or below the separation threshold, or below the storage minimum.
   */
  cautions: string[];
  /**
   * Mixture cylinder stores: hours to empty across the mixture's Z range at the fill state (null = runs
   * beyond the horizon), with the method; null for pure gases, bulk tanks and manifolds.
   */
  hoursToEmptyRange: { low: number | null; high: number | null; method: string } | null;
  /** The Monte Carlo settings behind `bands` (null when no draws were asked for). */
  monteCarlo: { demandCv: number; persistence: number } | null;
  /** Cylinder stores: the gauge pressure each cylinder is changed at and where it came from; null otherwise. */
  residual: { gaugeBar: number; basis: string } | null;
  /** Conversion factors used, for the method panel. */
  factors: { freeGasLitresPerKg?: number; fullCylinderFreeGasL?: number; residualPerCylinderL?: number; usablePerCylinderL?: number };
}

/** Re-labels the gas engine's field paths with the forecast request's. */
function withGasPaths<T>(prefix: string, rename: Record<string, string>, f: () => T): T {
  try {
    return f();
  } catch (e) {
    if (e instanceof InvalidInputError) {
      const details = e.details.map((d) => ({ path: `${prefix}.${rename[d.path] ?? d.path}`, message: d.message }));
      throw new InvalidInputError(e.message, details);
    }
    throw e;
  }
}

/** Free gas in one cylinder at a gauge reading, L at the reference (gas engine, real gas). */
function cylinderFreeGasL(gas: GasCode, waterCapacityL: number, gaugeBar: number, temperatureC: number, reference: ReferenceCode, gaugePath: string): number {
  return withGasPaths(
    'source',
    { gaugeBar: gaugePath, temperatureC: 'fill_temperature_C', waterCapacityL: 'water_capacity_L', gas: 'gas' },
    () => compressedContents({ gas, waterCapacityL, gaugeBar, temperatureC, reference }).freeGasL,
  );
}

function relativeLevel(
  src: { reorder_level_days?: number; reorder_level_percent?: number },
  meanDailyLoss: () => number | null,
  percentBase: number,
): number | undefined {
  if (src.reorder_level_days !== undefined) {
    const perDay = meanDailyLoss();
    return perDay === null ? 0 : src.reorder_level_days * perDay;
  }
  if (src.reorder_level_percent !== undefined) return (src.reorder_level_percent / 100) * percentBase;
  return undefined;
}

/**
 * Forecasts one supply source from a validated request (see forecastInputSchema): builds the hour grid,
 * the hourly demand with scenarios, converts it to the source's unit with the gas engine (bulk: L → kg
 * by the real-gas free-gas litres per kg; cylinders: free gas per full cylinder at the fill pressure and
 * temperature), projects it (projectDepletion or projectManifold) and, if asked, runs the Monte Carlo.
 * @param input parsed ForecastInput (flows L/min of free gas at `reference`; masses kg; pressures bar(g); °C)
 */
export function forecastSource(input: ForecastInput): SourceForecast {
  const index = buildHourIndex(input.timezone, input.start, input.horizon_days);
  const lines: DemandLine[] = input.scenarios.length > 0 ? applyScenarios(input.demand, input.scenarios) : input.demand;
  const demandL = buildHourlyDemand(lines, index);
  const src = input.source;
  const boundaryOf = (at: string) => boundaryAtOrAfter(index, resolveLocalTimeUtcMs(at, index.timeZone)!);

  if (src.type === 'manifold') return forecastManifold(input, src, index, demandL, boundaryOf);

  let model: DepletionModel;
  let residual: SourceForecast['residual'] = null;
  let unit: 'kg' | 'L';
  let factors: SourceForecast['factors'];
  if (src.type === 'bulk_liquid') {
    unit = 'kg';
    const lPerKg = withGasPaths('source', {}, () => freeGasLitresPerKg(src.gas, input.reference));
    factors = { freeGasLitresPerKg: lPerKg };
    const demandKg = new Float64Array(demandL.length);
    const kgPerL = 1 / lPerKg;
    for (let i = 0; i < demandL.length; i++) demandKg[i] = demandL[i] * kgPerL;
    model = {
      contentsStart: src.contents_kg,
      capacity: src.capacity_kg,
      demandPerHour: demandKg,
      evaporationPerHour: ((src.evaporation_percent_per_day / 100) * src.capacity_kg) / 24,
      deliveries: input.deliveries.map((d) => ({ boundary: boundaryOf(d.at), amount: d.kg ?? 0 })),
      reserveLevel: src.reserve_kg,
    };
    const level = src.reorder_level_kg ?? relativeLevel(src, () => meanDailyLoss(model), src.capacity_kg);
    if (level !== undefined) {
      model.reorder = { level, orderUpTo: src.order_up_to_kg ?? src.capacity_kg, leadTimeHours: src.lead_time_hours, lotSize: 0 };
    }
  } else {
    unit = 'L';
    const fullL = fullCylinderFreeGasL(src, input.reference);
    const inUseT = src.in_use_temperature_C ?? src.fill_temperature_C;
    // each cylinder is changed at its residual, not drawn flat: what stays behind is not stock
    const liquefied = isLiquefiedGas(src.gas);
    const residualBar = liquefied ? 0 : (src.residual_gauge_bar ?? DEFAULT_RESIDUAL_FRACTION_OF_FILL * src.fill_gauge_bar);
    residual = {
      gaugeBar: residualBar,
      basis: liquefied
        ? 'liquefied gas: drawn until the liquid is gone (no residual)'
        : src.residual_gauge_bar !== undefined
          ? 'residual as given'
          : DEFAULT_RESIDUAL_SOURCE,
    };
    const residualL = residualBar > 0 ? cylinderFreeGasL(src.gas, src.water_capacity_L, residualBar, inUseT, input.reference, 'residual_gauge_bar') : 0;
    const perCyl = fullL - residualL;
    if (!(perCyl > 0))
      throw new InvalidInputError('The residual leaves no usable gas in a full cylinder', [
        { path: 'source.residual_gauge_bar', message: 'must be well below the fill pressure' },
      ]);
    let inUse = 0;
    src.in_use_gauge_bar.forEach((g, k) => {
      inUse += Math.max(0, cylinderFreeGasL(src.gas, src.water_capacity_L, g, inUseT, input.reference, `in_use_gauge_bar.${k}`) - residualL);
    });
    if (src.in_use_net_kg.length > 0) {
      if (!isLiquefiedGas(src.gas))
        throw new InvalidInputError('in_use_net_kg is for liquefied gases (CO2, N2O): give in_use_gauge_bar for this gas', [
          { path: 'source.in_use_net_kg', message: 'for CO2 and N2O only' },
        ]);
      const lPerKg = withGasPaths('source', {}, () => freeGasLitresPerKg(src.gas, input.reference));
      for (const kg of src.in_use_net_kg) inUse += kg * lPerKg;
    }
    factors = { fullCylinderFreeGasL: fullL, residualPerCylinderL: residualL, usablePerCylinderL: perCyl };
    model = {
      contentsStart: src.full * perCyl + inUse,
      capacity: Infinity,
      demandPerHour: demandL,
      evaporationPerHour: 0,
      deliveries: input.deliveries.map((d) => ({ boundary: boundaryOf(d.at), amount: (d.cylinders ?? 0) * perCyl })),
      reserveLevel: src.reserve_cylinders !== undefined ? src.reserve_cylinders * perCyl : undefined,
    };
    const levelCyl = cylinderReorderLevel(src, model, perCyl);
    if (levelCyl !== undefined && src.order_up_to_cylinders !== undefined) {
      model.reorder = { level: levelCyl * perCyl, orderUpTo: src.order_up_to_cylinders * perCyl, leadTimeHours: src.lead_time_hours, lotSize: perCyl };
    }
  }
  const result = projectDepletion(model);
  // mixtures: the hours to empty across the Z range of a full cylinder (contents scale as 1/Z)
  let hoursToEmptyRange: SourceForecast['hoursToEmptyRange'] = null;
  if (src.type !== 'bulk_liquid' && !isLiquefiedGas(src.gas)) {
    const zr = mixtureZRange(src.gas, src.fill_temperature_C + 273.15, src.fill_gauge_bar + 1.01325);
    if (zr) {
      const z = zr.low === zr.secondMethodZ ? zr.high : zr.low;
      const run = (f: number) => {
        const scaled: DepletionModel = {
          ...model,
          contentsStart: model.contentsStart * f,
          deliveries: model.deliveries?.map((d) => ({ ...d, amount: d.amount * f })),
          reserveLevel: model.reserveLevel === undefined ? undefined : model.reserveLevel * f,
          reorder: model.reorder
            ? { ...model.reorder, level: model.reorder.level * f, orderUpTo: model.reorder.orderUpTo * f, lotSize: model.reorder.lotSize * f }
            : undefined,
        };
        return projectDepletion(scaled).hoursToEmpty;
      };
      hoursToEmptyRange = { low: run(z / zr.high), high: run(z / zr.low), method: zr.method };
    }
  }
  const bands =
    input.draws > 0
      ? estimateHoursToEmptyBands(model, index.dayOfRun, index.days, {
          draws: input.draws,
          demandCv: input.demand_cv,
          seed: input.seed,
          persistence: input.demand_persistence,
        })
      : null;
  return {
    index,
    unit,
    quantityUnit: unit === 'kg' ? 'kg' : 'cylinders',
    contentsStart: model.contentsStart,
    series: result.series,
    demandLPerHour: demandL,
    hoursToEmpty: result.hoursToEmpty,
    orders: result.orders,
    firstOrderHours: result.firstOrderHours,
    daysOfStockAtStart: result.daysOfStockAtStart,
    firstRisk: result.firstRisk,
    bands,
    manifoldEvents: [],
    reorderLevel: model.reorder ? model.reorder.level : null,
    cautions: src.type === 'bulk_liquid' ? [] : temperatureCautions(src),
    residual,
    hoursToEmptyRange,
    monteCarlo: bands ? { demandCv: input.demand_cv, persistence: input.demand_persistence } : null,
    factors,
  };
}

/** Mean daily loss over the first 7 days (the days-of-stock denominator), model unit per day. */
function meanDailyLoss(model: DepletionModel): number | null {
  const dos = daysOfStock({ ...model, contentsStart: 1 });
  return dos === null ? null : 1 / dos;
}

function cylinderReorderLevel(src: CylinderSourceInput | ManifoldSourceInput, model: DepletionModel, perCylL: number): number | undefined {
  if (src.reorder_level_cylinders !== undefined) return src.reorder_level_cylinders;
  const perDay = () => {
    const l = meanDailyLoss(model);
    return l === null ? null : l / perCylL;
  };
  return relativeLevel(src, perDay, src.order_up_to_cylinders ?? 0);
}

/** Mixture cautions for the store (fill) and in-use temperatures of a cylinder source, the colder first. */
function temperatureCautions(src: CylinderSourceInput | ManifoldSourceInput): string[] {
  const store = src.fill_temperature_C;
  const inUse = src.in_use_temperature_C ?? store;
  const colder = inUse < store ? { t: inUse, where: 'The in-use temperature' } : { t: store, where: 'The store temperature' };
  return mixtureCautions(src.gas, colder.t, colder.where);
}

/**
 * Free gas of one full cylinder, L at the reference. Compressed gases: at fill_gauge_bar and
 * fill_temperature_C. CO2 and N2O: from fill_kg (their gauge shows the vapour pressure, not the contents).
 */
function fullCylinderFreeGasL(src: CylinderSourceInput | ManifoldSourceInput, reference: ReferenceCode): number {
  if (isLiquefiedGas(src.gas)) {
    if (src.fill_kg === undefined) {
      throw new InvalidInputError(
        `${src.gas} is a liquefied gas: its gauge shows the vapour pressure, not the contents. Give fill_kg (net kg of a full cylinder) and weigh part-used cylinders (gross − tare) into in_use_net_kg`,
        [{ path: 'source.fill_kg', message: 'required for a liquefied gas (weigh the cylinder: gross − tare)' }],
      );
    }
    return src.fill_kg * withGasPaths('source', {}, () => freeGasLitresPerKg(src.gas, reference));
  }
  return cylinderFreeGasL(src.gas, src.water_capacity_L, src.fill_gauge_bar, src.fill_temperature_C, reference, 'fill_gauge_bar');
}

function forecastManifold(
  input: ForecastInput,
  src: ManifoldSourceInput,
  index: HourIndex,
  demandL: Float64Array,
  boundaryOf: (at: string) => number,
): SourceForecast {
  const perCyl = fullCylinderFreeGasL(src, input.reference);
  const inUseT = src.in_use_temperature_C ?? src.fill_temperature_C;
  const residual =
    src.changeover_gauge_bar > 0
      ? cylinderFreeGasL(src.gas, src.water_capacity_L, src.changeover_gauge_bar, inUseT, input.reference, 'changeover_gauge_bar')
      : 0;
  const bankL = (readings: number | number[], key: string) => {
    const list = Array.isArray(readings) ? readings : new Array<number>(src.cylinders_per_bank).fill(readings);
    return list.reduce(
      (sum, g, k) => sum + cylinderFreeGasL(src.gas, src.water_capacity_L, g, inUseT, input.reference, Array.isArray(readings) ? `${key}.${k}` : key),
      0,
    );
  };
  const config = {
    cylindersPerBank: src.cylinders_per_bank,
    fullCylinderL: perCyl,
    residualPerCylinderL: residual,
    bankReplacementHours: src.bank_replacement_hours,
  };
  const usablePerCyl = perCyl - residual;
  const base = {
    config,
    // A reading a little above the nominal fill (fill tolerance, a warm bank) counts as a full bank.
    dutyBankL: Math.min(bankL(src.duty_bank_gauge_bar, 'duty_bank_gauge_bar'), src.cylinders_per_bank * perCyl),
    standbyBankL: Math.min(bankL(src.standby_bank_gauge_bar, 'standby_bank_gauge_bar'), src.cylinders_per_bank * perCyl),
    spareFull: src.spare_full,
    demandPerHour: demandL,
    deliveries: input.deliveries.map((d) => ({ boundary: boundaryOf(d.at), cylinders: d.cylinders ?? 0 })),
  };
  const lossModel: DepletionModel = { contentsStart: 0, capacity: Infinity, demandPerHour: demandL, evaporationPerHour: 0 };
  const levelCyl =
    src.reorder_level_cylinders ??
    relativeLevel(
      src,
      () => {
        const l = meanDailyLoss(lossModel);
        return l === null ? null : l / usablePerCyl;
      },
      src.order_up_to_cylinders ?? 0,
    );
  const reorder =
    levelCyl !== undefined && src.order_up_to_cylinders !== undefined
      ? { levelCylinders: levelCyl, orderUpToCylinders: src.order_up_to_cylinders, leadTimeHours: src.lead_time_hours }
      : undefined;
  const result = projectManifold({ ...base, reorder });
  const contentsStart =
    Math.max(0, base.dutyBankL - src.cylinders_per_bank * residual) +
    Math.max(0, base.standbyBankL - src.cylinders_per_bank * residual) +
    src.spare_full * usablePerCyl;
  let bands: HoursToEmptyBands | null = null;
  if (input.draws > 0) {
    // Same day-multiplier model as estimateHoursToEmptyBands, stepping the manifold per draw.
    const rng = mulberry32(input.seed);
    const mult = new Float64Array(Math.max(1, index.days));
    const hs = new Float64Array(input.draws);
    let outlasting = 0;
    for (let k = 0; k < input.draws; k++) {
      fillPersistentDayMultipliers(rng, input.demand_cv, input.demand_persistence, mult);
      const h = projectManifold({ ...base, reorder }, { dayMultiplier: mult, dayOfRun: index.dayOfRun, stopAtEmpty: true }).hoursToEmpty;
      hs[k] = h === null ? Infinity : h;
      if (h === null) outlasting++;
    }
    hs.sort();
    bands = {
      p10: percentileOfSorted(hs, 0.1),
      p50: percentileOfSorted(hs, 0.5),
      p90: percentileOfSorted(hs, 0.9),
      draws: input.draws,
      drawsOutlastingHorizon: outlasting,
    };
  }
  const reserveL = src.reserve_cylinders !== undefined ? src.reserve_cylinders * usablePerCyl : undefined;
  let firstRisk: ForecastRisk | null = null;
  if (result.hoursToEmpty !== null) firstRisk = { kind: 'runs_empty', atHours: result.hoursToEmpty, message: 'Both banks run out within the horizon.' };
  if (reserveL !== undefined) {
    const i = result.series.findIndex((c) => c <= reserveL);
    if (i >= 0 && (firstRisk === null || i + 1 < firstRisk.atHours))
      firstRisk = { kind: 'reserve_touched', atHours: i + 1, message: 'Contents fall into the reserve.' };
  }
  return {
    index,
    unit: 'L',
    quantityUnit: 'cylinders',
    contentsStart,
    series: result.series,
    demandLPerHour: demandL,
    hoursToEmpty: result.hoursToEmpty,
    orders: result.orders,
    firstOrderHours: result.orders.length > 0 ? result.orders[0].placedHours : null,
    daysOfStockAtStart: (() => {
      const perDay = meanDailyLoss(lossModel);
      return perDay === null ? null : contentsStart / perDay;
    })(),
    firstRisk,
    bands,
    manifoldEvents: result.events,
    reorderLevel: reorder ? reorder.levelCylinders * usablePerCyl : null,
    cautions: temperatureCautions(src),
    residual: { gaugeBar: src.changeover_gauge_bar, basis: 'the manifold’s changeover pressure' },
    hoursToEmptyRange: null,
    monteCarlo: bands ? { demandCv: input.demand_cv, persistence: input.demand_persistence } : null,
    factors: { fullCylinderFreeGasL: perCyl, residualPerCylinderL: residual },
  };
}
