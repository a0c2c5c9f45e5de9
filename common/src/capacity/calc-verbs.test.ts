import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { capacityCalcVerbs } from './calc-verbs';

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

function verb(name: string, input: unknown): any {
  return capacityCalcVerbs[name](input);
}

function refusal(name: string, input: unknown): InvalidInputError {
  try {
    verb(name, input);
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidInputError);
    return e as InvalidInputError;
  }
  throw new Error('expected InvalidInputError');
}

const ward = (patch: Record<string, unknown> = {}) => ({ name: 'Ward 4', department: 'ward', terminal_units: 10, ...patch });

describe('design-flow verb', () => {
  it('returns the contract shape: zones[{name, design_flow_L_min}], total_L_min, rule_set, sources', () => {
    // HTM 02-01 Part A Table 21: 40 + 9 × 40/4 = 130 L/min
    const out = verb('design-flow', { gas: 'VAC', rule_set: 'default', zones: [ward()] });
    expect(out.zones[0]).toMatchObject({ name: 'Ward 4', design_flow_L_min: 130, verified: true });
    expect(out.total_L_min).toBe(130);
    expect(out.total_method).toBe('sum');
    expect(out.rule_set).toBe('default');
    expect(out.sources[0].citation).toMatch(/Table 21/);
  });

  it('WE-6 through the verb gives exactly 390.6', () => {
    // WE-6, GB 50751-2012 as quoted
    const out = verb('design-flow', {
      gas: 'O2',
      rule_set: 'gb50751',
      zones: [
        { name: 'Wards', department: 'ward', terminal_units: 200 },
        { name: 'ICU', department: 'critical_care', terminal_units: 10 },
        { name: 'Theatres', department: 'theatre', terminal_units: 6 },
      ],
    });
    expect(out.total_L_min).toBe(390.6);
  });

  it('marks from-memory oxygen rules in the output', () => {
    // WE-7: 10 + 27 × 6/4 = 50.5
    const out = verb('design-flow', { gas: 'O2', rule_set: 'default', zones: [ward({ terminal_units: 28 })] });
    expect(out.zones[0]).toMatchObject({ design_flow_L_min: 50.5, verified: false, warning: 'from memory, not verified' });
  });

  it('accepts an inline, user-edited rule set', () => {
    const rules = {
      id: 'site-a',
      name: 'Site A air',
      sources: [{ id: 'survey', citation: 'site survey 2024', verified: false }],
      gases: {
        AIR: {
          departments: {
            ward: { method: 'first_plus_further', first_unit_L_min: 20, further_unit_L_min: 10, diversity: 0.2, source: 'survey', verified: false },
          },
        },
      },
    };
    // 20 + 9 × 10 × 0.2 = 38
    const out = verb('design-flow', { gas: 'AIR', rules, zones: [ward()] });
    expect(out.rule_set).toBe('site-a');
    expect(out.total_L_min).toBe(38);
  });

  it.each([
    ['zero units', { gas: 'VAC', rule_set: 'default', zones: [ward({ terminal_units: 0 })] }, 'zones.0.terminal_units'],
    ['negative units', { gas: 'VAC', rule_set: 'default', zones: [ward({ terminal_units: -2 })] }, 'zones.0.terminal_units'],
    ['unknown department', { gas: 'VAC', rule_set: 'default', zones: [ward({ department: 'canteen' })] }, 'zones.0.department'],
    ['unknown gas', { gas: 'XE', rule_set: 'default', zones: [ward()] }, 'gas'],
    ['unknown rule set', { gas: 'VAC', rule_set: 'nfpa', zones: [ward()] }, 'rule_set'],
    ['no rule set', { gas: 'VAC', zones: [ward()] }, 'rule_set'],
    ['no rule for the department', { gas: 'VAC', rule_set: 'default', zones: [ward({ department: 'theatre' })] }, 'zones.0.department'],
    ['gas without rules', { gas: 'AIR', rule_set: 'default', zones: [ward()] }, 'gas'],
    ['no zones', { gas: 'VAC', rule_set: 'default', zones: [] }, 'zones'],
    [
      'inline rule with an unlisted source',
      {
        gas: 'AIR',
        rules: {
          id: 'x',
          name: 'x',
          sources: [],
          gases: { AIR: { departments: { ward: { method: 'use_factor', unit_L_min: 10, use_factor: 0.1, source: 's', verified: false } } } },
        },
        zones: [ward()],
      },
      'rules.gases.AIR.departments.ward.source',
    ],
  ])('refuses %s with a field path', (_label, input, path) => {
    const e = refusal('design-flow', input);
    expect(e.details.map((d) => d.path)).toContain(path);
    expect(e.message.length).toBeGreaterThan(10);
  });
});

describe('other verbs', () => {
  it('diversity-rules lists the shipped sets, and one copied from it runs through design-flow unchanged', () => {
    const all = verb('diversity-rules', {});
    expect(all.rule_sets.map((x: any) => x.id)).toEqual(['default', 'gb50751']);
    const gbSet = { ...verb('diversity-rules', { rule_set: 'gb50751' }).rule_sets[0], id: 'gb-copy' };
    // WE-6 again through the copied data: 390.6
    const out = verb('design-flow', {
      gas: 'O2',
      rules: gbSet,
      zones: [
        { name: 'Wards', department: 'ward', terminal_units: 200 },
        { name: 'ICU', department: 'critical_care', terminal_units: 10 },
        { name: 'Theatres', department: 'theatre', terminal_units: 6 },
      ],
    });
    expect(out.total_L_min).toBe(390.6);
    expect(refusal('diversity-rules', { rule_set: 'nope' }).details[0].path).toBe('rule_set');
  });

  it('pressure-drop: tube by name, defaults stated, VAC refused', () => {
    const out = verb('pressure-drop', { gas: 'O2', flow_L_min: 500, tube: '22x0.9', length_m: 50 });
    expect(out.inner_diameter_mm).toBe(20.2);
    expect(out.effective_length_m).toBe(60);
    expect(out.allowed_drop_kPa).toBe(20);
    expect(out.pressure_drop_kPa).toBeGreaterThan(5);
    expect(out.within_allowance).toBe(true);
    expect(refusal('pressure-drop', { gas: 'VAC', flow_L_min: 50, tube: '22x0.9', length_m: 5 }).details[0].path).toBe('gas');
    expect(refusal('pressure-drop', { gas: 'O2', flow_L_min: 50, tube: '22x0.9' }).details[0].path).toBe('length_m');
    expect(refusal('pressure-drop', { gas: 'O2', flow_L_min: 50, tube: '23x1', length_m: 5 }).details[0].path).toBe('tube');
    expect(refusal('pressure-drop', { gas: 'O2', flow_L_min: 50, inner_diameter_mm: 0, length_m: 5 }).details[0].path).toBe('inner_diameter_mm');
    expect(refusal('pressure-drop', { gas: 'O2', flow_L_min: 50, length_m: 5 }).details[0].path).toBe('tube');
  });

  it('headroom: vaporiser limit and a pipe-run zone limit', () => {
    const out = verb('headroom', {
      gas: 'O2',
      flow_per_patient_L_min: 40,
      site: { current_flow_L_min: 300, limits: [{ kind: 'vaporiser', name: 'VIE', rating_m3_h: 60 }] },
      zones: [{ name: 'Ward 7', current_flow_L_min: 50.5, limits: [{ kind: 'pipe_run', name: 'branch', tube: '15x0.7', length_m: 60 }] }],
    });
    // (700 − 300) / 40 = 10 at the site (60 m³/h × 0.7 derating)
    expect(out.site.extra_patients).toBe(10);
    expect(out.site.first_limit.kind).toBe('vaporiser');
    expect(out.zones[0].limited_by.kind).toBe('pipe_run');
    expect(out.zones[0].extra_patients_with_site).toBeLessThan(10);
    const e = refusal('headroom', { gas: 'VAC', flow_per_patient_L_min: 40, site: { limits: [{ kind: 'pipe_run', name: 'p', tube: '22x0.9', length_m: 3 }] } });
    expect(e.details[0].path).toBe('site.limits.0.kind');
  });

  it('manifold-sizing reproduces WE-3', () => {
    // WE-3: 120,600 L/day, 17.7 cylinders → 2 × 10; secondary 4 h: 48,240 L, 8 cylinders
    const out = verb('manifold-sizing', { flow_L_min: 201, hours_per_day: 10, cylinder_free_gas_L: 6800 });
    expect(out).toMatchObject({ daily_demand_L: 120600, manifold: '2 × 10', secondary_supply: { required_free_gas_L: 48240, cylinders: 8 } });
    expect(out.cylinders_per_day).toBeCloseTo(17.7, 1);
  });

  it('reserve-check applies both rules with their sources', () => {
    const out = verb('reserve-check', { design_flow_L_min: 201, average_daily_consumption_L: 120600, reserve_free_gas_L: 50000 });
    expect(out.rules.map((x: any) => x.meets)).toEqual([true, false]);
    expect(out.rules[0].source).toMatch(/HTM 02-01/);
    expect(out.rules[1].source).toMatch(/NFPA 99/);
    expect(refusal('reserve-check', {}).details[0].path).toBe('design_flow_L_min');
  });

  it('simultaneous-use compares binomial and AS 2896-style results', () => {
    // binomial table n = 20, p = 0.1: P(X ≤ 4) = 0.9568 → 4 × 10 = 40; F(20) = 1.3/log10(200) = 0.5650
    const out = verb('simultaneous-use', { outlets: 20, use_probability: 0.1, confidence: 0.95, flow_per_outlet_L_min: 10 });
    expect(out.binomial.design_flow_L_min).toBe(40);
    expect(out.as2896.factor).toBeCloseTo(0.565, 3);
    expect(refusal('simultaneous-use', { outlets: 0, use_probability: 0.1, confidence: 0.95, flow_per_outlet_L_min: 10 }).details[0].path).toBe('outlets');
  });
});

describe('calc command line', () => {
  function run(input: string) {
    return spawnSync(process.execPath, ['--import', 'tsx', 'scripts/calc.ts', 'design-flow'], { cwd: repoRoot, input, encoding: 'utf8', timeout: 60_000 });
  }

  it('exit 0 with the design-flow shape', () => {
    const res = run(JSON.stringify({ gas: 'VAC', rule_set: 'default', zones: [{ name: 'Ward 4', department: 'ward', terminal_units: 10 }] }));
    expect(res.status).toBe(0);
    const out = JSON.parse(res.stdout);
    expect(out.zones).toEqual([expect.objectContaining({ name: 'Ward 4', design_flow_L_min: 130 })]);
    expect(out.total_L_min).toBe(130);
    expect(out.rule_set).toBe('default');
    expect(Array.isArray(out.sources)).toBe(true);
  }, 60_000);

  it('exit 2 with the error body for bad input', () => {
    const res = run(JSON.stringify({ gas: 'VAC', rule_set: 'default', zones: [{ name: 'Ward 4', department: 'ward', terminal_units: 0 }] }));
    expect(res.status).toBe(2);
    const out = JSON.parse(res.stdout);
    expect(out.error.code).toBe('invalid_input');
    expect(typeof out.error.message).toBe('string');
    expect(out.error.details).toContainEqual({ path: 'zones.0.terminal_units', message: expect.any(String) });
  }, 60_000);
});
