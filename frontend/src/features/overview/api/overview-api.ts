import { queryOptions } from '@tanstack/react-query';
import type { SourceStatus } from '@common/forecast/status';
import { api } from '@/lib/api-client';

export type { SourceStatus };

export interface OverviewSource {
  id: number;
  name: string;
  type: 'bulk_liquid' | 'manifold' | 'cylinder_store';
  gasCode: string;
  unit: 'kg' | 'L';
  /** Null while the source has no reading. */
  contents: number | null;
  capacity: number | null;
  daysOfStock: number | null;
  /** ISO instant, UTC. */
  emptyAt: string | null;
  reorderAt: string | null;
  status: SourceStatus;
  statusText: string;
  firstRisk: { code: string; message: string } | null;
  /** Daily contents over the next 14 days. */
  trend: number[];
  leadTimeHours: number | null;
  /** Why there is no forecast, when there is none. */
  note: string | null;
}

export interface OverviewSite {
  id: number;
  name: string;
  timeZone: string;
  sources: OverviewSource[];
}

export interface Overview {
  generatedAt: string;
  /** The planning caution the forecast travels with. */
  caution?: string;
  sites: OverviewSite[];
}

export const overviewQueries = {
  all: () => ['overview'] as const,
  /**
   * Days of stock move by the hour; a screen left open in the plant room refreshes every 5 minutes
   * and counts as stale after one.
   */
  summary: () =>
    queryOptions({
      queryKey: [...overviewQueries.all(), 'summary'] as const,
      queryFn: ({ signal }) => api.get<Overview>('/overview', { signal }),
      staleTime: 60_000,
      refetchInterval: 5 * 60_000,
    }),
};
