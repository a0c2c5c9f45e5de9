/**
 * Published short equations and mixing parameters for the premixed medical gases.
 *
 * Mixture model: the multi-fluid Helmholtz approximation of GERG-2008 (Kunz & Wagner 2012,
 * "The GERG-2008 wide-range equation of state for natural gases and other mixtures: an expansion
 * of GERG-2004", J. Chem. Eng. Data 57, 3032–3091):
 *   α^r(δ, τ, x) = Σᵢ xᵢ α^r_oᵢ(δ, τ),  δ = ρ/ρ_r(x),  τ = T_r(x)/T,
 *   1/ρ_r(x) = Σᵢ xᵢ²/ρ_c,i + Σᵢ<ⱼ 2xᵢxⱼ β_v γ_v (xᵢ+xⱼ)/(β_v² xᵢ + xⱼ) · (ρ_c,i^−⅓ + ρ_c,j^−⅓)³/8
 *   T_r(x)   = Σᵢ xᵢ² T_c,i + Σᵢ<ⱼ 2xᵢxⱼ β_T γ_T (xᵢ+xⱼ)/(β_T² xᵢ + xⱼ) · (T_c,i T_c,j)^½
 * with no departure function (GERG-2008 has none for these pairs).
 *
 * Pure-fluid equations (GERG-2008 Tables A4–A5, the GERG-2004 pure-substance equations):
 * oxygen, nitrogen and argon use the Span–Wagner 12-term (nitrogen 24-term) forms refitted by
 * Kunz & Wagner; helium its own 12-term form. Nitrous oxide is not a GERG-2008 component: its
 * equation is Lemmon & Span (2006), J. Chem. Eng. Data 51, 785.
 *
 * Binary parameters (β_v, γ_v, β_T, γ_T), Kunz & Wagner (2012) Table A8: O2–He 1, 1, 1, 1;
 * N2–O2, N2–Ar, O2–Ar as listed (used to check the mixing code against the air reference
 * equation). N2O–O2: no published parameters; 1, 1, 1, 1 (Lorentz–Berthelot-type combining),
 * an estimate.
 */

export interface ComponentEquation {
  name: string;
  criticalTemperatureK: number;
  criticalDensityMolM3: number;
  n: readonly number[];
  d: readonly number[];
  t: readonly number[];
  l: readonly number[];
}

/** Gas constant of GERG-2008 and of Lemmon & Span (2006), J/(mol·K). */
export const GERG_GAS_CONSTANT = 8.314472;

const SW12_D = [1, 1, 1, 2, 3, 7, 2, 5, 1, 4, 3, 4];
const SW12_T = [0.25, 1.125, 1.5, 1.375, 0.25, 0.875, 0.625, 1.75, 3.625, 3.625, 14.5, 12];
const SW12_L = [0, 0, 0, 0, 0, 0, 1, 1, 2, 2, 3, 3];

export type MixtureComponent = 'O2' | 'HE' | 'N2O' | 'N2' | 'AR';

export const COMPONENT_EQUATIONS: Record<MixtureComponent, ComponentEquation> = {
  O2: {
    name: 'oxygen, GERG-2008 (Kunz & Wagner 2012)',
    criticalTemperatureK: 154.595,
    criticalDensityMolM3: 13630,
    n: [
      0.88878286369701, -2.4879433312148, 0.59750190775886, 0.0096501817061881, 0.07197042871277, 0.00022337443000195, 0.18558686391474, -0.03812936803576,
      -0.15352245383006, -0.026726814910919, -0.025675298677127, 0.0095714302123668,
    ],
    d: SW12_D,
    t: SW12_T,
    l: SW12_L,
  },
  HE: {
    name: 'helium, GERG-2008 (Kunz & Wagner 2012)',
    criticalTemperatureK: 5.1953,
    criticalDensityMolM3: 17399,
    n: [
      -0.45579024006737, 1.2516390754925, -1.5438231650621, 0.020467489707221, -0.34476212380781, -0.020858459512787, 0.016227414711778, -0.057471818200892,
      0.019462416430715, -0.03329568012302, -0.010863577372367, -0.022173365245954,
    ],
    d: [1, 1, 1, 4, 1, 3, 5, 5, 5, 2, 1, 2],
    t: [0, 0.125, 0.75, 1, 0.75, 2.625, 0.125, 1.25, 2, 1, 4.5, 5],
    l: [0, 0, 0, 0, 1, 1, 1, 1, 1, 2, 3, 3],
  },
  N2O: {
    name: 'nitrous oxide, Lemmon & Span (2006)',
    criticalTemperatureK: 309.52,
    criticalDensityMolM3: 10270,
    n: [0.88045, -2.4235, 0.38237, 0.068917, 0.00020367, 0.13122, 0.46032, -0.0036985, -0.23263, -0.00042859, -0.04281, -0.023038],
    d: [1, 1, 1, 3, 7, 1, 2, 5, 1, 1, 4, 2],
    t: [0.25, 1.25, 1.5, 0.25, 0.875, 2.375, 2, 2.125, 3.5, 6.5, 4.75, 12.5],
    l: [0, 0, 0, 0, 0, 1, 1, 1, 2, 2, 2, 3],
  },
  N2: {
    name: 'nitrogen, GERG-2008 (Kunz & Wagner 2012)',
    criticalTemperatureK: 126.192,
    criticalDensityMolM3: 11183.9,
    n: [
      0.59889711801201, -1.6941557480731, 0.24579736191718, -0.23722456755175, 0.017954918715141, 0.014592875720215, 0.10008065936206, 0.73157115385532,
      -0.88372272336366, 0.31887660246708, 0.20766491728799, -0.019379315454158, -0.16936641554983, 0.13546846041701, -0.033066712095307, -0.060690817018557,
      0.012797548292871, 0.0058743664107299, -0.018451951971969, 0.0047226622042472, -0.0052024079680599, 0.043563505956635, -0.036251690750939,
      -0.0028974026866543,
    ],
    d: [1, 1, 2, 2, 4, 4, 1, 1, 1, 2, 3, 6, 2, 3, 3, 4, 4, 2, 3, 4, 5, 6, 6, 7],
    t: [0.125, 1.125, 0.375, 1.125, 0.625, 1.5, 0.625, 2.625, 2.75, 2.125, 2, 1.75, 4.5, 4.75, 5, 4, 4.5, 7.5, 14, 11.5, 26, 28, 30, 16],
    l: [0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 6, 6, 6, 6],
  },
  AR: {
    name: 'argon, GERG-2008 (Kunz & Wagner 2012)',
    criticalTemperatureK: 150.687,
    criticalDensityMolM3: 13407.429659,
    n: [
      0.85095714803969, -2.400322294348, 0.54127841476466, 0.016919770692538, 0.068825965019035, 0.00021428032815338, 0.17429895321992, -0.033654495604194,
      -0.13526799857691, -0.016387350791552, -0.024987666851475, 0.0088769204815709,
    ],
    d: SW12_D,
    t: SW12_T,
    l: SW12_L,
  },
};

export interface BinaryParameters {
  betaV: number;
  gammaV: number;
  betaT: number;
  gammaT: number;
}

/** Binary reducing parameters for the ordered pair "i|j" (β for the reverse order is 1/β). */
export const BINARY_PARAMETERS: Record<string, BinaryParameters> = {
  'O2|HE': { betaV: 1, gammaV: 1, betaT: 1, gammaT: 1 },
  'N2O|O2': { betaV: 1, gammaV: 1, betaT: 1, gammaT: 1 },
  'N2|O2': { betaV: 0.99952177, gammaV: 0.997082328, betaT: 0.997190589, gammaT: 0.995157044 },
  'N2|AR': { betaV: 1.004166412, gammaV: 1.002212182, betaT: 0.999069843, gammaT: 0.990034831 },
  'O2|AR': { betaV: 0.999746847, gammaV: 0.993907223, betaT: 1.000023103, gammaT: 0.990430423 },
};

/** Parameters for (i, j) in either order; Lorentz–Berthelot (all 1) when none are published. */
export function binaryParameters(i: MixtureComponent, j: MixtureComponent): BinaryParameters {
  const direct = BINARY_PARAMETERS[`${i}|${j}`];
  if (direct) return direct;
  const reverse = BINARY_PARAMETERS[`${j}|${i}`];
  if (reverse) return { betaV: 1 / reverse.betaV, gammaV: reverse.gammaV, betaT: 1 / reverse.betaT, gammaT: reverse.gammaT };
  return { betaV: 1, gammaV: 1, betaT: 1, gammaT: 1 };
}
