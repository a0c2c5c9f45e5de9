import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { DeliveryInput, ReadingInput, SourceInput, SourceType } from '@common/schemas/supply.schema';
import { api } from '@/lib/api-client';

export type { SourceType };
export type SupplyStatus = 'ok' | 'watch' | 'reorder' | 'critical' | 'unknown';
export type ForecastBasis = 'model' | 'measured' | 'scaled';

/** A supply source as the server presents it (the fields of sourceSchema plus its ids). */
export interface Source {
  id: number;
  siteId: number;
  name: string;
  type: SourceType;
  gasCode: string;
  supplierId: number | null;
  capacityKg: number | null;
  evaporationPercentPerDay: number | null;
  vaporiserM3H: number | null;
  vaporiserDerating: number | null;
  minLevelAlarmPercent: number | null;
  reservePercent: number | null;
  calibration: { reading: number; kg: number }[] | null;
  calibrationUnit: string | null;
  cylinderTypeId: number | null;
  cylindersPerBank: number | null;
  regulatorLMin: number | null;
  changeoverGaugeBar: number | null;
  /** Bulk liquid: working pressure, bar(g); null = the 7 bar g default. */
  operatingPressureBar?: number | null;
  temperatureC: number | null;
  backsUp: number[];
  reorderMode: 'none' | 'days' | 'percent' | 'amount';
  reorderLevel: number | null;
  orderUpTo: number | null;
  leadTimeHours: number | null;
  forecastBasis: ForecastBasis;
  modelCorrectionFactor: number;
  notes: string;
  active: boolean;
}

export interface Outlook {
  id: number;
  name: string;
  type: SourceType;
  gasCode: string;
  unit: 'kg' | 'L';
  contents: number | null;
  capacity: number | null;
  daysOfStock: number | null;
  emptyAt: string | null;
  reorderAt: string | null;
  status: SupplyStatus;
  statusText: string;
  firstRisk: { code: string; message: string; at?: string } | null;
  trend: number[];
  leadTimeHours: number | null;
  note: string | null;
}

export interface Scenario {
  id: number;
  siteId: number;
  name: string;
  multiplier: number;
  extraPatients: number;
  extraFlowLMin: number;
  wardId: number | null;
  wardChange: 'open' | 'close' | null;
  fromLocal: string;
  untilLocal: string | null;
  note: string;
}

export interface WardSummary {
  id: number;
  siteId: number;
  name: string;
  department: string;
  beds: number;
  leakagePercent: number;
  active: boolean;
}

export type ReadingKind = 'level_percent' | 'kg' | 'litres_liquid' | 'calibration' | 'bank_gauges' | 'store_count';

export interface Reading {
  id: string;
  takenAt: string;
  kind: ReadingKind;
  value: number | null;
  detail: { dutyBar?: number; standbyBar?: number; spareFull?: number; full?: number; inUseGaugeBar?: number[]; empty?: number } | null;
  contents: number;
  method: 'manual' | 'telemetry' | 'delivery_note' | 'import';
  takenByUserId: number | null;
  takenByName: string | null;
  note: string;
}

export interface DemandLineView {
  label: string;
  flowLMin: number;
  hours: number[] | null;
  weekdays: number[] | null;
}

export interface SourceDetail {
  source: Source & { cylinderTypeName: string | null; supplierName: string | null };
  site: { id: number; name: string; timeZone: string; referenceCode: string; currency: string };
  outlook: Outlook;
  /** Hourly, from the hour before now to the end of the horizon; `at` is a UTC instant. */
  series: { at: string; contents: number; demandL: number }[];
  /** Percentiles of the empty time over the demand draws; null where a draw outlasts the horizon. */
  band: { draws: number; drawsOutlastingHorizon: number; p10: string | null; p50: string | null; p90: string | null } | null;
  reorderLevel: number | null;
  orders: { placedAt: string; arrivesAt: string; quantity: number | null; quantityUnit: 'kg' | 'cylinders' }[];
  manifoldEvents: { kind: 'changeover' | 'bank_replaced' | string; at: string; bank: string; cylinders?: number }[];
  deliveries: { id: number; dueAt: string; kg: number | null; cylinders: number | null; reference: string }[];
  scenarios: Scenario[];
  scenarioId: number | null;
  wardsFed: WardSummary[];
  readings: Reading[];
  method: {
    caution: string;
    /** Cautions of this forecast (e.g. the 50:50 N2O/O2 separation caution for a cold store). */
    cautions?: string[];
    /** Cylinder sources: the gauge pressure each cylinder is changed at, and where it comes from. */
    residual?: { gaugeBar: number; basis: string } | null;
    basis: { used: ForecastBasis; message: string; modelledLPerDay: number; measuredLPerDay: number | null };
    reference: string;
    startedFrom: string | null;
    leadTimeHours: number;
    freeGasLitresPerKg: number | null;
    fullCylinderFreeGasL: number | null;
    demandLines: DemandLineView[];
    text: string[];
  };
}

export interface Delivery {
  id: number;
  sourceId: number;
  dueAt: string;
  kg: number | null;
  cylinders: number | null;
  status: string;
  reference: string;
}

export const sourcesQueries = {
  all: () => ['sources'] as const,
  /**
   * A source's forecast moves by the hour and with every reading: fresh for a minute. The previous
   * scenario's answer stays on screen while another is computed, so the chart does not blink.
   */
  detail: (id: number, scenarioId: number | null) =>
    queryOptions({
      queryKey: [...sourcesQueries.all(), 'detail', id, { scenario: scenarioId }] as const,
      queryFn: ({ signal }) => api.get<SourceDetail>(`/sources/${id}`, { signal, query: { scenario: scenarioId ?? undefined } }),
      staleTime: 60_000,
      placeholderData: keepPreviousData,
    }),
  /** The sources of a site change when a facilities manager edits one: fresh for a minute. */
  site: (siteId: number) =>
    queryOptions({ queryKey: [...sourcesQueries.all(), 'site', siteId] as const, queryFn: ({ signal }) => api.get<Source[]>(`/sites/${siteId}/sources`, { signal }), staleTime: 60_000 }),
};

/** Where the forecast of a source is downloaded as CSV (hourly contents and demand). */
export function forecastCsvUrl(id: number, scenarioId: number | null): string {
  return `/api/sources/${id}/forecast.csv${scenarioId ? `?scenario=${scenarioId}` : ''}`;
}

/**
 * Every write here moves forecasts other screens show (the overview, the wards): `onSaved` lets the app
 * refresh those; this feature refreshes its own queries.
 */
function useSourcesMutation<V, R>(fn: (v: V) => Promise<R>, onSaved?: () => void, formHandlesErrors = true) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    meta: { formHandlesErrors },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: sourcesQueries.all() });
      onSaved?.();
    },
  });
}

export function useAddReading(sourceId: number, onSaved?: () => void) {
  return useSourcesMutation((body: ReadingInput) => api.post<Reading>(`/sources/${sourceId}/readings`, body), onSaved);
}

export function useScheduleDelivery(sourceId: number, onSaved?: () => void) {
  return useSourcesMutation((body: DeliveryInput) => api.post<Delivery>(`/sources/${sourceId}/deliveries`, body), onSaved);
}

export function useCancelDelivery(onSaved?: () => void) {
  return useSourcesMutation((id: number) => api.post<Delivery>(`/deliveries/${id}/cancel`), onSaved, false);
}

export function useSaveSource(siteId: number, onSaved?: () => void) {
  return useSourcesMutation(({ id, body }: { id?: number; body: SourceInput }) => (id ? api.put<Source>(`/sources/${id}`, body) : api.post<Source>(`/sites/${siteId}/sources`, body)), onSaved);
}
