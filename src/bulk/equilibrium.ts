// Bulk equilibrium of the support: carrier statistics, defect ionisation and charge neutrality.
// Everything is written in the reduced local variable xi = (E_F - E_C)/kT so that the same charge model serves
// the bulk (xi = xi_bulk) and the space-charge layer (xi = xi_bulk - u, with u the reduced band bending).
import { H_PLANCK_J_S, K_BOLTZMANN_J_PER_K, M_ELECTRON_KG, thermalEnergy_eV } from '../constants.js';
import { ConvergenceError } from '../errors.js';
import { BOLTZMANN, FERMI_DIRAC, type CarrierStatistics } from './fermiDirac.js';
import type { Statistics } from '../types.js';

/** Spin degeneracy factor of a single donor (common practice, Sze & Ng ch. 1). */
export const DONOR_DEGENERACY = 2;
/** Acceptor degeneracy factor (two-fold valence-band degeneracy x spin; Sze & Ng ch. 1). */
export const ACCEPTOR_DEGENERACY = 4;

export type DonorKind = 'single' | 'double';

export interface DonorSpec {
  density_m3: number;
  kind: DonorKind;
  /** depth of the (0/+) level below E_C, eV; undefined = fully ionised */
  level1_eV?: number | undefined;
  /** depth of the (+/2+) level below E_C (double donors), eV; undefined = the second electron is always released */
  level2_eV?: number | undefined;
}

export interface AcceptorSpec {
  density_m3: number;
  /** height of the (0/-) level above E_V, eV; undefined = fully ionised */
  level_eV?: number | undefined;
}

export interface SupportElectronic {
  temperature_K: number;
  bandGap_eV: number;
  electronMass_me: number;
  holeMass_me: number;
  donors: DonorSpec;
  acceptors: AcceptorSpec;
  statistics: Statistics;
}

// Effective density of states N = 2 (2 pi m* k T / h^2)^(3/2) (parabolic band; Sze & Ng eq. 1.20).
export function effectiveDensityOfStates_m3(mass_me: number, temperature_K: number): number {
  const m = mass_me * M_ELECTRON_KG;
  return 2 * Math.pow((2 * Math.PI * m * K_BOLTZMANN_J_PER_K * temperature_K) / (H_PLANCK_J_S * H_PLANCK_J_S), 1.5);
}

/** Space charge as a function of xi; all densities per m^3. */
export interface ChargeModel {
  readonly kT_eV: number;
  readonly conductionDos_m3: number;
  readonly valenceDos_m3: number;
  /** Eg/kT */
  readonly reducedGap: number;
  readonly statistics: CarrierStatistics;
  electronDensity(xi: number): number;
  holeDensity(xi: number): number;
  /** ionised donor charge density (units of q per m^3: a double donor counts twice when doubly ionised) */
  donorCharge(xi: number): number;
  ionisedAcceptors(xi: number): number;
  /**
   * Net charge density / q = p - n + N_D^+ - N_A^-, and its xi-derivative, written into out[0], out[1].
   * The derivative is always <= 0 (raising E_F adds negative charge), which keeps the Newton Jacobian an M-matrix.
   */
  netCharge(xi: number, out: Float64Array): void;
  /** ln of the positive and negative charge sums, finite even when every density underflows */
  logChargeBalance(xi: number): number;
}

function softplus(x: number): number {
  // ln(1 + e^x) without overflow
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

function logSumExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  const m = Math.max(a, b);
  return m + Math.log(Math.exp(a - m) + Math.exp(b - m));
}

/**
 * Occupation statistics of a defect with charge states q_k and log-weights a_k - q_k xi (grand-canonical):
 * mean charge <q> and d<q>/dxi = -Var(q). Log-weights are shifted by their maximum so nothing overflows.
 */
function defectMeanCharge(logWeights: number[], charges: number[], out: Float64Array): void {
  let max = -Infinity;
  for (const w of logWeights) if (w > max) max = w;
  let z = 0;
  let m1 = 0;
  let m2 = 0;
  for (let k = 0; k < logWeights.length; k++) {
    const w = Math.exp(logWeights[k]! - max);
    z += w;
    m1 += charges[k]! * w;
    m2 += charges[k]! * charges[k]! * w;
  }
  const mean = m1 / z;
  out[0] = mean;
  out[1] = -(m2 / z - mean * mean);
}

export function makeChargeModel(support: SupportElectronic): ChargeModel {
  const kT_eV = thermalEnergy_eV(support.temperature_K);
  const stats = support.statistics === 'boltzmann' ? BOLTZMANN : FERMI_DIRAC;
  const conductionDos_m3 = effectiveDensityOfStates_m3(support.electronMass_me, support.temperature_K);
  const valenceDos_m3 = effectiveDensityOfStates_m3(support.holeMass_me, support.temperature_K);
  const reducedGap = support.bandGap_eV / kT_eV;
  const nd = support.donors.density_m3;
  const na = support.acceptors.density_m3;
  const donorDepth1 = support.donors.level1_eV === undefined ? undefined : support.donors.level1_eV / kT_eV;
  const donorDepth2 = support.donors.level2_eV === undefined ? undefined : support.donors.level2_eV / kT_eV;
  const doubleDonor = support.donors.kind === 'double';
  const acceptorHeight = support.acceptors.level_eV === undefined ? undefined : support.acceptors.level_eV / kT_eV;
  const lnDonorDegeneracy = Math.log(DONOR_DEGENERACY);
  const lnAcceptorDegeneracy = Math.log(ACCEPTOR_DEGENERACY);

  const scratch = new Float64Array(2);
  const carriers = new Float64Array(4);
  const pair = stats.pair;
  const donorLogWeights = [0, 0, 0];
  const doubleCharges = [0, 1, 2];

  /** mean charge per donor and its xi-derivative */
  function donorState(xi: number, out: Float64Array): void {
    if (!doubleDonor) {
      if (donorDepth1 === undefined) {
        out[0] = 1;
        out[1] = 0;
        return;
      }
      // N_D^+ / N_D = 1 / (1 + g_D exp((E_F - E_D)/kT)), written with log-weights: D0 = ln g_D + (xi + e_d), D+ = 0
      // N_D^+ / N_D = 1 / (1 + g_D exp((E_F - E_D)/kT)) (Sze & Ng eq. 1.35); d/dxi = -f(1-f)
      const x = lnDonorDegeneracy + xi + donorDepth1;
      const f = x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x));
      out[0] = f;
      out[1] = -f * (1 - f);
      return;
    }
    // Double donor V0 (g=1), V+ (g=2), V2+ (g=1): [V+]/[V0] = 2 exp(-(xi + e1)), [V2+]/[V+] = (1/2) exp(-(xi + e2))
    if (donorDepth1 === undefined || donorDepth2 === undefined) {
      // both levels absent (checked at input): fully ionised, two electrons released per vacancy
      out[0] = 2;
      out[1] = 0;
      return;
    }
    const e1 = donorDepth1;
    const e2 = donorDepth2;
    donorLogWeights[0] = 0;
    donorLogWeights[1] = Math.log(2) - (xi + e1);
    donorLogWeights[2] = donorLogWeights[1]! - Math.log(2) - (xi + e2);
    defectMeanCharge(donorLogWeights, doubleCharges, out);
  }

  function acceptorState(xi: number, out: Float64Array): void {
    // fraction ionised N_A^-/N_A = 1 / (1 + g_A exp((E_A - E_F)/kT)), (E_A - E_F)/kT = e_a - Eg/kT - xi
    if (acceptorHeight === undefined) {
      out[0] = 1;
      out[1] = 0;
      return;
    }
    const x = lnAcceptorDegeneracy + acceptorHeight - reducedGap - xi;
    // f = 1/(1+e^x); df/dxi = f(1-f) (x decreases with xi)
    const f = x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x));
    out[0] = f;
    out[1] = f * (1 - f);
  }

  const model: ChargeModel = {
    kT_eV,
    conductionDos_m3,
    valenceDos_m3,
    reducedGap,
    statistics: stats,
    electronDensity: (xi) => conductionDos_m3 * stats.density(xi),
    holeDensity: (xi) => valenceDos_m3 * stats.density(-xi - reducedGap),
    donorCharge(xi) {
      if (nd === 0) return 0;
      donorState(xi, scratch);
      return nd * scratch[0]!;
    },
    ionisedAcceptors(xi) {
      if (na === 0) return 0;
      acceptorState(xi, scratch);
      return na * scratch[0]!;
    },
    netCharge(xi, out) {
      pair(-xi - reducedGap, carriers, 0);
      pair(xi, carriers, 2);
      let value = valenceDos_m3 * carriers[0]! - conductionDos_m3 * carriers[2]!;
      let slope = -valenceDos_m3 * carriers[1]! - conductionDos_m3 * carriers[3]!;
      if (nd !== 0) {
        donorState(xi, scratch);
        value += nd * scratch[0]!;
        slope += nd * scratch[1]!;
      }
      if (na !== 0) {
        acceptorState(xi, scratch);
        value -= na * scratch[0]!;
        slope -= na * scratch[1]!;
      }
      out[0] = value;
      out[1] = slope;
    },
    logChargeBalance(xi) {
      const logHoles = Math.log(valenceDos_m3) + stats.logDensity(-xi - reducedGap);
      const logElectrons = Math.log(conductionDos_m3) + stats.logDensity(xi);
      let logPositive = logHoles;
      let logNegative = logElectrons;
      if (nd > 0) {
        donorState(xi, scratch);
        // the donor charge is never below its floor only for fully bound donors; log of a tiny fraction is fine
        const fraction = scratch[0]!;
        const logFraction = fraction > 0 ? Math.log(fraction) : logDonorFractionDeep(xi);
        logPositive = logSumExp(logPositive, Math.log(nd) + logFraction);
      }
      if (na > 0) {
        const logFraction =
          acceptorHeight === undefined ? 0 : -softplus(lnAcceptorDegeneracy + acceptorHeight - reducedGap - xi);
        logNegative = logSumExp(logNegative, Math.log(na) + logFraction);
      }
      return logPositive - logNegative;
    },
  };

  /** ln(mean donor charge) when it underflows to 0 (E_F far above the donor levels) */
  function logDonorFractionDeep(xi: number): number {
    if (!doubleDonor) return -(lnDonorDegeneracy + xi + (donorDepth1 ?? 0));
    // dominated by V+ : ln(2 e^{-(xi+e1)}) relative to V0
    return Math.log(2) - (xi + (donorDepth1 ?? 0));
  }

  return model;
}

export interface BulkState {
  /** (E_F - E_C)/kT in the bulk */
  reducedFermiLevel: number;
  /** E_C - E_F in the bulk, eV */
  fermiLevelBelowConduction_eV: number;
  electronDensity_m3: number;
  holeDensity_m3: number;
  donorCharge_m3: number;
  ionisedAcceptors_m3: number;
  conductionDos_m3: number;
  valenceDos_m3: number;
  /** log10 of the intrinsic density (Boltzmann definition sqrt(N_C N_V) exp(-Eg/2kT)), per cm^3 */
  intrinsicDensityLog10_cm3: number;
  /** bisection iterations used */
  iterations: number;
}

/**
 * Charge neutrality p - n + N_D^+ - N_A^- = 0 for E_F, by bisection on the log charge balance.
 * The balance is strictly decreasing in xi and continuous, so a bracket always exists and bisection cannot fail;
 * working in logs keeps it exact for insulators whose carrier densities underflow any float.
 */
export function solveBulkNeutrality(model: ChargeModel): BulkState {
  let low = -model.reducedGap - 40;
  let high = 40;
  let expansions = 0;
  while (model.logChargeBalance(low) <= 0 && expansions < 200) {
    low -= Math.max(40, Math.abs(low));
    expansions++;
  }
  while (model.logChargeBalance(high) >= 0 && expansions < 400) {
    high += Math.max(40, Math.abs(high));
    expansions++;
  }
  if (!(model.logChargeBalance(low) > 0 && model.logChargeBalance(high) < 0)) {
    throw new ConvergenceError('no bracket for the bulk Fermi level (charge balance not monotone?)', expansions);
  }
  let iterations = 0;
  while (high - low > 1e-13 * Math.max(1, Math.abs(low) + Math.abs(high)) && iterations < 300) {
    const mid = 0.5 * (low + high);
    if (model.logChargeBalance(mid) > 0) low = mid;
    else high = mid;
    iterations++;
  }
  const xi = 0.5 * (low + high);
  const lnIntrinsic = 0.5 * Math.log(model.conductionDos_m3 * model.valenceDos_m3) - 0.5 * model.reducedGap;
  return {
    reducedFermiLevel: xi,
    fermiLevelBelowConduction_eV: -xi * model.kT_eV,
    electronDensity_m3: model.electronDensity(xi),
    holeDensity_m3: model.holeDensity(xi),
    donorCharge_m3: model.donorCharge(xi),
    ionisedAcceptors_m3: model.ionisedAcceptors(xi),
    conductionDos_m3: model.conductionDos_m3,
    valenceDos_m3: model.valenceDos_m3,
    intrinsicDensityLog10_cm3: (lnIntrinsic - Math.log(1e6)) / Math.LN10,
    iterations,
  };
}
