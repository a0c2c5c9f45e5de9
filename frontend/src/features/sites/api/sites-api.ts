import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { SiteInput } from '@common/schemas/admin.schema';
import { api } from '@/lib/api-client';

export interface Site {
  id: number;
  name: string;
  kind: 'hospital' | 'clinic' | 'other';
  address: string;
  timeZone: string;
  referenceCode: '15C' | '21C' | '0C';
  unitSystem: 'metric' | 'us';
  altitudeM: number;
  atmosphericBar: number;
  currency: string;
  cylinderColours: 'ISO32' | 'CGA_C9';
  storeTemperatureC: number;
  beds: number;
  updatedAt?: string;
}

export interface Organisation {
  id: number;
  name: string;
}

export const sitesQueries = {
  all: () => ['sites'] as const,
  /** Sites change when an administrator edits them: fresh for 5 minutes. */
  list: () => queryOptions({ queryKey: [...sitesQueries.all(), 'list'] as const, queryFn: ({ signal }) => api.get<Site[]>('/sites', { signal }), staleTime: 5 * 60_000 }),
  detail: (id: number) => queryOptions({ queryKey: [...sitesQueries.all(), 'detail', id] as const, queryFn: ({ signal }) => api.get<Site>(`/sites/${id}`, { signal }), staleTime: 5 * 60_000 }),
  organisation: () => queryOptions({ queryKey: [...sitesQueries.all(), 'organisation'] as const, queryFn: ({ signal }) => api.get<Organisation>('/organisation', { signal }), staleTime: 10 * 60_000 }),
};

/** `onSaved` lets the app refresh what other features derive from sites (the session's site list). */
export function useSaveSite(onSaved?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: SiteInput }) => (id ? api.put<Site>(`/sites/${id}`, body) : api.post<Site>('/sites', body)),
    meta: { formHandlesErrors: true },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: sitesQueries.all() });
      onSaved?.();
    },
  });
}

export function useRenameOrganisation(onSaved?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (name: string) => api.patch<Organisation>('/organisation', { name }),
    meta: { formHandlesErrors: true },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: sitesQueries.organisation().queryKey });
      onSaved?.();
    },
  });
}
