import type { ManifoldEvent } from '../forecast/manifold';
import type { ForecastChartSeries } from '../forecast/chart-series';
import type { SourceStatus } from '../forecast/status';
import type { FeedRole, ForecastBasis, ReadingView, ScenarioView, SourceType, SourceView, TherapyLineView, WardView } from './supply.schema';

/**
 * Responses of the forecast module: the overview of every source (Today), a source's detail with its
 * hourly forecast, and a ward's demand. The server's presenters declare them; the browser reads them.
 * (The request side, forecastQuerySchema, lives with the supply schemas.)
 */

/** One source in the overview, worst first; also the outlook of a source's detail. */
export interface OverviewSource {
  id: number;
  name: string;
  type: SourceType;
  gasCode: string;
  unit: 'kg' | 'L';
  /** Null while the source has no reading. */
  contents: number | null;
  capacity: number | null;
  daysOfStock: number | null;
  /** ISO instant, UTC. */
  emptyAt: string | null;
  reorderAt: string | null;
  status: SourceStatus;
  statusText: string;
  firstRisk: { code: string; message: string; at: string } | null;
  /** Daily contents over the next 14 days. */
  trend: number[];
  leadTimeHours: number;
  /** Why there is no forecast, when there is none. */
  note: string | null;
}

export interface OverviewSite {
  id: number;
  name: string;
  timeZone: string;
  referenceCode: string;
  /** When this site's figures were computed (ISO instant). */
  computedAt: string;
  sources: OverviewSource[];
}

export interface Overview {
  /** The oldest computation among the sites shown (ISO instant). */
  generatedAt: string;
  /** The planning caution the forecast travels with. */
  caution: string;
  sites: OverviewSite[];
}

export interface DemandLineView {
  label: string;
  flowLMin: number;
  /** Local hours of the day (0–23) the line runs, null for all day. */
  hours: readonly number[] | null;
  /** ISO weekdays (1 = Monday) the line runs, null for every day. */
  weekdays: readonly number[] | null;
}

export interface SourceDetail {
  source: SourceView & { cylinderTypeName: string | null; supplierName: string | null };
  site: { id: number; name: string; timeZone: string; referenceCode: string; currency: string };
  outlook: OverviewSource;
  /** Hourly, from the hour before now to the end of the horizon; `at` is a UTC instant. */
  /** Hourly columns from the hour before now to the end of the horizon (the CSV export has every hour's demand too). */
  series: ForecastChartSeries;
  /** Percentiles of the empty time over the demand draws; null where a draw outlasts the horizon. */
  band: { draws: number; drawsOutlastingHorizon: number; p10: string | null; p50: string | null; p90: string | null } | null;
  reorderLevel: number | null;
  orders: { placedAt: string; arrivesAt: string; quantity: number | null; quantityUnit: 'kg' | 'cylinders' }[];
  manifoldEvents: (ManifoldEvent & { at: string })[];
  deliveries: { id: number; dueAt: string; kg: number | null; cylinders: number | null; reference: string }[];
  scenarios: ScenarioView[];
  scenarioId: number | null;
  wardsFed: WardView[];
  readings: ReadingView[];
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

export interface WardFeedView {
  sourceId: number;
  gasCode: string;
  role: FeedRole;
  sourceName: string;
}

/** A ward's demand of one gas: modelled from its therapy lines, measured from its primary source. */
export interface GasDemand {
  gasCode: string;
  modelledLPerDay: number;
  measuredLPerDay: number | null;
  suggestedFactor: number | null;
  primarySource: { id: number; name: string } | null;
  lines: DemandLineView[];
}

export interface WardDetail {
  ward: WardView;
  site: { id: number; name: string; timeZone: string; referenceCode: string };
  therapy: TherapyLineView[];
  feeds: WardFeedView[];
  perGas: GasDemand[];
  scenarios: ScenarioView[];
}
