import { z } from 'zod';
import { CAPACITY_GAS_CODES, DEFAULT_RULE_SETS, DEPARTMENTS, diversityRuleSetSchema } from '../capacity/diversity-rules';
import { EN13348_TUBES } from '../capacity/pipe-hydraulics';
import { DEFAULT_FITTINGS_ALLOWANCE_PERCENT, NOMINAL_DISTRIBUTION_PRESSURE_KPA } from '../capacity/pipe-run';
import type { CapacityGasCode, Department, DiversityRuleSet, RuleSource } from '../capacity/diversity-rules';
import type { LimitKind } from '../capacity/surge-headroom';
import type { ReferenceCode } from '../gas/reference-conditions';

/**
 * Request schemas of the capacity module: pipeline zones, pipe runs, diversity rule sets, the
 * capacity check's what-if inputs and the engineer's sign-off. Shared by the server and the forms.
 */

const num = (what: string) => z.number({ error: `${what} must be a number` });

/** Ids of the shipped rule sets ("default" = HTM 02-01, "gb50751"). */
export const BUILTIN_RULE_SET_IDS = Object.keys(DEFAULT_RULE_SETS) as [string, ...string[]];
export const TUBE_IDS = EN13348_TUBES.map((t) => t.id) as [string, ...string[]];
export const DIVERSITY_METHODS = ['rule_set', 'binomial'] as const;

export const DEPARTMENT_LABELS: Record<(typeof DEPARTMENTS)[number], string> = {
  ward: 'Ward',
  critical_care: 'Critical care (ITU/CCU)',
  theatre: 'Theatre',
  anaesthetic_room: 'Anaesthetic room',
  recovery: 'Recovery',
  emergency_resuscitation: 'Emergency resuscitation',
  delivery_room: 'Delivery room',
  treatment_room: 'Major treatment / plaster room',
  hyperbaric: 'Hyperbaric chamber',
};

/** Capacity gases: the catalogue's gases plus VAC (medical vacuum), whose zones have no supply source. */
export const CAPACITY_GAS_LABELS: Record<(typeof CAPACITY_GAS_CODES)[number], string> = {
  O2: 'Oxygen',
  N2: 'Nitrogen (surgical tools)',
  AIR: 'Medical air',
  AR: 'Argon',
  HE: 'Helium',
  CO2: 'Carbon dioxide',
  N2O: 'Nitrous oxide',
  N2O_O2_50: 'Nitrous oxide/oxygen 50:50',
  HE_O2_79: 'Helium/oxygen 79/21',
  HE_O2_80: 'Helium/oxygen 80/20',
  VAC: 'Medical vacuum',
};

export const zoneSchema = z
  .object({
    name: z.string().trim().min(1, 'required').max(120),
    gasCode: z.enum(CAPACITY_GAS_CODES, { error: 'choose a gas (or VAC for vacuum)' }),
    department: z.enum(DEPARTMENTS, { error: `unknown department; one of ${DEPARTMENTS.join(', ')}` }),
    terminalUnits: num('terminal units')
      .int('a whole number of terminal units')
      .min(1, 'at least 1 terminal unit')
      .max(5000, 'above 5,000 terminal units in one zone? split the zone'),
    sourceId: z.number().int().positive().nullable().default(null),
    /** An organisation's own rule set; null = the shipped set named in builtinRuleSet. */
    ruleSetId: z.number().int().positive().nullable().default(null),
    builtinRuleSet: z.enum(BUILTIN_RULE_SET_IDS).default('default'),
    /** rule_set: the department rule; binomial: k of n outlets in use at a confidence (small zones). */
    diversityMethod: z.enum(DIVERSITY_METHODS).default('rule_set'),
    unitFlowLMin: num('flow per terminal unit').positive('must be above 0').max(1000).nullable().default(null),
    useProbability: num('use probability').min(0, 'between 0 and 1').max(1, 'between 0 and 1').nullable().default(null),
    confidence: num('confidence').gt(0, 'between 0 and 1').max(1, 'between 0 and 1').nullable().default(null),
    notes: z.string().trim().max(1000).default(''),
  })
  .superRefine((v, ctx) => {
    if (v.diversityMethod === 'binomial') {
      if (v.unitFlowLMin === null) ctx.addIssue({ code: 'custom', path: ['unitFlowLMin'], message: 'the binomial method needs the flow of one terminal unit' });
      if (v.useProbability === null)
        ctx.addIssue({ code: 'custom', path: ['useProbability'], message: 'the binomial method needs the chance that one unit is in use' });
      if (v.confidence === null) ctx.addIssue({ code: 'custom', path: ['confidence'], message: 'the binomial method needs a confidence, e.g. 0.99' });
    }
    if (v.gasCode === 'VAC' && v.sourceId !== null) {
      ctx.addIssue({ code: 'custom', path: ['sourceId'], message: 'vacuum zones are served by the vacuum plant, not by a gas supply source' });
    }
  });
export type ZoneInput = z.infer<typeof zoneSchema>;
export type ZoneFormValues = z.input<typeof zoneSchema>;

export const pipeRunSchema = z.object({
  name: z.string().trim().min(1, 'required').max(120),
  lengthM: num('length').positive('the pipe run needs its length (m, above 0)').max(5000, 'above 5 km? split the run'),
  tube: z.enum(TUBE_IDS, { error: `choose a tube size (EN 13348): ${TUBE_IDS.join(', ')}` }),
  /** Fittings as a percentage of the straight length; documented default 20 % (common practice). */
  fittingsAllowancePercent: num('fittings allowance')
    .min(0, 'must be ≥ 0 %')
    .max(300, 'above 300 %? give the equivalent length')
    .default(DEFAULT_FITTINGS_ALLOWANCE_PERCENT),
  /** Line pressure at the start of the run, kPa gauge; default 400 (HTM 02-01 nominal). */
  linePressureKPa: num('line pressure').positive('must be above 0 kPa gauge').max(2000).default(NOMINAL_DISTRIBUTION_PRESSURE_KPA),
  /** Allowed drop over the run, kPa; null = 5 % of the line pressure (common practice). */
  allowedDropKPa: num('allowed drop').positive('must be above 0 kPa').max(500).nullable().default(null),
  /** Gas temperature in the pipe, °C; null = 20 °C. */
  gasTemperatureC: num('gas temperature').min(-40).max(60).nullable().default(null),
  sortOrder: num('order').int().min(0).max(10_000).default(0),
});
export type PipeRunInput = z.infer<typeof pipeRunSchema>;
export type PipeRunFormValues = z.input<typeof pipeRunSchema>;

/** A rule set as sent by a client: the engine's shape; the server sets its `id`. */
const ruleSetBodySchema = z.preprocess(
  (v) => (v && typeof v === 'object' && !Array.isArray(v) && !('id' in v) ? { ...v, id: 'custom' } : v),
  diversityRuleSetSchema,
);

export const ruleSetCreateSchema = z
  .object({
    name: z.string().trim().min(1, 'required').max(120),
    /** Copy of a shipped set ("default", "gb50751") or of one of the organisation's sets (its id). */
    basedOn: z
      .union([z.enum(BUILTIN_RULE_SET_IDS), z.number().int().positive()])
      .nullable()
      .default(null),
    /** The rules; left out = an unchanged copy of basedOn. */
    rules: ruleSetBodySchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.basedOn === null && v.rules === undefined) ctx.addIssue({ code: 'custom', path: ['basedOn'], message: 'copy a rule set or give the rules' });
  });
export type RuleSetCreateInput = z.infer<typeof ruleSetCreateSchema>;

export const ruleSetUpdateSchema = z.object({
  name: z.string().trim().min(1, 'required').max(120),
  rules: ruleSetBodySchema,
});
export type RuleSetUpdateInput = z.infer<typeof ruleSetUpdateSchema>;

/** What-if inputs of the capacity check (query string). Each has a documented default. */
export const capacityQuerySchema = z.object({
  /** Flow of one extra surge patient, L/min; default 40 (high-flow nasal oxygen planning default). */
  flowPerPatientLMin: z.coerce.number().positive('must be above 0').max(200).default(40),
  /** Overrides every vaporiser's derating (e.g. 0.5 for a cold-weather check); empty = each source's own or 0.7. */
  vaporiserDerating: z.coerce.number().gt(0, 'between 0 and 1').max(1, 'between 0 and 1').optional(),
  /** Operating hours per day at peak flow, for manifold sizing; default 10 (08:00–18:00). */
  peakHoursPerDay: z.coerce.number().positive().max(24, 'at most 24 h').default(10),
});
export type CapacityQuery = z.infer<typeof capacityQuerySchema>;

export const signoffSchema = z.object({
  engineerName: z.string().trim().min(1, 'enter the name of the engineer signing off').max(190),
  /** The inputs hash the engineer reviewed; refused if the inputs changed meanwhile. */
  inputsHash: z.string().regex(/^[0-9a-f]{64}$/, 'reload the capacity check and sign again'),
  note: z.string().trim().max(1000).default(''),
  flowPerPatientLMin: capacityQuerySchema.shape.flowPerPatientLMin,
  vaporiserDerating: capacityQuerySchema.shape.vaporiserDerating,
  peakHoursPerDay: capacityQuerySchema.shape.peakHoursPerDay,
});
export type SignoffInput = z.infer<typeof signoffSchema>;

// ---------------------------------------------------------------------------------------------
// responses of the capacity check (the server computes them; the screen shows them)

export interface LimitOut {
  kind: LimitKind;
  name: string;
  /** where the limit sits: a supply source or a zone's pipe run */
  scope: 'source' | 'zone';
  ownerId: number;
  capacityLMin: number;
  flowLMin: number;
  marginLMin: number;
  utilisation: number;
  ok: boolean;
  detail: string | null;
  /** the limit nearest to being exceeded for its gas */
  limiting: boolean;
}

export interface PipeRunOut {
  id: number;
  name: string;
  tube: string;
  innerDiameterMm: number | null;
  lengthM: number;
  fittingsAllowancePercent: number;
  linePressureKPa: number;
  /** null = 20 °C */
  gasTemperatureC: number | null;
  effectiveLengthM: number | null;
  flowLMin: number;
  pressureDropKPa: number | null;
  allowedDropKPa: number | null;
  outletPressureKPa: number | null;
  utilisation: number | null;
  withinAllowance: boolean | null;
  capacityLMin: number | null;
  velocityMS: number | null;
  reynolds: number | null;
  regime: string | null;
  frictionFactor: number | null;
  lineDensityKgM3: number | null;
  lineZ: number | null;
  /** Next to the verdict: the from-memory defaults it rests on (null when not computed). */
  verdictNote?: string | null;
  assumptions: string[];
  error: string | null;
  /** the limit nearest to being exceeded for its gas */
  limiting: boolean;
}

export interface ZoneOut {
  id: number;
  name: string;
  department: Department;
  terminalUnits: number;
  sourceId: number | null;
  ruleSet: { key: string; name: string; builtin: boolean };
  diversityMethod: 'rule_set' | 'binomial';
  designFlowLMin: number | null;
  method: string | null;
  formula: string | null;
  countedAs: string | null;
  ruleSource: string | null;
  verified: boolean | null;
  warning: string | null;
  /** why no design flow could be found (no documented rule) */
  refused: string | null;
  pipeRuns: PipeRunOut[];
  headroom: {
    extraPatients: number | null;
    extraPatientsWithSource: number | null;
    limitedBy: { scope: 'zone' | 'source'; kind: LimitKind; name: string } | null;
  } | null;
}

export interface ManifoldOut {
  cylinder: string;
  cylinderFreeGasL: number;
  cylindersPerBank: number;
  bankFreeGasL: number;
  bankDurationAtDesignH: number | null;
  bankDurationAtForecastH: number | null;
  changeoverIntervalDays: number | null;
  cylindersPerWeekAtForecast: number | null;
  cylindersPerWeekAtDesign: number | null;
  recommended: { label: string; cylindersPerBank: number; dailyDemandL: number; hoursPerDay: number } | null;
  recommendedNote: string | null;
  source: string;
}

export interface ReserveOut {
  rule: 'four_hour_secondary' | 'average_day';
  basisFlowLMin: number;
  requiredFreeGasL: number;
  heldFreeGasL: number | null;
  cylindersRequired: number | null;
  cylinderName: string | null;
  covers: number | null;
  coversUnit: 'h' | 'days';
  meets: boolean | null;
  source: string;
}

export interface SourceOut {
  id: number;
  name: string;
  type: string;
  zoneIds: number[];
  designFlowLMin: number;
  designFlowNote: string;
  forecastFlowLMin: number | null;
  forecastBasis: string | null;
  limits: LimitOut[];
  missingLimit: string | null;
  manifold: ManifoldOut | null;
  reserves: { reserveSources: { id: number; name: string }[]; rules: ReserveOut[]; note: string | null };
  headroom: { extraPatients: number | null; firstLimit: { kind: LimitKind; name: string } | null; overloaded: boolean };
}

export interface GasOut {
  gasCode: CapacityGasCode;
  designFlowLMin: number;
  totalNote: string;
  /** zones left out of the total because no rule gives their flow */
  incomplete: boolean;
  zones: ZoneOut[];
  sources: SourceOut[];
  headroom: { extraPatients: number | null; limits: { sourceId: number; kind: LimitKind; name: string; extraPatients: number }[]; note: string | null };
  limiting: LimitOut | null;
  ruleSources: RuleSource[];
  warnings: string[];
}

export interface SiteCapacity {
  reference: { code: ReferenceCode; label: string; atmosphericBar: number };
  options: CapacityOptions & { vaporiserDeratingDefault: number };
  gases: GasOut[];
  method: { topic: string; text: string; source: string }[];
  caution: string;
}

export interface CapacityOptions {
  /** flow of one extra surge patient, L/min */
  flowPerPatientLMin: number;
  /** overrides every vaporiser's derating (cold-weather check) */
  vaporiserDerating?: number;
  /** operating hours per day at peak flow, for manifold sizing */
  peakHoursPerDay: number;
}

export interface PipeRunRow extends PipeRunInput {
  id: number;
  zoneId: number;
}

export interface ZoneRow {
  id: number;
  siteId: number;
  name: string;
  gasCode: CapacityGasCode;
  department: Department;
  terminalUnits: number;
  sourceId: number | null;
  ruleSetId: number | null;
  builtinRuleSet: string;
  diversityMethod: (typeof DIVERSITY_METHODS)[number];
  unitFlowLMin: number | null;
  useProbability: number | null;
  confidence: number | null;
  notes: string;
  pipeRuns: PipeRunRow[];
  updatedAt: string;
}

/** A rule set as listed: a shipped one (id null, read-only) or one of the organisation's. */
export interface RuleSetRow {
  id: number | null;
  key: string;
  name: string;
  builtin: boolean;
  basedOn: string | null;
  rules: DiversityRuleSet;
  usedByZones: number | null;
  updatedAt: string | null;
}

export interface SignoffRow {
  id: number;
  siteId: number;
  engineerName: string;
  userId: number | null;
  signedAt: string;
  inputsHash: string;
  note: string;
}

/** The capacity check of a site as the API returns it (and as a sign-off stores it). */
export interface CapacityReport extends SiteCapacity {
  site: { id: number; name: string };
  generatedAt: string;
  inputsHash: string;
  sources: { id: number; name: string; type: string; gasCode: string }[];
  zoneCount: number;
}

export interface CapacityResponse extends CapacityReport {
  latestSignoff: (SignoffRow & { current: boolean }) | null;
}
