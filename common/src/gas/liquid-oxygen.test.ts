import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InvalidInputError } from '../api/errors';
import { oxygenSaturationAtPressure } from './oxygen-saturation';
import {
  loxDensityAtTankPressureKgPerL,
  LOX_DENSITY_KG_PER_L,
  contentsFromCalibrationTable,
  freeGasLToLoxLitres,
  kgToLoxLitres,
  levelPercentToKg,
  loxLitresToFreeGasL,
  loxLitresToKg,
} from './liquid-oxygen';

describe('liquid oxygen', () => {
  it('uses the boiling-point liquid density of 1.141 kg/L', () => {
    // encyclopedia value for liquid oxygen: 1.141 kg/L at the normal boiling point (90.19 K)
    expect(LOX_DENSITY_KG_PER_L).toBeCloseTo(1.141, 3);
    expect(loxLitresToKg(1000)).toBeCloseTo(1141.2, 0);
    expect(kgToLoxLitres(loxLitresToKg(123.4))).toBeCloseTo(123.4, 10);
  });

  it('gives about 842 L of gas per litre of liquid at 15 °C, 860 L at 21.1 °C and 798 L at 0 °C', () => {
    // hand calculation from the reference densities of oxygen gas at 1.01325 bar (reference README in tests/reference:
    // 1.35436 kg/m³ at 15 °C, 1.32615 at 21.11 °C; 1.429 at 0 °C, NIST): 1141.17 / ρ → 798 L (0 °C), 842 L (15 °C), 860 L (21.1 °C)
    expect(Math.abs(loxLitresToFreeGasL(1, '15C') / 842 - 1)).toBeLessThan(0.002);
    expect(Math.abs(loxLitresToFreeGasL(1, '21C') / 860 - 1)).toBeLessThan(0.002);
    expect(Math.abs(loxLitresToFreeGasL(1, '0C') / 798 - 1)).toBeLessThan(0.002);
  });

  it('worked example WE-4: 120,600 L of gas a day is about 143 L of liquid', () => {
    // hand calculation: 120,600 L/day ÷ 842 L of gas per L of liquid (15 °C, above) = 143 L LOX/day
    expect(freeGasLToLoxLitres(120600, '15C')).toBeCloseTo(143, 0);
  });

  it('reads percent levels linearly in mass and rejects impossible readings', () => {
    expect(levelPercentToKg(11412, 80)).toBeCloseTo(9129.6, 6);
    expect(() => levelPercentToKg(11412, 101)).toThrow(InvalidInputError);
    expect(() => levelPercentToKg(11412, Number.NaN)).toThrow(InvalidInputError);
    expect(() => levelPercentToKg(0, 50)).toThrow(InvalidInputError);
    expect(() => loxLitresToKg(-1)).toThrow(InvalidInputError);
  });
});

describe('calibration-table interpolation', () => {
  const table = [
    { reading: 0, kg: 0 },
    { reading: 50, kg: 2000 },
    { reading: 100, kg: 5000 },
    { reading: 150, kg: 8600 },
  ];

  it('interpolates linearly between points and hits the points exactly', () => {
    expect(contentsFromCalibrationTable(table, 50)).toBe(2000);
    expect(contentsFromCalibrationTable(table, 75)).toBe(3500);
    expect(contentsFromCalibrationTable(table, 150)).toBe(8600);
    expect(contentsFromCalibrationTable([...table].reverse(), 125)).toBe(6800);
  });

  it('is monotone over the table (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 150, noNaN: true }), fc.double({ min: 0, max: 150, noNaN: true }), (a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        expect(contentsFromCalibrationTable(table, lo)).toBeLessThanOrEqual(contentsFromCalibrationTable(table, hi));
      }),
      { numRuns: 200, seed: 37 },
    );
  });

  it('refuses readings outside the table and tables that are short, repeated or falling', () => {
    expect(() => contentsFromCalibrationTable(table, 151)).toThrow(/outside the calibration table/);
    expect(() => contentsFromCalibrationTable(table, -1)).toThrow(InvalidInputError);
    expect(() => contentsFromCalibrationTable(table, Number.NaN)).toThrow(InvalidInputError);
    expect(() => contentsFromCalibrationTable([{ reading: 0, kg: 0 }], 0)).toThrow(/at least two/);
    expect(() =>
      contentsFromCalibrationTable(
        [
          { reading: 0, kg: 0 },
          { reading: 0, kg: 5 },
        ],
        0,
      ),
    ).toThrow(/twice/);
    expect(() =>
      contentsFromCalibrationTable(
        [
          { reading: 0, kg: 10 },
          { reading: 5, kg: 5 },
        ],
        1,
      ),
    ).toThrow(/not monotone/);
  });
});

describe('liquid oxygen at the tank operating pressure', () => {
  it('saturated-liquid density at several pressures against published values', () => {
    // normal boiling point: 90.19 K, 1.141 kg/L (encyclopedia value for liquid oxygen)
    const nbp = oxygenSaturationAtPressure(1.01325);
    expect(nbp.temperatureK).toBeCloseTo(90.19, 1);
    expect(nbp.liquidDensityKgM3 / 1141).toBeCloseTo(1, 3);
    // warm liquid in a working tank: about 974 kg/m³ at about 120 K and 10 bar (liquid-oxygen reference page)
    const warm = oxygenSaturationAtPressure(10);
    expect(Math.abs(warm.temperatureK - 120)).toBeLessThan(1);
    expect(Math.abs(warm.liquidDensityKgM3 / 974 - 1)).toBeLessThan(0.005);
    // towards the critical point (154.581 K, 50.43 bar, 436.1 kg/m³; Schmidt & Wagner 1985) liquid and vapour meet
    const near = oxygenSaturationAtPressure(50);
    expect(near.temperatureK).toBeGreaterThan(153.5);
    expect(near.temperatureK).toBeLessThan(154.581);
    expect(near.liquidDensityKgM3 - near.vapourDensityKgM3).toBeLessThan(400);
    // the liquid gets lighter as the pressure rises
    const rho = [1.01325, 3, 5, 8, 10, 15].map((p) => oxygenSaturationAtPressure(p).liquidDensityKgM3);
    for (let i = 1; i < rho.length; i++) expect(rho[i]).toBeLessThan(rho[i - 1]);
  });

  it('a tank at its default 7 bar g converts litres at the warm density, not the boiling-point one', () => {
    const d = loxDensityAtTankPressureKgPerL();
    // between the 10 bar abs (976) and 5 bar abs (1042) values above: 8 bar abs lies near 1,003 kg/m³
    expect(d).toBeGreaterThan(0.976);
    expect(d).toBeLessThan(1.042);
    expect(loxLitresToKg(1000, d)).toBeLessThan(loxLitresToKg(1000) * 0.9);
    expect(() => loxDensityAtTankPressureKgPerL(60)).toThrow(InvalidInputError);
  });
});
