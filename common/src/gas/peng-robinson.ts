import { GAS_INFO, PURE_FLUIDS, R_J_MOL_K, type GasCode, type PureGasCode } from './gases';

/**
 * Peng–Robinson (1976) cubic equation of state, kept as a comparison and fallback for the
 * Helmholtz-energy engine in eos.ts (it is 2.5–6 % off Z at cylinder pressures, see the
 * tests/reference/README.md). Mixtures use the van der Waals one-fluid mixing rules with k_ij = 0.
 *
 * Source: D.-Y. Peng & D. B. Robinson, "A New Two-Constant Equation of State",
 * Ind. Eng. Chem. Fundam. 15 (1976) 59–64.
 */

interface PrComponent {
  aCritical: number; // Pa·m⁶/mol²
  b: number; // m³/mol
  kappa: number;
  criticalTemperatureK: number;
}

function prComponent(gas: PureGasCode): PrComponent {
  const f = PURE_FLUIDS[gas];
  const tc = f.criticalTemperatureK;
  const pc = f.criticalPressureBarAbs * 1e5;
  const w = f.acentricFactor;
  return {
    aCritical: (0.45724 * R_J_MOL_K * R_J_MOL_K * tc * tc) / pc,
    b: (0.0778 * R_J_MOL_K * tc) / pc,
    kappa: 0.37464 + 1.54226 * w - 0.26992 * w * w,
    criticalTemperatureK: tc,
  };
}

interface PrModel {
  components: PrComponent[];
  fractions: number[];
}

const models = new Map<GasCode, PrModel>();

function prModel(gas: GasCode): PrModel {
  let m = models.get(gas);
  if (!m) {
    const info = GAS_INFO[gas];
    const parts = info.components ?? [{ gas: gas as PureGasCode, moleFraction: 1 }];
    m = { components: parts.map((c) => prComponent(c.gas)), fractions: parts.map((c) => c.moleFraction) };
    models.set(gas, m);
  }
  return m;
}

/**
 * Compressibility factor Z from Peng–Robinson (1976), largest real root of
 * Z³ − (1−B)Z² + (A − 3B² − 2B)Z − (AB − B² − B³) = 0 (the vapour root).
 * @param temperatureK absolute temperature, K
 * @param pressureBarAbs absolute pressure, bar
 * No input checks here: callers (eos.ts, the bench) validate.
 */
export function pengRobinsonZ(gas: GasCode, temperatureK: number, pressureBarAbs: number): number {
  const { components, fractions } = prModel(gas);
  const n = components.length;
  let aMix = 0;
  let bMix = 0;
  for (let i = 0; i < n; i++) {
    const ci = components[i];
    const si = 1 + ci.kappa * (1 - Math.sqrt(temperatureK / ci.criticalTemperatureK));
    const ai = ci.aCritical * si * si;
    bMix += fractions[i] * ci.b;
    for (let j = 0; j < n; j++) {
      const cj = components[j];
      const sj = 1 + cj.kappa * (1 - Math.sqrt(temperatureK / cj.criticalTemperatureK));
      aMix += fractions[i] * fractions[j] * Math.sqrt(ai * cj.aCritical * sj * sj);
    }
  }
  const rt = R_J_MOL_K * temperatureK;
  const p = pressureBarAbs * 1e5;
  const A = (aMix * p) / (rt * rt);
  const B = (bMix * p) / rt;
  return largestCubicRoot(-(1 - B), A - 3 * B * B - 2 * B, -(A * B - B * B - B * B * B));
}

/** Largest real root of z³ + c2·z² + c1·z + c0 = 0 (Cardano / trigonometric form). */
function largestCubicRoot(c2: number, c1: number, c0: number): number {
  const q = (3 * c1 - c2 * c2) / 9;
  const r = (9 * c2 * c1 - 27 * c0 - 2 * c2 * c2 * c2) / 54;
  const disc = q * q * q + r * r;
  if (disc > 0) {
    const s = Math.cbrt(r + Math.sqrt(disc));
    const t = Math.cbrt(r - Math.sqrt(disc));
    return s + t - c2 / 3;
  }
  // three real roots: the largest is the k = 0 branch
  const theta = Math.acos(Math.max(-1, Math.min(1, r / Math.sqrt(-q * q * q))));
  return 2 * Math.sqrt(-q) * Math.cos(theta / 3) - c2 / 3;
}
