import { idParamSchema } from '@common/schemas/common.schema';
import { forecastQuerySchema } from '@common/schemas/supply.schema';
import { toCsv } from '@common/api/csv';
import { meanDailyDemandL } from '@common/forecast/demand-model';
import { REFERENCE_CONDITIONS, type ReferenceCode } from '@common/gas/reference-conditions';
import { cylinderTypeName } from '@common/catalogue/cylinder-type';
import type { RouteDef } from '../../http/route';
import { actorOf, type Actor } from '../../http/context';
import { validate } from '../../http/validate';
import { notFound } from '../../errors/app-error';
import { db } from '../../db/db';
import { SourceReading } from '../../db/entities/supply.entity';
import { loadSiteModels, type SiteModel } from './site-model';
import { siteVersions, VersionedCache } from './site-version';
import { FORECAST_CAUTION, measuredDemandCv, measuredLPerDay, modelledLines, outlookFor, wardDemandLines, wardsFedBy, type SourceOutlook } from './forecast.service';
import { presentReading, readerNames, presentScenario, presentSource, presentTherapy, presentWard, sourceFor, wardFor } from '../supply/supply.service';

const MS_H = 3_600_000;
const STATUS_RANK = { critical: 0, reorder: 1, watch: 2, unknown: 3, ok: 4 } as const;

function overviewRow(model: SiteModel, o: SourceOutlook) {
  const s = model.sources.find((x) => x.id === o.sourceId)!;
  return {
    id: s.id,
    name: s.name,
    type: s.type,
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

type OverviewSite = { id: number; name: string; timeZone: string; referenceCode: string; computedAt: string; sources: ReturnType<typeof overviewRow>[] };

/** Computed overview per site, by data version and a 5-minute clock bucket (see VersionedCache). */
const overviewCache = new VersionedCache<OverviewSite>(5 * 60_000);
const BUCKET_MS = 5 * 60_000;

/** The overview: every source of the caller's sites, worst first. */
export async function overview(actor: Actor) {
  const now = new Date();
  const versions = await siteVersions(actor.user.siteIds, actor.user.organisationId);
  const bucket = Math.floor(now.getTime() / BUCKET_MS);
  const key = (siteId: number) => `${siteId}:${versions.get(siteId)}:${bucket}`;
  const sites = new Map<number, OverviewSite>();
  const missing: number[] = [];
  for (const id of versions.keys()) {
    const hit = overviewCache.get(key(id));
    if (hit) sites.set(id, hit);
    else missing.push(id);
  }
  if (missing.length) {
    const models = await loadSiteModels(missing, actor.user.organisationId);
    for (const m of models) {
      const site: OverviewSite = {
        id: m.site.id,
        name: m.site.name,
        timeZone: m.site.timeZone,
        referenceCode: m.site.referenceCode,
        computedAt: now.toISOString(),
        sources: m.sources
          .filter((s) => s.type !== 'emergency_reserve')
          .map((s) => overviewRow(m, outlookFor(m, s, { now })))
          .sort((a, b) => STATUS_RANK[a.status] - STATUS_RANK[b.status] || (a.daysOfStock ?? 1e9) - (b.daysOfStock ?? 1e9)),
      };
      sites.set(m.site.id, site);
      overviewCache.set(key(m.site.id), site);
    }
  }
  const list = [...sites.values()];
  return {
    generatedAt: list.reduce((oldest, x) => (x.computedAt < oldest ? x.computedAt : oldest), now.toISOString()),
    caution: FORECAST_CAUTION,
    sites: list.sort((a, b) => a.name.localeCompare(b.name)),
  };
}

async function modelOf(actor: Actor, siteId: number): Promise<SiteModel> {
  const [m] = await loadSiteModels([siteId], actor.user.organisationId);
  if (!m) throw notFound('Site');
  return m;
}

/** Source detail: settings, forecast from now (hourly), empty-time band, orders, deliveries, method and readings. */
async function sourceDetail(actor: Actor, id: number, q: { scenario?: number; draws: number; horizonDays: number }) {
  const source = await sourceFor(actor, id);
  const model = await modelOf(actor, source.siteId);
  const s = model.sources.find((x) => x.id === id) ?? source;
  const now = new Date();
  if (q.scenario && !model.scenarios.some((x) => x.id === q.scenario)) throw notFound('Scenario');
  const o = outlookFor(model, s, { now, scenarioId: q.scenario, draws: q.draws, horizonDays: q.horizonDays });
  const f = o.forecast;
  const startMs = f?.index.startUtcMs ?? now.getTime();
  const series: { at: string; contents: number; demandL: number }[] = [];
  if (f) {
    for (let i = Math.max(0, o.elapsedHours - 1); i < f.series.length; i++) {
      series.push({ at: new Date(startMs + (i + 1) * MS_H).toISOString(), contents: f.series[i], demandL: f.demandLPerHour[i] });
    }
  }
  const band = f?.bands
    ? {
        draws: f.bands.draws,
        drawsOutlastingHorizon: f.bands.drawsOutlastingHorizon,
        p10: f.bands.p10 !== null && Number.isFinite(f.bands.p10) ? new Date(startMs + f.bands.p10 * MS_H).toISOString() : null,
        p50: f.bands.p50 !== null && Number.isFinite(f.bands.p50) ? new Date(startMs + f.bands.p50 * MS_H).toISOString() : null,
        p90: f.bands.p90 !== null && Number.isFinite(f.bands.p90) ? new Date(startMs + f.bands.p90 * MS_H).toISOString() : null,
      }
    : null;
  const perCyl = f?.factors.usablePerCylinderL ?? f?.factors.fullCylinderFreeGasL;
  const dailyLoss = f && f.daysOfStockAtStart ? f.contentsStart / f.daysOfStockAtStart : null;
  let reorderLevel: number | null = null;
  if (s.reorderMode !== 'none' && s.reorderLevel !== null) {
    if (s.reorderMode === 'amount') reorderLevel = s.type === 'bulk_liquid' ? s.reorderLevel : perCyl ? s.reorderLevel * perCyl : null;
    else if (s.reorderMode === 'percent') reorderLevel = s.type === 'bulk_liquid' ? ((s.capacityKg ?? 0) * s.reorderLevel) / 100 : perCyl && s.orderUpTo ? (s.orderUpTo * perCyl * s.reorderLevel) / 100 : null;
    else if (s.reorderMode === 'days') reorderLevel = dailyLoss !== null ? dailyLoss * s.reorderLevel : null;
  }
  const reference = model.site.referenceCode as ReferenceCode;
  const cyl = s.cylinderTypeId ? model.cylinderTypes.get(s.cylinderTypeId) : undefined;
  const readings = await db().getRepository(SourceReading).find({ where: { sourceId: id }, order: { takenAt: 'DESC', id: 'DESC' }, take: 20 });
  const lines = modelledLines(model, s);
  const names = await readerNames(actor.user.organisationId, readings);
  return {
    source: { ...presentSource(s), cylinderTypeName: cyl ? cylinderTypeName(cyl.waterCapacityL, cyl.fillPressureBar) : null, supplierName: s.supplierId ? (model.suppliers.get(s.supplierId)?.name ?? null) : null },
    site: { id: model.site.id, name: model.site.name, timeZone: model.site.timeZone, referenceCode: model.site.referenceCode, currency: model.site.currency },
    outlook: overviewRow(model, o),
    series,
    band,
    reorderLevel,
    orders: (f?.orders ?? []).map((x) => ({ placedAt: new Date(startMs + x.placedHours * MS_H).toISOString(), arrivesAt: new Date(startMs + x.arrivesHours * MS_H).toISOString(), quantity: x.amount === null ? null : f!.quantityUnit === 'cylinders' && perCyl ? Math.round(x.amount / perCyl) : x.amount, quantityUnit: f!.quantityUnit })),
    manifoldEvents: (f?.manifoldEvents ?? []).map((e) => ({ ...e, at: new Date(startMs + e.atHours * MS_H).toISOString() })),
    deliveries: model.deliveries.filter((d) => d.sourceId === id).map((d) => ({ id: d.id, dueAt: d.dueAt.toISOString(), kg: d.kg, cylinders: d.cylinders, reference: d.reference })),
    scenarios: model.scenarios.map(presentScenario),
    scenarioId: q.scenario ?? null,
    wardsFed: wardsFedBy(model, s).map(presentWard),
    readings: readings.map((r) => presentReading(r, names)),
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
        s.type === 'bulk_liquid' ? 'A bulk tank loses the larger of demand and its normal evaporation (evaporated gas feeds the pipeline; only the excess vents).' : 'Cylinders count in free gas at the reference conditions, from the real-gas equation of state at the fill pressure and the gauge readings.',
        'When contents cross the reorder level an order is placed; it arrives after the lead time and fills to the order-up-to level.',
        `The band is the 10th–90th percentile of the empty time over Monte Carlo draws of day-to-day demand (coefficient of variation ${(o.input?.demand_cv ?? 0.2).toFixed(2)}${measuredDemandCv(model, s).measured ? ', measured from the last three weeks of readings' : ', a default until seven whole days of readings exist'}). Busy and quiet days come in runs: each day’s factor carries ${(o.input?.demand_persistence ?? 0).toFixed(2)} of the day before (a first-order autoregressive model${measuredDemandCv(model, s).persistenceMeasured ? ', fitted from the measured daily use' : ', a default until 14 whole days of readings exist'}).`,
      ],
    },
  };
}

async function wardDetail(actor: Actor, id: number) {
  const ward = await wardFor(actor, id);
  const model = await modelOf(actor, ward.siteId);
  const reference = model.site.referenceCode as ReferenceCode;
  const gases = [...new Set([...model.therapy.filter((t) => t.wardId === id).map((t) => t.gasCode), ...model.feeds.filter((f) => f.wardId === id).map((f) => f.gasCode)])];
  const perGas = gases.map((gas) => {
    const lines = wardDemandLines(model, id, gas);
    const modelledLPerDay = meanDailyDemandL(lines);
    const primary = model.feeds.find((f) => f.wardId === id && f.gasCode === gas && f.role === 'primary');
    const src = primary ? model.sources.find((s) => s.id === primary.sourceId) : undefined;
    // Measured use of the ward is its share of its source's measured use (by modelled share), when the source feeds several wards.
    let measured: number | null = null;
    if (src) {
      const srcMeasured = measuredLPerDay(model, src, reference);
      const srcModelled = meanDailyDemandL(modelledLines(model, src));
      if (srcMeasured !== null && srcModelled > 0) measured = (srcMeasured * modelledLPerDay) / srcModelled;
    }
    return { gasCode: gas, modelledLPerDay, measuredLPerDay: measured, suggestedFactor: measured !== null && modelledLPerDay > 0 ? measured / modelledLPerDay : null, primarySource: src ? { id: src.id, name: src.name } : null, lines: lines.map((l) => ({ label: l.label, flowLMin: l.flow_L_min, hours: l.hours ?? null, weekdays: l.weekdays ?? null })) };
  });
  return {
    ward: presentWard(ward),
    site: { id: model.site.id, name: model.site.name, timeZone: model.site.timeZone, referenceCode: model.site.referenceCode },
    therapy: model.therapy.filter((t) => t.wardId === id).map(presentTherapy),
    feeds: model.feeds.filter((f) => f.wardId === id).map((f) => ({ sourceId: f.sourceId, gasCode: f.gasCode, role: f.role, sourceName: model.sources.find((s) => s.id === f.sourceId)?.name ?? '' })),
    perGas,
    scenarios: model.scenarios.filter((s) => s.wardId === id || s.wardId === null).map(presentScenario),
  };
}

export function forecastRoutes(): RouteDef[] {
  return [
    { method: 'get', path: '/api/overview', access: 'authenticated', handler: (req) => overview(actorOf(req)) },
    {
      method: 'get',
      path: '/api/sources/:id',
      access: 'authenticated',
      handler: (req) => sourceDetail(actorOf(req), validate(idParamSchema, req.params, 'address').id, validate(forecastQuerySchema, req.query, 'query')),
    },
    {
      method: 'get',
      path: '/api/sources/:id/forecast.csv',
      access: 'authenticated',
      handler: async (req, res) => {
        const id = validate(idParamSchema, req.params, 'address').id;
        const q = validate(forecastQuerySchema, req.query, 'query');
        const d = await sourceDetail(actorOf(req), id, { ...q, draws: 0 });
        const unit = d.outlook.unit;
        const csv = toCsv(['time_utc', `contents_${unit}`, 'demand_L_free_gas'], d.series.map((p) => [p.at, Number(p.contents.toFixed(3)), Number(p.demandL.toFixed(3))]));
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="forecast-source-${id}.csv"`);
        res.send(csv);
        return undefined;
      },
    },
    { method: 'get', path: '/api/wards/:id', access: 'authenticated', handler: (req) => wardDetail(actorOf(req), validate(idParamSchema, req.params, 'address').id) },
  ];
}
