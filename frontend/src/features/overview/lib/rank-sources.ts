import { compareStatus } from '@common/forecast/status';
import type { Overview, OverviewSource } from '../api/overview-api';

export { countByStatus } from '@common/forecast/status';

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
  return all.sort((a, b) => compareStatus(a.status, b.status) || days(a) - days(b) || reorder(a) - reorder(b) || a.name.localeCompare(b.name));
}
