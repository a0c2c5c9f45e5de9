import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { ExportTable, ImportJobView, ImportKind, ImportKinds, ImportPreviewRow, ImportRemap, ImportStatus } from '@common/schemas/usage.schema';
import type { SourceView, WardView } from '@common/schemas/supply.schema';
import { api, apiUrl } from '@/lib/api-client';

export type { ImportJobView as ImportJob, ImportKinds, ImportPreviewRow };

/** The targets an upload can go to (the site's sources and wards, as this screen needs them). */
export type TargetSource = Pick<SourceView, 'id' | 'name' | 'type' | 'gasCode' | 'calibrationUnit'>;
export type TargetWard = Pick<WardView, 'id' | 'name'>;

/** A job that the worker is still busy with: its screen polls. */
export function isBusy(status: ImportStatus | undefined): boolean {
  return status === 'validating' || status === 'queued' || status === 'running';
}

export const importsQueries = {
  all: () => ['imports'] as const,
  /** What can be uploaded: fixed by the server's release, fresh for an hour. */
  kinds: () =>
    queryOptions({
      queryKey: [...importsQueries.all(), 'kinds'] as const,
      queryFn: ({ signal }) => api.get<ImportKinds>('/import-kinds', { signal }),
      staleTime: 3_600_000,
    }),
  /** The site's uploads: polled every 2 s while one of them is being checked or imported. */
  list: (siteId: number) =>
    queryOptions({
      queryKey: [...importsQueries.all(), 'site', siteId] as const,
      queryFn: ({ signal }) => api.get<ImportJobView[]>(`/sites/${siteId}/imports`, { signal }),
      staleTime: 5_000,
      refetchInterval: (q) => (q.state.data?.some((j) => isBusy(j.status)) ? 2_000 : false),
    }),
  /** One upload: polled every second while the worker has it, so the bar moves (and survives a reload). */
  job: (id: number) =>
    queryOptions({
      queryKey: [...importsQueries.all(), 'job', id] as const,
      queryFn: ({ signal }) => api.get<ImportJobView>(`/imports/${id}`, { signal }),
      staleTime: 1_000,
      refetchInterval: (q) => (isBusy(q.state.data?.status) ? 1_000 : false),
    }),
  /** Targets change when a facilities manager edits sources or wards: fresh for a minute. */
  sources: (siteId: number) =>
    queryOptions({
      queryKey: [...importsQueries.all(), 'sources', siteId] as const,
      queryFn: ({ signal }) => api.get<TargetSource[]>(`/sites/${siteId}/sources`, { signal }),
      staleTime: 60_000,
    }),
  wards: (siteId: number) =>
    queryOptions({
      queryKey: [...importsQueries.all(), 'wards', siteId] as const,
      queryFn: ({ signal }) => api.get<TargetWard[]>(`/sites/${siteId}/wards`, { signal }),
      staleTime: 60_000,
    }),
};

export interface UploadInput {
  file: File;
  kind: ImportKind;
  sourceId?: number;
  wardId?: number;
  unit?: string;
  dateOrder: 'ymd' | 'dmy' | 'mdy';
  confirmDuplicate?: boolean;
}

export function useUpload(siteId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (u: UploadInput) => {
      const form = new FormData();
      form.append('kind', u.kind);
      if (u.sourceId) form.append('sourceId', String(u.sourceId));
      if (u.wardId) form.append('wardId', String(u.wardId));
      if (u.unit) form.append('unit', u.unit);
      form.append('dateOrder', u.dateOrder);
      if (u.confirmDuplicate) form.append('confirmDuplicate', 'true');
      form.append('file', u.file, u.file.name);
      return api.upload<ImportJobView>(`/sites/${siteId}/imports`, form);
    },
    meta: { formHandlesErrors: true },
    onSuccess: (job) => {
      qc.setQueryData(importsQueries.job(job.id).queryKey, job);
      return qc.invalidateQueries({ queryKey: [...importsQueries.all(), 'site', siteId] });
    },
  });
}

function useJobMutation<V>(fn: (v: V) => Promise<ImportJobView>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    meta: { formHandlesErrors: true },
    onSuccess: (job) => {
      qc.setQueryData(importsQueries.job(job.id).queryKey, job);
      return qc.invalidateQueries({ queryKey: [...importsQueries.all(), 'site', job.siteId] });
    },
  });
}

export const useRemap = (id: number) => useJobMutation((body: ImportRemap) => api.put<ImportJobView>(`/imports/${id}/mapping`, body));
export const useCommit = (id: number) => useJobMutation((confirmDuplicate: boolean) => api.post<ImportJobView>(`/imports/${id}/commit`, { confirmDuplicate }));
export const useCancel = (id: number) => useJobMutation(() => api.post<ImportJobView>(`/imports/${id}/cancel`, {}));

export const templateUrl = (siteId: number, kind: ImportKind) => apiUrl(`/sites/${siteId}/import-template`, { kind });
export const exportUrl = (siteId: number, table: ExportTable) => apiUrl(`/sites/${siteId}/export`, { table });
export const errorsUrl = (id: number) => apiUrl(`/imports/${id}/errors.csv`);
