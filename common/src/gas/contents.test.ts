import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InvalidInputError } from '../api/errors';
import { compressedContents, cylinderDuration, liquefiedContents, pressureAtTemperature } from './contents';
import { GAS_CODES, GAS_INFO, isLiquefiedGas, type GasCode } from './gases';
import { readSaturation, readZGrid } from './testing/reference-tables';

const permanent = GAS_CODES.filter((g) => !isLiquefiedGas(g));

function expectInvalid(fn: () => unknown, path: string): void {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidInputError);
    expect((e as InvalidInputError).details.map((d) => d.path)).toContain(path);
    return;
  }
  throw new Error('expected an InvalidInputError');
}

describe('compressed-gas contents', () => {
  it('mass in the cylinder equals ρ·V with ρ from the reference table', () => {
    // reference equations of state (tests/reference/README.md), value from reference table in tests/reference: density at 288.15 K, 200 bar abs
    for (const gas of ['O2', 'N2', 'AIR', 'AR', 'HE'] as const) {
      const row = readZGrid().find((r) => r.gas === gas && r.temperatureK === 288.15 && r.pressureBarAbs === 200)!;
      const c = compressedContents({ gas, waterCapacityL: 10, pressureBarAbs: 200, temperatureC: 15 });
      expect(Math.abs(c.massKg / (row.densityKgM3 * 0.01) - 1)).toBeLessThan(0.001);
      expect(Math.abs(c.Z / row.Z - 1)).toBeLessThan(0.001);
    }
  });

  it('a 10 L cylinder at 200 bar(g) and 15 °C: real free gas is ×1.07 the ideal for O2, ×0.96 for N2, ×0.91 for He', () => {
    // EU distributor page (consistent with the z-grid in tests/reference): 50 L × 200 bar = 10 m³ ideal;
    // real ≈ ×1.07 (O2), ×0.96 (N2), ×0.91 (He)
    const ratio = (gas: GasCode) => {
      const c = compressedContents({ gas, waterCapacityL: 10, gaugeBar: 200, temperatureC: 15 });
      return c.freeGasL / c.idealFreeGasL;
    };
    expect(ratio('O2')).toBeCloseTo(1.07, 2);
    expect(Math.abs(ratio('N2') - 0.96)).toBeLessThan(0.01);
    expect(ratio('HE')).toBeCloseTo(0.91, 2);
    // ideal: 10 L · 200 bar / 1.01325 bar = 1973.8 L at the same temperature (hand calculation)
    expect(compressedContents({ gas: 'O2', waterCapacityL: 10, gaugeBar: 200, temperatureC: 15 }).idealFreeGasL).toBeCloseTo(1973.85, 1);
  });

  it('47 L at 137 bar holds about 6,800 L of oxygen', () => {
    // HTM 02-01 Part A Table 22 (as quoted in a 2018 military-hospital cylinder calculation): 47 L at 137 bar ≈ 6,800 L O2
    const c = compressedContents({ gas: 'O2', waterCapacityL: 47, gaugeBar: 137, temperatureC: 15 });
    expect(Math.abs(c.freeGasL / 6800 - 1)).toBeLessThan(0.02);
  });

  it('states the free gas on the requested reference basis', () => {
    // hand calculation, ideal gas: 273.15/288.15 = 0.948 (0 °C gives 5.2 % fewer litres than 15 °C); 294.26/288.15 = 1.021 (2.1 % more)
    const base = { gas: 'O2' as const, waterCapacityL: 10, gaugeBar: 200, temperatureC: 15 };
    const at15 = compressedContents(base).freeGasL;
    expect(compressedContents({ ...base, reference: '0C' }).freeGasL / at15 - 1).toBeCloseTo(-0.052, 3);
    expect(compressedContents({ ...base, reference: '21C' }).freeGasL / at15 - 1).toBeCloseTo(0.021, 3);
  });

  it('counts no gas below atmospheric pressure and leaves the gas at 0 bar(g) in the cylinder', () => {
    const empty = compressedContents({ gas: 'O2', waterCapacityL: 10, gaugeBar: 0, temperatureC: 15 });
    expect(empty.freeGasL).toBe(0);
    expect(empty.moles).toBeGreaterThan(0.4); // 10 L of oxygen at 1 atm ≈ 0.42 mol (ideal gas, hand calculation)
    const vacuum = compressedContents({ gas: 'O2', waterCapacityL: 10, gaugeBar: -0.5, temperatureC: 15 });
    expect(vacuum.freeGasL).toBe(0);
    expect(vacuum.cautions.join(' ')).toMatch(/below atmospheric/);
  });

  it('contents rise with pressure (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...permanent),
        fc.double({ min: 0, max: 340, noNaN: true }),
        fc.double({ min: 0.5, max: 8, noNaN: true }),
        fc.double({ min: -30, max: 50, noNaN: true }),
        (gas, p, dp, t) => {
          const lo = compressedContents({ gas, waterCapacityL: 10, gaugeBar: p, temperatureC: t });
          const hi = compressedContents({ gas, waterCapacityL: 10, gaugeBar: p + dp, temperatureC: t });
          expect(hi.moles).toBeGreaterThan(lo.moles);
          expect(hi.freeGasL).toBeGreaterThan(lo.freeGasL);
          expect(hi.massKg).toBeGreaterThan(lo.massKg);
        },
      ),
      { numRuns: 200, seed: 17 },
    );
  });

  it('equivalent gauge at the reference temperature and pressure at another temperature round-trip (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...permanent.filter((g) => g !== 'N2O_O2_50')),
        fc.double({ min: 5, max: 250, noNaN: true }),
        fc.double({ min: -30, max: 50, noNaN: true }),
        (gas, gauge, t) => {
          const c = compressedContents({ gas, waterCapacityL: 10, gaugeBar: gauge, temperatureC: t });
          // the same contents measured at 15 °C show the equivalent gauge pressure
          const at15 = compressedContents({ gas, waterCapacityL: 10, gaugeBar: c.equivalentGaugeBarAtReferenceTemperature, temperatureC: 15 });
          expect(at15.moles / c.moles - 1).toBeCloseTo(0, 9);
          const back = pressureAtTemperature({ gas, gaugeBar: c.equivalentGaugeBarAtReferenceTemperature, temperatureC: 15, newTemperatureC: t });
          expect(back.gaugeBar).toBeCloseTo(gauge, 7);
        },
      ),
      { numRuns: 150, seed: 23 },
    );
  });

  it('a reading taken warm overstates the contents at 15 °C by about 7 % at 35 °C', () => {
    // hand calculation (worked example WE-2): read at 35 °C, 115 bar(g) overstates 15 °C contents by about 7 % (288.15/308.15, ideal gas)
    const warm = compressedContents({ gas: 'O2', waterCapacityL: 2, gaugeBar: 115, temperatureC: 35 });
    const cool = compressedContents({ gas: 'O2', waterCapacityL: 2, gaugeBar: 115, temperatureC: 15 });
    const overstatement = cool.moles / warm.moles - 1;
    expect(overstatement).toBeGreaterThan(0.06);
    expect(overstatement).toBeLessThan(0.1);
    expect(warm.equivalentGaugeBarAtReferenceTemperature).toBeLessThan(115 * 0.95);
  });

  it('warns when the same contents would exceed the validated 350 bar at the other temperature', () => {
    const hot = pressureAtTemperature({ gas: 'O2', gaugeBar: 300, temperatureC: 15, newTemperatureC: 60 });
    expect(hot.pressureBarAbs).toBeGreaterThan(350);
    expect(hot.cautions.join(' ')).toMatch(/extrapolated/);
    expect(pressureAtTemperature({ gas: 'O2', gaugeBar: 200, temperatureC: 15, newTemperatureC: 30 }).cautions).toEqual([]);
  });

  it('carries the 50:50 nitrous oxide/oxygen separation caution when cold', () => {
    // Bracken, Broughton & Hill, BMJ 1968;3:715, and anaesthesia teaching notes: N2O condenses out of the 50:50
    // mixture below about −5.5 to −7 °C (hypoxic hazard); store above 10 °C; ≥ 24 h flat at ≥ 5 °C and invert
    // (sports-medicine gas guidance)
    const cold = compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: 137, temperatureC: -10 });
    expect(cold.cautions.join(' ')).toMatch(/hypoxic/);
    expect(cold.cautions.join(' ')).toMatch(/24 hours/);
    expect(cold.cautions.join(' ')).toMatch(/invert/);
    expect(compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: 137, temperatureC: 5 }).cautions.join(' ')).toMatch(/above 10 °C/);
    expect(compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: 137, temperatureC: 20 }).cautions).toEqual([]);
    expect(compressedContents({ gas: 'O2', waterCapacityL: 10, gaugeBar: 137, temperatureC: -10 }).cautions).toEqual([]);
  });

  it('the separation threshold is inclusive, at the warmest published onset (−5.5 °C), and states the sources’ range', () => {
    const at = compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: 137, temperatureC: -5.5 });
    expect(at.cautions.join(' ')).toMatch(/hypoxic hazard\)\. Before use/);
    expect(at.cautions.join(' ')).toMatch(/−5\.5 to −7 °C/);
    expect(compressedContents({ gas: 'N2O_O2_50', waterCapacityL: 10, gaugeBar: 137, temperatureC: -6 }).cautions.join(' ')).toMatch(/24 hours/);
    // the reading taken cold and asked about at a warm temperature still carries the caution
    expect(pressureAtTemperature({ gas: 'N2O_O2_50', gaugeBar: 120, temperatureC: -8, newTemperatureC: 20 }).cautions.join(' ')).toMatch(/24 hours/);
  });

  it('rejects NaN, non-positive absolute pressure, bad volumes and temperatures outside the range', () => {
    const ok = { gas: 'O2' as const, waterCapacityL: 10, gaugeBar: 200, temperatureC: 15 };
    expectInvalid(() => compressedContents({ ...ok, gaugeBar: Number.NaN }), 'gaugeBar');
    expectInvalid(() => compressedContents({ ...ok, gaugeBar: undefined, pressureBarAbs: -2 }), 'pressureBarAbs');
    expectInvalid(() => compressedContents({ ...ok, gaugeBar: -1.5 }), 'gaugeBar');
    expectInvalid(() => compressedContents({ ...ok, pressureBarAbs: 100 }), 'gaugeBar');
    expectInvalid(() => compressedContents({ ...ok, gaugeBar: 400 }), 'gaugeBar');
    expectInvalid(() => compressedContents({ ...ok, waterCapacityL: 0 }), 'waterCapacityL');
    expectInvalid(() => compressedContents({ ...ok, temperatureC: Number.NaN }), 'temperatureC');
    expectInvalid(() => compressedContents({ ...ok, temperatureC: -80 }), 'temperatureC');
    expectInvalid(() => compressedContents({ ...ok, temperatureC: 130 }), 'temperatureC');
    expectInvalid(() => compressedContents({ ...ok, atmosphericBar: 0 }), 'atmosphericBar');
    expectInvalid(() => compressedContents({ ...ok, gas: 'CO2', gaugeBar: 60 }), 'gaugeBar');
    expectInvalid(() => compressedContents({ ...ok, reference: '20C' as '15C' }), 'reference');
    expectInvalid(() => pressureAtTemperature({ gas: 'O2', gaugeBar: 100, temperatureC: 15, newTemperatureC: Number.NaN }), 'newTemperatureC');
    fc.assert(
      fc.property(fc.constantFrom(...GAS_CODES), fc.double({ min: -1e4, max: 0, noNaN: true }), (gas, p) => {
        expectInvalid(() => compressedContents({ gas, waterCapacityL: 10, pressureBarAbs: p, temperatureC: 15 }), 'pressureBarAbs');
      }),
      { numRuns: 50, seed: 29 },
    );
  });
});

describe('cylinder duration', () => {
  it('is the real gas between the reading and the reserve over the flow (hand calculation from the reference equation)', () => {
    // Schmidt & Wagner (1985) for O2, z-grid in tests/reference, 288.15 K: ρ = 286.878288 kg/m³ at 200 bar abs,
    // 27.108021 kg/m³ at 20 bar abs, 1.354364 kg/m³ at 1.01325 bar (the 15 °C reference). 10 L from 200 down to
    // 20 bar abs: 10 × (286.878288 − 27.108021) / 1.354364 = 1918.03 L of free gas; at 10 L/min 191.80 min.
    const d = cylinderDuration({ gas: 'O2', waterCapacityL: 10, pressureBarAbs: 200, temperatureC: 15, flowLMin: 10, reserveGaugeBar: 20 - 1.01325 });
    expect(Math.abs(d.usableFreeGasL / 1918.03 - 1)).toBeLessThan(0.001);
    expect(Math.abs(d.minutes / 191.803 - 1)).toBeLessThan(0.001);
  });

  it('worked example WE-2: a 460 L / 230 bar cylinder at 115 bar gives about 38 min at 6 L/min, 19 min keeping a quarter', () => {
    // hand calculation with the ideal gas (worked example WE-2): 460 L/230 bar ⇒ 2 L water capacity; 115 bar ⇒ ~230 L; 38 min at 6 L/min;
    // 19 min keeping a ¼ residual (57.5 bar). The real-gas contents of oxygen are ~7 % larger at these pressures.
    const ideal = compressedContents({ gas: 'O2', waterCapacityL: 2, gaugeBar: 115, temperatureC: 15 }).idealFreeGasL;
    expect(ideal / 6).toBeCloseTo(37.8, 1);
    // the worked example runs to empty: reserve 0 given explicitly (the default is now a stated residual)
    const d = cylinderDuration({ gas: 'O2', waterCapacityL: 2, gaugeBar: 115, temperatureC: 15, flowLMin: 6, reserveGaugeBar: 0 });
    expect(d.minutes).toBeGreaterThan(38);
    expect(d.minutes).toBeLessThan(38 * 1.1);
    const kept = cylinderDuration({ gas: 'O2', waterCapacityL: 2, gaugeBar: 115, temperatureC: 15, flowLMin: 6, reserveGaugeBar: 57.5 });
    expect(kept.minutes).toBeGreaterThan(19);
    expect(kept.minutes).toBeLessThan(19 * 1.1);
  });

  it('with no reserve given, duration keeps the stated 200 psi (13.8 bar) residual and says so', () => {
    // US EMS oxygen-cylinder guidance: ~200 psi residual subtracted in duration sums. Hand calculation, ideal gas:
    // 2 L × (115 − 13.79) bar / 1.01325 bar = 199.8 L at 15 °C → 33.3 min at 6 L/min; oxygen's real-gas
    // contents are a few % larger at these pressures (Schmidt & Wagner 1985, z-grid in tests/reference).
    const d = cylinderDuration({ gas: 'O2', waterCapacityL: 2, gaugeBar: 115, temperatureC: 15, flowLMin: 6 });
    expect(d.reserveGaugeBar).toBeCloseTo(13.79, 2);
    expect(d.reserveBasis).toMatch(/200 psi/);
    expect(d.cautions.join(' ')).toMatch(/reserve of 13\.8 bar g/);
    expect(d.minutes).toBeGreaterThan(33.3);
    expect(d.minutes).toBeLessThan(33.3 * 1.08);
  });

  it('worked example WE-1: (2000 − 200 psi) × 0.16 L/psi at 0.5 L/min ≈ 576 min', () => {
    // US EMS oxygen-cylinder guidance (worked example WE-1): 0.16 L/psi at 2000 psi, 200 psi residual, 0.5 L/min: 288 L, 576 min.
    // The 0.16 L/psi cylinder holds ~350 L at 2200 psig (US contents tables, HFM Magazine); 2.2 L of water capacity
    // does that for oxygen at 70 °F (this engine: 351 L), so the engine's real-gas minutes should land near 576.
    const psi = 0.0689475729;
    const full = compressedContents({ gas: 'O2', waterCapacityL: 2.2, gaugeBar: 2200 * psi, temperatureC: 21.1, reference: '21C' });
    expect(full.freeGasL / 2200).toBeCloseTo(0.16, 2);
    const d = cylinderDuration({
      gas: 'O2',
      waterCapacityL: 2.2,
      gaugeBar: 2000 * psi,
      temperatureC: 21.1,
      reference: '21C',
      flowLMin: 0.5,
      reserveGaugeBar: 200 * psi,
    });
    expect(Math.abs(d.minutes / 576 - 1)).toBeLessThan(0.03);
  });

  it('liquefied gases: weighed mass less what stays behind and the reserve mass', () => {
    const base = { gas: 'N2O' as const, grossKg: 20, tareKg: 15, waterCapacityL: 10, temperatureC: 15, flowLMin: 10 };
    const d = cylinderDuration(base);
    // N2O gives 534 L of gas per kg at 15 °C, 1 atm: 1000 / 1.872814 kg/m³ (Lemmon & Span 2006, z-grid in tests/reference)
    expect(d.usableFreeGasL / (5 * 534)).toBeCloseTo(1, 2);
    const withReserve = cylinderDuration({ ...base, reserveKg: 1 });
    expect(d.usableFreeGasL - withReserve.usableFreeGasL).toBeCloseTo(534, -1);
  });

  it('rejects a non-positive flow and a negative reserve', () => {
    const ok = { gas: 'O2' as const, waterCapacityL: 10, gaugeBar: 200, temperatureC: 15, flowLMin: 5 };
    expectInvalid(() => cylinderDuration({ ...ok, flowLMin: 0 }), 'flowLMin');
    expectInvalid(() => cylinderDuration({ ...ok, flowLMin: Number.NaN }), 'flowLMin');
    expectInvalid(() => cylinderDuration({ ...ok, reserveGaugeBar: -1 }), 'reserveGaugeBar');
    expect(cylinderDuration({ ...ok, gaugeBar: 10, reserveGaugeBar: 20 }).minutes).toBe(0);
  });
});

describe('liquefied-gas contents (CO2, N2O)', () => {
  const sat = readSaturation();

  it('sits at the vapour pressure while liquid is present, and counts gas per kg', () => {
    // reference equation of state for CO2 (Span & Wagner, 1996), value from reference table in tests/reference: 50.871474 bar abs at 288.15 K
    const c = liquefiedContents({ gas: 'CO2', grossKg: 22.5, tareKg: 15, waterCapacityL: 10, temperatureC: 15 });
    const row = sat.find((r) => r.gas === 'CO2' && r.temperatureK === 288.15)!;
    expect(c.massKg).toBe(7.5);
    expect(c.fillingRatioKgPerL).toBe(0.75);
    expect(c.liquidPresent).toBe(true);
    expect(Math.abs(c.vapourPressureBarAbs! / row.vapourPressureBarAbs - 1)).toBeLessThan(0.005);
    // CO2 534 L per kg at 15 °C (1000 / 1.871850 kg/m³, Span & Wagner 1996, z-grid in tests/reference), 546 at 21.1 °C
    expect(c.freeGasL / (7.5 * 534)).toBeCloseTo(1, 2);
    const us = liquefiedContents({ gas: 'CO2', grossKg: 22.5, tareKg: 15, waterCapacityL: 10, temperatureC: 15, reference: '21C' });
    expect(us.freeGasL / (7.5 * 546)).toBeCloseTo(1, 2);
  });

  it('flags a liquid-full cylinder when the liquid expands to fill it', () => {
    // reference equation of state for CO2 (Span & Wagner, 1996), saturation table in tests/reference: saturated liquid 593.3 kg/m³ at 303.15 K,
    // so a 0.75 kg/L fill is liquid-full at 30 °C
    const c = liquefiedContents({ gas: 'CO2', grossKg: 22.5, tareKg: 15, waterCapacityL: 10, temperatureC: 30 });
    expect(c.pressureBarAbs).toBeNull();
    expect(c.cautions.join(' ')).toMatch(/Liquid-full/);
  });

  it('has no vapour pressure above the critical temperature and warns', () => {
    // critical temperature of N2O 36.4 °C (OpenAnesthesia; Lemmon & Span 2006: 309.52 K)
    const c = liquefiedContents({ gas: 'N2O', grossKg: 20, tareKg: 15, waterCapacityL: 10, temperatureC: 40 });
    expect(c.vapourPressureBarAbs).toBeNull();
    expect(c.liquidPresent).toBe(false);
    expect(c.pressureBarAbs!).toBeGreaterThan(72.45);
    expect(c.cautions.join(' ')).toMatch(/critical temperature/);
  });

  it('recognises an almost empty cylinder (no liquid left)', () => {
    const c = liquefiedContents({ gas: 'N2O', grossKg: 15.2, tareKg: 15, waterCapacityL: 10, temperatureC: 15 });
    expect(c.liquidPresent).toBe(false);
    expect(c.pressureBarAbs!).toBeLessThan(c.vapourPressureBarAbs!);
  });

  it('rejects gross below tare, NaN and temperatures outside −40…65 °C', () => {
    const ok = { gas: 'CO2' as const, grossKg: 20, tareKg: 15, waterCapacityL: 10, temperatureC: 15 };
    expectInvalid(() => liquefiedContents({ ...ok, grossKg: 14 }), 'grossKg');
    expectInvalid(() => liquefiedContents({ ...ok, tareKg: Number.NaN }), 'tareKg');
    expectInvalid(() => liquefiedContents({ ...ok, temperatureC: 70 }), 'temperatureC');
    expectInvalid(() => liquefiedContents({ ...ok, temperatureC: -41 }), 'temperatureC');
    expectInvalid(() => liquefiedContents({ ...ok, gas: 'O2' as 'CO2' }), 'gas');
  });
});

describe('gas info', () => {
  it('names every gas and gives mixture molar masses by mole fraction', () => {
    for (const gas of GAS_CODES) expect(GAS_INFO[gas].name.length).toBeGreaterThan(3);
    // 0.79·4.002602 + 0.21·31.9988 g/mol = 9.8816 g/mol (hand calculation)
    expect(GAS_INFO.HE_O2_79.molarMassKgMol * 1000).toBeCloseTo(9.8816, 3);
  });
});

describe('liquefied gases read by a gauge', () => {
  // A full N2O cylinder at 15 °C sits at its vapour pressure, 45.037 bar abs (saturation table in
  // tests/reference, Lemmon & Span 2006), i.e. about 44 bar g: the gauge of a full and of a nearly
  // empty cylinder read the same while liquid is left (the gauge "says nothing" about contents).
  // 10 L at a 0.75 kg/L filling ratio holds 7.5 kg (anaesthesia revision notes: filling ratio 0.75 temperate);
  // the vapour-only reading of the old engine gave about 1.3 kg.
  const full = { gas: 'N2O' as const, waterCapacityL: 10, gaugeBar: 44, temperatureC: 15 };

  it('refuses a gauge reading of CO2 or N2O while liquid may be present, telling the person to weigh', () => {
    for (const input of [full, { ...full, gaugeBar: 5 }, { gas: 'CO2' as const, waterCapacityL: 10, gaugeBar: 49, temperatureC: 15 }]) {
      expect(() => compressedContents(input)).toThrow(/weigh the cylinder: gross − tare/);
      expect(() => cylinderDuration({ ...input, flowLMin: 5 })).toThrow(/weigh the cylinder: gross − tare/);
      expect(() => pressureAtTemperature({ ...input, newTemperatureC: 20 })).toThrow(/weigh/);
      expectInvalid(() => compressedContents(input), 'gaugeBar');
    }
  });

  it('with the liquid stated gone, still refuses a reading near the vapour pressure (above 80 % of it)', () => {
    // 0.8 × 45.037 = 36.03 bar abs = 35.0 bar g: 44 bar g and 36 bar g are refused, 34 bar g is accepted
    expect(() => compressedContents({ ...full, liquidGone: true })).toThrow(/liquid may still be present/);
    expect(() => compressedContents({ ...full, gaugeBar: 36, liquidGone: true })).toThrow(/liquid may still be present/);
    expect(compressedContents({ ...full, gaugeBar: 34, liquidGone: true }).massKg).toBeGreaterThan(0);
  });

  it('with the liquid gone and a reading clearly below p_sat: vapour contents as the reference equation gives them', () => {
    // reference equation of state for N2O (Lemmon & Span, 2006), z-grid in tests/reference:
    // 288.15 K, 20 bar abs: ρ = 42.352778 kg/m³ → 10 L hold 0.42353 kg
    const c = compressedContents({ gas: 'N2O', waterCapacityL: 10, pressureBarAbs: 20, temperatureC: 15, liquidGone: true });
    expect(Math.abs(c.massKg / 0.42352778 - 1)).toBeLessThan(0.005);
  });

  it('above the critical temperature (N2O 36.4 °C, OpenAnesthesia; Lemmon & Span 2006: 309.52 K) a pressure reading is accepted', () => {
    expect(compressedContents({ gas: 'N2O', waterCapacityL: 10, gaugeBar: 60, temperatureC: 40 }).massKg).toBeGreaterThan(0);
  });
});
