import type { Overview, OverviewSource, SourceStatus } from '../api/overview-api';

const RANK: Record<SourceStatus, number> = { critical: 0, reorder: 1, watch: 2, ok: 3 };

export interface RankedSource extends OverviewSource {
  siteId: number;
  siteName: string;
  timeZone: string;
}

/**
 * Every source of every site, worst first: by status, then by the days of stock left (unknown last),
 * then by the reorder date, then by name, so the list reads as a to-do list.
 */
export function rankSources(overview: Overview): RankedSource[] {
  const all = overview.sites.flatMap((s) => s.sources.map((src) => ({ ...src, siteId: s.id, siteName: s.name, timeZone: s.timeZone })));
  const days = (s: RankedSource) => (typeof s.daysOfStock === 'number' && Number.isFinite(s.daysOfStock) ? s.daysOfStock : Infinity);
  const reorder = (s: RankedSource) => (s.reorderAt ? Date.parse(s.reorderAt) : Infinity);
  return all.sort(
    (a, b) => (RANK[a.status] ?? 2) - (RANK[b.status] ?? 2) || days(a) - days(b) || reorder(a) - reorder(b) || a.name.localeCompare(b.name),
  );
}

export function countByStatus(sources: { status: SourceStatus }[]): Record<SourceStatus, number> {
  const counts: Record<SourceStatus, number> = { critical: 0, reorder: 0, watch: 0, ok: 0 };
  for (const s of sources) counts[s.status] = (counts[s.status] ?? 0) + 1;
  return counts;
}
