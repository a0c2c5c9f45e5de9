import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import {
  computeColebrookWhiteFriction,
  computeDarcyFriction,
  computeDarcyPressureDrop,
  computeSwameeJainFriction,
  findCopperTube,
  lookupViscosityPaS,
} from './pipe-hydraulics';

describe('friction factor', () => {
  it('Colebrook–White matches Moody-chart values', () => {
    // Moody chart / Prandtl–Kármán smooth-pipe law (from memory): smooth, Re 1e5 → 0.0180;
    // ε/D 1e-4, Re 1e5 → 0.0185; ε/D 1e-3, Re 1e6 → 0.0199
    expect(computeColebrookWhiteFriction(1e5, 0)).toBeCloseTo(0.018, 3);
    expect(computeColebrookWhiteFriction(1e5, 1e-4)).toBeCloseTo(0.0185, 3);
    expect(computeColebrookWhiteFriction(1e6, 1e-3)).toBeCloseTo(0.0199, 3);
  });

  it('the solution satisfies the Colebrook–White equation', () => {
    fc.assert(
      fc.property(fc.double({ min: 4000, max: 1e8, noNaN: true }), fc.double({ min: 0, max: 0.01, noNaN: true }), (re, rr) => {
        const f = computeColebrookWhiteFriction(re, rr);
        const rhs = -2 * Math.log10(rr / 3.7 + 2.51 / (re * Math.sqrt(f)));
        expect(1 / Math.sqrt(f)).toBeCloseTo(rhs, 9);
      }),
    );
  });

  it('Swamee–Jain (1976) stays within 3 % of Colebrook–White over its stated range', () => {
    // Swamee & Jain 1976: explicit fit to Colebrook for 5000 ≤ Re ≤ 1e8, 1e-6 ≤ ε/D ≤ 1e-2 (about 1 %, worst near Re 5000, ε/D 1e-2)
    fc.assert(
      fc.property(fc.double({ min: 5000, max: 1e8, noNaN: true }), fc.double({ min: 1e-6, max: 1e-2, noNaN: true }), (re, rr) => {
        const ratio = computeSwameeJainFriction(re, rr) / computeColebrookWhiteFriction(re, rr);
        expect(Math.abs(ratio - 1)).toBeLessThan(0.03);
      }),
    );
  });

  it('laminar below Re 2300: f = 64/Re (Hagen–Poiseuille)', () => {
    expect(computeDarcyFriction(1000, 1e-4, 'colebrook_white')).toEqual({ frictionFactor: 0.064, regime: 'laminar' });
    expect(computeDarcyFriction(3000, 1e-4, 'colebrook_white').regime).toBe('transitional');
  });
});

describe('Darcy–Weisbach pressure drop', () => {
  it('matches a hand calculation: oxygen, 500 L/min, 22 × 0.9 copper, 50 m + 20 %', () => {
    /*
     * Hand calculation (inputs: free-gas reference 15 °C, 1.01325 bar; line 5 bar abs, 20 °C):
     *   ρ_ref  = 1.35436 kg/m³   (O2, 288.15 K, 1.01325 bar: reference EOS Schmidt & Wagner 1985, tests/reference)
     *   ρ_line = 6.586960 kg/m³  (O2, 293.15 K, 5 bar: same table)
     *   μ      = 20.4e-6 Pa·s    (O2 near 20 °C, from memory)
     *   D      = 22 − 2 × 0.9 = 20.2 mm;  A = π/4 × 0.0202² = 3.204739e-4 m²
     *   ṁ      = 500/60000 × 1.35436 = 0.01128633 kg/s
     *   Q      = ṁ/ρ_line = 1.713436e-3 m³/s (102.806 L/min at line pressure)
     *   v      = Q/A = 5.346570 m/s
     *   Re     = ρ v D / μ = 6.58696 × 5.34657 × 0.0202 / 20.4e-6 = 34 872  (turbulent)
     *   ε/D    = 0.0015 / 20.2 = 7.4257e-5
     *   f      : start Swamee–Jain 0.25/[log10(ε/3.7D + 5.74/Re^0.9)]² = 0.022803;
     *            Colebrook 1/√f = −2 log10(ε/3.7D + 2.51/(Re √f)) iterates 0.022903, 0.022890, 0.0228918 → 0.0228916
     *   L_eff  = 50 × 1.20 = 60 m
     *   ΔP     = f (L/D) ρ v²/2 = 0.0228916 × (60/0.0202) × 6.58696 × 5.34657²/2 = 6401.5 Pa = 6.4015 kPa
     */
    const r = computeDarcyPressureDrop({
      flowFreeLMin: 500,
      referenceDensityKgM3: 1.35436,
      lineDensityKgM3: 6.58696,
      viscosityPaS: 20.4e-6,
      innerDiameterMm: 20.2,
      lengthM: 50,
      fittingsAllowancePercent: 20,
      roughnessMm: 0.0015,
      correlation: 'colebrook_white',
    });
    expect(r.actualFlowLMin).toBeCloseTo(102.806, 3);
    expect(r.velocityMS).toBeCloseTo(5.34657, 4);
    expect(r.reynolds).toBeCloseTo(34872, -1);
    expect(r.regime).toBe('turbulent');
    expect(r.frictionFactor).toBeCloseTo(0.0228916, 6);
    expect(r.effectiveLengthM).toBeCloseTo(60, 12);
    expect(r.pressureDropKPa).toBeCloseTo(6.4015, 3);
  });

  it('Swamee–Jain gives the same case within 0.5 % (6.377 kPa by hand with f = 0.022803)', () => {
    // same hand calculation with the Swamee–Jain factor 0.022803: ΔP = 6376.8 Pa
    const r = computeDarcyPressureDrop({
      flowFreeLMin: 500,
      referenceDensityKgM3: 1.35436,
      lineDensityKgM3: 6.58696,
      viscosityPaS: 20.4e-6,
      innerDiameterMm: 20.2,
      lengthM: 60,
      correlation: 'swamee_jain',
    });
    expect(r.pressureDropKPa).toBeCloseTo(6.3768, 3);
  });

  it('an equivalent length adds to the straight length', () => {
    const base = { flowFreeLMin: 300, referenceDensityKgM3: 1.35, lineDensityKgM3: 6.6, viscosityPaS: 2e-5, innerDiameterMm: 20.2 };
    const a = computeDarcyPressureDrop({ ...base, lengthM: 40, fittingsEquivalentLengthM: 8 });
    const b = computeDarcyPressureDrop({ ...base, lengthM: 48 });
    expect(a.effectiveLengthM).toBe(48);
    expect(a.pressureDropKPa).toBeCloseTo(b.pressureDropKPa, 12);
  });

  it('zero flow gives zero drop', () => {
    const r = computeDarcyPressureDrop({
      flowFreeLMin: 0,
      referenceDensityKgM3: 1.35,
      lineDensityKgM3: 6.6,
      viscosityPaS: 2e-5,
      innerDiameterMm: 20.2,
      lengthM: 10,
    });
    expect(r.pressureDropKPa).toBe(0);
  });

  it.each([
    ['length_m', { lengthM: 0 }],
    ['length_m', { lengthM: Number.NaN }],
    ['inner_diameter_mm', { innerDiameterMm: 0 }],
    ['flow_L_min', { flowFreeLMin: -5 }],
    ['viscosity_Pa_s', { viscosityPaS: 0 }],
    ['fittings_allowance_percent', { fittingsAllowancePercent: -10 }],
  ])('refuses a bad %s', (path, patch) => {
    const base = { flowFreeLMin: 300, referenceDensityKgM3: 1.35, lineDensityKgM3: 6.6, viscosityPaS: 2e-5, innerDiameterMm: 20.2, lengthM: 10 };
    try {
      computeDarcyPressureDrop({ ...base, ...patch });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InvalidInputError);
      expect((e as InvalidInputError).details[0].path).toBe(path);
    }
  });
});

describe('tubes and viscosities', () => {
  it('EN 13348 sizes give inner diameters by OD − 2 × wall', () => {
    expect(findCopperTube('22x0.9')!.innerDiameterMm).toBeCloseTo(20.2, 12);
    expect(findCopperTube('108 × 1.5')!.innerDiameterMm).toBeCloseTo(105, 12);
    expect(findCopperTube('23x1')).toBeUndefined();
  });

  it('50:50 N2O/O2 viscosity by Wilke lies between its components', () => {
    const mu = lookupViscosityPaS('N2O_O2_50');
    expect(mu).toBeGreaterThan(lookupViscosityPaS('N2O'));
    expect(mu).toBeLessThan(lookupViscosityPaS('O2'));
  });

  it('unknown gas asks for an explicit viscosity', () => {
    expect(() => lookupViscosityPaS('VAC')).toThrow(InvalidInputError);
  });
});
