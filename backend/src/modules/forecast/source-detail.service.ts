import { toCsv } from '@common/api/csv';
import { toChartSeries } from '@common/forecast/chart-series';
import { REFERENCE_CONDITIONS, type ReferenceCode } from '@common/gas/reference-conditions';
import { cylinderTypeName } from '@common/catalogue/cylinder-type';
import type { OverviewSource, SourceDetail } from '@common/schemas/forecast.schema';
import type { SourceType } from '@common/schemas/supply.schema';
import type { Actor } from '../../http/context';
import { notFound } from '../../errors/app-error';
import { db } from '../../db/db';
import { SourceReading, type SupplySource } from '../../db/entities/supply.entity';
import type { SiteModel } from './site-model';
import { VersionedCache } from './site-version';
import { clockBucket, computeOnce, siteModelsAt, siteVersionOf, BUCKET_MS } from './forecast-cache';
import { FORECAST_CAUTION, measuredDemandCv, modelledLines, outlookFor, wardsFedBy, type SourceOutlook } from './forecast.service';
import { presentReading, readerNames, presentScenario, presentSource, presentWard, sourceFor } from '../supply/supply.service';

const MS_H = 3_600_000;

export interface SourceDetailQuery {
  scenario?: number;
  draws: number;
  horizonDays: number;
}

/** One row of the overview (and the outlook of the source detail). */
export function overviewRow(model: SiteModel, o: SourceOutlook): OverviewSource {
  const s = model.sources.find((x) => x.id === o.sourceId)!;
  return {
    id: s.id,
    name: s.name,
    type: s.type as SourceType,
    gasCode: s.gasCode,
    unit: o.unit,
    contents: o.contentsNow,
    capacity: o.capacity,
    daysOfStock: o.daysOfStock,
    emptyAt: o.emptyAt,
    reorderAt: o.reorderAt,
    status: o.status,
    statusText: o.statusText,
    firstRisk: o.firstRisk,
    trend: o.trend,
    leadTimeHours: o.leadTimeHours,
    note: o.note,
  };
}

/** The hourly projection behind the chart and the CSV export: hours `from`… of the engine's series. */
interface Hourly {
  startMs: number;
  from: number;
  contents: Float64Array;
  demandL: Float64Array;
}

type Computed = ReturnType<typeof compute>;

/** Computed source details by source, scenario, draws, horizon, site data version and clock bucket. */
const detailCache = new VersionedCache<Promise<Computed>>(BUCKET_MS, 200);

function compute(model: SiteModel, s: SupplySource, q: SourceDetailQuery, readings: SourceReading[], now: Date) {
  if (q.scenario && !model.scenarios.some((x) => x.id === q.scenario)) throw notFound('Scenario');
  const o = outlookFor(model, s, { now, scenarioId: q.scenario, draws: q.draws, horizonDays: q.horizonDays });
  const f = o.forecast;
  const startMs = f?.index.startUtcMs ?? now.getTime();
  const hourly: Hourly | null = f ? { startMs, from: Math.max(0, o.elapsedHours - 1), contents: f.series, demandL: f.demandLPerHour } : null;
  // Columns, hourly, rounded for drawing (the CSV export keeps full precision and the demand column).
  const series = hourly ? toChartSeries(hourly.contents, startMs, hourly.from, o.unit) : toChartSeries([], now.getTime(), 0, o.unit);
  const iso = (h: number | null) => (h !== null && Number.isFinite(h) ? new Date(startMs + h * MS_H).toISOString() : null);
  const band = f?.bands
    ? { draws: f.bands.draws, drawsOutlastingHorizon: f.bands.drawsOutlastingHorizon, p10: iso(f.bands.p10), p50: iso(f.bands.p50), p90: iso(f.bands.p90) }
    : null;
  const perCyl = f?.factors.usablePerCylinderL ?? f?.factors.fullCylinderFreeGasL;
  const reference = model.site.referenceCode as ReferenceCode;
  const cyl = s.cylinderTypeId ? model.cylinderTypes.get(s.cylinderTypeId) : undefined;
  const lines = modelledLines(model, s);
  const body = {
    source: {
      ...presentSource(s),
      cylinderTypeName: cyl ? cylinderTypeName(cyl.waterCapacityL, cyl.fillPressureBar) : null,
      supplierName: s.supplierId ? (model.suppliers.get(s.supplierId)?.name ?? null) : null,
    },
    site: { id: model.site.id, name: model.site.name, timeZone: model.site.timeZone, referenceCode: model.site.referenceCode, currency: model.site.currency },
    computedAt: now.toISOString(),
    outlook: overviewRow(model, o),
    series,
    band,
    // The level the engine places orders at (in the series' unit), so the chart's line and the orders agree.
    reorderLevel: f?.reorderLevel ?? null,
    orders: (f?.orders ?? []).map((x) => ({
      placedAt: new Date(startMs + x.placedHours * MS_H).toISOString(),
      arrivesAt: new Date(startMs + x.arrivesHours * MS_H).toISOString(),
      quantity: x.amount === null ? null : f!.quantityUnit === 'cylinders' && perCyl ? Math.round(x.amount / perCyl) : x.amount,
      quantityUnit: f!.quantityUnit,
    })),
    manifoldEvents: (f?.manifoldEvents ?? []).map((e) => ({ ...e, at: new Date(startMs + e.atHours * MS_H).toISOString() })),
    deliveries: model.deliveries
      .filter((d) => d.sourceId === s.id)
      .map((d) => ({ id: d.id, dueAt: d.dueAt.toISOString(), kg: d.kg, cylinders: d.cylinders, reference: d.reference })),
    scenarios: model.scenarios.map(presentScenario),
    scenarioId: q.scenario ?? null,
    wardsFed: wardsFedBy(model, s).map(presentWard),
    method: {
      caution: FORECAST_CAUTION,
      cautions: f?.cautions ?? [],
      basis: o.basis,
      reference: REFERENCE_CONDITIONS[reference].label,
      startedFrom: o.startUtc,
      leadTimeHours: o.leadTimeHours,
      freeGasLitresPerKg: f?.factors.freeGasLitresPerKg ?? null,
      fullCylinderFreeGasL: f?.factors.fullCylinderFreeGasL ?? null,
      residual: f?.residual ?? null,
      demandLines: lines.map((l) => ({ label: l.label ?? '', flowLMin: l.flow_L_min, hours: l.hours ?? null, weekdays: l.weekdays ?? null })),
      text: [
        'Hour-by-hour projection in the site’s time zone from the latest reading: each hour removes the demand of the wards this source feeds (therapy lines × device flows, plus leakage)',
        s.type === 'bulk_liquid'
          ? 'A bulk tank loses the larger of demand and its normal evaporation (evaporated gas feeds the pipeline; only the excess vents).'
          : 'Cylinders count in free gas at the reference conditions, from the real-gas equation of state at the fill pressure and the gauge readings.',
        'When contents cross the reorder level an order is placed; it arrives after the lead time and fills to the order-up-to level.',
        `The band is the 10th–90th percentile of the empty time over Monte Carlo draws of day-to-day demand (coefficient of variation ${(o.input?.demand_cv ?? 0.2).toFixed(2)}${measuredDemandCv(model, s).measured ? ', measured from the last three weeks of readings' : ', a default until seven whole days of readings exist'}). Busy and quiet days come in runs: each day’s factor carries ${(o.input?.demand_persistence ?? 0).toFixed(2)} of the day before (a first-order autoregressive model${measuredDemandCv(model, s).persistenceMeasured ? ', fitted from the measured daily use' : ', a default until 14 whole days of readings exist'}).`,
      ],
    },
  };
  return { body, readings, hourly, unit: o.unit };
}

/**
 * The computed detail of a source the caller may see: from the cache while the site's data version and
 * the clock bucket are unchanged (every write to a forecast input bumps the version), else computed once.
 */
async function computed(actor: Actor, id: number, q: SourceDetailQuery): Promise<Computed> {
  const source = await sourceFor(actor, id);
  const organisationId = actor.user.organisationId;
  const version = await siteVersionOf(source.siteId, organisationId);
  if (version === undefined) throw notFound('Site');
  const now = new Date();
  const bucket = clockBucket(now);
  const key = `${id}:${q.scenario ?? 0}:${q.draws}:${q.horizonDays}:${version}:${bucket}`;
  return computeOnce(detailCache, key, async () => {
    const [models, readings] = await Promise.all([
      siteModelsAt(new Map([[source.siteId, version]]), organisationId, bucket),
      db()
        .getRepository(SourceReading)
        .find({ where: { sourceId: id }, order: { takenAt: 'DESC', id: 'DESC' }, take: 20 }),
    ]);
    const model = models.get(source.siteId);
    if (!model) throw notFound('Site');
    return compute(model, model.sources.find((x) => x.id === id) ?? source, q, readings, now);
  });
}

/** Source detail: settings, forecast from now (hourly), empty-time band, orders, deliveries, method and readings. */
export async function sourceDetail(actor: Actor, id: number, q: SourceDetailQuery): Promise<SourceDetail> {
  const c = await computed(actor, id, q);
  // Names are read each time: a person's name is not a forecast input and does not bump the version.
  const names = await readerNames(actor.user.organisationId, c.readings);
  return { ...c.body, readings: c.readings.map((r) => presentReading(r, names)) };
}

/** The forecast as CSV, every hour from the hour before now to the end of the horizon (no Monte Carlo). */
export async function sourceForecastCsv(actor: Actor, id: number, q: Omit<SourceDetailQuery, 'draws'>): Promise<{ filename: string; csv: string }> {
  const c = await computed(actor, id, { ...q, draws: 0 });
  const rows: (string | number)[][] = [];
  const h = c.hourly;
  if (h)
    for (let i = h.from; i < h.contents.length; i++)
      rows.push([new Date(h.startMs + (i + 1) * MS_H).toISOString(), Number(h.contents[i].toFixed(3)), Number(h.demandL[i].toFixed(3))]);
  return { filename: `forecast-source-${id}.csv`, csv: toCsv(['time_utc', `contents_${c.unit}`, 'demand_L_free_gas'], rows) };
}
