import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { CylinderTypeInput, CylinderTypeView, GasView, SupplierInput, SupplierPriceView, SupplierView } from '@common/schemas/admin.schema';
import { api } from '@/lib/api-client';

export type { GasView as Gas, CylinderTypeView as CylinderType, SupplierPriceView as SupplierPrice, SupplierView as Supplier };

export const catalogueQueries = {
  all: () => ['catalogue'] as const,
  /** The gas list is fixed data of the engine: fresh for an hour. */
  gases: () =>
    queryOptions({
      queryKey: [...catalogueQueries.all(), 'gases'] as const,
      queryFn: ({ signal }) => api.get<GasView[]>('/gases', { signal }),
      staleTime: 60 * 60_000,
    }),
  /** Cylinder types change when an administrator edits the catalogue: fresh for 5 minutes. */
  cylinderTypes: () =>
    queryOptions({
      queryKey: [...catalogueQueries.all(), 'cylinder-types'] as const,
      queryFn: ({ signal }) => api.get<CylinderTypeView[]>('/cylinder-types', { signal }),
      staleTime: 5 * 60_000,
    }),
  suppliers: () =>
    queryOptions({
      queryKey: [...catalogueQueries.all(), 'suppliers'] as const,
      queryFn: ({ signal }) => api.get<SupplierView[]>('/suppliers', { signal }),
      staleTime: 60_000,
    }),
};

export function useSaveCylinderType() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: CylinderTypeInput }) =>
      id ? api.put<CylinderTypeView>(`/cylinder-types/${id}`, body) : api.post<CylinderTypeView>('/cylinder-types', body),
    meta: { formHandlesErrors: true },
    // suppliers' prices name cylinder types too: refresh the whole catalogue
    onSuccess: () => qc.invalidateQueries({ queryKey: catalogueQueries.all() }),
  });
}

export function useSaveSupplier() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: SupplierInput }) =>
      id ? api.put<SupplierView>(`/suppliers/${id}`, body) : api.post<SupplierView>('/suppliers', body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: [...catalogueQueries.all(), 'suppliers'] }),
  });
}
