/**
 * Calc verbs of the capacity module (`npm run --silent calc -- VERB`, JSON in, JSON out):
 * design-flow, diversity-rules, pressure-drop, headroom, manifold-sizing, reserve-check, simultaneous-use.
 * Input is validated with zod; bad input throws InvalidInputError (exit 2 on the command line).
 */
import { z } from 'zod';
import { InvalidInputError, parseOrThrow } from '../api/errors';
import type { CalcVerb } from '../calc/verbs';
import type { GasCode } from '../gas/gases';
import { computeDesignFlow, getRuleSet } from './design-flow';
import { DEFAULT_RULE_SETS, capacityGasCodeSchema, departmentSchema, diversityRuleSetSchema, type CapacityGasCode } from './diversity-rules';
import { EN13348_TUBES, findCopperTube } from './pipe-hydraulics';
import { computePipeRunPressureDrop, type PipeRunSpec } from './pipe-run';
import { computeAs2896Factor, computeSimultaneousOutlets } from './simultaneous-use';
import { applyAverageDayRule, applyFourHourRule, sizeCylinderManifold } from './supply-capacity';
import { computeSurgeHeadroom, resolveCapacityLimit, type CapacityLimitSpec, type HeadroomScope, type LimitAssessment } from './surge-headroom';

/** Shown with every capacity result a person might act on. */
export const CAPACITY_CAUTION =
  "Planning estimate only: it does not replace the site's Authorised Person (MGPS), the authority having jurisdiction, local codes and standards, or the supplier's figures.";

/** Rounds away binary noise (390.59999999999997 → 390.6) without hiding meaningful digits. */
const r = (x: number, digits = 6) => (Number.isFinite(x) ? Math.round(x * 10 ** digits) / 10 ** digits : x);
const finiteOrNull = (x: number) => (Number.isFinite(x) ? r(x) : null);

/**
 * Physically meaningful ranges of the capacity inputs (beyond them the arithmetic overflows or
 * underflows into null or absurd figures). Each field takes the bound of its kind; common practice:
 * the largest hospital sites draw a few tens of thousands of L/min, tanks hold at most ~100 t.
 */
const BOUNDS: Record<string, { min?: number; max: number; positiveMin?: number }> = {
  flow: { max: 1e6, positiveMin: 0.01 }, // L/min (1,000 m³/min); a positive flow is at least 0.01 L/min
  volume: { max: 1e10, positiveMin: 0.01 }, // L of free gas (10 million m³)
  rating_m3_h: { max: 1e5, positiveMin: 1e-3 },
  length_m: { min: 0.01, max: 10_000 },
  inner_diameter_mm: { min: 1, max: 1000 },
  fittings_allowance_percent: { max: 1000 },
  fittings_equivalent_length_m: { max: 10_000 },
  line_pressure_kPa_gauge: { max: 5000 },
  atmospheric_pressure_bar_abs: { min: 0.5, max: 1.1 },
  temperature_K: { min: 200, max: 400 },
  reference_pressure_bar_abs: { min: 0.5, max: 1.1 },
  allowed_drop_kPa: { min: 0.001, max: 5000 },
  roughness_mm: { max: 10 },
  viscosity_Pa_s: { min: 1e-7, max: 1e-3 },
  days: { max: 3660, positiveMin: 1e-3 },
  flow_per_patient_L_min: { max: 1000, positiveMin: 0.01 },
};
function bounded(schema: z.ZodNumber, what: string, kind: keyof typeof BOUNDS | undefined, positive = false): z.ZodNumber {
  const b = kind === undefined ? { max: 1e9, positiveMin: 1e-6 } : BOUNDS[kind];
  let out = schema.max(b.max, `${what} must be at most ${b.max}`);
  const min = b.min ?? (positive ? b.positiveMin : undefined);
  if (min !== undefined) out = out.min(min, `${what} must be at least ${min}`);
  return out;
}
const positiveNumber = (what: string, kind?: keyof typeof BOUNDS) =>
  bounded(z.number({ error: `${what} is required (a number)` }).positive(`${what} must be greater than zero`), what, kind, true);
const nonNegativeNumber = (what: string, kind?: keyof typeof BOUNDS) =>
  bounded(z.number({ error: `${what} must be a number` }).nonnegative(`${what} must not be negative`), what, kind);

// ---------------------------------------------------------------------------------------------
// design-flow

const designFlowInputSchema = z
  .object({
    gas: capacityGasCodeSchema,
    rule_set: z.string().min(1).optional(),
    rules: diversityRuleSetSchema.optional(),
    zones: z
      .array(
        z.object({
          name: z.string().min(1, 'give the zone a name'),
          department: departmentSchema,
          terminal_units: z
            .number({ error: 'terminal_units is required (a whole number ≥ 1)' })
            .int('terminal_units must be a whole number')
            .positive('terminal_units must be at least 1')
            .max(100_000, 'terminal_units must be at most 100,000'),
        }),
      )
      .min(1, 'give at least one zone'),
  })
  .superRefine((v, ctx) => {
    if (!v.rule_set && !v.rules) ctx.addIssue({ code: 'custom', path: ['rule_set'], message: 'name a rule set (e.g. "default") or pass your own in "rules"' });
    if (v.rule_set && v.rules && v.rule_set !== v.rules.id) {
      ctx.addIssue({ code: 'custom', path: ['rule_set'], message: `rule_set "${v.rule_set}" does not match rules.id "${v.rules.id}"` });
    }
  });

function designFlowVerb(input: unknown): unknown {
  const v = parseOrThrow(designFlowInputSchema, input, 'design-flow input');
  const ruleSet = v.rules ?? getRuleSet(v.rule_set!);
  const result = computeDesignFlow(
    v.gas,
    v.zones.map((z) => ({ name: z.name, department: z.department, terminalUnits: z.terminal_units })),
    ruleSet,
  );
  return {
    gas: result.gas,
    rule_set: result.ruleSetId,
    zones: result.zones.map((z) => ({
      name: z.name,
      design_flow_L_min: r(z.designFlowLMin),
      department: z.department,
      terminal_units: z.count,
      counted_as: z.countedAs,
      method: z.method,
      formula: z.formula,
      source: z.source,
      verified: z.verified,
      ...(z.warning ? { warning: z.warning } : {}),
    })),
    total_L_min: r(result.totalLMin),
    total_method: result.totalMethod,
    total_note: result.totalNote,
    sources: result.sources,
    warnings: result.warnings,
    caution: CAPACITY_CAUTION,
  };
}

const ruleSetsInputSchema = z.object({ rule_set: z.string().min(1).optional() });

/** The shipped rule sets (or one of them), as the starting point for an organisation's own copy. */
function diversityRulesVerb(input: unknown): unknown {
  const v = parseOrThrow(ruleSetsInputSchema, input ?? {}, 'diversity-rules input');
  const sets = v.rule_set ? [getRuleSet(v.rule_set)] : Object.values(DEFAULT_RULE_SETS);
  return { rule_sets: sets, caution: CAPACITY_CAUTION };
}

// ---------------------------------------------------------------------------------------------
// pipe runs (pressure-drop, and pipe limits of headroom)

const pipeFields = {
  tube: z.string().optional(),
  inner_diameter_mm: positiveNumber('inner_diameter_mm', 'inner_diameter_mm').optional(),
  length_m: positiveNumber('length_m (the pipe length)', 'length_m'),
  fittings_allowance_percent: nonNegativeNumber('fittings_allowance_percent', 'fittings_allowance_percent').optional(),
  fittings_equivalent_length_m: nonNegativeNumber('fittings_equivalent_length_m', 'fittings_equivalent_length_m').optional(),
  line_pressure_kPa_gauge: positiveNumber('line_pressure_kPa_gauge', 'line_pressure_kPa_gauge').optional(),
  atmospheric_pressure_bar_abs: positiveNumber('atmospheric_pressure_bar_abs', 'atmospheric_pressure_bar_abs').optional(),
  gas_temperature_K: positiveNumber('gas_temperature_K', 'temperature_K').optional(),
  reference_temperature_K: positiveNumber('reference_temperature_K', 'temperature_K').optional(),
  reference_pressure_bar_abs: positiveNumber('reference_pressure_bar_abs', 'reference_pressure_bar_abs').optional(),
  allowed_drop_kPa: positiveNumber('allowed_drop_kPa', 'allowed_drop_kPa').optional(),
  roughness_mm: nonNegativeNumber('roughness_mm', 'roughness_mm').optional(),
  correlation: z.enum(['colebrook_white', 'swamee_jain']).optional(),
  viscosity_Pa_s: positiveNumber('viscosity_Pa_s', 'viscosity_Pa_s').optional(),
};
type PipeFields = z.infer<z.ZodObject<typeof pipeFields>>;

function toPipeSpec(p: PipeFields, pathPrefix: string): Omit<PipeRunSpec, 'gas'> {
  let innerDiameterMm = p.inner_diameter_mm;
  if (p.tube !== undefined) {
    const tube = findCopperTube(p.tube);
    if (!tube) {
      throw new InvalidInputError(`Unknown tube "${p.tube}"`, [
        { path: `${pathPrefix}tube`, message: `known EN 13348 sizes: ${EN13348_TUBES.map((t) => t.id).join(', ')}; or give inner_diameter_mm` },
      ]);
    }
    if (innerDiameterMm !== undefined && Math.abs(innerDiameterMm - tube.innerDiameterMm) > 1e-9) {
      throw new InvalidInputError('Give either tube or inner_diameter_mm, not both', [
        { path: `${pathPrefix}inner_diameter_mm`, message: 'conflicts with tube' },
      ]);
    }
    innerDiameterMm = tube.innerDiameterMm;
  }
  if (innerDiameterMm === undefined) {
    throw new InvalidInputError('Give the tube size ("22x0.9") or inner_diameter_mm', [
      { path: `${pathPrefix}tube`, message: 'tube or inner_diameter_mm is required' },
    ]);
  }
  return {
    innerDiameterMm,
    innerDiameterFromTubeTable: p.tube !== undefined,
    lengthM: p.length_m,
    fittingsAllowancePercent: p.fittings_allowance_percent,
    fittingsEquivalentLengthM: p.fittings_equivalent_length_m,
    linePressureKPaGauge: p.line_pressure_kPa_gauge,
    atmosphericPressureBarAbs: p.atmospheric_pressure_bar_abs,
    gasTemperatureK: p.gas_temperature_K,
    referenceTemperatureK: p.reference_temperature_K,
    referencePressureBarAbs: p.reference_pressure_bar_abs,
    allowedDropKPa: p.allowed_drop_kPa,
    roughnessMm: p.roughness_mm,
    correlation: p.correlation,
    viscosityPaS: p.viscosity_Pa_s,
  };
}

function pipelineGas(gas: CapacityGasCode, path: string): GasCode {
  if (gas === 'VAC') {
    throw new InvalidInputError('Vacuum pipework runs below atmospheric pressure and is not sized by this positive-pressure method', [
      { path, message: 'pipe runs need a positive-pressure gas' },
    ]);
  }
  return gas;
}

const pressureDropInputSchema = z.object({ gas: capacityGasCodeSchema, flow_L_min: nonNegativeNumber('flow_L_min', 'flow'), ...pipeFields });

function pressureDropVerb(input: unknown): unknown {
  const v = parseOrThrow(pressureDropInputSchema, input, 'pressure-drop input');
  const gas = pipelineGas(v.gas, 'gas');
  const res = computePipeRunPressureDrop({ ...toPipeSpec(v, ''), gas }, v.flow_L_min);
  return {
    gas,
    flow_L_min: r(res.flowFreeLMin),
    actual_flow_L_min: r(res.actualFlowLMin),
    inner_diameter_mm: r(toPipeSpec(v, '').innerDiameterMm),
    effective_length_m: r(res.effectiveLengthM),
    velocity_m_s: r(res.velocityMS),
    reynolds: r(res.reynolds, 1),
    regime: res.regime,
    friction_factor: r(res.frictionFactor, 8),
    correlation: v.correlation ?? 'colebrook_white',
    line_density_kg_m3: r(res.lineDensityKgM3),
    line_Z: r(res.lineZ, 8),
    reference_density_kg_m3: r(res.referenceDensityKgM3),
    viscosity_Pa_s: res.viscosityPaS,
    inlet_pressure_bar_abs: r(res.inletPressureBarAbs),
    mean_pressure_bar_abs: r(res.meanPressureBarAbs),
    pressure_drop_kPa: r(res.pressureDropKPa),
    allowed_drop_kPa: r(res.allowedDropKPa),
    outlet_pressure_kPa_gauge: r(res.outletPressureKPaGauge),
    within_allowance: res.withinAllowance,
    verdict_note: res.verdictNote,
    utilisation: r(res.utilisation),
    method: 'Darcy–Weisbach; friction factor Colebrook–White (iterative) or Swamee–Jain 1976; real-gas density from the gas engine at the mean line pressure',
    assumptions: res.assumptions,
    caution: CAPACITY_CAUTION,
  };
}

// ---------------------------------------------------------------------------------------------
// headroom

const limitSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.enum(['manifold_regulator', 'other']), name: z.string().min(1), capacity_L_min: positiveNumber('capacity_L_min', 'flow') }),
  z.object({
    kind: z.literal('vaporiser'),
    name: z.string().min(1),
    rating_m3_h: positiveNumber('rating_m3_h', 'rating_m3_h'),
    derating_factor: z.number().gt(0, 'derating_factor must be greater than zero').max(1, 'derating_factor must be at most 1').optional(),
  }),
  z.object({ kind: z.literal('pipe_run'), name: z.string().min(1), ...pipeFields }),
]);
type LimitInput = z.infer<typeof limitSchema>;

const headroomInputSchema = z.object({
  gas: capacityGasCodeSchema,
  flow_per_patient_L_min: positiveNumber('flow_per_patient_L_min', 'flow_per_patient_L_min'),
  site: z.object({
    current_flow_L_min: nonNegativeNumber('site.current_flow_L_min', 'flow').optional(),
    limits: z.array(limitSchema).min(1, 'give at least one site limit (regulator, vaporiser or main pipe run)'),
  }),
  zones: z
    .array(z.object({ name: z.string().min(1), current_flow_L_min: nonNegativeNumber('current_flow_L_min', 'flow'), limits: z.array(limitSchema).default([]) }))
    .default([]),
});

function resolveLimit(l: LimitInput, gas: CapacityGasCode, path: string) {
  let spec: CapacityLimitSpec;
  if (l.kind === 'pipe_run') spec = { kind: 'pipe_run', name: l.name, pipe: toPipeSpec(l, `${path}.`) };
  else if (l.kind === 'vaporiser') spec = { kind: 'vaporiser', name: l.name, ratingM3H: l.rating_m3_h, deratingFactor: l.derating_factor };
  else spec = { kind: l.kind, name: l.name, capacityLMin: l.capacity_L_min };
  // Vacuum has no positive-pressure pipe runs; only rated limits apply to it.
  return resolveCapacityLimit(spec, spec.kind === 'pipe_run' ? pipelineGas(gas, `${path}.kind`) : undefined);
}

const limitOut = (l: LimitAssessment) => ({
  kind: l.kind,
  name: l.name,
  capacity_L_min: r(l.capacityLMin),
  margin_L_min: r(l.marginLMin),
  utilisation: r(l.utilisation),
  ok: l.ok,
  ...(l.detail ? { detail: l.detail } : {}),
});

const scopeOut = (s: HeadroomScope) => ({
  current_flow_L_min: r(s.currentFlowLMin),
  extra_patients: finiteOrNull(s.extraPatients),
  first_limit: s.firstLimit ? { kind: s.firstLimit.kind, name: s.firstLimit.name, capacity_L_min: r(s.firstLimit.capacityLMin) } : null,
  overloaded: s.overloaded,
  limits: s.limits.map(limitOut),
});

function headroomVerb(input: unknown): unknown {
  const v = parseOrThrow(headroomInputSchema, input, 'headroom input');
  const result = computeSurgeHeadroom({
    flowPerPatientLMin: v.flow_per_patient_L_min,
    site: { currentFlowLMin: v.site.current_flow_L_min, limits: v.site.limits.map((l, i) => resolveLimit(l, v.gas, `site.limits.${i}`)) },
    zones: v.zones.map((z, zi) => ({
      name: z.name,
      currentFlowLMin: z.current_flow_L_min,
      limits: z.limits.map((l, i) => resolveLimit(l, v.gas, `zones.${zi}.limits.${i}`)),
    })),
  });
  return {
    gas: v.gas,
    flow_per_patient_L_min: result.flowPerPatientLMin,
    site: scopeOut(result.site),
    zones: result.zones.map((z) => ({
      name: z.name,
      ...scopeOut(z),
      extra_patients_with_site: finiteOrNull(z.extraPatientsWithSite),
      limited_by: z.limitedBy,
    })),
    method: 'extra patients = floor((capacity − current flow) ÷ flow per patient) at the first limit; surge patients counted at full flow (no diversity)',
    caution: CAPACITY_CAUTION,
  };
}

// ---------------------------------------------------------------------------------------------
// manifold-sizing, reserve-check

const manifoldInputSchema = z.object({
  flow_L_min: positiveNumber('flow_L_min', 'flow'),
  hours_per_day: positiveNumber('hours_per_day').max(24, 'hours_per_day must be at most 24'),
  cylinder_free_gas_L: positiveNumber('cylinder_free_gas_L', 'volume'),
  days_on_manifold: positiveNumber('days_on_manifold', 'days').optional(),
  days_per_week: positiveNumber('days_per_week').max(7, 'days_per_week must be at most 7').optional(),
  bank_sizes: z.array(z.number().int().positive().max(1000, 'a bank of more than 1,000 cylinders?')).min(1).optional(),
  /** design flow for the 4-hour secondary supply, if different from flow_L_min */
  design_flow_L_min: positiveNumber('design_flow_L_min', 'flow').optional(),
});

function manifoldSizingVerb(input: unknown): unknown {
  const v = parseOrThrow(manifoldInputSchema, input, 'manifold-sizing input');
  const m = sizeCylinderManifold({
    flowLMin: v.flow_L_min,
    hoursPerDay: v.hours_per_day,
    cylinderFreeGasL: v.cylinder_free_gas_L,
    daysOnManifold: v.days_on_manifold,
    daysPerWeek: v.days_per_week,
    bankSizes: v.bank_sizes,
  });
  const secondary = applyFourHourRule(v.design_flow_L_min ?? v.flow_L_min, { cylinderFreeGasL: v.cylinder_free_gas_L });
  return {
    daily_demand_L: r(m.dailyDemandL),
    cylinders_per_day: r(m.cylindersPerDay),
    cylinders_needed: m.cylindersNeeded,
    cylinders_per_bank: m.cylindersPerBank,
    manifold: m.label,
    bank_free_gas_L: r(m.bankFreeGasL),
    bank_duration_at_flow_h: r(m.bankDurationAtFlowH),
    changeover_interval_days: r(m.changeoverIntervalDays),
    cylinders_per_week: r(m.cylindersPerWeek),
    source: m.source,
    secondary_supply: {
      rule: secondary.rule,
      required_free_gas_L: r(secondary.requiredFreeGasL),
      cylinders: secondary.cylindersRequired,
      source: secondary.source,
    },
    assumptions: v.bank_sizes ? [] : ['bank sizes offered: common sizes from memory; use the sizes your supplier offers'],
    caution: CAPACITY_CAUTION,
  };
}

const reserveInputSchema = z
  .object({
    design_flow_L_min: positiveNumber('design_flow_L_min', 'flow').optional(),
    average_daily_consumption_L: positiveNumber('average_daily_consumption_L', 'volume').optional(),
    reserve_free_gas_L: nonNegativeNumber('reserve_free_gas_L', 'volume').optional(),
    cylinder_free_gas_L: positiveNumber('cylinder_free_gas_L', 'volume').optional(),
  })
  .refine((v) => v.design_flow_L_min !== undefined || v.average_daily_consumption_L !== undefined, {
    path: ['design_flow_L_min'],
    message: 'give design_flow_L_min (4-hour rule) and/or average_daily_consumption_L (average-day rule)',
  });

function reserveCheckVerb(input: unknown): unknown {
  const v = parseOrThrow(reserveInputSchema, input, 'reserve-check input');
  const opts = { cylinderFreeGasL: v.cylinder_free_gas_L, heldFreeGasL: v.reserve_free_gas_L };
  const rules = [];
  if (v.design_flow_L_min !== undefined) rules.push(applyFourHourRule(v.design_flow_L_min, opts));
  if (v.average_daily_consumption_L !== undefined) rules.push(applyAverageDayRule(v.average_daily_consumption_L, opts));
  return {
    rules: rules.map((x) => ({
      rule: x.rule,
      required_free_gas_L: r(x.requiredFreeGasL),
      ...(x.cylindersRequired !== undefined ? { cylinders: x.cylindersRequired } : {}),
      ...(x.covers !== undefined ? { [x.rule === 'average_day' ? 'covers_days' : 'covers_hours']: r(x.covers), meets: x.meets } : {}),
      source: x.source,
    })),
    caution: CAPACITY_CAUTION,
  };
}

// ---------------------------------------------------------------------------------------------
// simultaneous-use

const simultaneousInputSchema = z.object({
  outlets: z
    .number({ error: 'outlets is required' })
    .int('outlets must be a whole number')
    .positive('outlets must be at least 1')
    .max(100_000, 'outlets must be at most 100,000'),
  use_probability: z.number({ error: 'use_probability is required' }).min(0, 'use_probability must be ≥ 0').max(1, 'use_probability must be ≤ 1'),
  confidence: z.number({ error: 'confidence is required' }).gt(0, 'confidence must be > 0').max(1, 'confidence must be ≤ 1'),
  flow_per_outlet_L_min: positiveNumber('flow_per_outlet_L_min', 'flow_per_patient_L_min'),
});

function simultaneousUseVerb(input: unknown): unknown {
  const v = parseOrThrow(simultaneousInputSchema, input, 'simultaneous-use input');
  const b = computeSimultaneousOutlets(v.outlets, v.use_probability, v.confidence);
  const f = computeAs2896Factor(v.outlets);
  return {
    outlets: v.outlets,
    undiversified_L_min: r(v.outlets * v.flow_per_outlet_L_min),
    binomial: {
      outlets_in_use: b.outletsInUse,
      cumulative_probability: r(b.cumulativeProbability, 9),
      design_flow_L_min: r(b.outletsInUse * v.flow_per_outlet_L_min),
      method: 'smallest k with P(X ≤ k) ≥ confidence, X ~ Binomial(outlets, use_probability)',
    },
    as2896: {
      factor: r(f, 9),
      design_flow_L_min: r(v.outlets * v.flow_per_outlet_L_min * f),
      method: 'F = min(1, 1.3 / log10(10 n)) (AS 2896 style, as quoted)',
    },
    caution: CAPACITY_CAUTION,
  };
}

/** Calc verbs of the capacity module. Names and the design-flow shape are a public contract. */
export const capacityCalcVerbs: Record<string, CalcVerb> = {
  'design-flow': designFlowVerb,
  'diversity-rules': diversityRulesVerb,
  'pressure-drop': pressureDropVerb,
  headroom: headroomVerb,
  'manifold-sizing': manifoldSizingVerb,
  'reserve-check': reserveCheckVerb,
  'simultaneous-use': simultaneousUseVerb,
};
