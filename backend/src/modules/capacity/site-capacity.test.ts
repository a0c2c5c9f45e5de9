import { describe, expect, it } from 'vitest';
import { DEFAULT_RULE_SETS } from '@common/capacity/diversity-rules';
import { assessSiteCapacity, type SiteCapacityInput, type SourceData, type ZoneData } from './site-capacity';

const zone = (over: Partial<ZoneData>): ZoneData => ({
  id: 1,
  name: 'Zone',
  gasCode: 'O2',
  department: 'ward',
  terminalUnits: 11,
  sourceId: 10,
  ruleSet: DEFAULT_RULE_SETS.default,
  ruleSetLabel: { key: 'default', name: 'default', builtin: true },
  diversityMethod: 'rule_set',
  unitFlowLMin: null,
  useProbability: null,
  confidence: null,
  pipeRuns: [],
  ...over,
});

const tank: SourceData = {
  id: 10,
  name: 'VIE',
  type: 'bulk_liquid',
  gasCode: 'O2',
  regulatorLMin: null,
  vaporiserM3H: 60,
  vaporiserDerating: null,
  cylindersPerBank: null,
  cylinder: null,
  backsUp: [],
  forecastFlowLMin: null,
  forecastBasis: 'model',
};

const input = (zones: ZoneData[], sources: SourceData[], options: Partial<SiteCapacityInput['options']> = {}): SiteCapacityInput => ({
  site: { referenceCode: '15C', atmosphericBar: 1.01325 },
  zones,
  sources,
  options: { flowPerPatientLMin: 40, peakHoursPerDay: 10, ...options },
});

describe('assessSiteCapacity', () => {
  it('adds the totals of zones on different rule sets (no several-ward rule across sets)', () => {
    const r = assessSiteCapacity(
      input(
        [
          zone({ id: 1, name: 'HTM ward' }),
          zone({ id: 2, name: 'GB ward', ruleSet: DEFAULT_RULE_SETS.gb50751, ruleSetLabel: { key: 'gb50751', name: 'GB', builtin: true } }),
        ],
        [tank],
      ),
    );
    const o2 = r.gases[0];
    // Default (from memory): 10 + 10·6/4 = 25. GB 50751 (quoted): 10 + 6·10·0.15 = 19. Different sets: 25 + 19 = 44.
    expect(o2.zones.map((z) => z.designFlowLMin)).toEqual([25, 19]);
    expect(o2.designFlowLMin).toBeCloseTo(44, 9);
    expect(o2.totalNote).toMatch(/the parts add/);
  });

  it('derates the vaporiser by the documented default 0.7, or by a what-if factor, and counts surge patients', () => {
    const zones = [zone({ id: 1, name: 'A' }), zone({ id: 2, name: 'B' })];
    // Two equal HTM wards (from memory): 25 + 25/2 = 37.5 L/min.
    const base = assessSiteCapacity(input(zones, [tank])).gases[0];
    expect(base.designFlowLMin).toBeCloseTo(37.5, 9);
    const vap = base.sources[0].limits[0];
    // 60 m³/h × 0.7 × 1000/60 = 700 L/min (continuous-duty derating, alternating pair; practitioners' forum).
    expect(vap.capacityLMin).toBeCloseTo(700, 9);
    expect(vap.detail).toMatch(/default derating/);
    // floor((700 − 37.5) / 40) = 16 more patients at 40 L/min.
    expect(base.headroom.extraPatients).toBe(16);

    const cold = assessSiteCapacity(input(zones, [tank], { vaporiserDerating: 0.5 })).gases[0];
    // 60 × 0.5 × 1000/60 = 500 L/min; floor((500 − 37.5) / 40) = 11.
    expect(cold.sources[0].limits[0].capacityLMin).toBeCloseTo(500, 9);
    expect(cold.headroom.extraPatients).toBe(11);
    expect(cold.limiting?.kind).toBe('vaporiser');
  });

  it('a source with no rating gives no headroom figure and says why', () => {
    const r = assessSiteCapacity(input([zone({})], [{ ...tank, vaporiserM3H: null }])).gases[0];
    expect(r.sources[0].missingLimit).toMatch(/No vaporiser rating/);
    expect(r.headroom.extraPatients).toBeNull();
    expect(r.limiting).toBeNull();
  });
});
