import type { CalcVerb } from '../calc/verbs';
import { parseOrThrow } from '../api/errors';
import { forecastInputSchema } from './forecast-input.schema';
import { FORECAST_CAUTION, MONTE_CARLO_MODEL_TEXT, forecastSource, type SourceForecast } from './forecast-source';
import { boundaryLabel, boundaryOffset, formatLocalAt } from './hour-index';

const round = (v: number, digits: number): number => {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
};

/**
 * The JSON shape of `calc forecast` (a stable contract). Times are local wall-clock strings in the
 * request's zone; `series[i].at` is the END of elapsed hour i (so the repeated autumn hour appears
 * twice, told apart by `offset`). Quantities: kg for bulk tanks, cylinders for cylinder sources
 * (`quantity_unit`); contents in `unit`. Orders arriving after the horizon carry quantity null, since
 * the order-up-to quantity is fixed only on arrival. Bands are present only when draws > 0; a
 * percentile that falls on draws outlasting the horizon is null.
 */
export function presentForecast(f: SourceForecast, draws: number): Record<string, unknown> {
  const { index } = f;
  const hoursToInstant = (h: number) => index.startUtcMs + h * 3_600_000;
  const series = new Array(f.series.length);
  for (let i = 0; i < f.series.length; i++) {
    series[i] = { at: boundaryLabel(index, i + 1), offset: boundaryOffset(index, i + 1), contents: round(f.series[i], 3) };
  }
  const qDigits = f.quantityUnit === 'kg' ? 3 : 0;
  const out: Record<string, unknown> = {
    hours_to_empty: f.hoursToEmpty === null ? null : round(f.hoursToEmpty, 4),
    empty_at: f.hoursToEmpty === null ? null : formatLocalAt(hoursToInstant(f.hoursToEmpty), index.timeZone),
    reorder_at: f.firstOrderHours === null ? null : boundaryLabel(index, f.firstOrderHours),
    days_of_stock_at_start: f.daysOfStockAtStart === null ? null : round(f.daysOfStockAtStart, 4),
    orders: f.orders.map((o) => ({
      placed_at: boundaryLabel(index, o.placedBoundary),
      arrives_at: formatLocalAt(hoursToInstant(o.arrivesHours), index.timeZone),
      quantity: o.quantity === null ? null : round(o.quantity, qDigits),
      quantity_unit: f.quantityUnit,
    })),
    series,
    unit: f.unit,
    quantity_unit: f.quantityUnit,
    contents_at_start: round(f.contentsStart, 3),
  };
  if (f.manifoldEvents.length > 0) {
    out.manifold_events = f.manifoldEvents.map((e) => ({
      kind: e.kind,
      at: formatLocalAt(hoursToInstant(e.atHours), index.timeZone),
      hours: round(e.atHours, 4),
      bank: e.bank,
      ...(e.cylinders !== undefined ? { cylinders: e.cylinders } : {}),
    }));
  }
  if (draws > 0 && f.bands) {
    const r = (v: number | null) => (v === null ? null : round(v, 4));
    out.bands = {
      hours_to_empty: { p10: r(f.bands.p10), p50: r(f.bands.p50), p90: r(f.bands.p90) },
      draws: f.bands.draws,
      draws_outlasting_horizon: f.bands.drawsOutlastingHorizon,
      demand_cv: f.monteCarlo?.demandCv,
      demand_persistence: f.monteCarlo?.persistence,
      model: MONTE_CARLO_MODEL_TEXT,
    };
  }
  if (f.hoursToEmptyRange) {
    const h = f.hoursToEmptyRange;
    out.hours_to_empty_range = { low: h.low === null ? null : round(h.low, 4), high: h.high === null ? null : round(h.high, 4), method: h.method };
  }
  if (f.residual) out.residual = { gauge_bar: round(f.residual.gaugeBar, 4), basis: f.residual.basis };
  out.cautions = f.cautions;
  out.caution = FORECAST_CAUTION;
  return out;
}

/** `calc forecast`: depletion forecast of one source (input: see forecastInputSchema). */
export const forecastVerb: CalcVerb = (raw) => {
  const input = parseOrThrow(forecastInputSchema, raw, 'forecast input');
  return presentForecast(forecastSource(input), input.draws);
};

/** Calc verbs of the forecast module. */
export const forecastCalcVerbs: Record<string, CalcVerb> = {
  forecast: forecastVerb,
};
