import { In } from 'typeorm';
import { db } from '../../db/db';
import { Site } from '../../db/entities/site.entity';
import { CylinderType, Supplier } from '../../db/entities/catalogue.entity';
import { DeviceFlow, Scenario, ScheduledDelivery, SourceReading, SupplySource, TherapyLineRow, Ward, WardFeed } from '../../db/entities/supply.entity';

/** Everything the forecast of a site's sources needs, loaded in a fixed number of queries. */
export interface SiteModel {
  site: Site;
  sources: SupplySource[];
  wards: Ward[];
  feeds: WardFeed[];
  therapy: TherapyLineRow[];
  deviceFlows: Map<string, number>;
  scenarios: Scenario[];
  deliveries: ScheduledDelivery[];
  latestReading: Map<number, SourceReading>;
  /** Recent readings per source (last 21 days), oldest first: measured consumption. */
  recentReadings: Map<number, SourceReading[]>;
  cylinderTypes: Map<number, CylinderType>;
  suppliers: Map<number, Supplier>;
}

const RECENT_DAYS = 21;

/**
 * The newest reading of each source: one backward step of ix_reading_source_time per source, then the
 * rows by primary key. (Filtering every reading of the sources by a correlated "is it the newest"
 * subquery reads all of their history: two years of hourly telemetry per tank at scale.)
 */
async function latestReadings(sourceIds: number[]): Promise<SourceReading[]> {
  const rows: { id: number | string | null }[] = await db().query(
    'SELECT (SELECT r.id FROM source_reading r WHERE r.source_id = s.id ORDER BY r.taken_at DESC, r.id DESC LIMIT 1) AS id FROM supply_source s WHERE s.id IN (?)',
    [sourceIds],
  );
  const ids = rows.filter((r) => r.id !== null).map((r) => Number(r.id));
  return ids.length
    ? db()
        .getRepository(SourceReading)
        .find({ where: { id: In(ids) } })
    : [];
}

export async function loadSiteModels(siteIds: number[], organisationId: number): Promise<SiteModel[]> {
  if (siteIds.length === 0) return [];
  const ds = db();
  const sites = await ds.getRepository(Site).find({ where: { id: In(siteIds), organisationId }, order: { name: 'ASC' } });
  if (sites.length === 0) return [];
  const ids = sites.map((s) => s.id);
  const [sources, wards, scenarios, flows, cylinderTypes, suppliers] = await Promise.all([
    ds.getRepository(SupplySource).find({ where: { siteId: In(ids), active: true }, order: { name: 'ASC' } }),
    ds.getRepository(Ward).find({ where: { siteId: In(ids) }, order: { name: 'ASC' } }),
    ds.getRepository(Scenario).find({ where: { siteId: In(ids) }, order: { fromLocal: 'ASC' } }),
    ds.getRepository(DeviceFlow).find({ where: { organisationId } }),
    ds.getRepository(CylinderType).find({ where: { organisationId } }),
    ds.getRepository(Supplier).find({ where: { organisationId } }),
  ]);
  const sourceIds = sources.map((s) => s.id);
  const wardIds = wards.map((w) => w.id);
  const [feeds, therapy, deliveries, latest, recent] = await Promise.all([
    wardIds.length ? ds.getRepository(WardFeed).find({ where: { wardId: In(wardIds) } }) : Promise.resolve([]),
    wardIds.length ? ds.getRepository(TherapyLineRow).find({ where: { wardId: In(wardIds) }, order: { id: 'ASC' } }) : Promise.resolve([]),
    sourceIds.length
      ? ds.getRepository(ScheduledDelivery).find({ where: { sourceId: In(sourceIds), status: 'scheduled' }, order: { dueAt: 'ASC' } })
      : Promise.resolve([]),
    sourceIds.length ? latestReadings(sourceIds) : Promise.resolve([]),
    sourceIds.length
      ? ds
          .getRepository(SourceReading)
          .createQueryBuilder('r')
          .select(['r.id', 'r.sourceId', 'r.takenAt', 'r.contents', 'r.kind'])
          .where('r.source_id IN (:...ids)', { ids: sourceIds })
          .andWhere('r.taken_at >= :since', { since: new Date(Date.now() - RECENT_DAYS * 86_400_000) })
          .orderBy('r.taken_at', 'ASC')
          .getMany()
      : Promise.resolve([]),
  ]);
  const deviceFlows = new Map(flows.map((f) => [f.device, f.flowLMin]));
  const cylMap = new Map(cylinderTypes.map((c) => [c.id, c]));
  const supMap = new Map(suppliers.map((s) => [s.id, s]));
  return sites.map((site) => {
    const siteSources = sources.filter((s) => s.siteId === site.id);
    const siteWards = wards.filter((w) => w.siteId === site.id);
    const wardSet = new Set(siteWards.map((w) => w.id));
    const srcSet = new Set(siteSources.map((s) => s.id));
    const recentReadings = new Map<number, SourceReading[]>();
    for (const r of recent) {
      if (!srcSet.has(r.sourceId)) continue;
      const list = recentReadings.get(r.sourceId) ?? [];
      list.push(r);
      recentReadings.set(r.sourceId, list);
    }
    return {
      site,
      sources: siteSources,
      wards: siteWards,
      feeds: feeds.filter((f) => wardSet.has(f.wardId)),
      therapy: therapy.filter((t) => wardSet.has(t.wardId)),
      deviceFlows,
      scenarios: scenarios.filter((s) => s.siteId === site.id),
      deliveries: deliveries.filter((d) => srcSet.has(d.sourceId)),
      latestReading: new Map(latest.filter((r) => srcSet.has(r.sourceId)).map((r) => [r.sourceId, r])),
      recentReadings,
      cylinderTypes: cylMap,
      suppliers: supMap,
    };
  });
}
