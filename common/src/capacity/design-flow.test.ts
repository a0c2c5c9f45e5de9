import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { computeDesignFlow, computeZoneDesignFlow, getRuleSet } from './design-flow';
import {
  DEFAULT_RULE_SETS,
  QUOTED_WARNING,
  UNVERIFIED_WARNING,
  copyRuleSet,
  diversityRuleSetSchema,
  type DepartmentRule,
  type DiversityRuleSet,
} from './diversity-rules';

const def = () => getRuleSet('default');
const gb = () => getRuleSet('gb50751');

function thrown(fn: () => unknown): InvalidInputError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidInputError);
    return e as InvalidInputError;
  }
  throw new Error('expected InvalidInputError');
}

describe('design flow, vacuum (HTM 02-01 Part A Table 21)', () => {
  it('ward: 10 terminal units give 40 + 9 × 40/4 = 130 L/min', () => {
    // HTM 02-01 Part A Table 21, multiple ward units: Q = 40 + (n − 1)·40/4
    const r = computeDesignFlow('VAC', [{ name: 'Ward 4', department: 'ward', terminalUnits: 10 }], def());
    expect(r.zones[0].designFlowLMin).toBeCloseTo(130, 9);
    expect(r.zones[0].verified).toBe(true);
    expect(r.totalLMin).toBeCloseTo(130, 9);
    expect(r.sources.map((s) => s.id)).toEqual(['htm-02-01-a-t21']);
  });

  it('a single ward unit is 40 L/min', () => {
    // HTM 02-01 Part A Table 21: ward unit Q = 40
    expect(computeDesignFlow('VAC', [{ name: 'Side room', department: 'ward', terminalUnits: 1 }], def()).totalLMin).toBe(40);
  });

  it('A&E resuscitation: 4 trolley spaces give 40 + 3 × 10 = 70 L/min', () => {
    // HTM 02-01 Part A Table 21: resuscitation room, per trolley space, Q = 40 + (n − 1)·40/4
    const r = computeDesignFlow('VAC', [{ name: 'Resus', department: 'emergency_resuscitation', terminalUnits: 4 }], def());
    expect(r.totalLMin).toBeCloseTo(70, 9);
    expect(r.zones[0].countedAs).toBe('trolley_space');
  });

  it('major treatment/plaster room stays at 40 L/min whatever the trolley count', () => {
    // HTM 02-01 Part A Table 21: major treatment/plaster room, Q = 40
    const r = computeDesignFlow('VAC', [{ name: 'Plaster', department: 'treatment_room', terminalUnits: 3 }], def());
    expect(r.totalLMin).toBe(40);
  });

  it('several vacuum zones add up (no multi-zone rule is documented for vacuum)', () => {
    // HTM 02-01 Table 21: 40 + 9·10 = 130 and 40 + 3·10 = 70
    const r = computeDesignFlow(
      'VAC',
      [
        { name: 'Ward 4', department: 'ward', terminalUnits: 10 },
        { name: 'Resus', department: 'emergency_resuscitation', terminalUnits: 4 },
      ],
      def(),
    );
    expect(r.totalMethod).toBe('sum');
    expect(r.totalLMin).toBeCloseTo(200, 9);
  });

  it('refuses theatres: Table 21 as retrieved documents no theatre rule', () => {
    const e = thrown(() => computeDesignFlow('VAC', [{ name: 'Th 1', department: 'theatre', terminalUnits: 2 }], def()));
    expect(e.details[0].path).toBe('zones.0.department');
    expect(e.details[0].message).toMatch(/no VAC rule for department "theatre"/);
  });
});

describe('design flow, 50:50 N2O/O2 (HTM 02-01 §§4.31–4.32)', () => {
  it('delivery suite: 275 for the first bed + 6 per other bed', () => {
    // HTM 02-01 §4.32: 275 L/min first bed space, 6 L/min each of the remainder → 8 beds: 275 + 7·6 = 317
    const r = computeDesignFlow('N2O_O2_50', [{ name: 'Delivery', department: 'delivery_room', terminalUnits: 8 }], def());
    expect(r.totalLMin).toBeCloseTo(317, 9);
  });

  it('an anaesthetic room adds nothing', () => {
    // HTM 02-01: no additional flow for the anaesthetic room of a theatre
    const r = computeDesignFlow(
      'N2O_O2_50',
      [
        { name: 'Delivery', department: 'delivery_room', terminalUnits: 1 },
        { name: 'Anaes 1', department: 'anaesthetic_room', terminalUnits: 1 },
      ],
      def(),
    );
    expect(r.zones[1].designFlowLMin).toBe(0);
    expect(r.totalLMin).toBe(275);
  });
});

describe('design flow, oxygen default rules (from memory, unverified)', () => {
  it('WE-7: a 28-bed ward needs 10 + 27 × 6/4 = 50.5 L/min, flagged as from memory', () => {
    // worked example WE-7 (computed), from-memory HTM 02-01 oxygen ward rule Qw = 10 + (n − 1)·6/4
    const r = computeDesignFlow('O2', [{ name: 'Ward 7', department: 'ward', terminalUnits: 28 }], def());
    expect(r.zones[0].designFlowLMin).toBeCloseTo(50.5, 9);
    expect(r.zones[0].verified).toBe(false);
    expect(r.zones[0].warning).toBe(UNVERIFIED_WARNING);
    expect(r.warnings.join(' ')).toMatch(/from memory, not verified/);
    expect(r.sources[0].verified).toBe(false);
  });

  it('every shipped oxygen rule carries verified:false and the "from memory, not verified" note', () => {
    const o2 = def().gases.O2!;
    for (const rule of Object.values(o2.departments)) {
      expect(rule!.verified).toBe(false);
      expect(rule!.note).toContain('from memory, not verified');
    }
    expect(o2.multi_zone!.verified).toBe(false);
  });

  it('ITU 10 beds: 10 + 9·6·3/4 = 50.5; theatres 4: 100 + 3·10 = 130; A&E 2 trolleys: 200; recovery 5 beds: 16', () => {
    // HTM 02-01 oxygen table as recalled (from memory)
    const r = computeDesignFlow(
      'O2',
      [
        { name: 'ITU', department: 'critical_care', terminalUnits: 10 },
        { name: 'Theatres', department: 'theatre', terminalUnits: 4 },
        { name: 'Resus', department: 'emergency_resuscitation', terminalUnits: 2 },
        { name: 'Recovery', department: 'recovery', terminalUnits: 5 },
      ],
      def(),
    );
    expect(r.zones.map((z) => z.designFlowLMin)).toEqual([50.5, 130, 200, 16]);
    expect(r.totalMethod).toBe('sum');
    expect(r.totalLMin).toBeCloseTo(396.5, 9);
  });

  it('several equal wards combine as Qw·[1 + (nw − 1)/2]', () => {
    // from-memory several-ward rule: 3 wards of 28 beds → 50.5 × (1 + 2/2) = 101
    const wards = [1, 2, 3].map((i) => ({ name: `Ward ${i}`, department: 'ward' as const, terminalUnits: 28 }));
    const r = computeDesignFlow('O2', wards, def());
    expect(r.totalMethod).toBe('multi_zone_rule');
    expect(r.totalLMin).toBeCloseTo(101, 9);
  });

  it('unequal wards: largest in full, others at half; other departments add in full', () => {
    // wards 50.5 (28 TU) and 23.5 (10 TU): 50.5 + 23.5/2 = 62.25; plus ITU 10 beds 50.5 → 112.75
    const r = computeDesignFlow(
      'O2',
      [
        { name: 'Ward A', department: 'ward', terminalUnits: 28 },
        { name: 'Ward B', department: 'ward', terminalUnits: 10 },
        { name: 'ITU', department: 'critical_care', terminalUnits: 10 },
      ],
      def(),
    );
    expect(r.totalLMin).toBeCloseTo(112.75, 9);
    expect(r.totalNote).toMatch(/largest/);
  });

  it('one ward alone is not reduced by the multi-ward rule', () => {
    const r = computeDesignFlow('O2', [{ name: 'Ward 7', department: 'ward', terminalUnits: 28 }], def());
    expect(r.totalMethod).toBe('sum');
  });
});

describe('design flow, GB 50751-2012', () => {
  it('WE-6: 200 ward beds + 10 ICU beds + 6 theatres = 390.6 L/min', () => {
    // worked example WE-6 (computed), GB 50751-2012 as quoted: 189.1 + 64 + 137.5 = 390.6
    const r = computeDesignFlow(
      'O2',
      [
        { name: 'Wards', department: 'ward', terminalUnits: 200 },
        { name: 'ICU', department: 'critical_care', terminalUnits: 10 },
        { name: 'Theatres', department: 'theatre', terminalUnits: 6 },
      ],
      gb(),
    );
    expect(r.zones[0].designFlowLMin).toBeCloseTo(189.1, 9);
    expect(r.zones[1].designFlowLMin).toBeCloseTo(64, 9);
    expect(r.zones[2].designFlowLMin).toBeCloseTo(137.5, 9);
    expect(r.totalLMin).toBeCloseTo(390.6, 9);
    // quoted on a supplier page, not checked against the standard's own table: not verified, and it says so
    expect(r.zones.every((z) => !z.verified && z.warning === QUOTED_WARNING)).toBe(true);
    expect(r.warnings.join(' ')).toMatch(/quoted from a supplier page, not verified against the standard/);
  });

  it('hyperbaric chamber: 25 L/min per occupant', () => {
    // GB 50751-2012 as quoted: hyperbaric 25 L/min per occupant → 12 occupants: 300
    expect(computeDesignFlow('O2', [{ name: 'HBO', department: 'hyperbaric', terminalUnits: 12 }], gb()).totalLMin).toBe(300);
  });
});

describe('design flow, refusals', () => {
  it('medical air has no documented rule: clear error on gas', () => {
    const e = thrown(() => computeDesignFlow('AIR', [{ name: 'W', department: 'ward', terminalUnits: 4 }], def()));
    expect(e.details[0].path).toBe('gas');
    expect(e.message).toMatch(/medical air/);
  });

  it('unknown rule set', () => {
    const e = thrown(() => getRuleSet('nfpa'));
    expect(e.details[0].path).toBe('rule_set');
  });

  it.each([0, -3, 2.5])('count %s is refused', (n) => {
    const e = thrown(() => computeDesignFlow('VAC', [{ name: 'W', department: 'ward', terminalUnits: n }], def()));
    expect(e.details[0].path).toBe('zones.0.terminal_units');
  });

  it('lists every zone whose department has no rule', () => {
    const e = thrown(() =>
      computeDesignFlow(
        'N2O_O2_50',
        [
          { name: 'D', department: 'delivery_room', terminalUnits: 2 },
          { name: 'W', department: 'ward', terminalUnits: 2 },
          { name: 'T', department: 'theatre', terminalUnits: 2 },
        ],
        def(),
      ),
    );
    expect(e.details.map((d) => d.path)).toEqual(['zones.1.department', 'zones.2.department']);
  });
});

describe('rule sets as editable data', () => {
  it('shipped sets validate and every rule names a listed source', () => {
    for (const set of Object.values(DEFAULT_RULE_SETS)) {
      expect(diversityRuleSetSchema.safeParse(set).success).toBe(true);
      expect(set.sources.length).toBeGreaterThan(0);
    }
  });

  it('a copied set can be edited without touching the default', () => {
    const mine = copyRuleSet('default', 'site-a');
    (mine.gases.O2!.departments.ward as Extract<DepartmentRule, { method: 'first_plus_further' }>).diversity = 0.5;
    // edited: 10 + 27·6·0.5 = 91; default still 50.5 (WE-7)
    expect(computeDesignFlow('O2', [{ name: 'W', department: 'ward', terminalUnits: 28 }], mine).totalLMin).toBeCloseTo(91, 9);
    expect(computeDesignFlow('O2', [{ name: 'W', department: 'ward', terminalUnits: 28 }], def()).totalLMin).toBeCloseTo(50.5, 9);
  });

  it('a rule pointing at an unlisted source is refused with its path', () => {
    const bad = structuredClone(DEFAULT_RULE_SETS.gb50751) as DiversityRuleSet;
    (bad.gases.O2!.departments.ward as DepartmentRule).source = 'nowhere';
    const res = diversityRuleSetSchema.safeParse(bad);
    expect(res.success).toBe(false);
    expect(res.error!.issues[0].path.join('.')).toBe('gases.O2.departments.ward.source');
  });

  it('a user set may use the AS 2896-style, use-factor and binomial methods', () => {
    const set = diversityRuleSetSchema.parse({
      id: 'mine',
      name: 'alternatives',
      sources: [{ id: 's', citation: 'own survey', verified: false }],
      gases: {
        AIR: {
          departments: {
            ward: { method: 'as2896_factor', unit_L_min: 10, source: 's', verified: false },
            recovery: { method: 'use_factor', unit_L_min: 10, use_factor: 0.5, source: 's', verified: false },
            theatre: { method: 'binomial', unit_L_min: 40, use_probability: 0.5, confidence: 0.9, source: 's', verified: false },
          },
        },
      },
    });
    const r = computeDesignFlow(
      'AIR',
      [
        { name: 'W', department: 'ward', terminalUnits: 10 },
        { name: 'R', department: 'recovery', terminalUnits: 6 },
        { name: 'T', department: 'theatre', terminalUnits: 2 },
      ],
      set,
    );
    // AS 2896-style: 10 × 10 × 0.65 = 65 (F at n = 10: 0.65, IHEA seminar paper)
    expect(r.zones[0].designFlowLMin).toBeCloseTo(65, 9);
    // use factor: 6 × 10 × 0.5 = 30
    expect(r.zones[1].designFlowLMin).toBeCloseTo(30, 9);
    // two outlets, p = 0.5: P(X ≤ 1) = 0.75 < 0.9, P(X ≤ 2) = 1 → both: 80
    expect(r.zones[2].designFlowLMin).toBe(80);
  });

  it('zone formula shows the numbers used', () => {
    const rule = def().gases.VAC!.departments.ward!;
    expect(computeZoneDesignFlow(rule, 10).formula).toBe('40 + (10 − 1) × 40 × 0.25');
  });
});
