import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { computePipeRunPressureDrop } from './pipe-run';
import { computeSurgeHeadroom, resolveCapacityLimit } from './surge-headroom';

describe('surge headroom', () => {
  it('vaporiser is the limit: 300 L/min now, 60 m³/h derated to 700 L/min → 10 more HFNO patients at 40 L/min', () => {
    // WE-5 ward load: 30 severe patients × 10 L/min (WHO) = 300 L/min.
    // vaporiser 60 m³/h × 0.7 (continuous-duty derating, alternating pair) = 700 L/min; (700 − 300) / 40 = 10
    const vaporiser = resolveCapacityLimit({ kind: 'vaporiser', name: 'VIE vaporiser', ratingM3H: 60 }, 'O2');
    const regulator = resolveCapacityLimit({ kind: 'manifold_regulator', name: 'Line regulator', capacityLMin: 1500 }, 'O2');
    const mainPipe = resolveCapacityLimit({ kind: 'pipe_run', name: 'Main riser 54 mm', pipe: { innerDiameterMm: 51.6, lengthM: 80 } }, 'O2');
    expect(vaporiser.capacityLMin).toBeCloseTo(700, 9);
    expect(mainPipe.capacityLMin).toBeGreaterThan(1500);
    const h = computeSurgeHeadroom({ flowPerPatientLMin: 40, site: { currentFlowLMin: 300, limits: [regulator, vaporiser, mainPipe] } });
    expect(h.site.extraPatients).toBe(10);
    expect(h.site.firstLimit!.kind).toBe('vaporiser');
    expect(h.site.overloaded).toBe(false);
  });

  it('pipework is the limit: a 15 mm ward branch stops the zone before the site limits', () => {
    const branch = { innerDiameterMm: 13.6, lengthM: 60 }; // 15 × 0.7 copper, 60 m + 20 % fittings
    const pipe = resolveCapacityLimit({ kind: 'pipe_run', name: 'Ward 7 branch', pipe: branch }, 'O2');
    // The capacity is the flow whose drop is the allowance (5 % of 400 kPa = 20 kPa): check it by forward calculation.
    const forward = computePipeRunPressureDrop({ gas: 'O2', ...branch }, pipe.capacityLMin);
    expect(forward.pressureDropKPa).toBeCloseTo(20, 3);
    const vaporiser = resolveCapacityLimit({ kind: 'vaporiser', name: 'VIE vaporiser', ratingM3H: 60 }, 'O2');
    // Ward 7 at its design flow, WE-7: 50.5 L/min; site load 300 L/min
    const h = computeSurgeHeadroom({
      flowPerPatientLMin: 40,
      site: { currentFlowLMin: 300, limits: [vaporiser] },
      zones: [{ name: 'Ward 7', currentFlowLMin: 50.5, limits: [pipe] }],
    });
    const zone = h.zones[0];
    expect(pipe.capacityLMin).toBeLessThan(50.5 + 400); // tighter than the site's 400 L/min margin
    expect(zone.extraPatients).toBe(Math.floor((pipe.capacityLMin - 50.5) / 40));
    expect(zone.extraPatientsWithSite).toBe(zone.extraPatients);
    expect(zone.limitedBy).toEqual({ scope: 'zone', kind: 'pipe_run', name: 'Ward 7 branch' });
  });

  it('a zone with room to spare is held back by the site', () => {
    const h = computeSurgeHeadroom({
      flowPerPatientLMin: 40,
      site: { limits: [{ kind: 'vaporiser', name: 'V', capacityLMin: 700 }] },
      zones: [
        { name: 'A', currentFlowLMin: 200, limits: [{ kind: 'pipe_run', name: 'A branch', capacityLMin: 2000 }] },
        { name: 'B', currentFlowLMin: 100, limits: [] },
      ],
    });
    // site flow = 200 + 100 = 300; (700 − 300)/40 = 10
    expect(h.site.currentFlowLMin).toBe(300);
    expect(h.zones[0].extraPatients).toBe(45);
    expect(h.zones[0].extraPatientsWithSite).toBe(10);
    expect(h.zones[0].limitedBy!.scope).toBe('site');
    expect(h.zones[1].limitedBy!.name).toBe('V');
  });

  it('an overloaded source gives zero headroom and says so', () => {
    // WE-5: 600 L/min against a 50 m³/h vaporiser derated to 583.3 L/min
    const v = resolveCapacityLimit({ kind: 'vaporiser', name: 'V', ratingM3H: 50 }, 'O2');
    const h = computeSurgeHeadroom({ flowPerPatientLMin: 40, site: { currentFlowLMin: 600, limits: [v] } });
    expect(h.site.extraPatients).toBe(0);
    expect(h.site.overloaded).toBe(true);
    expect(h.site.limits[0].marginLMin).toBeCloseTo(-16.6667, 4);
  });

  it('an exact fit counts the last patient', () => {
    const h = computeSurgeHeadroom({ flowPerPatientLMin: 40, site: { currentFlowLMin: 300, limits: [{ kind: 'other', name: 'X', capacityLMin: 700 }] } });
    expect(h.site.extraPatients).toBe(10);
  });

  it('refuses a site without limits and a non-positive patient flow', () => {
    expect(() => computeSurgeHeadroom({ flowPerPatientLMin: 40, site: { currentFlowLMin: 1, limits: [] } })).toThrow(InvalidInputError);
    expect(() =>
      computeSurgeHeadroom({ flowPerPatientLMin: 0, site: { currentFlowLMin: 1, limits: [{ kind: 'other', name: 'X', capacityLMin: 5 }] } }),
    ).toThrow(InvalidInputError);
  });
});
