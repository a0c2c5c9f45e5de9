import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export interface DayPoint {
  date: string;
  measuredL: number;
  modelledL: number;
  hours: number;
}

export interface SourceReconciliation {
  id: number;
  name: string;
  type: string;
  gasCode: string;
  modelledLPerDay: number;
  correctedLPerDay: number;
  measuredLPerDay: number | null;
  ratio: number | null;
  suggestedFactor: number | null;
  acceptedFactor: number;
  forecastBasis: 'model' | 'measured' | 'scaled';
  dailyCv: number | null;
  demandCv: { cv: number; measured: boolean; days: number };
  readings: number;
  spanHours: number;
  refills: { at: string; delivered: number; unit: string }[];
  daily: DayPoint[];
  weekly: { week: string; total: number; days: number; perDay: number }[];
  wardsFed: { id: number; name: string }[];
  note: string | null;
}

export interface WardReconciliation {
  id: number;
  name: string;
  department: string;
  modelledLPerDay: number;
  measuredLPerDay: number | null;
  basis: string | null;
  ratio: number | null;
  suggestedFactor: number | null;
  reports: number;
  reportedLPerDay: number | null;
  meterLPerDay: number | null;
  historyLPerDay: number | null;
  devices: { device: string; label: string; modelPatients: number; reportedMeanNow: number | null; reportedMaxShift: number | null }[];
  cylinders: { gasCode: string; cylinders: number; litres: number }[];
  weekly: { week: string; total: number; days: number; perDay: number }[];
  daily: { date: string; modelledL: number; reportedL: number | null; meterL: number | null; historyL: number | null }[];
  primarySource: { id: number; name: string } | null;
}

export interface SiteReconciliation {
  site: { id: number; name: string; timeZone: string; referenceCode: string };
  from: string;
  to: string;
  days: number;
  caution: string;
  method: string[];
  sources: SourceReconciliation[];
  wards: WardReconciliation[];
}

export interface SourceReconciliationDetail {
  site: { id: number; name: string; timeZone: string };
  days: number;
  caution: string;
  source: SourceReconciliation;
  corrections: { at: string; by: string | null; factor: number; basis: string; previousFactor: number | null }[];
}

export const reconciliationQueries = {
  all: () => ['reconciliation'] as const,
  /** Measured use moves with every reading and report: fresh for a minute. */
  site: (siteId: number, days: number) =>
    queryOptions({ queryKey: [...reconciliationQueries.all(), 'site', siteId, days] as const, queryFn: ({ signal }) => api.get<SiteReconciliation>(`/sites/${siteId}/reconciliation`, { signal, query: { days } }), staleTime: 60_000 }),
  source: (sourceId: number, days: number) =>
    queryOptions({ queryKey: [...reconciliationQueries.all(), 'source', sourceId, days] as const, queryFn: ({ signal }) => api.get<SourceReconciliationDetail>(`/sources/${sourceId}/reconciliation`, { signal, query: { days } }), staleTime: 60_000 }),
};

/** Accepts a correction factor (basis "scaled"), or goes back to the model (factor 1, basis "model"). Recorded in the audit log. */
export function useSetCorrection(onSaved?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ sourceId, factor, basis }: { sourceId: number; factor: number; basis: 'model' | 'scaled' }) => api.post<unknown>(`/sources/${sourceId}/correction`, { factor, basis }),
    meta: { formHandlesErrors: true },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: reconciliationQueries.all() });
      onSaved?.();
    },
  });
}
