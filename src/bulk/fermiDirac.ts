// Complete Fermi–Dirac integrals of order 1/2 and -1/2 (and -3/2 for Jacobians), normalised
// ("script F"): F_j(eta) = 1/Gamma(j+1) * integral_0^inf t^j / (1 + exp(t - eta)) dt,
// so F_j(eta) -> exp(eta) in the non-degenerate limit and dF_j/deta = F_{j-1}.
//
// Method (relative error < 1e-8 over eta in [-50, 50]; tested against an independent quadrature):
//  - eta < ETA_SERIES_MAX: the alternating series F_j = sum_k (-1)^(k+1) e^(k eta) / k^(j+1); one exp per call,
//    powers by multiplication, so the non-degenerate region (most of every solve) is cheap.
//  - eta > ETA_ASYMPTOTIC_MIN: the Sommerfeld asymptotic expansion; for half-integer j the exponentially small
//    correction cos(pi j) F_j(-eta) vanishes, so the truncated series is all there is.
//  - in between: a table built once at module load by the trapezoidal rule in s = sqrt(t) (spectrally accurate
//    for this analytic, rapidly decaying even integrand), read by cubic Hermite interpolation using the exact
//    derivative F_{j-1} from the same table.

const ETA_SERIES_MAX = -2;
const ETA_ASYMPTOTIC_MIN = 16;
const TABLE_STEP = 1 / 32;
const TABLE_MIN = ETA_SERIES_MAX - 0.5;
const TABLE_MAX = ETA_ASYMPTOTIC_MIN + 0.5;
const TABLE_SIZE = Math.round((TABLE_MAX - TABLE_MIN) / TABLE_STEP) + 1;
const SQRT_PI = Math.sqrt(Math.PI);

/** F_{1/2}, F_{-1/2}, F_{-3/2}, F_{-5/2} by trapezoidal quadrature in s = sqrt(t); used to build the table. */
export function fermiDiracByQuadrature(eta: number): [number, number, number, number] {
  // With t = s^2: F_{1/2} = (2/Gamma(3/2)) int s^2 f ds = (4/sqrt(pi)) int s^2 f ds,
  // F_{-1/2} = (2/Gamma(1/2)) int f ds, and the lower orders are eta-derivatives of F_{-1/2}.
  const sMax = Math.sqrt(Math.max(eta, 0) + 60);
  const h = 0.0125;
  const n = Math.ceil(sMax / h);
  let sumHalf = 0;
  let sumMinusHalf = 0;
  let sumMinus3Half = 0;
  let sumMinus5Half = 0;
  for (let i = 0; i <= n; i++) {
    const s = i * h;
    const x = s * s - eta;
    // occupancy f = 1/(1+e^x), and its derivatives in eta: f(1-f), f(1-f)(1-2f)
    const f = x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x));
    const g = f * (1 - f);
    const w = i === 0 ? 0.5 : 1;
    sumHalf += w * s * s * f;
    sumMinusHalf += w * f;
    sumMinus3Half += w * g;
    sumMinus5Half += w * g * (1 - 2 * f);
  }
  return [
    (4 / SQRT_PI) * h * sumHalf,
    (2 / SQRT_PI) * h * sumMinusHalf,
    (2 / SQRT_PI) * h * sumMinus3Half,
    (2 / SQRT_PI) * h * sumMinus5Half,
  ];
}

const tableHalf = new Float64Array(TABLE_SIZE);
const tableMinusHalf = new Float64Array(TABLE_SIZE);
const tableMinus3Half = new Float64Array(TABLE_SIZE);
const tableMinus5Half = new Float64Array(TABLE_SIZE);
for (let i = 0; i < TABLE_SIZE; i++) {
  const [a, b, c, d] = fermiDiracByQuadrature(TABLE_MIN + i * TABLE_STEP);
  tableHalf[i] = a;
  tableMinusHalf[i] = b;
  tableMinus3Half[i] = c;
  tableMinus5Half[i] = d;
}

/** Cubic Hermite basis at eta: table index, and weights for f_i, h f'_i, f_i+1, h f'_i+1 (h folded in). */
const hermiteWeights = new Float64Array(4);
function hermiteBasis(eta: number): number {
  const position = (eta - TABLE_MIN) / TABLE_STEP;
  let i = Math.floor(position);
  if (i >= TABLE_SIZE - 1) i = TABLE_SIZE - 2;
  const t = position - i;
  const t2 = t * t;
  const t3 = t2 * t;
  hermiteWeights[0] = 2 * t3 - 3 * t2 + 1;
  hermiteWeights[1] = (t3 - 2 * t2 + t) * TABLE_STEP;
  hermiteWeights[2] = -2 * t3 + 3 * t2;
  hermiteWeights[3] = (t3 - t2) * TABLE_STEP;
  return i;
}

/** Cubic Hermite interpolation of a tabulated function with tabulated derivative, at the basis just computed. */
function hermiteAt(i: number, values: Float64Array, derivatives: Float64Array): number {
  const w = hermiteWeights;
  return w[0]! * values[i]! + w[1]! * derivatives[i]! + w[2]! * values[i + 1]! + w[3]! * derivatives[i + 1]!;
}

function hermite(values: Float64Array, derivatives: Float64Array, eta: number): number {
  return hermiteAt(hermiteBasis(eta), values, derivatives);
}

const SERIES_TERMS = 40;
/** 1/k^p for the three series orders, precomputed so a series term costs one multiply-add */
function inversePowers(p: number): Float64Array {
  const out = new Float64Array(SERIES_TERMS + 1);
  for (let k = 1; k <= SERIES_TERMS; k++) out[k] = (k % 2 === 1 ? 1 : -1) / Math.pow(k, p);
  return out;
}
const SERIES_HALF = inversePowers(1.5);
const SERIES_MINUS_HALF = inversePowers(0.5);
const SERIES_MINUS_3HALF = inversePowers(-0.5);

/** Non-degenerate series sum_k (-1)^(k+1) x^k / k^p with x = e^eta < e^-2; converges to double precision. */
function alternatingSeries(x: number, signedCoefficients: Float64Array): number {
  let sum = x;
  let power = x;
  // x < e^-2: x^k falls below 1e-17 of the first term by k ~ 20
  const threshold = 1e-17 * x;
  for (let k = 2; k <= SERIES_TERMS; k++) {
    power *= x;
    if (power < threshold) break;
    sum += power * signedCoefficients[k]!;
  }
  return sum;
}

// Sommerfeld expansion coefficients c_k = 2 (1 - 2^(1-2k)) zeta(2k), k = 1..5
const SOMMERFELD = [
  Math.PI ** 2 / 6,
  (7 * Math.PI ** 4) / 360,
  (31 * Math.PI ** 6) / 15120,
  (2 * (1 - 2 ** -7) * Math.PI ** 8) / 9450,
  (2 * (1 - 2 ** -9) * Math.PI ** 10) / 93555,
];

/** Sommerfeld asymptotic expansion of F_j for large eta (j half-integer, so no exponential correction). */
function sommerfeld(eta: number, j: number, gammaJPlus2: number): number {
  let sum = 1;
  let falling = 1; // (j+1)(j)...(j+2-2k)
  let inversePower = 1;
  const inverseEta2 = 1 / (eta * eta);
  for (let k = 1; k <= SOMMERFELD.length; k++) {
    falling *= (j + 1 - (2 * k - 2)) * (j + 1 - (2 * k - 1));
    inversePower *= inverseEta2;
    sum += SOMMERFELD[k - 1]! * falling * inversePower;
  }
  return (Math.pow(eta, j + 1) / gammaJPlus2) * sum;
}

const GAMMA_5_2 = (3 * SQRT_PI) / 4; // Gamma(5/2)
const GAMMA_3_2 = SQRT_PI / 2; // Gamma(3/2)
const GAMMA_1_2 = SQRT_PI; // Gamma(1/2)

/** F_{1/2}(eta), normalised. */
export function fermiDiracHalf(eta: number): number {
  if (eta < ETA_SERIES_MAX) return alternatingSeries(Math.exp(eta), SERIES_HALF);
  if (eta > ETA_ASYMPTOTIC_MIN) return sommerfeld(eta, 0.5, GAMMA_5_2);
  return hermite(tableHalf, tableMinusHalf, eta);
}

/** F_{-1/2}(eta) = dF_{1/2}/deta, normalised. */
export function fermiDiracMinusHalf(eta: number): number {
  if (eta < ETA_SERIES_MAX) return alternatingSeries(Math.exp(eta), SERIES_MINUS_HALF);
  if (eta > ETA_ASYMPTOTIC_MIN) return sommerfeld(eta, -0.5, GAMMA_3_2);
  return hermite(tableMinusHalf, tableMinus3Half, eta);
}

/** F_{-3/2}(eta) = dF_{-1/2}/deta, normalised (used only for checks and higher-order Jacobians). */
export function fermiDiracMinusThreeHalves(eta: number): number {
  if (eta < ETA_SERIES_MAX) return alternatingSeries(Math.exp(eta), SERIES_MINUS_3HALF);
  if (eta > ETA_ASYMPTOTIC_MIN) return sommerfeld(eta, -1.5, GAMMA_1_2);
  return hermite(tableMinus3Half, tableMinus5Half, eta);
}

/**
 * Natural log of F_{1/2}(eta), finite for any finite eta (no underflow for wide-gap insulators,
 * where eta can be -1000 or below).
 */
export function logFermiDiracHalf(eta: number): number {
  if (eta < ETA_SERIES_MAX) {
    // F = e^eta * (1 - e^eta/2^1.5 + ...): take the log of the bracket, which is close to 1
    return eta + Math.log(alternatingSeries(Math.exp(eta), SERIES_HALF) / Math.exp(eta) || 1);
  }
  return Math.log(fermiDiracHalf(eta));
}

/**
 * F_{1/2}(eta) and F_{-1/2}(eta) together, written to out[offset], out[offset + 1]: one exp, one series or one
 * table bracket for both, which is what the Poisson Jacobian needs at every node.
 */
export function fermiDiracPair(eta: number, out: Float64Array, offset: number): void {
  if (eta < ETA_SERIES_MAX) {
    const x = Math.exp(eta);
    let value = x;
    let slope = x;
    let power = x;
    const threshold = 1e-17 * x;
    for (let k = 2; k <= SERIES_TERMS; k++) {
      power *= x;
      if (power < threshold) break;
      value += power * SERIES_HALF[k]!;
      slope += power * SERIES_MINUS_HALF[k]!;
    }
    out[offset] = value;
    out[offset + 1] = slope;
    return;
  }
  if (eta > ETA_ASYMPTOTIC_MIN) {
    out[offset] = sommerfeld(eta, 0.5, GAMMA_5_2);
    out[offset + 1] = sommerfeld(eta, -0.5, GAMMA_3_2);
    return;
  }
  const i = hermiteBasis(eta);
  out[offset] = hermiteAt(i, tableHalf, tableMinusHalf);
  out[offset + 1] = hermiteAt(i, tableMinusHalf, tableMinus3Half);
}

/** exp(eta) twice, the Boltzmann counterpart of fermiDiracPair. */
export function boltzmannPair(eta: number, out: Float64Array, offset: number): void {
  const value = Math.exp(eta);
  out[offset] = value;
  out[offset + 1] = value;
}

/** Carrier statistics: FD or Boltzmann, with the same interface (value and derivative in eta). */
export interface CarrierStatistics {
  /** value and eta-derivative at once, into out[offset], out[offset + 1] */
  pair(eta: number, out: Float64Array, offset: number): void;
  /** occupancy integral: F_{1/2}(eta) or exp(eta) */
  density(eta: number): number;
  /** its eta-derivative */
  derivative(eta: number): number;
  /** natural log of density(eta), finite for any finite eta */
  logDensity(eta: number): number;
}

export const FERMI_DIRAC: CarrierStatistics = {
  pair: fermiDiracPair,
  density: fermiDiracHalf,
  derivative: fermiDiracMinusHalf,
  logDensity: logFermiDiracHalf,
};

export const BOLTZMANN: CarrierStatistics = {
  pair: boltzmannPair,
  density: Math.exp,
  derivative: Math.exp,
  logDensity: (eta) => eta,
};
