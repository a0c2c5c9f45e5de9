/**
 * The medical gases Plenum knows, with the constants the engines need.
 *
 * Molar masses of the pure fluids are those of their reference equations of state (the same values
 * the reference table in tests/reference was computed with); mixtures are defined by mole fraction and their molar
 * mass is the mole-fraction average. Critical constants: the reference equations of state (Schmidt &
 * Wagner 1985; Span et al. 2000; Lemmon et al. 2000; Tegeler et al. 1999; Ortiz-Vega et al. 2019;
 * Span & Wagner 1996; Lemmon & Span 2006). Acentric factors are used only by the Peng–Robinson
 * comparison model.
 */

export type GasCode = 'O2' | 'N2' | 'AIR' | 'AR' | 'HE' | 'CO2' | 'N2O' | 'N2O_O2_50' | 'HE_O2_79' | 'HE_O2_80';

/** Pure (or pseudo-pure) fluids that mixtures are built from. */
export type PureGasCode = 'O2' | 'N2' | 'AIR' | 'AR' | 'HE' | 'CO2' | 'N2O';
export type MixtureGasCode = 'N2O_O2_50' | 'HE_O2_79' | 'HE_O2_80';
export type LiquefiedGasCode = 'CO2' | 'N2O';

export const GAS_CODES: readonly GasCode[] = ['O2', 'N2', 'AIR', 'AR', 'HE', 'CO2', 'N2O', 'N2O_O2_50', 'HE_O2_79', 'HE_O2_80'];
export const PURE_GAS_CODES: readonly PureGasCode[] = ['O2', 'N2', 'AIR', 'AR', 'HE', 'CO2', 'N2O'];

export interface PureFluidConstants {
  molarMassKgMol: number;
  criticalTemperatureK: number;
  criticalPressureBarAbs: number;
  /** Critical molar density, mol/m³ (reducing density of the equation of state). */
  criticalDensityMolM3: number;
  acentricFactor: number;
}

export interface GasInfo {
  code: GasCode;
  name: string;
  formula: string;
  kind: 'pure' | 'pseudo-pure' | 'mixture';
  /** Sold by weight and held as liquid under its vapour pressure (CO2, N2O). */
  liquefied: boolean;
  molarMassKgMol: number;
  /** Mole fractions of the components (mixtures only). */
  components?: readonly { gas: PureGasCode; moleFraction: number }[];
  /** Temperature range the engine accepts for this gas, K. */
  minTemperatureK: number;
  maxTemperatureK: number;
}

/** Constants of the pure fluids (reference equations of state; air as a pseudo-pure fluid). */
export const PURE_FLUIDS: Record<PureGasCode, PureFluidConstants> = {
  // Schmidt & Wagner (1985)
  O2: { molarMassKgMol: 0.0319988, criticalTemperatureK: 154.581, criticalPressureBarAbs: 50.43, criticalDensityMolM3: 13630, acentricFactor: 0.0222 },
  // Span, Lemmon, Jacobsen, Wagner & Yokozeki (2000)
  N2: { molarMassKgMol: 0.02801348, criticalTemperatureK: 126.192, criticalPressureBarAbs: 33.958, criticalDensityMolM3: 11183.9, acentricFactor: 0.0372 },
  // Lemmon, Jacobsen, Penoncello & Friend (2000): maxcondentherm-based reducing point of the pseudo-pure fluid
  AIR: { molarMassKgMol: 0.02896546, criticalTemperatureK: 132.6312, criticalPressureBarAbs: 37.85, criticalDensityMolM3: 10447.7, acentricFactor: 0.0335 },
  // Tegeler, Span & Wagner (1999)
  AR: { molarMassKgMol: 0.039948, criticalTemperatureK: 150.687, criticalPressureBarAbs: 48.63, criticalDensityMolM3: 13407.43, acentricFactor: -0.00219 },
  // Ortiz-Vega et al. (2019), helium-4
  HE: { molarMassKgMol: 0.004002602, criticalTemperatureK: 5.1953, criticalPressureBarAbs: 2.2832, criticalDensityMolM3: 17383.7, acentricFactor: -0.385 },
  // Span & Wagner (1996)
  CO2: { molarMassKgMol: 0.0440098, criticalTemperatureK: 304.1282, criticalPressureBarAbs: 73.773, criticalDensityMolM3: 10624.9063, acentricFactor: 0.22394 },
  // Lemmon & Span (2006)
  N2O: { molarMassKgMol: 0.0440128, criticalTemperatureK: 309.52, criticalPressureBarAbs: 72.45, criticalDensityMolM3: 10270, acentricFactor: 0.162 },
};

function mixtureMolarMass(components: readonly { gas: PureGasCode; moleFraction: number }[]): number {
  return components.reduce((sum, c) => sum + c.moleFraction * PURE_FLUIDS[c.gas].molarMassKgMol, 0);
}

const N2O_O2_50 = [
  { gas: 'N2O', moleFraction: 0.5 },
  { gas: 'O2', moleFraction: 0.5 },
] as const;
const HE_O2_79 = [
  { gas: 'HE', moleFraction: 0.79 },
  { gas: 'O2', moleFraction: 0.21 },
] as const;
const HE_O2_80 = [
  { gas: 'HE', moleFraction: 0.8 },
  { gas: 'O2', moleFraction: 0.2 },
] as const;

/** Display names and engine limits of every gas. */
export const GAS_INFO: Record<GasCode, GasInfo> = {
  O2: {
    code: 'O2',
    name: 'Oxygen',
    formula: 'O₂',
    kind: 'pure',
    liquefied: false,
    molarMassKgMol: PURE_FLUIDS.O2.molarMassKgMol,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  N2: {
    code: 'N2',
    name: 'Nitrogen',
    formula: 'N₂',
    kind: 'pure',
    liquefied: false,
    molarMassKgMol: PURE_FLUIDS.N2.molarMassKgMol,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  AIR: {
    code: 'AIR',
    name: 'Medical air',
    formula: 'air',
    kind: 'pseudo-pure',
    liquefied: false,
    molarMassKgMol: PURE_FLUIDS.AIR.molarMassKgMol,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  AR: {
    code: 'AR',
    name: 'Argon',
    formula: 'Ar',
    kind: 'pure',
    liquefied: false,
    molarMassKgMol: PURE_FLUIDS.AR.molarMassKgMol,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  HE: {
    code: 'HE',
    name: 'Helium',
    formula: 'He',
    kind: 'pure',
    liquefied: false,
    molarMassKgMol: PURE_FLUIDS.HE.molarMassKgMol,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  CO2: {
    code: 'CO2',
    name: 'Carbon dioxide',
    formula: 'CO₂',
    kind: 'pure',
    liquefied: true,
    molarMassKgMol: PURE_FLUIDS.CO2.molarMassKgMol,
    minTemperatureK: 220,
    maxTemperatureK: 400,
  },
  N2O: {
    code: 'N2O',
    name: 'Nitrous oxide',
    formula: 'N₂O',
    kind: 'pure',
    liquefied: true,
    molarMassKgMol: PURE_FLUIDS.N2O.molarMassKgMol,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  N2O_O2_50: {
    code: 'N2O_O2_50',
    name: '50:50 nitrous oxide/oxygen',
    formula: 'N₂O/O₂ 50:50',
    kind: 'mixture',
    liquefied: false,
    molarMassKgMol: mixtureMolarMass(N2O_O2_50),
    components: N2O_O2_50,
    minTemperatureK: 233.15,
    maxTemperatureK: 400,
  },
  HE_O2_79: {
    code: 'HE_O2_79',
    name: 'Heliox 79/21',
    formula: 'He/O₂ 79:21',
    kind: 'mixture',
    liquefied: false,
    molarMassKgMol: mixtureMolarMass(HE_O2_79),
    components: HE_O2_79,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
  HE_O2_80: {
    code: 'HE_O2_80',
    name: 'Heliox 80/20',
    formula: 'He/O₂ 80:20',
    kind: 'mixture',
    liquefied: false,
    molarMassKgMol: mixtureMolarMass(HE_O2_80),
    components: HE_O2_80,
    minTemperatureK: 200,
    maxTemperatureK: 400,
  },
};

/** Highest absolute pressure the engine accepts for any gas, bar. */
export const MAX_PRESSURE_BAR_ABS = 350;

/** Molar gas constant, J/(mol·K) (CODATA 2018, exact). */
export const R_J_MOL_K = 8.314462618;

/** True if `value` is one of the gas codes. */
export function isGasCode(value: unknown): value is GasCode {
  return typeof value === 'string' && (GAS_CODES as readonly string[]).includes(value);
}

/** Molar mass of a gas or mixture, kg/mol (reference-EOS values; mixtures by mole fraction). */
export function molarMassKgMol(gas: GasCode): number {
  return GAS_INFO[gas].molarMassKgMol;
}

/** True for the gases stored as liquid under their own vapour pressure and sold by weight (CO2, N2O). */
export function isLiquefiedGas(gas: GasCode | string): gas is LiquefiedGasCode {
  return gas === 'CO2' || gas === 'N2O';
}

/** True for the three mixtures (composition by mole fraction). */
export function isMixture(gas: GasCode): gas is MixtureGasCode {
  return GAS_INFO[gas].kind === 'mixture';
}
