import { GAS_INFO, type GasCode } from './gases';
import { FITTED_EQUATIONS } from './coefficients';
import { COMPONENT_EQUATIONS, GERG_GAS_CONSTANT, binaryParameters, type MixtureComponent } from './mixture-equations';
import { compileEquation, type CompiledEquation } from './helmholtz-model';

/**
 * Which equation computes which gas:
 * - O2, N2, AIR, AR, HE, CO2: short Helmholtz equations (Span & Wagner 2003 form) fitted to the
 *   reference equation of each gas (coefficients.ts, made by scripts/fit-eos.ts).
 * - N2O: the Lemmon & Span (2006) short equation itself (it is the reference equation).
 * - Mixtures: GERG-2008 multi-fluid model (Kunz & Wagner 2012) without departure function
 *   (mixture-equations.ts).
 */

export function methodFor(gas: GasCode): string {
  return equationFor(gas).method;
}

/** Reducing temperature and density of a multi-fluid mixture (Kunz & Wagner 2012, Eqs. 7.9–7.10). */
export function mixtureReducing(parts: readonly { gas: MixtureComponent; moleFraction: number }[]): { temperatureK: number; densityMolM3: number } {
  let volume = 0;
  let temperature = 0;
  for (let i = 0; i < parts.length; i++) {
    const ci = COMPONENT_EQUATIONS[parts[i].gas];
    const xi = parts[i].moleFraction;
    volume += (xi * xi) / ci.criticalDensityMolM3;
    temperature += xi * xi * ci.criticalTemperatureK;
    for (let j = i + 1; j < parts.length; j++) {
      const cj = COMPONENT_EQUATIONS[parts[j].gas];
      const xj = parts[j].moleFraction;
      const b = binaryParameters(parts[i].gas, parts[j].gas);
      const cubeRoots = Math.cbrt(1 / ci.criticalDensityMolM3) + Math.cbrt(1 / cj.criticalDensityMolM3);
      const fv = xi + xj === 0 ? 0 : (xi + xj) / (b.betaV * b.betaV * xi + xj);
      const ft = xi + xj === 0 ? 0 : (xi + xj) / (b.betaT * b.betaT * xi + xj);
      volume += (2 * xi * xj * b.betaV * b.gammaV * fv * (cubeRoots * cubeRoots * cubeRoots)) / 8;
      temperature += 2 * xi * xj * b.betaT * b.gammaT * ft * Math.sqrt(ci.criticalTemperatureK * cj.criticalTemperatureK);
    }
  }
  return { temperatureK: temperature, densityMolM3: 1 / volume };
}

/** Compiles a GERG-2008-style multi-fluid mixture. */
export function compileMixture(method: string, parts: readonly { gas: MixtureComponent; moleFraction: number }[]): CompiledEquation {
  const r = mixtureReducing(parts);
  return compileEquation(
    method,
    r.temperatureK,
    r.densityMolM3,
    GERG_GAS_CONSTANT,
    parts.map((p) => ({ terms: COMPONENT_EQUATIONS[p.gas], weight: p.moleFraction })),
  );
}

function build(gas: GasCode): CompiledEquation {
  if (gas === 'N2O') {
    const c = COMPONENT_EQUATIONS.N2O;
    return compileEquation('Lemmon & Span (2006) short Helmholtz reference equation', c.criticalTemperatureK, c.criticalDensityMolM3, GERG_GAS_CONSTANT, [
      { terms: c, weight: 1 },
    ]);
  }
  const info = GAS_INFO[gas];
  if (info.components) {
    const parts = info.components.map((c) => ({ gas: c.gas as MixtureComponent, moleFraction: c.moleFraction }));
    const label = parts.map((p) => `${p.gas} ${(p.moleFraction * 100).toFixed(0)}`).join('/');
    const note = gas === 'N2O_O2_50' ? '; N2O–O2 binary parameters not published, set to 1 (estimate)' : '';
    return compileMixture(`GERG-2008 multi-fluid mixture (Kunz & Wagner 2012), no departure function; ${label} mol %${note}`, parts);
  }
  const f = FITTED_EQUATIONS[gas as keyof typeof FITTED_EQUATIONS];
  return compileEquation(`Short Helmholtz equation (Span & Wagner 2003 form), ${f.source}`, f.reducingTemperatureK, f.reducingDensityMolM3, f.gasConstant, [
    { terms: f, weight: 1 },
  ]);
}

const cache = new Map<GasCode, CompiledEquation>();

/** The compiled equation of a gas (built once). */
export function equationFor(gas: GasCode): CompiledEquation {
  let eq = cache.get(gas);
  if (!eq) {
    eq = build(gas);
    cache.set(gas, eq);
  }
  return eq;
}
