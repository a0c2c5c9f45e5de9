/**
 * Source capacity checks and surge headroom: a zone's and the site's flow against the limits that
 * carry it (manifold regulator, derated vaporiser, pipe runs), and how many more patients at a given
 * flow each fits before the first limit.
 */
import { InvalidInputError } from '../api/errors';
import type { GasCode } from '../gas/gases';
import { computePipeRunCapacityLMin, type PipeRunSpec } from './pipe-run';
import { VAPORISER_DERATING, computeVaporiserCapacityLMin } from './supply-capacity';

export type LimitKind = 'manifold_regulator' | 'vaporiser' | 'pipe_run' | 'other';

/** A limit already reduced to the free-gas flow it carries. */
export interface CapacityLimit {
  kind: LimitKind;
  name: string;
  capacityLMin: number;
  /** how the capacity was found */
  detail?: string;
}

export interface LimitAssessment extends CapacityLimit {
  marginLMin: number;
  /** current flow ÷ capacity */
  utilisation: number;
  ok: boolean;
}

/** A limit as described by a user: a rated flow, a vaporiser nameplate or a pipe run. */
export type CapacityLimitSpec =
  | { kind: 'manifold_regulator' | 'other'; name: string; capacityLMin: number }
  | { kind: 'vaporiser'; name: string; ratingM3H: number; deratingFactor?: number }
  | { kind: 'pipe_run'; name: string; pipe: Omit<PipeRunSpec, 'gas'> };

/**
 * Turns a limit spec into the flow it carries: regulator flow as rated; vaporiser nameplate × derating
 * (default 0.7, alternating pair in continuous duty); pipe run at its allowed pressure drop
 * (Darcy–Weisbach, real-gas density).
 * @param spec the limit
 * @param gas the pipeline gas (needed for pipe runs only)
 */
export function resolveCapacityLimit(spec: CapacityLimitSpec, gas?: GasCode): CapacityLimit {
  switch (spec.kind) {
    case 'manifold_regulator':
    case 'other':
      if (!(spec.capacityLMin > 0)) {
        throw new InvalidInputError(`Limit "${spec.name}": capacity must be positive`, [{ path: 'capacity_L_min', message: 'expected > 0' }]);
      }
      return { kind: spec.kind, name: spec.name, capacityLMin: spec.capacityLMin, detail: 'rated flow' };
    case 'vaporiser': {
      const factor = spec.deratingFactor ?? VAPORISER_DERATING.alternating;
      return {
        kind: 'vaporiser',
        name: spec.name,
        capacityLMin: computeVaporiserCapacityLMin(spec.ratingM3H, factor),
        detail: `${spec.ratingM3H} m³/h nameplate × ${factor} continuous-duty derating${spec.deratingFactor === undefined ? ' (default, alternating pair)' : ''}`,
      };
    }
    case 'pipe_run': {
      if (!gas) throw new InvalidInputError(`Limit "${spec.name}": a pipe run needs the pipeline gas`, [{ path: 'gas', message: 'required for pipe runs' }]);
      const { capacityLMin, atCapacity } = computePipeRunCapacityLMin({ ...spec.pipe, gas });
      return {
        kind: 'pipe_run',
        name: spec.name,
        capacityLMin,
        detail: `flow at the allowed drop of ${round(atCapacity.allowedDropKPa, 3)} kPa (Darcy–Weisbach, ${spec.pipe.correlation ?? 'colebrook_white'})`,
      };
    }
  }
}

const round = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;

/**
 * Checks a flow against each limit: margin, utilisation, and whether it fits.
 * @param currentFlowLMin flow to carry, L/min free gas
 * @param limits limits reduced to flows
 */
export function assessCapacityLimits(currentFlowLMin: number, limits: CapacityLimit[]): LimitAssessment[] {
  return limits.map((l) => ({
    ...l,
    marginLMin: l.capacityLMin - currentFlowLMin,
    utilisation: currentFlowLMin / l.capacityLMin,
    ok: currentFlowLMin <= l.capacityLMin,
  }));
}

function patientsThatFit(marginLMin: number, flowPerPatientLMin: number): number {
  // The small tolerance keeps an exact fit (e.g. 400/40) from losing a patient to rounding.
  return Math.max(0, Math.floor(marginLMin / flowPerPatientLMin + 1e-9));
}

export interface HeadroomScope {
  currentFlowLMin: number;
  limits: LimitAssessment[];
  /** the limit reached first (smallest margin); null when no limit applies */
  firstLimit: LimitAssessment | null;
  /** more patients that fit before the first limit of this scope alone */
  extraPatients: number;
  overloaded: boolean;
}

export interface ZoneHeadroom extends HeadroomScope {
  name: string;
  /** more patients that fit in this zone, also respecting the site's limits */
  extraPatientsWithSite: number;
  limitedBy: { scope: 'zone' | 'site'; kind: LimitKind; name: string } | null;
}

export interface SurgeHeadroomInput {
  /** flow of one extra patient, L/min free gas (e.g. 40 for high-flow nasal oxygen) */
  flowPerPatientLMin: number;
  site: { currentFlowLMin?: number; limits: CapacityLimit[] };
  zones?: { name: string; currentFlowLMin: number; limits: CapacityLimit[] }[];
}

export interface SurgeHeadroom {
  flowPerPatientLMin: number;
  site: HeadroomScope;
  zones: ZoneHeadroom[];
}

function assessScope(currentFlowLMin: number, limits: CapacityLimit[], flowPerPatientLMin: number): HeadroomScope {
  const assessed = assessCapacityLimits(currentFlowLMin, limits);
  const firstLimit = assessed.reduce<LimitAssessment | null>((min, l) => (min === null || l.marginLMin < min.marginLMin ? l : min), null);
  return {
    currentFlowLMin,
    limits: assessed,
    firstLimit,
    extraPatients: firstLimit ? patientsThatFit(firstLimit.marginLMin, flowPerPatientLMin) : Number.POSITIVE_INFINITY,
    overloaded: assessed.some((l) => !l.ok),
  };
}

/**
 * Surge headroom: extra patients at a fixed flow each (no diversity: surge devices such as HFNO run
 * continuously) that a zone and the site can take before the first limit; the limit reached first.
 * A zone's count also respects the site's limits, since the zone's extra flow passes through them.
 * Site flow defaults to the sum of the zones' flows.
 */
export function computeSurgeHeadroom(input: SurgeHeadroomInput): SurgeHeadroom {
  if (!(input.flowPerPatientLMin > 0)) {
    throw new InvalidInputError('The flow per patient must be positive', [{ path: 'flow_per_patient_L_min', message: 'expected > 0' }]);
  }
  if (input.site.limits.length === 0) {
    throw new InvalidInputError('Give at least one site limit (manifold regulator, vaporiser or main pipe run)', [
      { path: 'site.limits', message: 'expected at least one limit' },
    ]);
  }
  const zones = input.zones ?? [];
  const siteFlow = input.site.currentFlowLMin ?? zones.reduce((s, z) => s + z.currentFlowLMin, 0);
  if (!(siteFlow >= 0)) {
    throw new InvalidInputError('The site flow must be ≥ 0', [{ path: 'site.current_flow_L_min', message: 'expected ≥ 0' }]);
  }
  const site = assessScope(siteFlow, input.site.limits, input.flowPerPatientLMin);
  const zoneResults: ZoneHeadroom[] = zones.map((z) => {
    const own = assessScope(z.currentFlowLMin, z.limits, input.flowPerPatientLMin);
    const zoneFirst = own.firstLimit;
    const siteFirst = site.firstLimit!;
    const bySite = site.extraPatients < own.extraPatients;
    return {
      name: z.name,
      ...own,
      extraPatientsWithSite: Math.min(own.extraPatients, site.extraPatients),
      limitedBy:
        bySite || !zoneFirst ? { scope: 'site', kind: siteFirst.kind, name: siteFirst.name } : { scope: 'zone', kind: zoneFirst.kind, name: zoneFirst.name },
    };
  });
  return { flowPerPatientLMin: input.flowPerPatientLMin, site, zones: zoneResults };
}
