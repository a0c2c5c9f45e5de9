/**
 * The published reference equations of state (residual Helmholtz energy) of the pure gases, used to
 * generate the dense fitting data for coefficients.ts (scripts/fit-eos.ts) and by tests as a second,
 * independent check. At run time the engine uses one of them only for CO2 within ±10 K and ±20 bar
 * of its critical point, where no short form is accurate (eos.ts); elsewhere they are too slow
 * (12–42 terms, non-analytic critical-region terms, a bracketing density solver).
 *
 * α^r(δ, τ) with δ = ρ/ρ_r, τ = T_r/T. Term kinds:
 *   power:   n·δ^d·τ^t·exp(−δ^l)                       (no exponential when l = 0)
 *   gauss:   n·δ^d·τ^t·exp(−η(δ−ε)² − β(τ−γ)²)
 *   nonAnalytic (CO2): n·Δ^b·δ·ψ, Δ = θ² + B[(δ−1)²]^a, θ = (1−τ) + A[(δ−1)²]^(1/(2β)),
 *                      ψ = exp(−C(δ−1)² − D(τ−1)²)
 *
 * Coefficients as published (transcribed from the fluid files of the CoolProp project, which carry
 * the references below; data only):
 *   O2  Schmidt & Wagner (1985), Fluid Phase Equilib. 19, 175 (32 terms)
 *   N2  Span, Lemmon, Jacobsen, Wagner & Yokozeki (2000), J. Phys. Chem. Ref. Data 29, 1361 (36 terms)
 *   AIR Lemmon, Jacobsen, Penoncello & Friend (2000), J. Phys. Chem. Ref. Data 29, 331 (19 terms)
 *   AR  Tegeler, Span & Wagner (1999), J. Phys. Chem. Ref. Data 28, 779 (41 terms)
 *   HE  Ortiz-Vega, Hall, Holste, Arp, Harvey & Lemmon, helium-4 (23 terms)
 *   CO2 Span & Wagner (1996), J. Phys. Chem. Ref. Data 25, 1509 (42 terms)
 *   N2O Lemmon & Span (2006), J. Chem. Eng. Data 51, 785 (12 terms)
 */
import type { PureGasCode } from './gases';

export interface PowerTerms {
  n: number[];
  d: number[];
  t: number[];
  l: number[];
}
export interface GaussTerms {
  n: number[];
  d: number[];
  t: number[];
  eta: number[];
  epsilon: number[];
  beta: number[];
  gamma: number[];
}
export interface NonAnalyticTerms {
  n: number[];
  a: number[];
  b: number[];
  beta: number[];
  A: number[];
  B: number[];
  C: number[];
  D: number[];
}

export interface ReferenceEos {
  name: string;
  reducingTemperatureK: number;
  reducingDensityMolM3: number;
  gasConstant: number;
  molarMassKgMol: number;
  power: PowerTerms;
  gauss?: GaussTerms;
  nonAnalytic?: NonAnalyticTerms;
}

export const REFERENCE_EOS: Record<PureGasCode, ReferenceEos> = {
  O2: {
    name: 'Schmidt & Wagner (1985)',
    reducingTemperatureK: 154.581,
    reducingDensityMolM3: 13630,
    gasConstant: 8.31434,
    molarMassKgMol: 0.0319988,
    power: {
      d: [1, 1, 1, 2, 2, 2, 3, 3, 3, 6, 7, 7, 8, 1, 1, 2, 2, 3, 3, 5, 6, 7, 8, 10, 2, 3, 3, 4, 4, 5, 5, 5],
      l: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2, 4, 4, 4, 4, 4, 4, 4, 4],
      n: [
        0.3983768749, -1.846157454, 0.4183473197, 0.02370620711, 0.09771730573, 0.03017891294, 0.02273353212, 0.01357254086, -0.04052698943, 0.0005454628515,
        0.0005113182277, 2.953466883e-7, -8.687645072e-5, -0.2127082589, 0.08735941958, 0.127550919, -0.09067701064, -0.03540084206, -0.03623278059,
        0.0132769929, -0.0003254111865, -0.008313582932, 0.002124570559, -0.0008325206232, -2.626173276e-5, 0.002599581482, 0.009984649663, 0.002199923153,
        -0.02591350486, -0.1259630848, 0.1478355637, -0.01011251078,
      ],
      t: [0, 1.5, 2.5, -0.5, 1.5, 2, 0, 1, 2.5, 0, 2, 5, 2, 5, 6, 3.5, 5.5, 3, 7, 6, 8.5, 4, 6.5, 5.5, 22, 11, 18, 11, 23, 17, 18, 23],
    },
  },
  N2: {
    name: 'Span, Lemmon, Jacobsen, Wagner & Yokozeki (2000)',
    reducingTemperatureK: 126.192,
    reducingDensityMolM3: 11183.9,
    gasConstant: 8.31451,
    molarMassKgMol: 0.02801348,
    power: {
      d: [1, 1, 2, 2, 3, 3, 1, 1, 1, 3, 3, 4, 6, 6, 7, 7, 8, 8, 1, 2, 3, 4, 5, 8, 4, 5, 5, 8, 3, 5, 6, 9],
      l: [0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4],
      n: [
        0.924803575275, -0.492448489428, 0.661883336938, -1.92902649201, -0.0622469309629, 0.349943957581, 0.564857472498, -1.61720005987, -0.481395031883,
        0.421150636384, -0.0161962230825, 0.172100994165, 0.00735448924933, 0.0168077305479, -0.00107626664179, -0.0137318088513, 0.000635466899859,
        0.00304432279419, -0.0435762336045, -0.0723174889316, 0.0389644315272, -0.021220136391, 0.00408822981509, -5.51990017984e-5, -0.0462016716479,
        -0.00300311716011, 0.0368825891208, -0.0025585684622, 0.00896915264558, -0.0044151337035, 0.00133722924858, 0.000264832491957,
      ],
      t: [0.25, 0.875, 0.5, 0.875, 0.375, 0.75, 0.5, 0.75, 2, 1.25, 3.5, 1, 0.5, 3, 0, 2.75, 0.75, 2.5, 4, 6, 6, 3, 3, 6, 16, 11, 15, 12, 12, 7, 4, 16],
    },
    gauss: {
      n: [19.6688194015, -20.911560073, 0.0167788306989, 2627.67566274],
      d: [1, 1, 3, 2],
      t: [0, 1, 2, 3],
      eta: [20, 20, 15, 25],
      epsilon: [1, 1, 1, 1],
      beta: [325, 325, 300, 275],
      gamma: [1.16, 1.16, 1.13, 1.25],
    },
  },
  AIR: {
    name: 'Lemmon, Jacobsen, Penoncello & Friend (2000)',
    reducingTemperatureK: 132.6312,
    reducingDensityMolM3: 10447.7,
    gasConstant: 8.31451,
    molarMassKgMol: 0.02896546,
    power: {
      d: [1, 1, 1, 2, 3, 3, 4, 4, 4, 6, 1, 3, 5, 6, 1, 3, 11, 1, 3],
      l: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 3, 3],
      n: [
        0.118160747229, 0.713116392079, -1.61824192067, 0.0714140178971, -0.0865421396646, 0.134211176704, 0.0112626704218, -0.0420533228842, 0.0349008431982,
        0.000164957183186, -0.101365037912, -0.17381369097, -0.0472103183731, -0.0122523554253, -0.146629609713, -0.0316055879821, 0.000233594806142,
        0.0148287891978, -0.00938782884667,
      ],
      t: [0, 0.33, 1.01, 0, 0, 0.15, 0, 0.2, 0.35, 1.35, 1.6, 0.8, 0.95, 1.25, 3.6, 6, 3.25, 3.5, 15],
    },
  },
  AR: {
    name: 'Tegeler, Span & Wagner (1999)',
    reducingTemperatureK: 150.687,
    reducingDensityMolM3: 13407.42965855612,
    gasConstant: 8.31451,
    molarMassKgMol: 0.039948,
    power: {
      d: [1, 1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 4, 1, 1, 3, 4, 4, 5, 7, 10, 10, 2, 2, 4, 4, 8, 3, 5, 5, 6, 6, 7, 7, 8, 9, 5, 6],
      l: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 3, 3, 3, 3, 3, 3, 4, 4],
      n: [
        0.088722304990011, 0.70514805167298, -1.682011565409, -0.14909014431486, -0.1202480460094, -0.12164978798599, 0.40035933626752, -0.27136062699129,
        0.24211924579645, 0.005788958318557, -0.041097335615341, 0.024710761541614, -0.32181391750702, 0.33230017695794, 0.031019986287345, -0.030777086002437,
        0.093891137419581, -0.090643210682031, -0.00045778349276654, -8.2659729025197e-5, 0.00013013415603147, -0.011397840001996, -0.024455169960535,
        -0.064324067175955, 0.058889471093674, -0.00064933552112965, -0.013889862158435, 0.4048983929691, -0.38612519594749, -0.18817142332233,
        0.15977647596482, 0.053985518513856, -0.028953417958014, -0.013025413381384, 0.0028948696775778, -0.0022647134304796, 0.0017616456196368,
      ],
      t: [0, 0.25, 1, 2.75, 4, 0, 0.25, 0.75, 2.75, 0, 2, 0.75, 3, 3.5, 1, 2, 4, 3, 0, 0.5, 1, 1, 7, 5, 6, 6, 10, 13, 14, 11, 14, 8, 14, 6, 7, 24, 22],
    },
    gauss: {
      n: [0.0058552454482774, -0.69251908270028, 1.5315490030516, -0.0027380447449783],
      d: [2, 1, 2, 3],
      t: [3, 1, 0, 0],
      eta: [20, 20, 20, 20],
      epsilon: [1, 1, 1, 1],
      beta: [250, 375, 300, 225],
      gamma: [1.11, 1.14, 1.17, 1.11],
    },
  },
  HE: {
    name: 'Ortiz-Vega, Hall, Holste, Arp, Harvey & Lemmon (helium-4)',
    reducingTemperatureK: 5.1953,
    reducingDensityMolM3: 17383.7,
    gasConstant: 8.3144598,
    molarMassKgMol: 0.004002602,
    power: {
      d: [4, 1, 1, 2, 2, 3, 1, 1, 3, 2, 2, 1],
      l: [0, 0, 0, 0, 0, 0, 1, 2, 2, 1, 2, 1],
      n: [0.015559018, 3.0638932, -4.2420844, 0.054418088, -0.18971904, 0.087856262, 2.2833566, -0.53331595, -0.53296502, 0.99444915, -0.30078896, -1.6432563],
      t: [1.0, 0.425, 0.63, 0.69, 1.83, 0.575, 0.925, 1.585, 1.69, 1.51, 2.9, 0.8],
    },
    gauss: {
      n: [0.8029102, 0.026838669, 0.04687678, -0.14832766, 0.03016211, -0.019986041, 0.14283514, 0.007418269, -0.22989793, 0.79224829, -0.049386338],
      d: [2, 1, 2, 1, 1, 3, 2, 2, 3, 2, 2],
      t: [1.26, 3.51, 2.785, 1.0, 4.22, 0.83, 1.575, 3.447, 0.73, 1.634, 6.13],
      eta: [1.5497, 9.245, 4.76323, 6.3826, 8.7023, 0.255, 0.3523, 0.1492, 0.05, 0.1668, 42.2358],
      epsilon: [0.596, 0.3423, 0.761, 0.9747, 0.5868, 0.5627, 2.5346, 3.6763, 4.5245, 5.039, 0.959],
      beta: [0.2471, 0.0983, 0.1556, 2.6782, 2.7077, 0.6621, 0.1775, 0.4821, 0.3069, 0.1758, 1357.6577],
      gamma: [3.15, 2.54505, 1.2513, 1.9416, 0.5984, 2.2282, 1.606, 3.815, 1.61958, 0.6407, 1.076],
    },
  },
  CO2: {
    name: 'Span & Wagner (1996)',
    reducingTemperatureK: 304.1282,
    reducingDensityMolM3: 10624.9063,
    gasConstant: 8.31451,
    molarMassKgMol: 0.0440098,
    power: {
      d: [1, 1, 1, 1, 2, 2, 3, 1, 2, 4, 5, 5, 5, 6, 6, 6, 1, 1, 4, 4, 4, 7, 8, 2, 3, 3, 5, 5, 6, 7, 8, 10, 4, 8],
      l: [0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 2, 3, 3, 3, 4, 4, 4, 4, 4, 4, 5, 6],
      n: [
        0.388568232032, 2.93854759427, -5.5867188535, -0.767531995925, 0.317290055804, 0.548033158978, 0.122794112203, 2.16589615432, 1.58417351097,
        -0.231327054055, 0.0581169164314, -0.553691372054, 0.489466159094, -0.0242757398435, 0.0624947905017, -0.121758602252, -0.370556852701,
        -0.0167758797004, -0.11960736638, -0.0456193625088, 0.0356127892703, -0.00744277271321, -0.00173957049024, -0.0218101212895, 0.0243321665592,
        -0.0374401334235, 0.143387157569, -0.134919690833, -0.0231512250535, 0.0123631254929, 0.00210583219729, -0.000339585190264, 0.00559936517716,
        -0.000303351180556,
      ],
      t: [0, 0.75, 1, 2, 0.75, 2, 0.75, 1.5, 1.5, 2.5, 0, 1.5, 2, 0, 1, 2, 3, 6, 3, 6, 8, 6, 0, 7, 12, 16, 22, 24, 16, 24, 8, 2, 28, 14],
    },
    gauss: {
      n: [-213.654886883, 26641.5691493, -24027.2122046, -283.41603424, 212.472844002],
      d: [2, 2, 2, 3, 3],
      t: [1, 0, 1, 3, 3],
      eta: [25, 25, 25, 15, 20],
      epsilon: [1, 1, 1, 1, 1],
      beta: [325, 300, 300, 275, 275],
      gamma: [1.16, 1.19, 1.19, 1.25, 1.22],
    },
    nonAnalytic: {
      n: [-0.666422765408, 0.726086323499, 0.0550686686128],
      a: [3.5, 3.5, 3],
      b: [0.875, 0.925, 0.875],
      beta: [0.3, 0.3, 0.3],
      A: [0.7, 0.7, 0.7],
      B: [0.3, 0.3, 1],
      C: [10, 10, 12.5],
      D: [275, 275, 275],
    },
  },
  N2O: {
    name: 'Lemmon & Span (2006)',
    reducingTemperatureK: 309.52,
    reducingDensityMolM3: 10270,
    gasConstant: 8.314472,
    molarMassKgMol: 0.0440128,
    power: {
      d: [1, 1, 1, 3, 7, 1, 2, 5, 1, 1, 4, 2],
      l: [0, 0, 0, 0, 0, 1, 1, 1, 2, 2, 2, 3],
      n: [0.88045, -2.4235, 0.38237, 0.068917, 0.00020367, 0.13122, 0.46032, -0.0036985, -0.23263, -0.00042859, -0.04281, -0.023038],
      t: [0.25, 1.25, 1.5, 0.25, 0.875, 2.375, 2, 2.125, 3.5, 6.5, 4.75, 12.5],
    },
  },
};

function nonAnalyticTerm(na: NonAnalyticTerms, i: number, delta: number, tau: number): number {
  const dm1sq = (delta - 1) * (delta - 1);
  const theta = 1 - tau + na.A[i] * Math.pow(dm1sq, 1 / (2 * na.beta[i]));
  const Delta = theta * theta + na.B[i] * Math.pow(dm1sq, na.a[i]);
  const psi = Math.exp(-na.C[i] * dm1sq - na.D[i] * (tau - 1) * (tau - 1));
  return na.n[i] * Math.pow(Delta, na.b[i]) * delta * psi;
}

/** Residual Helmholtz energy α^r(δ, τ) of a reference equation. */
export function referenceAlphaR(eos: ReferenceEos, delta: number, tau: number): number {
  let a = 0;
  const p = eos.power;
  for (let i = 0; i < p.n.length; i++) {
    a += p.n[i] * Math.pow(delta, p.d[i]) * Math.pow(tau, p.t[i]) * (p.l[i] === 0 ? 1 : Math.exp(-Math.pow(delta, p.l[i])));
  }
  const g = eos.gauss;
  if (g) {
    for (let i = 0; i < g.n.length; i++) {
      a += g.n[i] * Math.pow(delta, g.d[i]) * Math.pow(tau, g.t[i]) * Math.exp(-g.eta[i] * (delta - g.epsilon[i]) ** 2 - g.beta[i] * (tau - g.gamma[i]) ** 2);
    }
  }
  const na = eos.nonAnalytic;
  if (na) for (let i = 0; i < na.n.length; i++) a += nonAnalyticTerm(na, i, delta, tau);
  return a;
}

/** ∂α^r/∂δ at constant τ (analytic for power and Gaussian terms, central difference for the non-analytic ones). */
export function referenceAlphaRDelta(eos: ReferenceEos, delta: number, tau: number): number {
  let a = 0;
  const p = eos.power;
  for (let i = 0; i < p.n.length; i++) {
    const l = p.l[i];
    const dl = l === 0 ? 0 : Math.pow(delta, l);
    a += p.n[i] * Math.pow(delta, p.d[i] - 1) * Math.pow(tau, p.t[i]) * (l === 0 ? p.d[i] : Math.exp(-dl) * (p.d[i] - l * dl));
  }
  const g = eos.gauss;
  if (g) {
    for (let i = 0; i < g.n.length; i++) {
      const term =
        g.n[i] * Math.pow(delta, g.d[i]) * Math.pow(tau, g.t[i]) * Math.exp(-g.eta[i] * (delta - g.epsilon[i]) ** 2 - g.beta[i] * (tau - g.gamma[i]) ** 2);
      a += term * (g.d[i] / delta - 2 * g.eta[i] * (delta - g.epsilon[i]));
    }
  }
  const na = eos.nonAnalytic;
  if (na) {
    const h = 1e-6;
    for (let i = 0; i < na.n.length; i++) {
      a += (nonAnalyticTerm(na, i, delta + h, tau) - nonAnalyticTerm(na, i, delta - h, tau)) / (2 * h);
    }
  }
  return a;
}

/** Z = 1 + δ·∂α^r/∂δ from a reference equation at (T, ρ). @param molarDensityMolM3 mol/m³ */
export function referenceZ(eos: ReferenceEos, temperatureK: number, molarDensityMolM3: number): number {
  const delta = molarDensityMolM3 / eos.reducingDensityMolM3;
  const tau = eos.reducingTemperatureK / temperatureK;
  return 1 + delta * referenceAlphaRDelta(eos, delta, tau);
}

/** Pressure, Pa, from a reference equation at (T, ρ). */
export function referencePressurePa(eos: ReferenceEos, temperatureK: number, molarDensityMolM3: number): number {
  return molarDensityMolM3 * eos.gasConstant * temperatureK * referenceZ(eos, temperatureK, molarDensityMolM3);
}

/**
 * Gas-side (vapour or supercritical) density at (T, p) from a reference equation, mol/m³: marches up
 * in density from zero until the pressure passes p (shortening the step if the pressure starts to
 * fall, i.e. past the vapour spinodal), then bisects. Slow and robust.
 */
export function referenceGasDensityMolM3(eos: ReferenceEos, temperatureK: number, pressurePa: number): number {
  let lo = 0;
  let pLo = 0;
  let factor = 1.05;
  let rho = (pressurePa / (eos.gasConstant * temperatureK)) * 0.5;
  let hi = NaN;
  for (let k = 0; k < 2000; k++) {
    const p = referencePressurePa(eos, temperatureK, rho);
    if (p >= pressurePa) {
      hi = rho;
      break;
    }
    if (p < pLo) {
      // past a pressure maximum: step back with a finer step
      factor = 1 + (factor - 1) / 4;
      if (factor - 1 < 1e-9) break;
      rho = lo * factor;
      continue;
    }
    lo = rho;
    pLo = p;
    rho = lo === 0 ? rho : lo * factor;
  }
  if (Number.isNaN(hi)) throw new Error(`no gas root at ${temperatureK} K, ${pressurePa} Pa`);
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (referencePressurePa(eos, temperatureK, mid) < pressurePa) lo = mid;
    else hi = mid;
    if (hi - lo < 1e-13 * hi) break;
  }
  return 0.5 * (lo + hi);
}

/**
 * Gas-side density at (T, p) from a reference equation by Newton's method (slope by central
 * difference) from a close first guess, mol/m³; null when it does not converge on a rising part of
 * the isotherm, so the caller can fall back to referenceGasDensityMolM3.
 */
export function refineGasDensityMolM3(eos: ReferenceEos, temperatureK: number, pressurePa: number, guessMolM3: number): number | null {
  let rho = guessMolM3;
  for (let k = 0; k < 30; k++) {
    const h = rho * 1e-6;
    const p = referencePressurePa(eos, temperatureK, rho);
    const slope = (referencePressurePa(eos, temperatureK, rho + h) - referencePressurePa(eos, temperatureK, rho - h)) / (2 * h);
    if (!(slope > 0)) return null;
    const next = rho - (p - pressurePa) / slope;
    if (!(next > 0) || Math.abs(next / guessMolM3 - 1) > 0.5) return null;
    if (Math.abs(next - rho) <= 1e-12 * rho) return next;
    rho = next;
  }
  return null;
}
