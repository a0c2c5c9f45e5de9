import { loadSiteModels, type SiteModel } from './site-model';
import { siteVersions, VersionedCache } from './site-version';

/**
 * The clock bucket of every cached forecast answer: the outlook moves with the clock (days of stock now,
 * status, the hour the chart starts from), so an answer is reused for at most this long even when no
 * write bumps the site's data version.
 */
export const BUCKET_MS = 5 * 60_000;

export function clockBucket(now: Date): number {
  return Math.floor(now.getTime() / BUCKET_MS);
}

/** A site's data version at this instant, read from the database (so every process sees every write). */
export async function siteVersionOf(siteId: number, organisationId: number): Promise<number | undefined> {
  return (await siteVersions([siteId], organisationId)).get(siteId);
}

/**
 * Loaded site models shared by the overview, source detail and ward detail: one load per site, data
 * version and clock bucket. The promise is kept, so concurrent requests for a cold site wait for one load.
 */
const models = new VersionedCache<Promise<SiteModel | undefined>>(BUCKET_MS, 200);

const modelKey = (organisationId: number, siteId: number, version: number, bucket: number) => `${organisationId}:${siteId}:${version}:${bucket}`;

/** Models of the given sites at their versions (sites the organisation does not own are left out). */
export async function siteModelsAt(versions: Map<number, number>, organisationId: number, bucket: number): Promise<Map<number, SiteModel>> {
  const pending = new Map<number, Promise<SiteModel | undefined>>();
  const missing: number[] = [];
  for (const [siteId, version] of versions) {
    const hit = models.get(modelKey(organisationId, siteId, version, bucket));
    if (hit) pending.set(siteId, hit);
    else missing.push(siteId);
  }
  if (missing.length) {
    const load = loadSiteModels(missing, organisationId);
    for (const siteId of missing) {
      const key = modelKey(organisationId, siteId, versions.get(siteId)!, bucket);
      const one = load.then((list) => list.find((m) => m.site.id === siteId));
      models.set(key, one);
      one.catch(() => models.delete(key));
      pending.set(siteId, one);
    }
  }
  const out = new Map<number, SiteModel>();
  for (const [siteId, p] of pending) {
    const m = await p;
    if (m) out.set(siteId, m);
  }
  return out;
}

/**
 * Computes once per key: concurrent requests for the same answer share one computation, and a failed
 * computation is not kept.
 */
export async function computeOnce<T>(cache: VersionedCache<Promise<T>>, key: string, compute: () => Promise<T>): Promise<T> {
  const hit = cache.get(key);
  if (hit) return hit;
  const p = compute();
  cache.set(key, p);
  p.catch(() => cache.delete(key));
  return p;
}
