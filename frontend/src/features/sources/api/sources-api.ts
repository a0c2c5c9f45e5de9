import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { DemandLineView, OverviewSource, SourceDetail } from '@common/schemas/forecast.schema';
import type {
  DeliveryInput,
  DeliveryView,
  ForecastBasis,
  ReadingInput,
  ReadingKind,
  ReadingView,
  ScenarioView,
  SourceInput,
  SourceType,
  SourceView,
  WardView,
} from '@common/schemas/supply.schema';
import { api } from '@/lib/api-client';

export type { DemandLineView, ForecastBasis, ReadingKind, SourceDetail, SourceType };
export type {
  SourceView as Source,
  OverviewSource as Outlook,
  ScenarioView as Scenario,
  WardView as WardSummary,
  ReadingView as Reading,
  DeliveryView as Delivery,
};

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
    queryOptions({
      queryKey: [...sourcesQueries.all(), 'site', siteId] as const,
      queryFn: ({ signal }) => api.get<SourceView[]>(`/sites/${siteId}/sources`, { signal }),
      staleTime: 60_000,
    }),
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
  return useSourcesMutation((body: ReadingInput) => api.post<ReadingView>(`/sources/${sourceId}/readings`, body), onSaved);
}

export function useScheduleDelivery(sourceId: number, onSaved?: () => void) {
  return useSourcesMutation((body: DeliveryInput) => api.post<DeliveryView>(`/sources/${sourceId}/deliveries`, body), onSaved);
}

export function useCancelDelivery(onSaved?: () => void) {
  return useSourcesMutation((id: number) => api.post<DeliveryView>(`/deliveries/${id}/cancel`), onSaved, false);
}

export function useSaveSource(siteId: number, onSaved?: () => void) {
  return useSourcesMutation(
    ({ id, body }: { id?: number; body: SourceInput }) =>
      id ? api.put<SourceView>(`/sources/${id}`, body) : api.post<SourceView>(`/sites/${siteId}/sources`, body),
    onSaved,
  );
}
