import { hasKey } from '@common/api/lookup';
import { DateTime } from 'luxon';
import { forecastInputSchema, type ForecastInput } from '@common/forecast/forecast-input.schema';
import { forecastSource, FORECAST_CAUTION, type SourceForecast } from '@common/forecast/forecast-source';
import { DEFAULT_DEMAND_PERSISTENCE, fitDailyPersistence } from '@common/forecast/monte-carlo';
import { buildDemandLinesFromTherapy, DEVICE_DEFAULTS, meanDailyDemandL, type OxygenDevice, type TherapyLine } from '@common/forecast/demand-model';
import type { DemandLine, DemandScenario } from '@common/forecast/demand-lines';
import { freeGasLitresPerKg, type ReferenceCode } from '@common/gas/reference-conditions';
import { isLiquefiedGas, type GasCode } from '@common/gas/gases';
import { InvalidInputError } from '@common/api/errors';
import {
  consumptionBetweenReadings,
  dailyRates,
  demandCvFromDays,
  detectRefills,
  orderedSeries,
  refillThreshold,
  type Consumption,
} from '@common/forecast/reconcile';
import { nominalContents } from '@common/catalogue/cylinder-type';
import type { Scenario, SupplySource } from '../../db/entities/supply.entity';
import { decideStatus, statusText, type SourceStatus } from '@common/forecast/status';
import type { SiteModel } from './site-model';

export type { SourceStatus };

const DEFAULT_LEAD_TIME_HOURS = 48;
/** Vaporiser derating when none is entered: 0.7 for an alternating pair (the capacity engine's documented default). */
const VAPORISER_DEFAULT_DERATING = 0.7;
const MS_H = 3_600_000;

export interface ForecastOptions {
  now?: Date;
  scenarioId?: number;
  draws?: number;
  horizonDays?: number;
}

export interface SourceOutlook {
  sourceId: number;
  status: SourceStatus;
  statusText: string;
  unit: 'kg' | 'L';
  contentsNow: number | null;
  capacity: number | null;
  daysOfStock: number | null;
  emptyAt: string | null;
  reorderAt: string | null;
  leadTimeHours: number;
  firstRisk: { code: string; message: string; at: string } | null;
  trend: number[];
  /** Why there is no forecast, when there is none. */
  note: string | null;
  basis: { used: 'model' | 'measured' | 'scaled'; message: string; modelledLPerDay: number; measuredLPerDay: number | null };
  forecast: SourceForecast | null;
  input: ForecastInput | null;
  startUtc: string | null;
  elapsedHours: number;
}

function toLocal(d: Date, zone: string): string {
  return DateTime.fromJSDate(d, { zone }).toFormat("yyyy-MM-dd'T'HH:mm");
}

function parseList(json: string | null): number[] | undefined {
  if (!json) return undefined;
  const v = JSON.parse(json) as number[];
  return v.length ? v : undefined;
}

/** Lead time of a source: its own, else its supplier's, else a default of 48 h (stated on screen). */
export function leadTimeOf(model: SiteModel, s: SupplySource): number {
  return s.leadTimeHours ?? (s.supplierId ? model.suppliers.get(s.supplierId)?.leadTimeHours : undefined) ?? DEFAULT_LEAD_TIME_HOURS;
}

/** The wards a source feeds as their primary supply of its gas. */
export function wardsFedBy(model: SiteModel, s: SupplySource) {
  const wardIds = new Set(model.feeds.filter((f) => f.sourceId === s.id && f.role === 'primary' && f.gasCode === s.gasCode).map((f) => f.wardId));
  return model.wards.filter((w) => wardIds.has(w.id));
}

/** Demand lines of a ward for one gas from its therapy lines (device flows: organisation's, else documented defaults). */
export function wardDemandLines(model: SiteModel, wardId: number, gas: string): DemandLine[] {
  const ward = model.wards.find((w) => w.id === wardId);
  if (!ward || !ward.active) return [];
  const therapy: TherapyLine[] = model.therapy
    .filter((t) => t.wardId === wardId && t.gasCode === gas)
    .map((t) => {
      const known = hasKey(DEVICE_DEFAULTS, t.device);
      const flow = t.flowLMin ?? model.deviceFlows.get(t.device) ?? (known ? DEVICE_DEFAULTS[t.device as OxygenDevice].flowLMin : 0);
      return {
        device: 'custom' as const,
        patients: t.patients,
        flow_L_min: flow,
        hours: parseList(t.hoursJson),
        weekdays: parseList(t.weekdaysJson),
        label: t.label || (known ? DEVICE_DEFAULTS[t.device as OxygenDevice].label : t.device),
      };
    });
  return buildDemandLinesFromTherapy(therapy, { leakagePercent: ward.leakagePercent }).map((l) => ({ ...l, label: `${ward.name}: ${l.label}` }));
}

/** Modelled demand lines of a source: every ward it feeds as primary, for its gas. */
export function modelledLines(model: SiteModel, s: SupplySource): DemandLine[] {
  return wardsFedBy(model, s).flatMap((w) => wardDemandLines(model, w.id, s.gasCode));
}

const consumptionCache = new WeakMap<object, Consumption | null>();

/**
 * Consumption of a source over its recent readings (time order, one point per instant, refills found
 * and bridged), computed once per loaded model: the overview asks for it for every source.
 */
function recentConsumption(model: SiteModel, s: SupplySource): Consumption | null {
  const readings = model.recentReadings.get(s.id);
  if (!readings) return null;
  if (consumptionCache.has(readings)) return consumptionCache.get(readings)!;
  const points = orderedSeries(readings.map((r) => ({ atMs: r.takenAt.getTime(), contents: r.contents })));
  let c: Consumption | null = null;
  if (points.length >= 2) {
    const cyl = s.cylinderTypeId ? model.cylinderTypes.get(s.cylinderTypeId) : undefined;
    const full = cyl
      ? (nominalContents({
          gas: cyl.gasCode,
          waterCapacityL: cyl.waterCapacityL,
          fillPressureBar: cyl.fillPressureBar,
          maxFillingRatioKgPerL: cyl.maxFillingRatioKgPerL,
        })?.freeGasL ?? null)
      : null;
    const minRise = refillThreshold({ capacity: s.capacityKg, fullCylinder: s.type === 'bulk_liquid' ? null : full });
    c = consumptionBetweenReadings(points, detectRefills(points, { minRise }));
  }
  consumptionCache.set(readings, c);
  return c;
}

/**
 * Measured consumption of a bulk tank from its recent readings, L/day of free gas at the reference:
 * consumption between readings with tanker refills found and bridged (reconcile.ts: signed falls, so
 * gauge noise does not add up as use), over the time the readings span. Null when fewer than two days
 * of readings exist or for cylinder sources (whose measured use comes from usage reports).
 */
export function measuredLPerDay(model: SiteModel, s: SupplySource, reference: ReferenceCode): number | null {
  if (s.type !== 'bulk_liquid') return null;
  const c = recentConsumption(model, s);
  if (!c || c.spanHours < 48 || c.perDay === null) return null;
  return Math.max(0, c.perDay) * freeGasLitresPerKg(s.gasCode as GasCode, reference);
}

/**
 * Day-to-day variability of a source's measured use (coefficient of variation of whole local days) for
 * the Monte Carlo band; 0.2 until seven whole days of readings exist (reconcile.ts, demandCvFromDays).
 */
export function measuredDemandCv(
  model: SiteModel,
  s: SupplySource,
): { cv: number; measured: boolean; days: number; persistence: number; persistenceMeasured: boolean } {
  const c = recentConsumption(model, s);
  if (!c) return { cv: 0.2, measured: false, days: 0, persistence: DEFAULT_DEMAND_PERSISTENCE, persistenceMeasured: false };
  const days = dailyRates(c.curve, model.site.timeZone);
  // AR(1) persistence of daily use (Yule–Walker), the default until 14 whole days exist
  const phi = fitDailyPersistence(days.map((d) => d.perDay));
  return { ...demandCvFromDays(days), persistence: phi ?? DEFAULT_DEMAND_PERSISTENCE, persistenceMeasured: phi !== null };
}

/** A stored scenario as the engine's overlay for one source (extra patients go to the sources of their ward). */
function scenarioFor(
  model: SiteModel,
  sc: Scenario,
  s: SupplySource,
  fedWardIds: Set<number>,
): { scenario: DemandScenario; wardWindow?: { wardId: number; from?: string; until?: string } } {
  const out: DemandScenario = { name: sc.name, from: sc.fromLocal, until: sc.untilLocal ?? undefined, multiplier: sc.multiplier };
  const appliesHere = sc.wardId ? fedWardIds.has(sc.wardId) : s.gasCode === 'O2' && fedWardIds.size > 0;
  if (sc.extraPatients > 0 && appliesHere && s.gasCode === 'O2') {
    // Without a ward, extra patients are shared among the site's primary oxygen sources.
    const share = sc.wardId
      ? 1
      : 1 / Math.max(1, model.sources.filter((o) => o.gasCode === 'O2' && model.feeds.some((f) => f.sourceId === o.id && f.role === 'primary')).length);
    out.extra_lines = [
      { flow_L_min: sc.extraPatients * sc.extraFlowLMin * share, label: `${sc.name}: +${sc.extraPatients} patients at ${sc.extraFlowLMin} L/min` },
    ];
  }
  if (sc.wardId && sc.wardChange && fedWardIds.has(sc.wardId)) {
    return { scenario: out, wardWindow: sc.wardChange === 'close' ? { wardId: sc.wardId, until: sc.fromLocal } : { wardId: sc.wardId, from: sc.fromLocal } };
  }
  return { scenario: out };
}

function reorderFields(s: SupplySource, kind: 'kg' | 'cylinders'): Record<string, number> {
  if (s.reorderMode === 'none' || s.reorderLevel === null || s.orderUpTo === null) return {};
  const upTo: Record<string, number> = kind === 'kg' ? { order_up_to_kg: s.orderUpTo } : { order_up_to_cylinders: s.orderUpTo };
  if (s.reorderMode === 'days') return { reorder_level_days: s.reorderLevel, ...upTo };
  if (s.reorderMode === 'percent') return { reorder_level_percent: s.reorderLevel, ...upTo };
  return kind === 'kg' ? { reorder_level_kg: s.reorderLevel, ...upTo } : { reorder_level_cylinders: s.reorderLevel, ...upTo };
}

/**
 * The engine's request for one source, from its latest reading forward: demand of the wards it feeds
 * (model, measured or scaled), the chosen scenario, scheduled deliveries and its reorder rule.
 */
export function buildForecastInput(
  model: SiteModel,
  s: SupplySource,
  opts: ForecastOptions = {},
): { input: ForecastInput | null; note: string | null; basis: SourceOutlook['basis'] } {
  const reference = model.site.referenceCode as ReferenceCode;
  const zone = model.site.timeZone;
  const baseLines = modelledLines(model, s);
  const modelled = meanDailyDemandL(baseLines);
  const measured = measuredLPerDay(model, s, reference);
  let lines = baseLines;
  let basis: SourceOutlook['basis'] = {
    used: 'model',
    message: 'Demand from the therapy lines of the wards this source feeds.',
    modelledLPerDay: modelled,
    measuredLPerDay: measured,
  };
  if (s.forecastBasis === 'measured') {
    if (measured !== null) {
      lines = [{ flow_L_min: measured / 1440, label: 'Measured mean use (recent readings)' }];
      basis = { ...basis, used: 'measured', message: 'Demand at the measured mean rate of the last three weeks of readings.' };
    } else basis = { ...basis, message: 'Measured use is not available for this source yet: using the model.' };
  } else if (s.forecastBasis === 'scaled' && s.modelCorrectionFactor !== 1) {
    lines = baseLines.map((l) => ({ ...l, flow_L_min: l.flow_L_min * s.modelCorrectionFactor }));
    basis = { ...basis, used: 'scaled', message: `Modelled demand × ${s.modelCorrectionFactor.toFixed(2)} (accepted correction from measured use).` };
  }

  const reading = model.latestReading.get(s.id);
  if (!reading) return { input: null, note: 'No reading yet: enter the contents to forecast this source.', basis };
  if (isLiquefiedGas(s.gasCode) && s.type !== 'bulk_liquid') {
    return { input: null, note: 'Liquefied-gas cylinders are counted by weight; their forecast is not available yet (contents only).', basis };
  }

  const fedWardIds = new Set(wardsFedBy(model, s).map((w) => w.id));
  const scenarios: DemandScenario[] = [];
  const chosen = opts.scenarioId ? model.scenarios.find((x) => x.id === opts.scenarioId) : undefined;
  if (chosen) {
    const { scenario, wardWindow } = scenarioFor(model, chosen, s, fedWardIds);
    scenarios.push(scenario);
    if (wardWindow) {
      const wardName = model.wards.find((w) => w.id === wardWindow.wardId)?.name ?? '';
      lines = lines.map((l) =>
        l.label?.startsWith(`${wardName}:`)
          ? { ...l, ...(wardWindow.from ? { from: wardWindow.from } : {}), ...(wardWindow.until ? { until: wardWindow.until } : {}) }
          : l,
      );
    }
  }

  const start = DateTime.fromJSDate(reading.takenAt, { zone }).startOf('hour');
  const startLocal = start.toFormat("yyyy-MM-dd'T'HH:mm");
  const now = opts.now ?? new Date();
  const elapsedDays = Math.max(0, (now.getTime() - start.toMillis()) / 86_400_000);
  const horizonDays = Math.min(1000, Math.ceil((opts.horizonDays ?? 90) + elapsedDays));
  const lead = leadTimeOf(model, s);
  const deliveries = model.deliveries
    .filter((d) => d.sourceId === s.id && d.dueAt.getTime() >= start.toMillis())
    .map((d) => ({ at: toLocal(d.dueAt, zone), ...(d.kg !== null ? { kg: d.kg } : {}), ...(d.cylinders !== null ? { cylinders: d.cylinders } : {}) }));
  const common = {
    start: startLocal,
    timezone: zone,
    horizon_days: horizonDays,
    reference,
    demand: lines,
    scenarios,
    deliveries,
    draws: opts.draws ?? 0,
    demand_cv: measuredDemandCv(model, s).cv,
    demand_persistence: measuredDemandCv(model, s).persistence,
    seed: s.id,
  };
  const detail = reading.detailJson ? (JSON.parse(reading.detailJson) as Record<string, unknown>) : {};
  const cyl = s.cylinderTypeId ? model.cylinderTypes.get(s.cylinderTypeId) : undefined;
  const temperatureC = s.temperatureC ?? model.site.storeTemperatureC;

  let raw: unknown;
  if (s.type === 'bulk_liquid') {
    raw = {
      ...common,
      deliveries: deliveries.filter((d) => 'kg' in d),
      source: {
        type: 'bulk_liquid',
        gas: s.gasCode,
        capacity_kg: s.capacityKg,
        contents_kg: Math.min(reading.contents, s.capacityKg ?? reading.contents),
        evaporation_percent_per_day: s.evaporationPercentPerDay ?? 0,
        lead_time_hours: lead,
        ...(s.reservePercent ? { reserve_kg: (s.reservePercent / 100) * (s.capacityKg ?? 0) } : {}),
        ...reorderFields(s, 'kg'),
      },
    };
  } else {
    if (!cyl) return { input: null, note: 'Choose the cylinder type of this source.', basis };
    const cylinderCommon = {
      gas: s.gasCode,
      water_capacity_L: cyl.waterCapacityL,
      fill_gauge_bar: cyl.fillPressureBar,
      fill_temperature_C: 15,
      in_use_temperature_C: temperatureC,
      lead_time_hours: lead,
      ...reorderFields(s, 'cylinders'),
    };
    if (s.type === 'manifold' && reading.kind === 'bank_gauges') {
      raw = {
        ...common,
        deliveries: deliveries.filter((d) => 'cylinders' in d),
        source: {
          type: 'manifold',
          ...cylinderCommon,
          cylinders_per_bank: s.cylindersPerBank ?? 1,
          duty_bank_gauge_bar: Number(detail.dutyBar ?? 0),
          standby_bank_gauge_bar: Number(detail.standbyBar ?? 0),
          spare_full: Number(detail.spareFull ?? 0),
          changeover_gauge_bar: s.changeoverGaugeBar ?? 0,
        },
      };
    } else {
      raw = {
        ...common,
        deliveries: deliveries.filter((d) => 'cylinders' in d),
        source: {
          type: 'cylinders',
          ...cylinderCommon,
          full: Number(detail.full ?? 0),
          in_use_gauge_bar: (detail.inUseGaugeBar as number[] | undefined) ?? [],
          ...(cyl.residualGaugeBar != null ? { residual_gauge_bar: cyl.residualGaugeBar } : {}),
        },
      };
    }
  }
  const parsed = forecastInputSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return { input: null, note: `This source's settings cannot be forecast: ${issue.path.join('.')}: ${issue.message}`, basis };
  }
  return { input: parsed.data, note: null, basis };
}

/**
 * The engine is a pure function of its request, so its results are kept by the request itself (as JSON):
 * a version bump that does not change this source's request (a write elsewhere on the site) reuses the
 * forecast and its Monte Carlo band, and a changed request can never hit an old result.
 */
const engineResults = new Map<string, SourceForecast>();
const ENGINE_RESULTS_MAX = 300;

function forecastOnce(input: ForecastInput): SourceForecast {
  const key = JSON.stringify(input);
  const hit = engineResults.get(key);
  if (hit) {
    // Most recently used last, so the oldest unused result goes first.
    engineResults.delete(key);
    engineResults.set(key, hit);
    return hit;
  }
  const f = forecastSource(input);
  if (engineResults.size >= ENGINE_RESULTS_MAX) engineResults.delete(engineResults.keys().next().value!);
  engineResults.set(key, f);
  return f;
}

/** Forecast and outlook of one source at `now` (status, days of stock, dates in UTC ISO). */
export function outlookFor(model: SiteModel, s: SupplySource, opts: ForecastOptions = {}): SourceOutlook {
  const now = opts.now ?? new Date();
  const lead = leadTimeOf(model, s);
  const { input, note, basis } = buildForecastInput(model, s, opts);
  const reading = model.latestReading.get(s.id);
  const unit: 'kg' | 'L' = s.type === 'bulk_liquid' ? 'kg' : 'L';
  const capacity = s.type === 'bulk_liquid' ? s.capacityKg : null;
  const empty: SourceOutlook = {
    sourceId: s.id,
    status: 'unknown',
    statusText: statusText('unknown', reading !== undefined),
    unit,
    contentsNow: reading ? reading.contents : null,
    capacity,
    daysOfStock: null,
    emptyAt: null,
    reorderAt: null,
    leadTimeHours: lead,
    firstRisk: null,
    trend: [],
    note,
    basis,
    forecast: null,
    input: null,
    startUtc: null,
    elapsedHours: 0,
  };
  if (!input) return empty;
  let f: SourceForecast;
  try {
    f = forecastOnce(input);
  } catch (e) {
    if (e instanceof InvalidInputError) return { ...empty, note: `Cannot forecast: ${e.message}` };
    throw e;
  }
  const startMs = f.index.startUtcMs;
  const elapsed = Math.max(0, Math.min(f.series.length, Math.floor((now.getTime() - startMs) / MS_H)));
  const contentsNow = elapsed === 0 ? f.contentsStart : f.series[elapsed - 1];
  const dailyLoss = f.daysOfStockAtStart && f.daysOfStockAtStart > 0 ? f.contentsStart / f.daysOfStockAtStart : 0;
  const daysOfStock = dailyLoss > 0 ? contentsNow / dailyLoss : null;
  const hoursToEmptyNow = f.hoursToEmpty === null ? null : f.hoursToEmpty - (now.getTime() - startMs) / MS_H;
  const emptyAt = f.hoursToEmpty === null ? null : new Date(startMs + f.hoursToEmpty * MS_H).toISOString();
  const firstOrder = f.orders[0];
  const reorderAtMs = firstOrder ? Math.max(startMs + firstOrder.placedHours * MS_H, now.getTime()) : null;
  const hoursToReorder = reorderAtMs === null ? null : (reorderAtMs - now.getTime()) / MS_H;

  const reserveTouched = f.firstRisk?.kind === 'reserve_touched' && f.firstRisk.atHours <= elapsed + lead;

  // A vaporiser carries the hourly demand only up to its derated rating (continuous duty, cold weather).
  let risk = f.firstRisk ? { code: f.firstRisk.kind as string, message: f.firstRisk.message, atHours: f.firstRisk.atHours } : null;
  if (s.type === 'bulk_liquid' && s.vaporiserM3H) {
    const derated = s.vaporiserM3H * (s.vaporiserDerating ?? VAPORISER_DEFAULT_DERATING);
    for (let i = elapsed; i < f.demandLPerHour.length; i++) {
      if (f.demandLPerHour[i] / 1000 > derated) {
        if (!risk || i + 1 < risk.atHours)
          risk = {
            code: 'vaporiser_overload',
            message: `Demand of ${(f.demandLPerHour[i] / 1000).toFixed(1)} m³/h is above the vaporiser's derated ${derated.toFixed(1)} m³/h.`,
            atHours: i,
          };
        break;
      }
    }
  }
  const status = decideStatus({
    forecast: true,
    leadTimeHours: lead,
    hoursToEmpty: hoursToEmptyNow,
    hoursToReorder,
    daysOfStock,
    reserveTouchedWithinLead: reserveTouched,
    vaporiserOverloadWithinDay: risk?.code === 'vaporiser_overload' && risk.atHours <= elapsed + 24,
  });

  const trend: number[] = [];
  for (let d = 0; d <= 14; d++) {
    const i = elapsed + d * 24 - 1;
    trend.push(i < 0 ? f.contentsStart : i < f.series.length ? f.series[i] : f.series[f.series.length - 1]);
  }
  return {
    ...empty,
    status,
    statusText: statusText(status, true),
    contentsNow,
    daysOfStock,
    emptyAt,
    reorderAt: reorderAtMs === null ? null : new Date(reorderAtMs).toISOString(),
    firstRisk: risk ? { code: risk.code, message: risk.message, at: new Date(startMs + risk.atHours * MS_H).toISOString() } : null,
    trend,
    note: null,
    forecast: f,
    input,
    startUtc: new Date(startMs).toISOString(),
    elapsedHours: elapsed,
  };
}

export { FORECAST_CAUTION };
