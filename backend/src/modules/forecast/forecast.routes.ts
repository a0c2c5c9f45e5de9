import { idParamSchema } from '@common/schemas/common.schema';
import { forecastQuerySchema } from '@common/schemas/supply.schema';
import { meanDailyDemandL } from '@common/forecast/demand-model';
import type { ReferenceCode } from '@common/gas/reference-conditions';
import type { RouteDef } from '../../http/route';
import { actorOf, type Actor } from '../../http/context';
import { validate } from '../../http/validate';
import { notFound } from '../../errors/app-error';
import { compareStatus } from '@common/forecast/status';
import type { Overview, OverviewSite, WardDetail } from '@common/schemas/forecast.schema';
import type { FeedRole } from '@common/schemas/supply.schema';
import type { Ward } from '../../db/entities/supply.entity';
import type { SiteModel } from './site-model';
import { siteVersions, VersionedCache } from './site-version';
import { BUCKET_MS, clockBucket, computeOnce, siteModelsAt, siteVersionOf } from './forecast-cache';
import { FORECAST_CAUTION, measuredLPerDay, modelledLines, outlookFor, wardDemandLines } from './forecast.service';
import { overviewRow, sourceDetail, sourceForecastCsv } from './source-detail.service';
import { presentScenario, presentTherapy, presentWard, wardFor } from '../supply/supply.service';

/** Computed overview per site, by data version and a 5-minute clock bucket (see VersionedCache). */
const overviewCache = new VersionedCache<OverviewSite>(BUCKET_MS);

/** The overview: every source of the caller's sites, worst first. */
export async function overview(actor: Actor): Promise<Overview> {
  const now = new Date();
  const versions = await siteVersions(actor.user.siteIds, actor.user.organisationId);
  const bucket = clockBucket(now);
  const key = (siteId: number) => `${siteId}:${versions.get(siteId)}:${bucket}`;
  const sites = new Map<number, OverviewSite>();
  const missing: number[] = [];
  for (const id of versions.keys()) {
    const hit = overviewCache.get(key(id));
    if (hit) sites.set(id, hit);
    else missing.push(id);
  }
  if (missing.length) {
    const models = await siteModelsAt(new Map(missing.map((id) => [id, versions.get(id)!])), actor.user.organisationId, bucket);
    for (const m of models.values()) {
      const site: OverviewSite = {
        id: m.site.id,
        name: m.site.name,
        timeZone: m.site.timeZone,
        referenceCode: m.site.referenceCode,
        computedAt: now.toISOString(),
        sources: m.sources
          .filter((s) => s.type !== 'emergency_reserve')
          .map((s) => overviewRow(m, outlookFor(m, s, { now })))
          .sort((a, b) => compareStatus(a.status, b.status) || (a.daysOfStock ?? 1e9) - (b.daysOfStock ?? 1e9)),
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

/** Computed ward details by ward, site data version and clock bucket. */
const wardCache = new VersionedCache<Promise<WardDetail>>(BUCKET_MS, 200);

async function wardDetail(actor: Actor, id: number): Promise<WardDetail> {
  const ward = await wardFor(actor, id);
  const organisationId = actor.user.organisationId;
  const version = await siteVersionOf(ward.siteId, organisationId);
  if (version === undefined) throw notFound('Site');
  const bucket = clockBucket(new Date());
  return computeOnce(wardCache, `${id}:${version}:${bucket}`, async () => {
    const model = (await siteModelsAt(new Map([[ward.siteId, version]]), organisationId, bucket)).get(ward.siteId);
    if (!model) throw notFound('Site');
    return computeWardDetail(model, model.wards.find((w) => w.id === id) ?? ward);
  });
}

function computeWardDetail(model: SiteModel, ward: Ward): WardDetail {
  const id = ward.id;
  const reference = model.site.referenceCode as ReferenceCode;
  const gases = [
    ...new Set([...model.therapy.filter((t) => t.wardId === id).map((t) => t.gasCode), ...model.feeds.filter((f) => f.wardId === id).map((f) => f.gasCode)]),
  ];
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
    return {
      gasCode: gas,
      modelledLPerDay,
      measuredLPerDay: measured,
      suggestedFactor: measured !== null && modelledLPerDay > 0 ? measured / modelledLPerDay : null,
      primarySource: src ? { id: src.id, name: src.name } : null,
      lines: lines.map((l) => ({ label: l.label ?? '', flowLMin: l.flow_L_min, hours: l.hours ?? null, weekdays: l.weekdays ?? null })),
    };
  });
  return {
    ward: presentWard(ward),
    site: { id: model.site.id, name: model.site.name, timeZone: model.site.timeZone, referenceCode: model.site.referenceCode },
    therapy: model.therapy.filter((t) => t.wardId === id).map(presentTherapy),
    feeds: model.feeds
      .filter((f) => f.wardId === id)
      .map((f) => ({
        sourceId: f.sourceId,
        gasCode: f.gasCode,
        role: f.role as FeedRole,
        sourceName: model.sources.find((s) => s.id === f.sourceId)?.name ?? '',
      })),
    perGas,
    scenarios: model.scenarios.filter((s) => s.wardId === id || s.wardId === null).map(presentScenario),
  };
}

export function forecastRoutes(): RouteDef[] {
  return [
    { method: 'get', path: '/api/overview', access: 'authenticated', revalidate: true, handler: (req) => overview(actorOf(req)) },
    {
      method: 'get',
      path: '/api/sources/:id',
      access: 'authenticated',
      revalidate: true,
      handler: (req) => sourceDetail(actorOf(req), validate(idParamSchema, req.params, 'address').id, validate(forecastQuerySchema, req.query, 'query')),
    },
    {
      method: 'get',
      path: '/api/sources/:id/forecast.csv',
      access: 'authenticated',
      handler: async (req, res) => {
        const id = validate(idParamSchema, req.params, 'address').id;
        const q = validate(forecastQuerySchema, req.query, 'query');
        const { filename, csv } = await sourceForecastCsv(actorOf(req), id, q);
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
        res.send(csv);
        return undefined;
      },
    },
    {
      method: 'get',
      path: '/api/wards/:id',
      access: 'authenticated',
      revalidate: true,
      handler: (req) => wardDetail(actorOf(req), validate(idParamSchema, req.params, 'address').id),
    },
  ];
}
