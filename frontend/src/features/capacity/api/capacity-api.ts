import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  CapacityQuery,
  CapacityReport,
  CapacityResponse,
  PipeRunInput,
  PipeRunRow,
  RuleSetCreateInput,
  RuleSetRow,
  RuleSetUpdateInput,
  SignoffRow,
  ZoneInput,
  ZoneRow,
} from '@common/schemas/capacity.schema';
import { api } from '@/lib/api-client';

export type { CapacityReport, CapacityResponse, PipeRunRow, RuleSetRow, SignoffRow, ZoneRow };

/** What-if inputs of the check (the query the server validates); each left out takes its documented default there. */
export type CapacityWhatIf = Partial<CapacityQuery>;

export const capacityQueries = {
  all: () => ['capacity'] as const,
  site: (siteId: number) => [...capacityQueries.all(), 'site', siteId] as const,
  /**
   * The check of a site. It moves when zones, sources, demand or readings change: fresh for 30 s, and
   * the previous answer stays on screen while a new what-if is computed.
   */
  report: (siteId: number, whatIf: CapacityWhatIf) =>
    queryOptions({
      queryKey: [...capacityQueries.site(siteId), 'report', whatIf] as const,
      queryFn: ({ signal }) => api.get<CapacityResponse>(`/sites/${siteId}/capacity`, { signal, query: { ...whatIf } }),
      staleTime: 30_000,
      placeholderData: keepPreviousData,
    }),
  zones: (siteId: number) =>
    queryOptions({
      queryKey: [...capacityQueries.site(siteId), 'zones'] as const,
      queryFn: ({ signal }) => api.get<ZoneRow[]>(`/sites/${siteId}/zones`, { signal }),
      staleTime: 30_000,
    }),
  signoffs: (siteId: number) =>
    queryOptions({
      queryKey: [...capacityQueries.site(siteId), 'signoffs'] as const,
      queryFn: ({ signal }) => api.get<SignoffRow[]>(`/sites/${siteId}/capacity/signoffs`, { signal }),
      staleTime: 60_000,
    }),
  /** A sign-off never changes once recorded. */
  signoff: (id: number) =>
    queryOptions({
      queryKey: [...capacityQueries.all(), 'signoff', id] as const,
      queryFn: ({ signal }) => api.get<SignoffRow & { report: CapacityReport }>(`/capacity-signoffs/${id}`, { signal }),
      staleTime: Infinity,
    }),
  /** Rule sets change only when an engineer edits one: fresh for 5 minutes. */
  ruleSets: () =>
    queryOptions({
      queryKey: [...capacityQueries.all(), 'rule-sets'] as const,
      queryFn: ({ signal }) => api.get<RuleSetRow[]>('/rule-sets', { signal }),
      staleTime: 5 * 60_000,
    }),
};

/** Any change to a site's inputs moves its check: refresh everything of that site. */
function useInvalidateSite() {
  const qc = useQueryClient();
  return (siteId: number) => qc.invalidateQueries({ queryKey: capacityQueries.site(siteId) });
}

export function useSaveZone(siteId: number) {
  const invalidate = useInvalidateSite();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: ZoneInput }) =>
      id ? api.put<ZoneRow>(`/zones/${id}`, body) : api.post<ZoneRow>(`/sites/${siteId}/zones`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => invalidate(siteId),
  });
}

export function useDeleteZone(siteId: number) {
  const invalidate = useInvalidateSite();
  return useMutation({ mutationFn: (id: number) => api.delete<{ deleted: true }>(`/zones/${id}`), onSuccess: () => invalidate(siteId) });
}

export function useSavePipeRun(siteId: number) {
  const invalidate = useInvalidateSite();
  return useMutation({
    mutationFn: ({ id, zoneId, body }: { id?: number; zoneId: number; body: PipeRunInput }) =>
      id ? api.put<PipeRunRow>(`/pipe-runs/${id}`, body) : api.post<PipeRunRow>(`/zones/${zoneId}/pipe-runs`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => invalidate(siteId),
  });
}

export function useDeletePipeRun(siteId: number) {
  const invalidate = useInvalidateSite();
  return useMutation({ mutationFn: (id: number) => api.delete<{ deleted: true }>(`/pipe-runs/${id}`), onSuccess: () => invalidate(siteId) });
}

export function useSignOff(siteId: number) {
  const invalidate = useInvalidateSite();
  return useMutation({
    mutationFn: (body: { engineerName: string; note: string; inputsHash: string } & CapacityWhatIf) =>
      api.post<SignoffRow>(`/sites/${siteId}/capacity/signoffs`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => invalidate(siteId),
  });
}

/** Rule sets are used by zones on every site: a change refreshes all capacity data. */
export function useCreateRuleSet() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: Omit<RuleSetCreateInput, 'rules'> & { rules?: unknown }) => api.post<RuleSetRow>('/rule-sets', body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: capacityQueries.all() }),
  });
}

export function useUpdateRuleSet() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: Omit<RuleSetUpdateInput, 'rules'> & { rules: unknown } }) => api.put<RuleSetRow>(`/rule-sets/${id}`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: capacityQueries.all() }),
  });
}

export function useDeleteRuleSet() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.delete<{ deleted: true }>(`/rule-sets/${id}`),
    onSuccess: () => qc.invalidateQueries({ queryKey: capacityQueries.all() }),
  });
}
