/**
 * Diversity rule sets: the data that turns terminal-unit counts into a diversified design flow.
 *
 * Rule sets are plain JSON-able data so that an organisation can copy a default set, edit it and
 * store its own. Every rule names its source (an id into the set's `sources`) and says whether
 * the figure was seen in that source (`verified: true`) or recalled (`verified: false`). A screen
 * showing an unverified rule must say "from memory, not verified".
 *
 * Where no source documents a rule for a gas or department, the default sets leave it out on
 * purpose: the design-flow calculation then refuses and asks for an explicit rule rather than
 * inventing one.
 */
import { lookup } from '../api/lookup';
import { z } from 'zod';
import { InvalidInputError } from '../api/errors';

/** Gas codes of the capacity engine: the gas engine's codes plus VAC for medical vacuum. */
export const CAPACITY_GAS_CODES = ['O2', 'N2', 'AIR', 'AR', 'HE', 'CO2', 'N2O', 'N2O_O2_50', 'HE_O2_79', 'HE_O2_80', 'VAC'] as const;
export type CapacityGasCode = (typeof CAPACITY_GAS_CODES)[number];
export const capacityGasCodeSchema = z.enum(CAPACITY_GAS_CODES);

/** Department types a pipeline zone can serve. */
export const DEPARTMENTS = [
  'ward',
  'critical_care',
  'theatre',
  'anaesthetic_room',
  'recovery',
  'emergency_resuscitation',
  'delivery_room',
  'treatment_room',
  'hyperbaric',
] as const;
export type Department = (typeof DEPARTMENTS)[number];
export const departmentSchema = z.enum(DEPARTMENTS);

/**
 * What the zone's count means for a rule. The design-flow input always calls the count
 * `terminal_units`; a rule that counts beds, rooms, trolley spaces or occupants reads it as that.
 */
export const COUNT_BASES = ['terminal_unit', 'bed', 'room', 'trolley_space', 'occupant'] as const;
export type CountBasis = (typeof COUNT_BASES)[number];

const ruleMeta = {
  source: z.string().min(1, 'name the source id of this rule'),
  verified: z.boolean(),
  note: z.string().optional(),
  counts: z.enum(COUNT_BASES).default('terminal_unit'),
};

/** Q = first + (n − 1) · further · diversity (HTM 02-01 and GB 50751 style). */
export const firstPlusFurtherRuleSchema = z.object({
  method: z.literal('first_plus_further'),
  first_unit_L_min: z.number().nonnegative(),
  further_unit_L_min: z.number().nonnegative(),
  diversity: z.number().min(0).max(1),
  ...ruleMeta,
});

/** Q = n · flow · use factor (US practice: outlets × flow × use factor). */
export const useFactorRuleSchema = z.object({
  method: z.literal('use_factor'),
  unit_L_min: z.number().positive(),
  use_factor: z.number().gt(0).max(1),
  ...ruleMeta,
});

/** Q = n · flow · F(n) with the AS 2896-style factor F = 1.3 / log10(10n), capped at 1. */
export const as2896RuleSchema = z.object({
  method: z.literal('as2896_factor'),
  unit_L_min: z.number().positive(),
  ...ruleMeta,
});

/** Q = k · flow, k the smallest count with P(X ≤ k) ≥ confidence, X ~ Binomial(n, p). */
export const binomialRuleSchema = z.object({
  method: z.literal('binomial'),
  unit_L_min: z.number().positive(),
  use_probability: z.number().min(0).max(1),
  confidence: z.number().gt(0).max(1),
  ...ruleMeta,
});

export const departmentRuleSchema = z.discriminatedUnion('method', [firstPlusFurtherRuleSchema, useFactorRuleSchema, as2896RuleSchema, binomialRuleSchema]);
export type DepartmentRule = z.infer<typeof departmentRuleSchema>;

/**
 * How the zones of the listed departments combine: the largest zone counts in full and the others
 * at `fraction_of_others`. With nw equal wards of flow Qw this is Qw·[1 + (nw − 1)·fraction], the
 * multi-ward form of the oxygen table; for unequal wards the largest ward stands in for Qw.
 * Zones of other departments add in full.
 */
export const multiZoneRuleSchema = z.object({
  method: z.literal('largest_plus_fraction_of_others'),
  departments: z.array(departmentSchema).min(1),
  fraction_of_others: z.number().min(0).max(1),
  source: z.string().min(1),
  verified: z.boolean(),
  note: z.string().optional(),
});
export type MultiZoneRule = z.infer<typeof multiZoneRuleSchema>;

export const gasRulesSchema = z.object({
  departments: z.partialRecord(departmentSchema, departmentRuleSchema),
  multi_zone: multiZoneRuleSchema.optional(),
  note: z.string().optional(),
});
export type GasRules = z.infer<typeof gasRulesSchema>;

export const ruleSourceSchema = z.object({
  id: z.string().min(1),
  citation: z.string().min(1),
  /** true only when the figures were checked against the standard's own table (a quotation elsewhere is not enough) */
  verified: z.boolean(),
  note: z.string().optional(),
  /** What a screen shows beside a rule of this source when it is unverified (default UNVERIFIED_WARNING). */
  unverified_warning: z.string().max(200).optional(),
});
export type RuleSource = z.infer<typeof ruleSourceSchema>;

export const diversityRuleSetSchema = z
  .object({
    id: z.string().min(1),
    name: z.string().min(1),
    description: z.string().optional(),
    sources: z.array(ruleSourceSchema),
    gases: z.partialRecord(capacityGasCodeSchema, gasRulesSchema),
    /** Per gas: why there is no rule (shown when a user asks for that gas). */
    missing: z.partialRecord(capacityGasCodeSchema, z.string()).optional(),
  })
  .superRefine((set, ctx) => {
    const ids = new Set(set.sources.map((s) => s.id));
    for (const [gas, rules] of Object.entries(set.gases)) {
      if (!rules) continue;
      for (const [dept, rule] of Object.entries(rules.departments)) {
        if (rule && !ids.has(rule.source)) {
          ctx.addIssue({
            code: 'custom',
            path: ['gases', gas, 'departments', dept, 'source'],
            message: `source "${rule.source}" is not listed in sources`,
          });
        }
      }
      if (rules.multi_zone && !ids.has(rules.multi_zone.source)) {
        ctx.addIssue({
          code: 'custom',
          path: ['gases', gas, 'multi_zone', 'source'],
          message: `source "${rules.multi_zone.source}" is not listed in sources`,
        });
      }
    }
  });
export type DiversityRuleSet = z.infer<typeof diversityRuleSetSchema>;
/** The input form of a rule set (defaults such as `counts` may be left out). */
export type DiversityRuleSetInput = z.input<typeof diversityRuleSetSchema>;

/**
 * The text a screen must show beside a rule with `verified: false` ("verified" means checked against the
 * standard's own table), unless its source gives its own `unverified_warning`.
 */
export const UNVERIFIED_WARNING = 'from memory, not verified';
/** Shown beside rules quoted from a secondary source (a supplier's page), not the standard itself. */
export const QUOTED_WARNING = 'quoted from a supplier page, not verified against the standard';

const FROM_MEMORY_NOTE = `Recalled, not checked against the published table: the screen must show "${UNVERIFIED_WARNING}". Editable default only.`;

const SOURCES_HTM: RuleSource[] = [
  {
    id: 'htm-02-01-a-t21',
    citation: 'HTM 02-01 (2006) Medical gas pipeline systems, Part A, Table 21 "Vacuum – design and diversified flows"',
    verified: true,
  },
  {
    id: 'htm-02-01-a-4.31',
    citation: 'HTM 02-01 (2006) Part A §§4.31–4.32, nitrous oxide/oxygen mixture',
    verified: true,
    note: 'Each terminal unit passes 275 L/min for about 5 s ("gasps") and 20 L/min continuously.',
  },
  {
    id: 'htm-02-01-o2-memory',
    citation: 'HTM 02-01 (2006) Part A oxygen design and diversified flows, as recalled',
    verified: false,
    note: FROM_MEMORY_NOTE,
  },
];

/**
 * Default rule set: HTM 02-01 Part A. Vacuum and 50:50 N2O/O2 were seen in the published text;
 * oxygen is from memory. Medical air, nitrogen, helium mixtures and the rest have no documented
 * rule here and are refused.
 */
export const DEFAULT_RULE_SET: DiversityRuleSetInput = {
  id: 'default',
  name: 'HTM 02-01 (vacuum, 50:50 N2O/O2 verified; oxygen from memory)',
  description:
    'Design and diversified flows per HTM 02-01 Part A. Planning estimate only: defer to the Authorised Person (MGPS), local codes and the supplier.',
  sources: SOURCES_HTM,
  gases: {
    VAC: {
      note: 'Every vacuum terminal unit is rated 40 L/min (Table 21).',
      departments: {
        ward: {
          method: 'first_plus_further',
          first_unit_L_min: 40,
          further_unit_L_min: 40,
          diversity: 0.25,
          counts: 'terminal_unit',
          source: 'htm-02-01-a-t21',
          verified: true,
          note:
            'Table 21: single ward unit Q = 40; multiple ward units Q = 40 + (n − 1)·40/4. Here n counts the terminal units of the zone. ' +
            'The table may mean n = number of ward units (whole wards); that reading gives 40 L/min per ward and a smaller total, so the per-unit reading used here errs high.',
        },
        emergency_resuscitation: {
          method: 'first_plus_further',
          first_unit_L_min: 40,
          further_unit_L_min: 40,
          diversity: 0.25,
          counts: 'trolley_space',
          source: 'htm-02-01-a-t21',
          verified: true,
          note: 'Table 21: A&E resuscitation room, per trolley space: Q = 40 + (n − 1)·40/4.',
        },
        treatment_room: {
          method: 'first_plus_further',
          first_unit_L_min: 40,
          further_unit_L_min: 40,
          diversity: 0,
          counts: 'trolley_space',
          source: 'htm-02-01-a-t21',
          verified: true,
          note: 'Table 21: major treatment/plaster room, 40 L/min per trolley space, diversified Q = 40 for the room. One zone per room.',
        },
      },
    },
    N2O_O2_50: {
      note: 'Each terminal unit must pass 275 L/min for about 5 s and 20 L/min continuously (§4.31); that is a terminal-unit rating, not a diversity rule.',
      departments: {
        delivery_room: {
          method: 'first_plus_further',
          first_unit_L_min: 275,
          further_unit_L_min: 6,
          diversity: 1,
          counts: 'bed',
          source: 'htm-02-01-a-4.31',
          verified: true,
          note:
            '§4.32: 275 L/min for the first bed space and 6 L/min for each of the others. The text adds that about half the women use gas half the time; ' +
            'the exact formula behind that was not retrieved, so no further reduction is applied (errs high).',
        },
        anaesthetic_room: {
          method: 'first_plus_further',
          first_unit_L_min: 0,
          further_unit_L_min: 0,
          diversity: 0,
          counts: 'room',
          source: 'htm-02-01-a-4.31',
          verified: true,
          note: 'No additional flow: a patient is rarely induced in the anaesthetic room while the associated theatre is still anaesthetising; induction is short.',
        },
      },
    },
    O2: {
      note: FROM_MEMORY_NOTE,
      departments: {
        ward: {
          method: 'first_plus_further',
          first_unit_L_min: 10,
          further_unit_L_min: 6,
          diversity: 0.25,
          counts: 'terminal_unit',
          source: 'htm-02-01-o2-memory',
          verified: false,
          note: `Qw = 10 + (n − 1)·6/4. ${FROM_MEMORY_NOTE}`,
        },
        critical_care: {
          method: 'first_plus_further',
          first_unit_L_min: 10,
          further_unit_L_min: 6,
          diversity: 0.75,
          counts: 'bed',
          source: 'htm-02-01-o2-memory',
          verified: false,
          note: `ITU/CCU: 10 + (n − 1)·6·3/4. ${FROM_MEMORY_NOTE}`,
        },
        theatre: {
          method: 'first_plus_further',
          first_unit_L_min: 100,
          further_unit_L_min: 10,
          diversity: 1,
          counts: 'room',
          source: 'htm-02-01-o2-memory',
          verified: false,
          note: `100 L/min for the first theatre, about 10 for each further one. ${FROM_MEMORY_NOTE}`,
        },
        emergency_resuscitation: {
          method: 'first_plus_further',
          first_unit_L_min: 100,
          further_unit_L_min: 100,
          diversity: 1,
          counts: 'trolley_space',
          source: 'htm-02-01-o2-memory',
          verified: false,
          note: `A&E resuscitation: 100 L/min per trolley, no diversity. ${FROM_MEMORY_NOTE}`,
        },
        recovery: {
          method: 'first_plus_further',
          first_unit_L_min: 10,
          further_unit_L_min: 6,
          diversity: 0.25,
          counts: 'bed',
          source: 'htm-02-01-o2-memory',
          verified: false,
          note: `10 L/min with 6/4 diversity for further beds. ${FROM_MEMORY_NOTE}`,
        },
      },
      multi_zone: {
        method: 'largest_plus_fraction_of_others',
        departments: ['ward'],
        fraction_of_others: 0.5,
        source: 'htm-02-01-o2-memory',
        verified: false,
        note: `Several wards: Qw·[1 + (nw − 1)/2]; for unequal wards the largest ward is taken as Qw. ${FROM_MEMORY_NOTE}`,
      },
    },
  },
  missing: {
    AIR: 'No diversity rule for medical air is documented in the sources of this rule set: supply an explicit rule.',
    N2: 'No diversity rule for nitrogen (surgical tool drive) is documented in the sources of this rule set: supply an explicit rule.',
    N2O: 'No diversity rule for nitrous oxide is documented in the sources of this rule set: supply an explicit rule.',
    CO2: 'No diversity rule for carbon dioxide is documented in the sources of this rule set: supply an explicit rule.',
    HE: 'No diversity rule for helium is documented in the sources of this rule set: supply an explicit rule.',
    AR: 'No diversity rule for argon is documented in the sources of this rule set: supply an explicit rule.',
    HE_O2_79: 'No diversity rule for helium/oxygen is documented in the sources of this rule set: supply an explicit rule.',
    HE_O2_80: 'No diversity rule for helium/oxygen is documented in the sources of this rule set: supply an explicit rule.',
  },
};

/** Rule set "gb50751": GB 50751-2012 oxygen formulas as quoted. */
export const GB50751_RULE_SET: DiversityRuleSetInput = {
  id: 'gb50751',
  name: 'GB 50751-2012 (oxygen, as quoted; not verified)',
  description:
    'Oxygen design flows per GB 50751-2012 (Code for design of medical gas engineering), as quoted. Planning estimate only: defer to local codes and the supplier.',
  sources: [
    {
      id: 'gb-50751-2012',
      citation: 'GB 50751-2012 Code for design of medical gas engineering, oxygen flow formulas (as quoted on a supplier page)',
      verified: false,
      note: 'Quoted on a supplier page, not checked against the standard’s own table: check the official edition before relying on it.',
      unverified_warning: QUOTED_WARNING,
    },
  ],
  gases: {
    O2: {
      departments: {
        ward: {
          method: 'first_plus_further',
          first_unit_L_min: 10,
          further_unit_L_min: 6,
          diversity: 0.15,
          counts: 'bed',
          source: 'gb-50751-2012',
          verified: false,
          note: 'Wards: 10 + 6·(beds − 1)·15 %.',
        },
        critical_care: {
          method: 'first_plus_further',
          first_unit_L_min: 10,
          further_unit_L_min: 6,
          diversity: 1,
          counts: 'bed',
          source: 'gb-50751-2012',
          verified: false,
          note: 'ICU: 10 + 6·(beds − 1)·100 %.',
        },
        theatre: {
          method: 'first_plus_further',
          first_unit_L_min: 100,
          further_unit_L_min: 10,
          diversity: 0.75,
          counts: 'room',
          source: 'gb-50751-2012',
          verified: false,
          note: 'Operating rooms: 100 + 10·(rooms − 1)·75 %.',
        },
        hyperbaric: {
          method: 'first_plus_further',
          first_unit_L_min: 25,
          further_unit_L_min: 25,
          diversity: 1,
          counts: 'occupant',
          source: 'gb-50751-2012',
          verified: false,
          note: 'Hyperbaric chamber: 25 L/min per occupant.',
        },
      },
    },
  },
  missing: {
    VAC: 'Rule set "gb50751" carries only the quoted oxygen formulas: supply an explicit vacuum rule.',
    AIR: 'Rule set "gb50751" carries only the quoted oxygen formulas: supply an explicit medical-air rule.',
  },
};

/** The shipped rule sets by id, validated once (a broken default is a programming error). */
export const DEFAULT_RULE_SETS: Record<string, DiversityRuleSet> = Object.fromEntries(
  [DEFAULT_RULE_SET, GB50751_RULE_SET].map((set) => [set.id, diversityRuleSetSchema.parse(set)]),
);

/** A deep copy of a shipped rule set, as a starting point for an organisation's own edits. */
export function copyRuleSet(id: string, newId: string): DiversityRuleSet {
  const base = lookup(DEFAULT_RULE_SETS, id);
  if (!base) throw new InvalidInputError(`Unknown rule set "${id}"`, [{ path: 'rule_set', message: `known: ${Object.keys(DEFAULT_RULE_SETS).join(', ')}` }]);
  return { ...structuredClone(base), id: newId };
}
