import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { CylinderTypeInput, SupplierInput } from '@common/schemas/admin.schema';
import { api } from '@/lib/api-client';

export interface Gas {
  code: string;
  name: string;
  state: 'compressed' | 'liquefied';
  iso32Colours: string[];
  cgaColours: string[];
}

export interface CylinderType {
  id: number;
  name: string;
  gasCode: string;
  waterCapacityL: number;
  fillPressureBar: number;
  tareKg: number | null;
  maxFillingRatioKgPerL: number | null;
  residualGaugeBar?: number | null;
  residual?: { gaugeBar: number; basis: string };
  material: string;
  valveNotes: string;
  active: boolean;
  nominal: { freeGasL: number; idealFreeGasL: number | null; massKg: number; basis: string } | null;
}

export interface SupplierPrice {
  id: number;
  cylinderTypeId: number | null;
  gasCode: string | null;
  unit: 'cylinder' | 'kg';
  priceMinor: number;
}

export interface Supplier {
  id: number;
  name: string;
  orderEmail: string;
  phone: string;
  leadTimeHours: number;
  rentalMinorPerCylinderDay: number;
  minBulkDropKg: number;
  currency: string;
  active: boolean;
  prices: SupplierPrice[];
}

export const catalogueQueries = {
  all: () => ['catalogue'] as const,
  /** The gas list is fixed data of the engine: fresh for an hour. */
  gases: () => queryOptions({ queryKey: [...catalogueQueries.all(), 'gases'] as const, queryFn: ({ signal }) => api.get<Gas[]>('/gases', { signal }), staleTime: 60 * 60_000 }),
  /** Cylinder types change when an administrator edits the catalogue: fresh for 5 minutes. */
  cylinderTypes: () =>
    queryOptions({ queryKey: [...catalogueQueries.all(), 'cylinder-types'] as const, queryFn: ({ signal }) => api.get<CylinderType[]>('/cylinder-types', { signal }), staleTime: 5 * 60_000 }),
  suppliers: () => queryOptions({ queryKey: [...catalogueQueries.all(), 'suppliers'] as const, queryFn: ({ signal }) => api.get<Supplier[]>('/suppliers', { signal }), staleTime: 60_000 }),
};

export function useSaveCylinderType() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: CylinderTypeInput }) => (id ? api.put<CylinderType>(`/cylinder-types/${id}`, body) : api.post<CylinderType>('/cylinder-types', body)),
    meta: { formHandlesErrors: true },
    // suppliers' prices name cylinder types too: refresh the whole catalogue
    onSuccess: () => qc.invalidateQueries({ queryKey: catalogueQueries.all() }),
  });
}

export function useSaveSupplier() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: number; body: SupplierInput }) => (id ? api.put<Supplier>(`/suppliers/${id}`, body) : api.post<Supplier>('/suppliers', body)),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: [...catalogueQueries.all(), 'suppliers'] }),
  });
}
