// Bulk equilibrium of the support: carrier statistics, defect ionisation and charge neutrality.
// Everything is written in the reduced local variable xi = (E_F - E_C)/kT so that the same charge model serves
// the bulk (xi = xi_bulk) and the space-charge layer (xi = xi_bulk - u, with u the reduced band bending).
import { H_PLANCK_J_S, K_BOLTZMANN_J_PER_K, M_ELECTRON_KG, Q_ELEMENTARY_C, thermalEnergy_eV } from '../constants.js';
import { ConvergenceError, requireInRange } from '../errors.js';
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

/**
 * Electron-trapping localised states (small polarons: Ce 4f / Ce3+ in reduced CeO2, Ti 3d / Ti3+ in TiO2):
 * neutral when empty, charge -q when occupied, at most one electron per site.
 * Library names (SupportRecord): `localisedSiteDensity_cm3`, `localisedLevel_eV`.
 */
export interface LocalisedSpec {
  /** density of trapping sites (e.g. cation sites), m^-3; 0 to 1e30 */
  siteDensity_m3: number;
  /**
   * depth of the trapping level below E_C, eV (>= 0 below the band edge; may be negative = above E_C). This is the
   * thermodynamic (0/-) level. A gap-state peak seen in photoemission (e.g. Ti3+ ~0.85 eV below E_F on reduced
   * rutile(110)) lies deeper than it by the polaron's lattice-relaxation (Franck–Condon) energy: convert it with
   * thermalPolaronDepth_eV (src/bulk/polaron.ts; the library values are converted already).
   */
  level_eV: number;
  /** degeneracy of the occupied site relative to the empty one; default 2 (spin of one electron) */
  degeneracy?: number | undefined;
}

/**
 * Mott transition of the donors (issue 10 item 2): above the critical density the donor electrons are delocalised
 * (donors fully ionised); below it the ionisation energy is lowered with density, see effectiveDonorLevel_eV.
 */
export interface MottSpec {
  /** static relative permittivity of the support (sets the effective Bohr radius) */
  relativePermittivity: number;
  /** override of the critical density, m^-3 (library: `mottCriticalDensity_cm3`); default from the Mott criterion */
  criticalDensity_m3?: number | undefined;
}

export interface SupportElectronic {
  temperature_K: number;
  bandGap_eV: number;
  electronMass_me: number;
  holeMass_me: number;
  donors: DonorSpec;
  acceptors: AcceptorSpec;
  statistics: Statistics;
  /** optional electron-trapping localised states (small polarons) */
  localised?: LocalisedSpec | undefined;
  /** optional: apply the Mott criterion and the Pearson–Bardeen lowering to the donor levels */
  mott?: MottSpec | undefined;
}

/** Spin degeneracy of a singly occupied localised site (common practice, same counting as a donor; Sze & Ng ch. 1). */
export const LOCALISED_DEGENERACY = 2;

/** Mott constant n_c^(1/3) a_B* = 0.26 +- 0.05 (Edwards & Sienko, Phys. Rev. B 17, 2575 (1978); from memory, verify). */
export const MOTT_CONSTANT = 0.26;
/** Bohr radius a_0, m (CODATA 2018, Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)). */
export const BOHR_RADIUS_M = 5.29177210903e-11;

/**
 * Effective (hydrogenic) Bohr radius a_B* = a_0 eps_r / (m* / m_e), m (Kittel, Introduction to Solid State Physics,
 * ch. "Semiconductor crystals", donor states). permittivity 1-1e5, mass 0.01-100 m_e.
 */
export function effectiveBohrRadius_m(permittivity: number, mass_me: number): number {
  requireInRange('permittivity', permittivity, 1, 1e5, '');
  requireInRange('mass_me', mass_me, 0.01, 100, 'm_e');
  return (BOHR_RADIUS_M * permittivity) / mass_me;
}

/**
 * Localisation radius of a donor electron, m: the decay length of its bound state hbar / sqrt(2 m* E_D) (the
 * envelope of any bound state decays as exp(-r sqrt(2 m* E_D)/hbar) outside the core), but never more than the
 * hydrogenic a_B* (central-cell corrections only deepen a Coulomb donor). For a hydrogenic donor
 * (E_D = 13.6 eV m* / eps^2) both are equal. This choice (ours) keeps deep, non-hydrogenic donors (e.g. 0.5 eV in
 * a high-permittivity oxide) localised to the density their small radius implies. level undefined = hydrogenic.
 */
export function donorLocalisationRadius_m(permittivity: number, mass_me: number, level_eV?: number): number {
  const hydrogenic = effectiveBohrRadius_m(permittivity, mass_me);
  if (level_eV === undefined || !(level_eV > 0)) return hydrogenic;
  const hbar = H_PLANCK_J_S / (2 * Math.PI);
  // kappa^-1 = hbar / sqrt(2 m* E_D) (bound-state decay length)
  const decay = hbar / Math.sqrt(2 * mass_me * M_ELECTRON_KG * level_eV * Q_ELEMENTARY_C);
  return Math.min(hydrogenic, decay);
}

/**
 * Mott critical donor density n_c = (0.26 / a)^3, m^-3 (Edwards & Sienko, Phys. Rev. B 17, 2575 (1978):
 * n_c^(1/3) a_H* = 0.26 +- 0.05 over many systems; from memory, verify). a = a_B* = a_0 eps_r / m* (hydrogenic)
 * unless level_eV is given, then a = donorLocalisationRadius_m. ZnO (eps 8.656, m* 0.24): 2.5e18 cm^-3.
 */
export function mottCriticalDensity_m3(permittivity: number, mass_me: number, level_eV?: number): number {
  const a = donorLocalisationRadius_m(permittivity, mass_me, level_eV);
  return (MOTT_CONSTANT / a) ** 3;
}

/**
 * Donor ionisation energy lowered by the donor density, eV:
 *   E_D(N) = E_D0 (1 - (N / n_c)^(1/3))  for N < n_c,   0 (delocalised: donors fully ionised) for N >= n_c.
 * The N^(1/3) law is Pearson & Bardeen's (Phys. Rev. 75, 865 (1949): E = E_0 - alpha N^(1/3), attributed to the
 * carrier-ion attraction at the mean impurity spacing; in Si:B E_A = 0.08 eV vanished near 5e18 cm^-3). Its
 * coefficient is not taken from Si: we fix alpha = E_D0 / n_c^(1/3) so the level vanishes at the Mott density
 * (our choice, consistent with Pearson & Bardeen's observation that the energy vanishes near the metallic
 * transition). For a hydrogenic donor this is alpha = q^2/(4 pi eps eps0) / (2 * 0.26) = 1.92 q^2/(4 pi eps eps0).
 * n_c = mottCriticalDensity_m3(permittivity, mass, level) unless criticalDensity_m3 is given.
 * Inputs: level_eV >= 0, density_m3 >= 0; returns a depth in [0, level_eV].
 */
export function effectiveDonorLevel_eV(
  level_eV: number,
  density_m3: number,
  permittivity: number,
  mass_me: number,
  criticalDensity_m3?: number,
): number {
  return donorMottState(level_eV, density_m3, permittivity, mass_me, criticalDensity_m3).level_eV ?? 0;
}

export interface DonorMottState {
  /** lowered depth below E_C, eV; undefined when delocalised (above the Mott density: fully ionised) */
  level_eV: number | undefined;
  delocalised: boolean;
  criticalDensity_m3: number;
}

/** As effectiveDonorLevel_eV, with the delocalised flag and the critical density used. */
export function donorMottState(
  level_eV: number,
  density_m3: number,
  permittivity: number,
  mass_me: number,
  criticalDensity_m3?: number,
): DonorMottState {
  requireInRange('level_eV', level_eV, 0, 100, 'eV');
  requireInRange('density_m3', density_m3, 0, 1e31, 'm^-3');
  const nc =
    criticalDensity_m3 === undefined
      ? mottCriticalDensity_m3(permittivity, mass_me, level_eV)
      : requireInRange('criticalDensity_m3', criticalDensity_m3, 1, 1e31, 'm^-3');
  if (density_m3 >= nc) return { level_eV: undefined, delocalised: true, criticalDensity_m3: nc };
  // Pearson–Bardeen N^(1/3) lowering, vanishing at n_c
  return { level_eV: level_eV * (1 - Math.cbrt(density_m3 / nc)), delocalised: false, criticalDensity_m3: nc };
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
  /** occupied localised (small-polaron) sites, m^-3 (0 without localised states) */
  localisedElectrons(xi: number): number;
  /** donor levels actually used (after the optional Mott treatment) */
  readonly donorLevels: EffectiveDonorLevels;
  /**
   * Net charge density / q = p - n + N_D^+ - N_A^- - N_L^occupied, and its xi-derivative, written into out[0], out[1].
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

export interface EffectiveDonorLevels {
  level1_eV: number | undefined;
  level2_eV: number | undefined;
  /** the Mott treatment was requested */
  mottApplied: boolean;
  /** first donor electron delocalised (N_D >= n_c for level 1) */
  delocalised: boolean;
  /** critical density used for level 1, m^-3 (null without the Mott treatment) */
  criticalDensity_m3: number | null;
}

function resolveDonorLevels(support: SupportElectronic): EffectiveDonorLevels {
  const d = support.donors;
  const mott = support.mott;
  if (mott === undefined || d.density_m3 === 0) {
    return { level1_eV: d.level1_eV, level2_eV: d.level2_eV, mottApplied: mott !== undefined, delocalised: false, criticalDensity_m3: null };
  }
  const m = support.electronMass_me;
  const eps = mott.relativePermittivity;
  let level1: number | undefined = d.level1_eV;
  let level2: number | undefined = d.level2_eV;
  let delocalised = false;
  let nc: number | null = null;
  if (level1 !== undefined) {
    const st = donorMottState(level1, d.density_m3, eps, m, mott.criticalDensity_m3);
    level1 = st.level_eV;
    delocalised = st.delocalised;
    nc = st.criticalDensity_m3;
  } else {
    nc = mott.criticalDensity_m3 ?? mottCriticalDensity_m3(eps, m);
  }
  if (d.kind === 'double' && level2 !== undefined) {
    // the second (deeper, He+-like) electron has its own, smaller radius and hence a higher n_c;
    // an override applies to the first electron only
    level2 = donorMottState(level2, d.density_m3, eps, m).level_eV;
  }
  return { level1_eV: level1, level2_eV: level2, mottApplied: true, delocalised, criticalDensity_m3: nc };
}

export function makeChargeModel(support: SupportElectronic): ChargeModel {
  const kT_eV = thermalEnergy_eV(support.temperature_K);
  const stats = support.statistics === 'boltzmann' ? BOLTZMANN : FERMI_DIRAC;
  const conductionDos_m3 = effectiveDensityOfStates_m3(support.electronMass_me, support.temperature_K);
  const valenceDos_m3 = effectiveDensityOfStates_m3(support.holeMass_me, support.temperature_K);
  const reducedGap = support.bandGap_eV / kT_eV;
  const nd = support.donors.density_m3;
  const na = support.acceptors.density_m3;
  const donorLevels = resolveDonorLevels(support);
  const donorDepth1 = donorLevels.level1_eV === undefined ? undefined : donorLevels.level1_eV / kT_eV;
  const donorDepth2 = donorLevels.level2_eV === undefined ? undefined : donorLevels.level2_eV / kT_eV;
  const doubleDonor = support.donors.kind === 'double';
  // a double donor whose first electron is delocalised (Mott) but whose second is still bound
  const firstDelocalisedOnly = doubleDonor && donorLevels.mottApplied && donorDepth1 === undefined && donorDepth2 !== undefined;
  const loc = support.localised;
  const nl = loc === undefined ? 0 : loc.siteDensity_m3;
  if (loc !== undefined) {
    requireInRange('localised.siteDensity_m3', loc.siteDensity_m3, 0, 1e30, 'm^-3');
    requireInRange('localised.level_eV', loc.level_eV, -100, 100, 'eV');
    if (loc.degeneracy !== undefined) requireInRange('localised.degeneracy', loc.degeneracy, 1e-6, 1e6, '');
  }
  const localisedDepth = loc === undefined ? 0 : loc.level_eV / kT_eV;
  const lnLocalisedDegeneracy = Math.log(loc?.degeneracy ?? LOCALISED_DEGENERACY);
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
    if (firstDelocalisedOnly) {
      // first electron delocalised (Mott): only V+ and V2+ remain
      donorLogWeights[0] = -Infinity;
      donorLogWeights[1] = 0;
      donorLogWeights[2] = -Math.log(2) - (xi + donorDepth2!);
      defectMeanCharge(donorLogWeights, doubleCharges, out);
      return;
    }
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

  /** occupied fraction of the localised sites and its xi-derivative */
  function localisedState(xi: number, out: Float64Array): void {
    // f = 1 / (1 + (1/g) exp((E_L - E_F)/kT)), (E_L - E_F)/kT = -(xi + e_L); log-weights: empty 0, occupied
    // ln g + xi + e_L (Fermi–Dirac with at most one electron per site; Sze & Ng ch. 1, trap occupancy)
    const x = lnLocalisedDegeneracy + xi + localisedDepth;
    const f = x > 0 ? 1 / (1 + Math.exp(-x)) : Math.exp(x) / (1 + Math.exp(x));
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
    localisedElectrons(xi) {
      if (nl === 0) return 0;
      localisedState(xi, scratch);
      return nl * scratch[0]!;
    },
    donorLevels,
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
      if (nl !== 0) {
        localisedState(xi, scratch);
        value -= nl * scratch[0]!;
        slope -= nl * scratch[1]!;
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
      if (nl > 0) {
        // ln f = -softplus(-(ln g + xi + e_L)), finite for any xi
        logNegative = logSumExp(logNegative, Math.log(nl) - softplus(-(lnLocalisedDegeneracy + xi + localisedDepth)));
      }
      return logPositive - logNegative;
    },
  };

  /** ln(mean donor charge) when it underflows to 0 (E_F far above the donor levels) */
  function logDonorFractionDeep(xi: number): number {
    if (firstDelocalisedOnly) return 0; // at least one electron released per donor
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
  /** occupied localised (small-polaron) sites, m^-3 (0 without localised states) */
  localisedElectrons_m3: number;
  conductionDos_m3: number;
  valenceDos_m3: number;
  /** log10 of the intrinsic density (Boltzmann definition sqrt(N_C N_V) exp(-Eg/2kT)), per cm^3 */
  intrinsicDensityLog10_cm3: number;
  /** bisection iterations used */
  iterations: number;
}

/**
 * Charge neutrality p - n + N_D^+ - N_A^- - N_L^occupied = 0 for E_F, by bisection on the log charge balance.
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
    localisedElectrons_m3: model.localisedElectrons(xi),
    conductionDos_m3: model.conductionDos_m3,
    valenceDos_m3: model.valenceDos_m3,
    intrinsicDensityLog10_cm3: (lnIntrinsic - Math.log(1e6)) / Math.LN10,
    iterations,
  };
}
