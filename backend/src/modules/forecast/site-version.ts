import type { EntityManager } from 'typeorm';
import { db } from '../../db/db';

/**
 * Bumps a site's data version inside the caller's transaction. Call it from every write that changes a
 * forecast input (source, reading, ward, therapy line, feed, scenario, delivery, order arrival).
 */
export async function bumpSiteVersion(m: EntityManager, siteId: number): Promise<void> {
  await m.query('UPDATE site SET data_version = data_version + 1 WHERE id = ?', [siteId]);
}

/**
 * Bumps the version of every site of an organisation: for writes to the shared catalogue that forecasts
 * read (a supplier's lead time, a cylinder type's size and fill pressure).
 */
export async function bumpOrganisationSiteVersions(m: EntityManager, organisationId: number): Promise<void> {
  await m.query('UPDATE site SET data_version = data_version + 1 WHERE organisation_id = ?', [organisationId]);
}

export async function siteVersions(siteIds: number[], organisationId: number): Promise<Map<number, number>> {
  if (siteIds.length === 0) return new Map();
  const rows: { id: number; data_version: string | number }[] = await db().query(
    `SELECT id, data_version FROM site WHERE organisation_id = ? AND id IN (${siteIds.map(() => '?').join(',')})`,
    [organisationId, ...siteIds],
  );
  return new Map(rows.map((r) => [Number(r.id), Number(r.data_version)]));
}

/**
 * Small in-process cache keyed by site, data version and a time bucket (the outlook moves with the
 * clock: days of stock now, status). Safe with several processes: a write in any of them bumps the
 * version and every process recomputes.
 */
export class VersionedCache<T> {
  private entries = new Map<string, { value: T; at: number }>();
  constructor(
    private readonly maxAgeMs: number,
    private readonly maxEntries = 500,
  ) {}

  get(key: string): T | undefined {
    const e = this.entries.get(key);
    if (!e) return undefined;
    if (Date.now() - e.at > this.maxAgeMs) {
      this.entries.delete(key);
      return undefined;
    }
    return e.value;
  }

  delete(key: string): void {
    this.entries.delete(key);
  }

  set(key: string, value: T): void {
    if (this.entries.size >= this.maxEntries) {
      const oldest = this.entries.keys().next().value;
      if (oldest !== undefined) this.entries.delete(oldest);
    }
    this.entries.set(key, { value, at: Date.now() });
  }
}
