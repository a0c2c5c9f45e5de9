import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { FiledReport, ReportScreenData, UsageReportCreate, UsageReportUpdate, UsageStatus } from '@common/schemas/usage.schema';
import { api } from '@/lib/api-client';

export type { FiledReport, ReportScreenData, UsageStatus };

export const usageQueries = {
  all: () => ['usage'] as const,
  /** The screen of one ward and day: the filed report or a draft. Fresh for 30 s (a colleague may file). */
  ward: (wardId: number, date?: string) =>
    queryOptions({
      queryKey: [...usageQueries.all(), 'ward', wardId, date ?? 'today'] as const,
      queryFn: ({ signal }) => api.get<ReportScreenData>(`/wards/${wardId}/usage-reports`, { signal, query: { date, days: 7 } }),
      staleTime: 30_000,
    }),
  /** Which wards have filed: changes as reports come in, fresh for 30 s. */
  status: (siteId: number, date?: string) =>
    queryOptions({
      queryKey: [...usageQueries.all(), 'status', siteId, date ?? 'today'] as const,
      queryFn: ({ signal }) => api.get<UsageStatus>(`/sites/${siteId}/usage-status`, { signal, query: { date } }),
      staleTime: 30_000,
    }),
};

export function useFileReport(wardId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: UsageReportCreate) => api.post<FiledReport>(`/wards/${wardId}/usage-reports`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: usageQueries.all() }),
  });
}

export function useEditReport(reportId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: UsageReportUpdate) => api.put<FiledReport>(`/usage-reports/${reportId}`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: usageQueries.all() }),
  });
}
