import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { OrganisationView, SiteInput, SiteView } from '@common/schemas/admin.schema';
import { api } from '@/lib/api-client';

export type { SiteView as Site, OrganisationView as Organisation };

export const sitesQueries = {
  all: () => ['sites'] as const,
  /** Sites change when an administrator edits them: fresh for 5 minutes. */
  list: () =>
    queryOptions({
      queryKey: [...sitesQueries.all(), 'list'] as const,
      queryFn: ({ signal }) => api.get<SiteView[]>('/sites', { signal }),
      staleTime: 5 * 60_000,
    }),
  detail: (id: number) =>
    queryOptions({
      queryKey: [...sitesQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => api.get<SiteView>(`/sites/${id}`, { signal }),
      staleTime: 5 * 60_000,
    }),
  organisation: () =>
    queryOptions({
      queryKey: [...sitesQueries.all(), 'organisation'] as const,
      queryFn: ({ signal }) => api.get<OrganisationView>('/organisation', { signal }),
      staleTime: 10 * 60_000,
    }),
};

/** `onSaved` lets the app refresh what other features derive from sites (the session's site list). */
export function useSaveSite(onSaved?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: SiteInput }) => (id ? api.put<SiteView>(`/sites/${id}`, body) : api.post<SiteView>('/sites', body)),
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
    mutationFn: (name: string) => api.patch<OrganisationView>('/organisation', { name }),
    meta: { formHandlesErrors: true },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: sitesQueries.organisation().queryKey });
      onSaved?.();
    },
  });
}
