import { queryOptions } from '@tanstack/react-query';
import type { Overview, OverviewSite, OverviewSource } from '@common/schemas/forecast.schema';
import { api } from '@/lib/api-client';

export type { SourceStatus } from '@common/forecast/status';
export type { Overview, OverviewSite, OverviewSource };

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
