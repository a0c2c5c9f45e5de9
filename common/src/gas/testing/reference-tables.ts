/**
 * Test support only (reads files): the reference tables kept in the repository at `tests/reference/`
 * (their sources in the README beside them), so that a clone on its own passes its tests.
 * Values: "reference equation of state for <gas> (<authors, year>), value from reference table in tests/reference".
 */
import { readFileSync } from 'node:fs';

export interface ZGridRow {
  gas: string;
  temperatureK: number;
  pressureBarAbs: number;
  Z: number;
  densityKgM3: number;
  phase: string;
}

export interface SaturationRow {
  gas: 'CO2' | 'N2O';
  temperatureK: number;
  vapourPressureBarAbs: number;
  liquidDensityKgM3: number;
  vapourDensityKgM3: number;
  vapourZ: number;
}

function readTable(name: string): string[][] {
  const url = new URL(`../../../../tests/reference/${name}`, import.meta.url);
  const lines = readFileSync(url, 'utf8').trim().split(/\r?\n/);
  return lines.slice(1).map((line) => line.split(','));
}

export function readZGrid(): ZGridRow[] {
  return readTable('z-grid.csv').map(([gas, t, p, z, rho, phase]) => ({
    gas,
    temperatureK: Number(t),
    pressureBarAbs: Number(p),
    Z: Number(z),
    densityKgM3: Number(rho),
    phase,
  }));
}

export function readSaturation(): SaturationRow[] {
  return readTable('saturation.csv').map(([gas, t, p, rl, rv, zv]) => ({
    gas: gas as 'CO2' | 'N2O',
    temperatureK: Number(t),
    vapourPressureBarAbs: Number(p),
    liquidDensityKgM3: Number(rl),
    vapourDensityKgM3: Number(rv),
    vapourZ: Number(zv),
  }));
}

/** Critical points of the liquefied gases (Span & Wagner 1996; Lemmon & Span 2006). */
export const CRITICAL_POINTS: Record<string, { temperatureK: number; pressureBarAbs: number }> = {
  CO2: { temperatureK: 304.1282, pressureBarAbs: 73.773 },
  N2O: { temperatureK: 309.52, pressureBarAbs: 72.45 },
};

/** True within ±10 K and ±20 bar of the critical point (where the 0.5 % target does not apply). */
export function nearCriticalPoint(gas: string, temperatureK: number, pressureBarAbs: number): boolean {
  const c = CRITICAL_POINTS[gas];
  return !!c && Math.abs(temperatureK - c.temperatureK) <= 10 && Math.abs(pressureBarAbs - c.pressureBarAbs) <= 20;
}
