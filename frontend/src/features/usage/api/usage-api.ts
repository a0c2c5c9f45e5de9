import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { UsageCylinderLine, UsageDeviceLine, UsageReportCreate, UsageReportUpdate } from '@common/schemas/usage.schema';
import { api } from '@/lib/api-client';

export interface FiledReport {
  id: number;
  wardId: number;
  siteId: number;
  date: string;
  devices: UsageDeviceLine[];
  cylinders: UsageCylinderLine[];
  note: string;
  submittedAt: string;
  submittedBy: string | null;
  updatedAt: string;
  updatedBy: string | null;
  canEdit: boolean;
  editableUntil: string;
  reason: string | null;
}

export interface ReportScreenData {
  ward: { id: number; siteId: number; name: string; department: string; beds: number };
  site: { id: number; name: string; timeZone: string; referenceCode: string };
  date: string;
  today: string;
  report: FiledReport | null;
  draft: { date: string; devices: UsageDeviceLine[]; cylinders: UsageCylinderLine[]; note: string; prefilledFrom: string | null } | null;
  previous: Omit<FiledReport, 'canEdit' | 'editableUntil' | 'reason'> | null;
  canCreate: boolean;
  createRule: string | null;
  devices: { device: UsageDeviceLine['device']; label: string; flowLMin: number; modelPatients: number }[];
  cylinderTypes: { id: number; gasCode: string; name: string; freeGasL: number | null }[];
  recent: { id: number; date: string; patientsNow: number; cylindersUsed: number; submittedBy: string | null; submittedAt: string }[];
  editWindowHours: number;
}

export interface UsageStatus {
  site: { id: number; name: string; timeZone: string };
  date: string;
  reminderLocalTime: string;
  wards: { wardId: number; name: string; department: string; reportId: number | null; submittedAt: string | null; submittedBy: string | null }[];
}

export const usageQueries = {
  all: () => ['usage'] as const,
  /** The screen of one ward and day: the filed report or a draft. Fresh for 30 s (a colleague may file). */
  ward: (wardId: number, date?: string) =>
    queryOptions({ queryKey: [...usageQueries.all(), 'ward', wardId, date ?? 'today'] as const, queryFn: ({ signal }) => api.get<ReportScreenData>(`/wards/${wardId}/usage-reports`, { signal, query: { date, days: 7 } }), staleTime: 30_000 }),
  /** Which wards have filed: changes as reports come in, fresh for 30 s. */
  status: (siteId: number, date?: string) =>
    queryOptions({ queryKey: [...usageQueries.all(), 'status', siteId, date ?? 'today'] as const, queryFn: ({ signal }) => api.get<UsageStatus>(`/sites/${siteId}/usage-status`, { signal, query: { date } }), staleTime: 30_000 }),
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
