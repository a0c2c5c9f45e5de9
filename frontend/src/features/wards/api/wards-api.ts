import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { GasDemand, WardDetail, WardFeedView } from '@common/schemas/forecast.schema';
import type {
  Department,
  DeviceFlowView,
  ScenarioInput,
  ScenarioView,
  SourceView,
  TherapyLineInput,
  TherapyLineView,
  WardInput,
  WardView,
} from '@common/schemas/supply.schema';
import { api } from '@/lib/api-client';

export type { Department, GasDemand, WardDetail };
export type { WardView as Ward, TherapyLineView as TherapyLine, WardFeedView as Feed, ScenarioView as Scenario, DeviceFlowView as DeviceFlow };

/** A supply source as the feeds editor needs it (the route passes the site's sources in). */
export type SourceOption = Pick<SourceView, 'id' | 'name' | 'gasCode' | 'type' | 'active'> &
  Partial<Pick<SourceView, 'forecastBasis' | 'modelCorrectionFactor'>>;

export const wardsQueries = {
  all: () => ['wards'] as const,
  /** Wards change when a facilities manager edits one: fresh for a minute. */
  site: (siteId: number) =>
    queryOptions({
      queryKey: [...wardsQueries.all(), 'site', siteId] as const,
      queryFn: ({ signal }) => api.get<WardView[]>(`/sites/${siteId}/wards`, { signal }),
      staleTime: 60_000,
    }),
  /** A ward's measured use moves with every reading of its source: fresh for a minute. */
  detail: (id: number) =>
    queryOptions({
      queryKey: [...wardsQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => api.get<WardDetail>(`/wards/${id}`, { signal }),
      staleTime: 60_000,
    }),
  scenarios: (siteId: number) =>
    queryOptions({
      queryKey: [...wardsQueries.all(), 'scenarios', siteId] as const,
      queryFn: ({ signal }) => api.get<ScenarioView[]>(`/sites/${siteId}/scenarios`, { signal }),
      staleTime: 60_000,
    }),
  /** The organisation's device flows change rarely: fresh for 10 minutes. */
  deviceFlows: () =>
    queryOptions({
      queryKey: [...wardsQueries.all(), 'device-flows'] as const,
      queryFn: ({ signal }) => api.get<DeviceFlowView[]>('/device-flows', { signal }),
      staleTime: 10 * 60_000,
    }),
};

/**
 * Every write here changes demand, and so the forecasts other screens show: `onSaved` lets the app
 * refresh those; this feature refreshes its own queries.
 */
function useWardsMutation<V, R>(fn: (v: V) => Promise<R>, onSaved?: () => void, formHandlesErrors = true) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    meta: { formHandlesErrors },
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: wardsQueries.all() });
      onSaved?.();
    },
  });
}

export function useSaveWard(siteId: number, onSaved?: () => void) {
  return useWardsMutation(
    ({ id, body }: { id?: number; body: WardInput }) => (id ? api.put<WardView>(`/wards/${id}`, body) : api.post<WardView>(`/sites/${siteId}/wards`, body)),
    onSaved,
  );
}

export function useSaveTherapy(wardId: number, onSaved?: () => void) {
  return useWardsMutation((lines: TherapyLineInput[]) => api.put<TherapyLineView[]>(`/wards/${wardId}/therapy`, { lines }), onSaved);
}

export function useSaveFeeds(wardId: number, onSaved?: () => void) {
  return useWardsMutation(
    (feeds: { sourceId: number; gasCode: string; role: WardFeedView['role'] }[]) => api.put<unknown>(`/wards/${wardId}/feeds`, { feeds }),
    onSaved,
  );
}

export function useSaveScenario(siteId: number, onSaved?: () => void) {
  return useWardsMutation(
    ({ id, body }: { id?: number; body: ScenarioInput }) =>
      id ? api.put<ScenarioView>(`/scenarios/${id}`, body) : api.post<ScenarioView>(`/sites/${siteId}/scenarios`, body),
    onSaved,
  );
}

export function useDeleteScenario(onSaved?: () => void) {
  return useWardsMutation((id: number) => api.delete<{ ok: true }>(`/scenarios/${id}`), onSaved, false);
}

export function useSaveDeviceFlows(onSaved?: () => void) {
  return useWardsMutation((flows: { device: DeviceFlowView['device']; flowLMin: number }[]) => api.put<unknown>('/device-flows', { flows }), onSaved);
}

/** Accept the measured/modelled ratio as the correction of the modelled demand of a source. */
export function useAcceptCorrection(onSaved?: () => void) {
  return useWardsMutation(
    ({ sourceId, factor }: { sourceId: number; factor: number }) => api.post<unknown>(`/sources/${sourceId}/correction`, { factor, basis: 'scaled' }),
    onSaved,
    false,
  );
}
