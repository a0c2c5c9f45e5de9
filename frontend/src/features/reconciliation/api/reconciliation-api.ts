import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { DayPoint, SiteReconciliation, SourceReconciliation, SourceReconciliationDetail, WardReconciliation } from '@common/schemas/usage.schema';
import { api } from '@/lib/api-client';

export type { DayPoint, SiteReconciliation, SourceReconciliation, SourceReconciliationDetail, WardReconciliation };

export const reconciliationQueries = {
  all: () => ['reconciliation'] as const,
  /** Measured use moves with every reading and report: fresh for a minute. */
  site: (siteId: number, days: number) =>
    queryOptions({
      queryKey: [...reconciliationQueries.all(), 'site', siteId, days] as const,
      queryFn: ({ signal }) => api.get<SiteReconciliation>(`/sites/${siteId}/reconciliation`, { signal, query: { days } }),
      staleTime: 60_000,
    }),
  source: (sourceId: number, days: number) =>
    queryOptions({
      queryKey: [...reconciliationQueries.all(), 'source', sourceId, days] as const,
      queryFn: ({ signal }) => api.get<SourceReconciliationDetail>(`/sources/${sourceId}/reconciliation`, { signal, query: { days } }),
      staleTime: 60_000,
    }),
};

/** Accepts a correction factor (basis "scaled"), or goes back to the model (factor 1, basis "model"). Recorded in the audit log. */
export function useSetCorrection(onSaved?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ sourceId, factor, basis }: { sourceId: number; factor: number; basis: 'model' | 'scaled' }) =>
      api.post<unknown>(`/sources/${sourceId}/correction`, { factor, basis }),
    meta: { formHandlesErrors: true },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: reconciliationQueries.all() });
      onSaved?.();
    },
  });
}
