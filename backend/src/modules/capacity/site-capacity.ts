/**
 * The capacity check of one site, assembled from the capacity engine: diversified design flow per zone,
 * per source and per gas; each source's and each pipe run's limit; manifold bank duration, changeover
 * and weekly cylinders; the 4-hour and average-day reserve rules; surge headroom. Pure: it takes the
 * site's records as plain data and returns the report (the service loads and stores).
 */
import { lookup } from '@common/api/lookup';
import { InvalidInputError } from '@common/api/errors';
import { computeDesignFlow, computeZoneDesignFlow, type ZoneFlow } from '@common/capacity/design-flow';
import { UNVERIFIED_WARNING, type CapacityGasCode, type Department, type DiversityRuleSet, type RuleSource } from '@common/capacity/diversity-rules';
import { EN13348_TUBES_SOURCE, VISCOSITY_SOURCE, findCopperTube } from '@common/capacity/pipe-hydraulics';
import { DEFAULT_ALLOWED_DROP_FRACTION, DEFAULT_FITTINGS_ALLOWANCE_PERCENT, computePipeRunPressureDrop, type PipeRunSpec } from '@common/capacity/pipe-run';
import {
  AVERAGE_DAY_RULE_SOURCE,
  FOUR_HOUR_RULE_SOURCE,
  MANIFOLD_SIZING_SOURCE,
  VAPORISER_DERATING,
  VAPORISER_DERATING_SOURCE,
  applyAverageDayRule,
  applyFourHourRule,
  computeDurationH,
  sizeCylinderManifold,
} from '@common/capacity/supply-capacity';
import { assessCapacityLimits, computeSurgeHeadroom, resolveCapacityLimit, type CapacityLimit, type LimitAssessment } from '@common/capacity/surge-headroom';
import { CAPACITY_CAUTION } from '@common/capacity/calc-verbs';
import type { GasCode } from '@common/gas/gases';
import type { CapacityOptions, GasOut, LimitOut, ManifoldOut, PipeRunOut, ReserveOut, SiteCapacity, SourceOut, ZoneOut } from '@common/schemas/capacity.schema';
import { REFERENCE_CONDITIONS, type ReferenceCode } from '@common/gas/reference-conditions';

export type { CapacityOptions, SiteCapacity };

export { CAPACITY_CAUTION };

// ---------------------------------------------------------------------------------------------
// input

export interface PipeRunData {
  id: number;
  name: string;
  lengthM: number;
  tube: string;
  fittingsAllowancePercent: number;
  linePressureKPa: number;
  allowedDropKPa: number | null;
  gasTemperatureC: number | null;
}

export interface ZoneData {
  id: number;
  name: string;
  gasCode: CapacityGasCode;
  department: Department;
  terminalUnits: number;
  sourceId: number | null;
  /** The rule set the zone uses (an organisation's own or a shipped one), and how to name it. */
  ruleSet: DiversityRuleSet;
  ruleSetLabel: { key: string; name: string; builtin: boolean };
  diversityMethod: 'rule_set' | 'binomial';
  unitFlowLMin: number | null;
  useProbability: number | null;
  confidence: number | null;
  pipeRuns: PipeRunData[];
}

export interface SourceData {
  id: number;
  name: string;
  type: 'bulk_liquid' | 'manifold' | 'cylinder_store' | 'emergency_reserve' | string;
  gasCode: string;
  regulatorLMin: number | null;
  vaporiserM3H: number | null;
  vaporiserDerating: number | null;
  cylindersPerBank: number | null;
  /** The source's cylinder type with its nominal free-gas content (gas engine), if it has one. */
  cylinder: { name: string; freeGasL: number } | null;
  backsUp: number[];
  /** Mean forecast demand on the source, L/min (from the demand model or measured use); null = unknown. */
  forecastFlowLMin: number | null;
  forecastBasis: string | null;
}

export interface SiteCapacityInput {
  site: { referenceCode: ReferenceCode; atmosphericBar: number };
  zones: ZoneData[];
  sources: SourceData[];
  options: CapacityOptions;
}

// ---------------------------------------------------------------------------------------------

const round = (x: number, digits = 6) => Math.round(x * 10 ** digits) / 10 ** digits;
const orNull = (x: number | null | undefined, digits = 6) => (x === null || x === undefined || !Number.isFinite(x) ? null : round(x, digits));

/** Source of the binomial method (rule inputs are the engineer's). */
const BINOMIAL_SOURCE: RuleSource = {
  id: 'binomial-zone',
  citation:
    'Binomial model of simultaneous use: the smallest k with P(X ≤ k) ≥ confidence, X ~ Binomial(n, p) ("Using probability to determine medical gas flow", PM Engineer)',
  verified: true,
  note: "The method is documented; the use probability and confidence are the engineer's inputs for this zone.",
};

interface ZoneFlowResult {
  zone: ZoneData;
  flow: ZoneFlow | null;
  warning: string | null;
  refused: string | null;
}

/** A zone's flow alone (the per-zone figure; totals combine separately). */
function zoneFlowOf(z: ZoneData): ZoneFlowResult {
  if (z.diversityMethod === 'binomial') {
    const flow = computeZoneDesignFlow(
      {
        method: 'binomial',
        unit_L_min: z.unitFlowLMin ?? 0,
        use_probability: z.useProbability ?? 0,
        confidence: z.confidence ?? 0,
        counts: 'terminal_unit',
        source: BINOMIAL_SOURCE.id,
        verified: true,
      },
      z.terminalUnits,
    );
    return { zone: z, flow, warning: null, refused: null };
  }
  const gasRules = lookup(z.ruleSet.gases, z.gasCode);
  const rule = gasRules ? lookup(gasRules.departments, z.department) : undefined;
  if (!gasRules || !rule) {
    const why = !gasRules
      ? (z.ruleSet.missing?.[z.gasCode] ?? `Rule set "${z.ruleSetLabel.name}" has no diversity rules for ${z.gasCode}.`)
      : `Rule set "${z.ruleSetLabel.name}" has no ${z.gasCode} rule for ${z.department}.`;
    return { zone: z, flow: null, warning: null, refused: `${why} Copy the rule set and add a documented rule, or use the binomial method for this zone.` };
  }
  const flow = computeZoneDesignFlow(rule, z.terminalUnits);
  return { zone: z, flow, warning: rule.verified ? null : UNVERIFIED_WARNING, refused: null };
}

interface Combined {
  totalLMin: number;
  note: string;
  sources: RuleSource[];
  warnings: string[];
  incomplete: boolean;
}

/**
 * Design flow of several zones of one gas: zones sharing a rule set combine by that set (its
 * multi-zone rule, if any); the totals of different sets and of binomial zones add. Zones without a
 * rule are left out and the result is marked incomplete.
 */
function combineZones(gas: CapacityGasCode, results: ZoneFlowResult[]): Combined {
  const groups = new Map<string, ZoneFlowResult[]>();
  let binomialSum = 0;
  let binomialCount = 0;
  const sources = new Map<string, RuleSource>();
  const warnings = new Set<string>();
  let incomplete = false;
  for (const r of results) {
    if (r.refused || !r.flow) {
      incomplete = true;
      continue;
    }
    if (r.zone.diversityMethod === 'binomial') {
      binomialSum += r.flow.designFlowLMin;
      binomialCount++;
      sources.set(BINOMIAL_SOURCE.id, BINOMIAL_SOURCE);
      continue;
    }
    const key = r.zone.ruleSetLabel.key;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  let total = binomialSum;
  const notes: string[] = [];
  for (const group of groups.values()) {
    const set = group[0].zone.ruleSet;
    const res = computeDesignFlow(
      gas,
      group.map((g) => ({ name: g.zone.name, department: g.zone.department, terminalUnits: g.zone.terminalUnits })),
      set,
    );
    total += res.totalLMin;
    notes.push(
      groups.size > 1 || binomialCount > 0 ? `${group[0].zone.ruleSetLabel.name}: ${res.totalNote} = ${round(res.totalLMin, 3)} L/min` : res.totalNote,
    );
    for (const s of res.sources) sources.set(s.id, s);
    for (const w of res.warnings) warnings.add(w);
  }
  if (binomialCount > 0) notes.push(`${binomialCount} binomial zone${binomialCount > 1 ? 's' : ''} added in full (${round(binomialSum, 3)} L/min)`);
  if (groups.size + (binomialCount > 0 ? 1 : 0) > 1) notes.push('the parts add');
  if (incomplete) notes.push('zones without a documented rule are left out: the total is incomplete');
  return { totalLMin: total, note: notes.join('; ') || 'no zone with a design flow', sources: [...sources.values()], warnings: [...warnings], incomplete };
}

function pipeSpecOf(run: PipeRunData, site: SiteCapacityInput['site']): Omit<PipeRunSpec, 'gas'> {
  const tube = findCopperTube(run.tube);
  if (!tube) throw new InvalidInputError(`Unknown tube "${run.tube}"`, [{ path: 'tube', message: 'unknown EN 13348 size' }]);
  const ref = REFERENCE_CONDITIONS[site.referenceCode];
  return {
    innerDiameterMm: tube.innerDiameterMm,
    innerDiameterFromTubeTable: true,
    lengthM: run.lengthM,
    fittingsAllowancePercent: run.fittingsAllowancePercent,
    linePressureKPaGauge: run.linePressureKPa,
    allowedDropKPa: run.allowedDropKPa ?? undefined,
    gasTemperatureK: run.gasTemperatureC === null ? undefined : run.gasTemperatureC + 273.15,
    atmosphericPressureBarAbs: site.atmosphericBar,
    referenceTemperatureK: ref.temperatureK,
    referencePressureBarAbs: ref.pressureBarAbs,
  };
}

interface PipeCheck {
  out: PipeRunOut;
  limit: CapacityLimit | null;
}

function checkPipeRun(run: PipeRunData, gas: CapacityGasCode, flowLMin: number, site: SiteCapacityInput['site']): PipeCheck {
  const tube = findCopperTube(run.tube);
  const base: PipeRunOut = {
    id: run.id,
    name: run.name,
    tube: run.tube,
    innerDiameterMm: tube ? tube.innerDiameterMm : null,
    lengthM: run.lengthM,
    fittingsAllowancePercent: run.fittingsAllowancePercent,
    linePressureKPa: run.linePressureKPa,
    gasTemperatureC: run.gasTemperatureC,
    effectiveLengthM: null,
    flowLMin: round(flowLMin),
    pressureDropKPa: null,
    allowedDropKPa: null,
    outletPressureKPa: null,
    utilisation: null,
    withinAllowance: null,
    capacityLMin: null,
    velocityMS: null,
    reynolds: null,
    regime: null,
    frictionFactor: null,
    lineDensityKgM3: null,
    lineZ: null,
    assumptions: [],
    verdictNote: null,
    error: null,
    limiting: false,
  };
  if (gas === 'VAC')
    return { out: { ...base, error: 'Vacuum pipework runs below atmospheric pressure; this positive-pressure check does not apply.' }, limit: null };
  try {
    const spec = pipeSpecOf(run, site);
    const drop = computePipeRunPressureDrop({ ...spec, gas: gas as GasCode }, flowLMin);
    const limit = resolveCapacityLimit({ kind: 'pipe_run', name: run.name, pipe: spec }, gas as GasCode);
    return {
      out: {
        ...base,
        effectiveLengthM: round(drop.effectiveLengthM),
        pressureDropKPa: round(drop.pressureDropKPa),
        allowedDropKPa: round(drop.allowedDropKPa),
        outletPressureKPa: round(drop.outletPressureKPaGauge),
        utilisation: round(drop.utilisation),
        withinAllowance: drop.withinAllowance,
        capacityLMin: round(limit.capacityLMin),
        velocityMS: round(drop.velocityMS),
        reynolds: round(drop.reynolds, 0),
        regime: drop.regime,
        frictionFactor: round(drop.frictionFactor, 8),
        lineDensityKgM3: round(drop.lineDensityKgM3),
        lineZ: round(drop.lineZ, 8),
        assumptions: drop.assumptions,
        verdictNote: drop.verdictNote,
      },
      limit,
    };
  } catch (e) {
    if (e instanceof InvalidInputError) return { out: { ...base, error: e.message }, limit: null };
    throw e;
  }
}

function sourceLimits(s: SourceData, options: CapacityOptions): { limits: CapacityLimit[]; missing: string | null } {
  const limits: CapacityLimit[] = [];
  if (s.type === 'bulk_liquid') {
    if (s.vaporiserM3H) {
      const factor = options.vaporiserDerating ?? s.vaporiserDerating ?? VAPORISER_DERATING.alternating;
      const provenance =
        options.vaporiserDerating !== undefined
          ? 'what-if derating for this check'
          : s.vaporiserDerating !== null
            ? "the source's derating"
            : 'default derating: alternating pair in continuous duty; lower it for frost';
      const l = resolveCapacityLimit({ kind: 'vaporiser', name: `${s.name}: vaporiser`, ratingM3H: s.vaporiserM3H, deratingFactor: factor });
      limits.push({ ...l, detail: `${s.vaporiserM3H} m³/h nameplate × ${factor} (${provenance})` });
    }
  }
  if (s.regulatorLMin) {
    limits.push(
      resolveCapacityLimit({
        kind: 'manifold_regulator',
        name: `${s.name}: ${s.type === 'manifold' ? 'manifold regulator' : 'regulator'}`,
        capacityLMin: s.regulatorLMin,
      }),
    );
  }
  let missing: string | null = null;
  if (limits.length === 0) {
    missing =
      s.type === 'bulk_liquid'
        ? 'No vaporiser rating or regulator flow is recorded for this source: its capacity cannot be checked.'
        : 'No regulator flow is recorded for this source: its capacity cannot be checked.';
  }
  return { limits, missing };
}

function manifoldOf(s: SourceData, designFlowLMin: number, options: CapacityOptions): ManifoldOut | null {
  if (s.type !== 'manifold' || !s.cylinder || !s.cylindersPerBank) return null;
  const bank = s.cylinder.freeGasL * s.cylindersPerBank;
  const forecastPerDayL = s.forecastFlowLMin !== null && s.forecastFlowLMin > 0 ? s.forecastFlowLMin * 1440 : null;
  let recommended: ManifoldOut['recommended'] = null;
  let recommendedNote: string | null = null;
  if (designFlowLMin > 0) {
    try {
      const m = sizeCylinderManifold({ flowLMin: designFlowLMin, hoursPerDay: options.peakHoursPerDay, cylinderFreeGasL: s.cylinder.freeGasL });
      recommended = { label: m.label, cylindersPerBank: m.cylindersPerBank, dailyDemandL: round(m.dailyDemandL), hoursPerDay: options.peakHoursPerDay };
    } catch (e) {
      if (!(e instanceof InvalidInputError)) throw e;
      recommendedNote = e.message;
    }
  }
  return {
    cylinder: s.cylinder.name,
    cylinderFreeGasL: round(s.cylinder.freeGasL),
    cylindersPerBank: s.cylindersPerBank,
    bankFreeGasL: round(bank),
    bankDurationAtDesignH: designFlowLMin > 0 ? round(computeDurationH(bank, designFlowLMin)) : null,
    bankDurationAtForecastH: forecastPerDayL ? round(computeDurationH(bank, s.forecastFlowLMin!)) : null,
    changeoverIntervalDays: forecastPerDayL ? round(bank / forecastPerDayL) : null,
    cylindersPerWeekAtForecast: forecastPerDayL ? round((forecastPerDayL * 7) / s.cylinder.freeGasL) : null,
    cylindersPerWeekAtDesign: designFlowLMin > 0 ? round((designFlowLMin * 1440 * 7) / s.cylinder.freeGasL) : null,
    recommended,
    recommendedNote,
    source: MANIFOLD_SIZING_SOURCE,
  };
}

function reservesOf(s: SourceData, all: SourceData[], designFlowLMin: number): SourceOut['reserves'] {
  const ofGas = all.filter((r) => r.type === 'emergency_reserve' && r.gasCode === s.gasCode && r.id !== s.id);
  const explicit = ofGas.filter((r) => r.backsUp.includes(s.id));
  // A reserve that names no source backs up every source of its gas.
  const reserves = explicit.length > 0 ? explicit : ofGas.filter((r) => r.backsUp.length === 0);
  const heldParts = reserves.map((r) => (r.cylinder && r.cylindersPerBank ? r.cylinder.freeGasL * r.cylindersPerBank : null));
  const held = reserves.length > 0 && heldParts.every((x) => x !== null) ? heldParts.reduce((a, b) => a! + b!, 0)! : null;
  const cyl = reserves.find((r) => r.cylinder)?.cylinder ?? s.cylinder;
  const opts = { ...(cyl ? { cylinderFreeGasL: cyl.freeGasL } : {}), ...(held !== null ? { heldFreeGasL: held } : {}) };
  const rules: ReserveOut[] = [];
  const notes: string[] = [];
  if (reserves.length === 0) notes.push('No emergency reserve is recorded for this source.');
  else if (held === null) notes.push('Enter the cylinder type and number of cylinders of each reserve to check what it holds.');
  if (designFlowLMin > 0) {
    const r = applyFourHourRule(designFlowLMin, opts);
    rules.push({
      rule: r.rule,
      basisFlowLMin: round(designFlowLMin),
      requiredFreeGasL: round(r.requiredFreeGasL),
      heldFreeGasL: orNull(r.heldFreeGasL),
      cylindersRequired: r.cylindersRequired ?? null,
      cylinderName: cyl?.name ?? null,
      covers: orNull(r.covers),
      coversUnit: 'h',
      meets: r.meets ?? null,
      source: FOUR_HOUR_RULE_SOURCE,
    });
  }
  if (s.forecastFlowLMin !== null && s.forecastFlowLMin > 0) {
    const r = applyAverageDayRule(s.forecastFlowLMin * 1440, opts);
    rules.push({
      rule: r.rule,
      basisFlowLMin: round(s.forecastFlowLMin),
      requiredFreeGasL: round(r.requiredFreeGasL),
      heldFreeGasL: orNull(r.heldFreeGasL),
      cylindersRequired: r.cylindersRequired ?? null,
      cylinderName: cyl?.name ?? null,
      covers: orNull(r.covers),
      coversUnit: 'days',
      meets: r.meets ?? null,
      source: AVERAGE_DAY_RULE_SOURCE,
    });
  } else notes.push('The average-day rule needs the forecast demand of this source (wards and therapy lines in Supply).');
  return { reserveSources: reserves.map((r) => ({ id: r.id, name: r.name })), rules, note: notes.join(' ') || null };
}

function limitOut(a: LimitAssessment, scope: 'source' | 'zone', ownerId: number, flowLMin: number): LimitOut {
  return {
    kind: a.kind,
    name: a.name,
    scope,
    ownerId,
    capacityLMin: round(a.capacityLMin),
    flowLMin: round(flowLMin),
    marginLMin: round(a.marginLMin),
    utilisation: round(a.utilisation),
    ok: a.ok,
    detail: a.detail ?? null,
    limiting: false,
  };
}

function patientsThatFit(marginLMin: number, flowPerPatientLMin: number): number {
  // Same rule as the engine's headroom: an exact fit counts.
  return Math.max(0, Math.floor(marginLMin / flowPerPatientLMin + 1e-9));
}

function assessGas(gas: CapacityGasCode, zones: ZoneData[], input: SiteCapacityInput): GasOut {
  const { options, site } = input;
  const flows = zones.map(zoneFlowOf);
  const flowOf = new Map(flows.map((f) => [f.zone.id, f]));
  const siteTotal = combineZones(gas, flows);

  // Pipe runs of each zone at the zone's design flow.
  const pipeChecks = new Map<number, PipeCheck[]>();
  for (const f of flows) {
    const q = f.flow?.designFlowLMin ?? 0;
    pipeChecks.set(
      f.zone.id,
      f.zone.pipeRuns.map((run) => checkPipeRun(run, gas, q, site)),
    );
  }
  const zoneLimits = (zoneId: number) => (pipeChecks.get(zoneId) ?? []).flatMap((c) => (c.limit ? [c.limit] : []));

  const allLimits: LimitOut[] = [];
  const zoneHeadroom = new Map<number, ZoneOut['headroom']>();
  const sourceOuts: SourceOut[] = [];
  const siteHeadroomParts: GasOut['headroom']['limits'] = [];
  const headroomNotes: string[] = [];

  const sourceIds = [...new Set(zones.map((z) => z.sourceId).filter((x): x is number => x !== null))];
  for (const sid of sourceIds) {
    const s = input.sources.find((x) => x.id === sid);
    const fed = flows.filter((f) => f.zone.sourceId === sid);
    if (!s) continue;
    const combined = combineZones(gas, fed);
    const { limits, missing } = sourceLimits(s, options);
    const sourceAssessed = assessCapacityLimits(combined.totalLMin, limits).map((a) => limitOut(a, 'source', s.id, combined.totalLMin));
    allLimits.push(...sourceAssessed);
    let headroom: SourceOut['headroom'] = { extraPatients: null, firstLimit: null, overloaded: sourceAssessed.some((l) => !l.ok) };
    const withFlow = fed.filter((f) => f.flow);
    if (limits.length > 0) {
      const h = computeSurgeHeadroom({
        flowPerPatientLMin: options.flowPerPatientLMin,
        site: { currentFlowLMin: combined.totalLMin, limits },
        zones: withFlow.map((f) => ({ name: String(f.zone.id), currentFlowLMin: f.flow!.designFlowLMin, limits: zoneLimits(f.zone.id) })),
      });
      headroom = {
        extraPatients: h.site.extraPatients,
        firstLimit: h.site.firstLimit ? { kind: h.site.firstLimit.kind, name: h.site.firstLimit.name } : null,
        overloaded: h.site.overloaded,
      };
      if (h.site.firstLimit)
        siteHeadroomParts.push({ sourceId: s.id, kind: h.site.firstLimit.kind, name: h.site.firstLimit.name, extraPatients: h.site.extraPatients });
      for (const z of h.zones) {
        zoneHeadroom.set(Number(z.name), {
          extraPatients: Number.isFinite(z.extraPatients) ? z.extraPatients : null,
          extraPatientsWithSource: Number.isFinite(z.extraPatientsWithSite) ? z.extraPatientsWithSite : null,
          limitedBy: z.limitedBy ? { scope: z.limitedBy.scope === 'site' ? 'source' : 'zone', kind: z.limitedBy.kind, name: z.limitedBy.name } : null,
        });
      }
    } else {
      headroomNotes.push(`${s.name}: ${missing}`);
    }
    sourceOuts.push({
      id: s.id,
      name: s.name,
      type: s.type,
      zoneIds: fed.map((f) => f.zone.id),
      designFlowLMin: round(combined.totalLMin),
      designFlowNote: combined.note,
      forecastFlowLMin: orNull(s.forecastFlowLMin),
      forecastBasis: s.forecastBasis,
      limits: sourceAssessed,
      missingLimit: missing,
      manifold: manifoldOf(s, combined.totalLMin, options),
      reserves: reservesOf(s, input.sources, combined.totalLMin),
      headroom,
    });
  }

  // Zones with no source (or a source without limits): their own pipe runs only.
  for (const f of flows) {
    if (!f.flow || zoneHeadroom.has(f.zone.id)) continue;
    const own = assessCapacityLimits(f.flow.designFlowLMin, zoneLimits(f.zone.id));
    const first = own.reduce<LimitAssessment | null>((m, l) => (m === null || l.marginLMin < m.marginLMin ? l : m), null);
    zoneHeadroom.set(f.zone.id, {
      extraPatients: first ? patientsThatFit(first.marginLMin, options.flowPerPatientLMin) : null,
      extraPatientsWithSource: null,
      limitedBy: first ? { scope: 'zone', kind: first.kind, name: first.name } : null,
    });
  }
  const unsourced = zones.filter((z) => z.sourceId === null);
  if (unsourced.length > 0 && gas !== 'VAC')
    headroomNotes.push(
      `${unsourced.length} zone${unsourced.length > 1 ? 's have' : ' has'} no supply source: the site figure leaves ${unsourced.length > 1 ? 'them' : 'it'} out.`,
    );
  if (gas === 'VAC') headroomNotes.push("Vacuum plant capacity is not modelled here: compare the design flow with the plant's rating.");

  // Zone pipe-run limits at the zone's flow.
  const zoneOuts: ZoneOut[] = zones.map((z) => {
    const f = flowOf.get(z.id)!;
    const checks = pipeChecks.get(z.id) ?? [];
    const q = f.flow?.designFlowLMin ?? 0;
    if (f.flow) {
      const assessed = assessCapacityLimits(
        q,
        checks.flatMap((c) => (c.limit ? [c.limit] : [])),
      );
      allLimits.push(...assessed.map((a) => limitOut(a, 'zone', z.id, q)));
    }
    return {
      id: z.id,
      name: z.name,
      department: z.department,
      terminalUnits: z.terminalUnits,
      sourceId: z.sourceId,
      ruleSet: z.ruleSetLabel,
      diversityMethod: z.diversityMethod,
      designFlowLMin: f.flow ? round(f.flow.designFlowLMin) : null,
      method: f.flow?.method ?? null,
      formula: f.flow?.formula ?? null,
      countedAs: f.flow?.countedAs ?? null,
      ruleSource: f.flow
        ? z.diversityMethod === 'binomial'
          ? BINOMIAL_SOURCE.citation
          : (z.ruleSet.sources.find((s) => s.id === f.flow!.source)?.citation ?? f.flow.source)
        : null,
      verified: f.flow?.verified ?? null,
      warning: f.warning,
      refused: f.refused,
      pipeRuns: checks.map((c) => c.out),
      headroom: zoneHeadroom.get(z.id) ?? null,
    };
  });

  // The limiting element: the highest utilisation at design flow among this gas's limits.
  let limiting: LimitOut | null = null;
  for (const l of allLimits) if (!limiting || l.utilisation > limiting.utilisation) limiting = l;
  if (limiting) limiting.limiting = true;
  for (const so of sourceOuts)
    for (const l of so.limits) if (limiting && l.scope === limiting.scope && l.ownerId === limiting.ownerId && l.name === limiting.name) l.limiting = true;
  for (const zo of zoneOuts) {
    for (const p of zo.pipeRuns) {
      if (limiting && limiting.scope === 'zone' && limiting.ownerId === zo.id && limiting.name === p.name) p.limiting = true;
    }
  }

  return {
    gasCode: gas,
    designFlowLMin: round(siteTotal.totalLMin),
    totalNote: siteTotal.note,
    incomplete: siteTotal.incomplete,
    zones: zoneOuts,
    sources: sourceOuts,
    headroom: {
      extraPatients: siteHeadroomParts.length > 0 ? siteHeadroomParts.reduce((s, p) => s + p.extraPatients, 0) : null,
      limits: siteHeadroomParts,
      note: headroomNotes.join(' ') || null,
    },
    limiting,
    ruleSources: siteTotal.sources,
    warnings: siteTotal.warnings,
  };
}

const GAS_ORDER: CapacityGasCode[] = ['O2', 'AIR', 'N2O', 'N2O_O2_50', 'CO2', 'N2', 'HE', 'HE_O2_79', 'HE_O2_80', 'AR', 'VAC'];

/**
 * The capacity check of a site: for each gas, the diversified design flow of every zone (rule set or
 * binomial method) and of the site; each supply source's design flow against its regulator and
 * derated vaporiser; each pipe run's pressure drop at its zone's design flow (Darcy–Weisbach,
 * real-gas density) and the flow at its allowed drop; manifold bank duration at design and forecast
 * flow, changeover interval and cylinders per week; the 4-hour (HTM 02-01) and average-day (NFPA 99)
 * reserve rules; and the extra patients at `flowPerPatientLMin` each that fit before the first limit.
 * Flows are L/min of free gas at the site's reference conditions.
 */
export function assessSiteCapacity(input: SiteCapacityInput): SiteCapacity {
  const gases = GAS_ORDER.filter((g) => input.zones.some((z) => z.gasCode === g)).map((g) =>
    assessGas(
      g,
      input.zones.filter((z) => z.gasCode === g),
      input,
    ),
  );
  const ref = REFERENCE_CONDITIONS[input.site.referenceCode];
  return {
    reference: { code: input.site.referenceCode, label: ref.label, atmosphericBar: input.site.atmosphericBar },
    options: { ...input.options, vaporiserDeratingDefault: VAPORISER_DERATING.alternating },
    gases,
    method: [
      {
        topic: 'Design flow',
        text: "Each zone: the department rule of its rule set, Q = first + (n − 1) × further × diversity (or the rule's own form), or the binomial method for small zones. Zones sharing a rule set combine by that set's several-zone rule where it has one; otherwise flows add.",
        source: 'Rule sets as data, each rule with its source; unverified rules say so.',
      },
      {
        topic: 'Supply sources',
        text: "The design flow of the zones a source feeds, against the manifold regulator's rated flow and the bulk vaporiser's nameplate × continuous-duty derating.",
        source: VAPORISER_DERATING_SOURCE,
      },
      {
        topic: 'Pipework',
        text: `Each pipe run at its zone's full design flow (errs high for branches): Darcy–Weisbach with the Colebrook–White friction factor; gas density from the real-gas equation of state at the run's mean pressure; fittings as ${DEFAULT_FITTINGS_ALLOWANCE_PERCENT} % of length unless entered; allowed drop ${DEFAULT_ALLOWED_DROP_FRACTION * 100} % of line pressure unless entered (common practice, from memory).`,
        source: `${EN13348_TUBES_SOURCE}; ${VISCOSITY_SOURCE}`,
      },
      {
        topic: 'Manifold',
        text: 'Bank = cylinders per bank × nominal free gas of one cylinder (gas engine, 15 °C fill); duration = bank ÷ flow; changeover interval = bank ÷ forecast daily use; cylinders per week = weekly use ÷ one cylinder.',
        source: MANIFOLD_SIZING_SOURCE,
      },
      { topic: 'Reserve: 4-hour rule', text: 'Secondary/emergency reserve ≥ 4 h at design flow.', source: FOUR_HOUR_RULE_SOURCE },
      { topic: 'Reserve: average day', text: "Emergency reserve ≥ one average day's use (forecast mean demand × 24 h).", source: AVERAGE_DAY_RULE_SOURCE },
      {
        topic: 'Surge headroom',
        text: `Extra patients at ${input.options.flowPerPatientLMin} L/min each, at full flow (no diversity), = floor(margin ÷ flow per patient) at the first limit of the zone (its pipe runs) and of its source.`,
        source: 'Capacity engine, surge headroom',
      },
    ],
    caution: CAPACITY_CAUTION,
  };
}
