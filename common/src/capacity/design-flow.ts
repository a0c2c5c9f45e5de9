/**
 * Diversified design flow of pipeline zones from terminal-unit counts, department types and a
 * diversity rule set (data, see diversity-rules.ts).
 */
import { hasKey, lookup } from '../api/lookup';
import { InvalidInputError } from '../api/errors';
import {
  DEFAULT_RULE_SETS,
  UNVERIFIED_WARNING,
  type CapacityGasCode,
  type CountBasis,
  type Department,
  type DepartmentRule,
  type DiversityRuleSet,
  type RuleSource,
} from './diversity-rules';
import { computeAs2896Factor, computeSimultaneousOutlets } from './simultaneous-use';

/** One zone's diversified flow and how it was found. */
export interface ZoneFlow {
  designFlowLMin: number;
  method: DepartmentRule['method'];
  /** the formula with the numbers filled in, for the screen */
  formula: string;
  countedAs: CountBasis;
  source: string;
  verified: boolean;
}

const fmt = (x: number) => String(Math.round(x * 1e6) / 1e6);

/**
 * Diversified flow of one zone under one department rule.
 * first_plus_further: Q = first + (n − 1)·further·diversity (HTM 02-01, GB 50751 form);
 * use_factor: Q = n·flow·factor; as2896_factor: Q = n·flow·F(n); binomial: Q = k·flow.
 * @param rule the department rule
 * @param count terminal units (or beds, rooms… as the rule's `counts` says), integer ≥ 1
 */
export function computeZoneDesignFlow(rule: DepartmentRule, count: number): ZoneFlow {
  if (!Number.isInteger(count) || count < 1) {
    throw new InvalidInputError(`The count must be a whole number of at least 1 (got ${count})`, [
      { path: 'terminal_units', message: 'expected an integer ≥ 1' },
    ]);
  }
  const base = { method: rule.method, countedAs: rule.counts, source: rule.source, verified: rule.verified };
  switch (rule.method) {
    case 'first_plus_further': {
      const q = rule.first_unit_L_min + (count - 1) * rule.further_unit_L_min * rule.diversity;
      const formula = `${fmt(rule.first_unit_L_min)} + (${count} − 1) × ${fmt(rule.further_unit_L_min)} × ${fmt(rule.diversity)}`;
      return { ...base, designFlowLMin: q, formula };
    }
    case 'use_factor':
      return {
        ...base,
        designFlowLMin: count * rule.unit_L_min * rule.use_factor,
        formula: `${count} × ${fmt(rule.unit_L_min)} × ${fmt(rule.use_factor)}`,
      };
    case 'as2896_factor': {
      const f = computeAs2896Factor(count);
      return {
        ...base,
        designFlowLMin: count * rule.unit_L_min * f,
        formula: `${count} × ${fmt(rule.unit_L_min)} × F, F = min(1, 1.3 / log10(10 × ${count})) = ${fmt(f)}`,
      };
    }
    case 'binomial': {
      const { outletsInUse, cumulativeProbability } = computeSimultaneousOutlets(count, rule.use_probability, rule.confidence);
      return {
        ...base,
        designFlowLMin: outletsInUse * rule.unit_L_min,
        formula: `${outletsInUse} of ${count} in use (P(X ≤ ${outletsInUse}) = ${fmt(cumulativeProbability)} ≥ ${fmt(rule.confidence)}) × ${fmt(rule.unit_L_min)}`,
      };
    }
  }
}

/** A zone as the design-flow calculation takes it. */
export interface ZoneInput {
  name: string;
  department: Department;
  terminalUnits: number;
}

export interface ZoneDesignFlow extends ZoneFlow {
  name: string;
  department: Department;
  count: number;
  /** set when the rule is unverified: the text the screen must show */
  warning?: string;
}

export interface DesignFlowResult {
  gas: CapacityGasCode;
  ruleSetId: string;
  zones: ZoneDesignFlow[];
  totalLMin: number;
  totalMethod: 'sum' | 'multi_zone_rule';
  /** how the total was formed, in words */
  totalNote: string;
  /** the sources of every rule used */
  sources: RuleSource[];
  warnings: string[];
}

/** Looks up a shipped rule set or throws InvalidInputError naming the field. */
export function getRuleSet(id: string): DiversityRuleSet {
  // own keys only: "__proto__" or "constructor" are not rule sets
  const set = Object.hasOwn(DEFAULT_RULE_SETS, id) ? DEFAULT_RULE_SETS[id] : undefined;
  if (!set) {
    throw new InvalidInputError(`Unknown rule set "${id}"`, [
      { path: 'rule_set', message: `unknown rule set; known: ${Object.keys(DEFAULT_RULE_SETS).join(', ')}, or pass your own in "rules"` },
    ]);
  }
  return set;
}

/**
 * Diversified design flow of a gas over several zones.
 * Total: if the rule set defines a multi-zone rule for the gas, the zones of its departments combine
 * as largest + fraction × the others (HTM-style several-ward rule) and every other zone adds in full;
 * otherwise the zone flows are summed.
 * @param gas gas code (VAC for vacuum)
 * @param zones zones with department and count (≥ 1)
 * @param ruleSet a validated rule set
 */
export function computeDesignFlow(gas: CapacityGasCode, zones: ZoneInput[], ruleSet: DiversityRuleSet): DesignFlowResult {
  const gasRules = lookup(ruleSet.gases, gas);
  if (!gasRules) {
    const why = ruleSet.missing?.[gas] ?? `Rule set "${ruleSet.id}" has no diversity rules for ${gas}: supply an explicit rule.`;
    throw new InvalidInputError(why, [{ path: 'gas', message: `no rules for ${gas} in rule set "${ruleSet.id}"` }]);
  }
  if (zones.length === 0) {
    throw new InvalidInputError('Give at least one zone', [{ path: 'zones', message: 'expected at least one zone' }]);
  }
  const problems = zones.flatMap((z, i) =>
    hasKey(gasRules.departments, z.department) && gasRules.departments[z.department]
      ? []
      : [
          {
            path: `zones.${i}.department`,
            message: `rule set "${ruleSet.id}" has no ${gas} rule for department "${z.department}" (documented: ${
              Object.keys(gasRules.departments).join(', ') || 'none'
            }); supply an explicit rule`,
          },
        ],
  );
  if (problems.length > 0) {
    throw new InvalidInputError(`No documented ${gas} diversity rule for ${problems.length === 1 ? 'a zone' : 'some zones'}: ${problems[0].message}`, problems);
  }

  const usedSourceIds = new Set<string>();
  const warnings = new Set<string>();
  const results: ZoneDesignFlow[] = zones.map((z, i) => {
    const rule = gasRules.departments[z.department]!;
    let flow: ZoneFlow;
    try {
      flow = computeZoneDesignFlow(rule, z.terminalUnits);
    } catch (e) {
      if (e instanceof InvalidInputError) {
        throw new InvalidInputError(`Zone "${z.name}": ${e.message}`, [{ path: `zones.${i}.terminal_units`, message: e.details[0]?.message ?? e.message }]);
      }
      throw e;
    }
    usedSourceIds.add(rule.source);
    const zone: ZoneDesignFlow = { ...flow, name: z.name, department: z.department, count: z.terminalUnits };
    if (!rule.verified) {
      const text = ruleSet.sources.find((x) => x.id === rule.source)?.unverified_warning ?? UNVERIFIED_WARNING;
      zone.warning = text;
      warnings.add(`${gas} ${z.department} rule: ${text}`);
    }
    return zone;
  });

  let totalLMin = results.reduce((s, z) => s + z.designFlowLMin, 0);
  let totalMethod: DesignFlowResult['totalMethod'] = 'sum';
  let totalNote = 'sum of the zone design flows';
  const mz = gasRules.multi_zone;
  if (mz) {
    const grouped = results.filter((z) => mz.departments.includes(z.department));
    if (grouped.length > 1) {
      const flows = grouped.map((z) => z.designFlowLMin);
      const largest = Math.max(...flows);
      const others = flows.reduce((s, q) => s + q, 0) - largest;
      const rest = results.filter((z) => !mz.departments.includes(z.department)).reduce((s, z) => s + z.designFlowLMin, 0);
      totalLMin = largest + mz.fraction_of_others * others + rest;
      totalMethod = 'multi_zone_rule';
      totalNote =
        `${mz.departments.join('/')} zones: largest (${fmt(largest)}) + ${fmt(mz.fraction_of_others)} × others (${fmt(others)})` +
        (rest > 0 ? `; other zones summed (${fmt(rest)})` : '');
      usedSourceIds.add(mz.source);
      if (!mz.verified) warnings.add(`${gas} multi-zone rule: ${UNVERIFIED_WARNING}`);
    } else {
      totalNote = `sum of the zone design flows (the multi-zone rule for ${mz.departments.join('/')} needs at least two such zones)`;
    }
  }

  return {
    gas,
    ruleSetId: ruleSet.id,
    zones: results,
    totalLMin,
    totalMethod,
    totalNote,
    sources: ruleSet.sources.filter((s) => usedSourceIds.has(s.id)),
    warnings: [...warnings],
  };
}
