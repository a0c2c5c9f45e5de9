/**
 * Pressure drop of a gas pipe run: Darcy–Weisbach with the Colebrook–White friction factor
 * (solved iteratively) or the explicit Swamee–Jain (1976) approximation. Pure: densities and
 * viscosity come in as numbers (pipe-run.ts fetches them from the gas engine).
 */
import { hasKey } from '../api/lookup';
import { InvalidInputError, type FieldIssue } from '../api/errors';

/** A nominal copper tube: outside diameter × wall thickness, mm. */
export interface CopperTube {
  id: string;
  outsideDiameterMm: number;
  wallMm: number;
  innerDiameterMm: number;
}

/**
 * Medical copper tube sizes, EN 13348 (outside diameter × wall, mm). From memory, not checked
 * against the standard's table: confirm the wall of the installed tube before relying on it.
 */
export const EN13348_TUBES: CopperTube[] = [
  [12, 0.6],
  [15, 0.7],
  [22, 0.9],
  [28, 0.9],
  [35, 1.2],
  [42, 1.2],
  [54, 1.2],
  [76.1, 1.5],
  [108, 1.5],
].map(([od, wall]) => ({
  id: `${od}x${wall}`,
  outsideDiameterMm: od,
  wallMm: wall,
  innerDiameterMm: Math.round((od - 2 * wall) * 1e9) / 1e9,
}));

export const EN13348_TUBES_SOURCE = 'EN 13348 medical copper tube sizes, from memory (not verified)';

/** Finds a tube by "22x0.9" (also "22 x 0.9", "22×0.9"). */
export function findCopperTube(id: string): CopperTube | undefined {
  const key = id.replace(/\s+/g, '').replace('×', 'x').toLowerCase();
  return EN13348_TUBES.find((t) => t.id === key);
}

/**
 * Absolute roughness of drawn copper tube, mm: 0.0015 mm, the usual handbook value for drawn
 * tubing (from memory). At these sizes the flow is close to hydraulically smooth anyway.
 */
export const DRAWN_COPPER_ROUGHNESS_MM = 0.0015;

/** Dynamic viscosity near 20 °C and 1 atm, Pa·s, with molar mass (g/mol) for mixing. */
export const PURE_GAS_VISCOSITY: Record<'O2' | 'N2' | 'AIR' | 'AR' | 'HE' | 'CO2' | 'N2O', { viscosityPaS: number; molarMassGMol: number }> = {
  // Viscosities: typical handbook values at 20 °C, from memory (within a few per cent of the
  // reference correlations; the pressure effect up to ~10 bar is under 1 %).
  // Molar masses: reference fluid files (tests/reference/README.md).
  O2: { viscosityPaS: 20.4e-6, molarMassGMol: 31.999 },
  N2: { viscosityPaS: 17.6e-6, molarMassGMol: 28.013 },
  AIR: { viscosityPaS: 18.2e-6, molarMassGMol: 28.965 },
  AR: { viscosityPaS: 22.3e-6, molarMassGMol: 39.948 },
  HE: { viscosityPaS: 19.6e-6, molarMassGMol: 4.003 },
  CO2: { viscosityPaS: 14.7e-6, molarMassGMol: 44.01 },
  N2O: { viscosityPaS: 14.6e-6, molarMassGMol: 44.013 },
};
export const VISCOSITY_SOURCE =
  'dynamic viscosities at 20 °C: typical handbook values, from memory, carried to the gas temperature by Sutherland’s law (constants from memory); mixtures by Wilke (1950)';

type PureViscosityGas = keyof typeof PURE_GAS_VISCOSITY;

/** Mixture compositions by mole (= volume) fraction, for the viscosity mixing rule. */
export const MIXTURE_MOLE_FRACTIONS: Record<'N2O_O2_50' | 'HE_O2_79' | 'HE_O2_80', Partial<Record<PureViscosityGas, number>>> = {
  N2O_O2_50: { N2O: 0.5, O2: 0.5 },
  HE_O2_79: { HE: 0.79, O2: 0.21 },
  HE_O2_80: { HE: 0.8, O2: 0.2 },
};

/**
 * Viscosity of a gas mixture by Wilke's mixing rule (Wilke 1950, J. Chem. Phys. 18, 517).
 * @param moleFractions mole fraction per component (sum 1)
 * @returns Pa·s
 */
export function computeWilkeViscosityPaS(moleFractions: Partial<Record<PureViscosityGas, number>>, viscosityOf?: (gas: PureViscosityGas) => number): number {
  const parts = Object.entries(moleFractions).map(([g, x]) => {
    const base = PURE_GAS_VISCOSITY[g as PureViscosityGas];
    return { x: x!, molarMassGMol: base.molarMassGMol, viscosityPaS: viscosityOf ? viscosityOf(g as PureViscosityGas) : base.viscosityPaS };
  });
  let mu = 0;
  for (const i of parts) {
    let denom = 0;
    for (const j of parts) {
      const phi =
        (1 + Math.sqrt(i.viscosityPaS / j.viscosityPaS) * Math.pow(j.molarMassGMol / i.molarMassGMol, 0.25)) ** 2 /
        Math.sqrt(8 * (1 + i.molarMassGMol / j.molarMassGMol));
      denom += j.x * phi;
    }
    mu += (i.x * i.viscosityPaS) / denom;
  }
  return mu;
}

/**
 * Sutherland constants, K (Sutherland 1893: μ(T) = μ₀·(T/T₀)^1.5·(T₀ + S)/(T + S)): typical handbook
 * values, from memory; good to a few per cent over −40 to +60 °C.
 */
export const SUTHERLAND_CONSTANT_K: Record<PureViscosityGas, number> = { O2: 127, N2: 111, AIR: 120, AR: 144, HE: 79.4, CO2: 240, N2O: 260 };
const VISCOSITY_TABLE_TEMPERATURE_K = 293.15;

/** A pure gas's viscosity at T by Sutherland's law from the 20 °C table value, Pa·s. */
function viscosityAt(gas: PureViscosityGas, temperatureK: number): number {
  const t0 = VISCOSITY_TABLE_TEMPERATURE_K;
  const sC = SUTHERLAND_CONSTANT_K[gas];
  return PURE_GAS_VISCOSITY[gas].viscosityPaS * Math.pow(temperatureK / t0, 1.5) * ((t0 + sC) / (temperatureK + sC));
}

/**
 * Dynamic viscosity of any pipeline gas the engine knows at the gas temperature, Pa·s: the 20 °C table
 * value carried to T by Sutherland's law; mixtures by Wilke (1950) from the components at T.
 * @param temperatureK gas temperature, K (default 293.15)
 */
export function lookupViscosityPaS(gas: string, temperatureK = VISCOSITY_TABLE_TEMPERATURE_K): number {
  if (hasKey(PURE_GAS_VISCOSITY, gas)) return viscosityAt(gas as PureViscosityGas, temperatureK);
  if (hasKey(MIXTURE_MOLE_FRACTIONS, gas)) {
    const fractions = MIXTURE_MOLE_FRACTIONS[gas as keyof typeof MIXTURE_MOLE_FRACTIONS];
    return computeWilkeViscosityPaS(fractions, (g) => viscosityAt(g, temperatureK));
  }
  throw new InvalidInputError(`No viscosity is known for "${gas}"; give viscosity_Pa_s`, [{ path: 'gas', message: 'no viscosity for this gas' }]);
}

export type FrictionCorrelation = 'colebrook_white' | 'swamee_jain';
export type FlowRegime = 'laminar' | 'transitional' | 'turbulent';

/**
 * Darcy friction factor by Swamee & Jain (1976), explicit:
 * f = 0.25 / [log10(ε/(3.7 D) + 5.74 / Re^0.9)]². Valid for 5000 ≤ Re ≤ 1e8, 1e-6 ≤ ε/D ≤ 1e-2.
 * @param reynolds Reynolds number
 * @param relativeRoughness ε/D
 */
export function computeSwameeJainFriction(reynolds: number, relativeRoughness: number): number {
  const l = Math.log10(relativeRoughness / 3.7 + 5.74 / Math.pow(reynolds, 0.9));
  return 0.25 / (l * l);
}

/**
 * Darcy friction factor by Colebrook–White (1939), solved by fixed-point iteration on 1/√f:
 * 1/√f = −2 log10(ε/(3.7 D) + 2.51 / (Re √f)), started from Swamee–Jain; stops at 1e-12 relative.
 * @param reynolds Reynolds number (turbulent range)
 * @param relativeRoughness ε/D
 */
export function computeColebrookWhiteFriction(reynolds: number, relativeRoughness: number): number {
  let x = 1 / Math.sqrt(computeSwameeJainFriction(reynolds, relativeRoughness));
  for (let i = 0; i < 100; i++) {
    const next = -2 * Math.log10(relativeRoughness / 3.7 + (2.51 * x) / reynolds);
    if (Math.abs(next - x) <= 1e-12 * Math.abs(x)) {
      x = next;
      break;
    }
    x = next;
  }
  return 1 / (x * x);
}

/**
 * Darcy friction factor for any regime: 64/Re below Re 2300 (Hagen–Poiseuille); above, the chosen
 * turbulent correlation. Between 2300 and 4000 the turbulent value is used, which errs high.
 */
export function computeDarcyFriction(
  reynolds: number,
  relativeRoughness: number,
  correlation: FrictionCorrelation,
): { frictionFactor: number; regime: FlowRegime } {
  if (reynolds < 2300) return { frictionFactor: 64 / reynolds, regime: 'laminar' };
  const f = correlation === 'swamee_jain' ? computeSwameeJainFriction(reynolds, relativeRoughness) : computeColebrookWhiteFriction(reynolds, relativeRoughness);
  return { frictionFactor: f, regime: reynolds < 4000 ? 'transitional' : 'turbulent' };
}

export interface DarcyPressureDropInput {
  /** flow as free gas at the pipeline's reference conditions, L/min */
  flowFreeLMin: number;
  /** gas density at the reference conditions of the free-gas flow, kg/m³ */
  referenceDensityKgM3: number;
  /** gas density in the pipe (line pressure and temperature), kg/m³ */
  lineDensityKgM3: number;
  /** dynamic viscosity, Pa·s */
  viscosityPaS: number;
  innerDiameterMm: number;
  lengthM: number;
  /** fittings as a percentage of the straight length (e.g. 20) */
  fittingsAllowancePercent?: number;
  /** fittings as an added equivalent length, m */
  fittingsEquivalentLengthM?: number;
  /** absolute roughness, mm (default drawn copper 0.0015) */
  roughnessMm?: number;
  correlation?: FrictionCorrelation;
}

export interface DarcyPressureDropResult {
  /** flow at line conditions, L/min (free-gas flow × reference density ÷ line density) */
  actualFlowLMin: number;
  massFlowKgS: number;
  velocityMS: number;
  reynolds: number;
  regime: FlowRegime;
  frictionFactor: number;
  effectiveLengthM: number;
  pressureDropKPa: number;
}

function positive(issues: FieldIssue[], path: string, value: number | undefined, what: string, allowZero = false): void {
  if (value === undefined) return;
  if (!Number.isFinite(value) || value < 0 || (!allowZero && value === 0)) {
    issues.push({ path, message: `${what} must be ${allowZero ? '≥ 0' : '> 0'} (got ${value})` });
  }
}

/**
 * Pressure drop of one pipe run by Darcy–Weisbach: ΔP = f·(L_eff/D)·ρv²/2, with v the actual
 * velocity at line density and f from computeDarcyFriction. L_eff = L·(1 + allowance %/100) + L_eq.
 * Mass is conserved, so the free-gas flow becomes actual flow by the density ratio.
 * Throws InvalidInputError for a missing length, a zero diameter and the like.
 */
export function computeDarcyPressureDrop(input: DarcyPressureDropInput): DarcyPressureDropResult {
  const issues: FieldIssue[] = [];
  positive(issues, 'flow_L_min', input.flowFreeLMin, 'Flow', true);
  positive(issues, 'reference_density_kg_m3', input.referenceDensityKgM3, 'Reference density');
  positive(issues, 'line_density_kg_m3', input.lineDensityKgM3, 'Line density');
  positive(issues, 'viscosity_Pa_s', input.viscosityPaS, 'Viscosity');
  positive(issues, 'inner_diameter_mm', input.innerDiameterMm, 'The inner diameter');
  positive(issues, 'length_m', input.lengthM, 'The pipe length');
  positive(issues, 'fittings_allowance_percent', input.fittingsAllowancePercent, 'The fittings allowance', true);
  positive(issues, 'fittings_equivalent_length_m', input.fittingsEquivalentLengthM, 'The fittings equivalent length', true);
  positive(issues, 'roughness_mm', input.roughnessMm, 'The roughness', true);
  if (issues.length > 0) throw new InvalidInputError(`Cannot compute the pressure drop: ${issues[0].message}`, issues);

  const d = input.innerDiameterMm / 1000;
  const area = (Math.PI * d * d) / 4;
  const massFlowKgS = (input.flowFreeLMin / 60000) * input.referenceDensityKgM3;
  const actualM3S = massFlowKgS / input.lineDensityKgM3;
  const velocityMS = actualM3S / area;
  const effectiveLengthM = input.lengthM * (1 + (input.fittingsAllowancePercent ?? 0) / 100) + (input.fittingsEquivalentLengthM ?? 0);
  const base = { actualFlowLMin: actualM3S * 60000, massFlowKgS, velocityMS, effectiveLengthM };
  if (input.flowFreeLMin === 0) {
    return { ...base, reynolds: 0, regime: 'laminar', frictionFactor: 0, pressureDropKPa: 0 };
  }
  const reynolds = (input.lineDensityKgM3 * velocityMS * d) / input.viscosityPaS;
  const roughnessMm = input.roughnessMm ?? DRAWN_COPPER_ROUGHNESS_MM;
  const { frictionFactor, regime } = computeDarcyFriction(reynolds, roughnessMm / input.innerDiameterMm, input.correlation ?? 'colebrook_white');
  const dpPa = ((frictionFactor * effectiveLengthM) / d) * ((input.lineDensityKgM3 * velocityMS * velocityMS) / 2);
  return { ...base, reynolds, regime, frictionFactor, pressureDropKPa: dpPa / 1000 };
}
