import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../api/errors';
import { computeDarcyPressureDrop, lookupViscosityPaS } from './pipe-hydraulics';
import { computePipeRunCapacityLMin, computePipeRunPressureDrop, type PipeRunSpec } from './pipe-run';

// Reference multiparameter EOS values (reference table in tests/reference z-grid.csv): gas,T_K,p_bar_abs,Z,rho_kg_m3,phase
const zGrid = readFileSync(new URL('../../../tests/reference/z-grid.csv', import.meta.url), 'utf8')
  .trim()
  .split('\n')
  .slice(1)
  .map((line) => line.split(','));
function referenceDensity(gas: string, temperatureK: number, pressureBarAbs: number): number {
  const row = zGrid.find((r) => r[0] === gas && Number(r[1]) === temperatureK && Number(r[2]) === pressureBarAbs);
  if (!row) throw new Error(`no reference row for ${gas} ${temperatureK} K ${pressureBarAbs} bar`);
  return Number(row[4]);
}

// Inlet exactly 5 bar abs at 20 °C so the line state sits on the reference grid.
const o2Run: PipeRunSpec = {
  gas: 'O2',
  innerDiameterMm: 20.2,
  lengthM: 50,
  fittingsAllowancePercent: 20,
  linePressureKPaGauge: 398.675,
  atmosphericPressureBarAbs: 1.01325,
  gasTemperatureK: 293.15,
  viscosityPaS: 20.4e-6,
};

describe('pipe run with real-gas density from the gas engine', () => {
  it('densities agree with the reference EOS within 0.3 % at line and reference states', () => {
    const r = computePipeRunPressureDrop(o2Run, 500);
    // reference EOS for O2 (Schmidt & Wagner 1985), tests/reference: 1.354364 kg/m³ at 288.15 K, 1.01325 bar
    expect(r.referenceDensityKgM3 / referenceDensity('O2', 288.15, 1.01325)).toBeCloseTo(1, 2);
    // line density is taken at the mean pressure: scale the 5 bar table value by pressure (Z is flat here)
    const expectedLine = referenceDensity('O2', 293.15, 5) * (r.meanPressureBarAbs / 5);
    expect(Math.abs(r.lineDensityKgM3 / expectedLine - 1)).toBeLessThan(0.003);
  });

  it('reproduces the hand calculation once the mean-pressure density is allowed for', () => {
    // Hand calculation in pipe-hydraulics.test.ts: 6.4015 kPa with the 5 bar density. At fixed mass flow
    // ΔP ∝ 1/ρ (f barely moves: Re does not depend on ρ), so the mean-pressure result is 6.4015 × 5 / p_mean.
    const r = computePipeRunPressureDrop(o2Run, 500);
    expect(r.inletPressureBarAbs).toBeCloseTo(5, 12);
    expect(r.meanPressureBarAbs).toBeCloseTo(5 - r.pressureDropKPa / 200, 6);
    expect(Math.abs(r.pressureDropKPa / ((6.4015 * 5) / r.meanPressureBarAbs) - 1)).toBeLessThan(0.003);
    expect(r.allowedDropKPa).toBeCloseTo(0.05 * 398.675, 9);
    expect(r.withinAllowance).toBe(true);
  });

  it('agrees with the core Darcy function fed the reference densities at the same mean pressure', () => {
    const r = computePipeRunPressureDrop(o2Run, 800);
    const core = computeDarcyPressureDrop({
      flowFreeLMin: 800,
      referenceDensityKgM3: referenceDensity('O2', 288.15, 1.01325),
      lineDensityKgM3: referenceDensity('O2', 293.15, 5) * (r.meanPressureBarAbs / 5),
      viscosityPaS: 20.4e-6,
      innerDiameterMm: 20.2,
      lengthM: 50,
      fittingsAllowancePercent: 20,
    });
    expect(Math.abs(r.pressureDropKPa / core.pressureDropKPa - 1)).toBeLessThan(0.005);
  });

  it('states the defaults it assumed', () => {
    const r = computePipeRunPressureDrop({ gas: 'AIR', innerDiameterMm: 20.2, lengthM: 30 }, 200);
    expect(r.assumptions.join(' | ')).toMatch(/400 kPa gauge/);
    expect(r.assumptions.join(' | ')).toMatch(/fittings allowance 20 %/);
    expect(r.assumptions.join(' | ')).toMatch(/5 % of line pressure/);
    expect(r.allowedDropKPa).toBe(20);
  });

  it('capacity is the flow whose drop equals the allowance', () => {
    const atFive = computePipeRunPressureDrop(o2Run, 500);
    const { capacityLMin, atCapacity } = computePipeRunCapacityLMin({ ...o2Run, allowedDropKPa: atFive.pressureDropKPa });
    expect(capacityLMin).toBeCloseTo(500, 2);
    expect(atCapacity.pressureDropKPa).toBeCloseTo(atFive.pressureDropKPa, 4);
  });

  it('refuses a pipe with no length or zero diameter', () => {
    expect(() => computePipeRunPressureDrop({ ...o2Run, lengthM: 0 }, 100)).toThrow(InvalidInputError);
    expect(() => computePipeRunPressureDrop({ ...o2Run, innerDiameterMm: 0 }, 100)).toThrow(InvalidInputError);
    expect(() => computePipeRunPressureDrop({ ...o2Run, linePressureKPaGauge: 0 }, 100)).toThrow(InvalidInputError);
  });
});

describe('from-memory defaults and the gas temperature', () => {
  it('viscosity follows the gas temperature (air: 17.2 µPa·s at 0 °C, CRC Handbook value, from memory)', () => {
    expect(lookupViscosityPaS('AIR', 273.15) / 17.2e-6).toBeCloseTo(1, 1);
    expect(Math.abs(lookupViscosityPaS('AIR', 273.15) / 17.2e-6 - 1)).toBeLessThan(0.02);
    expect(lookupViscosityPaS('O2', 233.15)).toBeLessThan(lookupViscosityPaS('O2', 293.15));
    expect(lookupViscosityPaS('N2O_O2_50', 253.15)).toBeLessThan(lookupViscosityPaS('N2O_O2_50', 293.15));
  });

  it('a verdict resting on from-memory defaults says so next to it; one from given figures does not', () => {
    const byDefault = computePipeRunPressureDrop({ gas: 'O2', innerDiameterMm: 20.2, innerDiameterFromTubeTable: true, lengthM: 50 }, 500);
    expect(byDefault.verdictNote).toMatch(/resting on from-memory defaults/);
    expect(byDefault.verdictNote).toMatch(/fittings allowance/);
    expect(byDefault.verdictNote).toMatch(/allowed drop/);
    expect(byDefault.verdictNote).toMatch(/EN 13348/);
    expect(byDefault.verdictNote).toMatch(/viscosity/);
    const given = computePipeRunPressureDrop(
      { gas: 'O2', innerDiameterMm: 20.2, lengthM: 50, fittingsAllowancePercent: 30, allowedDropKPa: 20, viscosityPaS: 2.04e-5, roughnessMm: 0.0015 },
      500,
    );
    expect(given.verdictNote).toMatch(/from the figures given/);
  });
});
