// Interface states at the metal/oxide contact, solved self-consistently with the support's space charge
// (Bardeen, Phys. Rev. 71, 717 (1947); Cowley & Sze, J. Appl. Phys. 36, 3212 (1965)).
//
// Geometry and signs (derived here; energies in eV, charges per m^2, this project's conventions):
//   metal | interfacial layer (thickness delta, relative permittivity eps_i) | support (x > 0)
//   - Q_m  : charge on the metal side of the layer (C/m^2)
//   - Q_it : charge of the interface states at the support surface (C/m^2)
//   - Q_sc : space charge in the support (C/m^2), positive = support positive = electrons went to the metal;
//            supplied by the caller as spaceCharge(bandBending_eV), non-decreasing in the band bending
//   - neutrality Q_m + Q_it + Q_sc = 0.
//   Gauss's law in the layer: field E_x = Q_m / (eps_i eps0) (zero field in the metal), so the electrostatic
//   potential falls by Q_m delta / (eps_i eps0) from metal to support and the electron (vacuum-level) energy
//   rises by Delta = -Q_m delta / (eps_i eps0) from metal to support:
//   Delta = E_vac(metal) - E_vac(support surface) = phi_m - (chi + Phi_B)
//   =>  Phi_B = phi_m - chi - Delta = phi_m - chi + Q_m delta / (eps_i eps0)          (Cowley & Sze eq. for Phi_Bn)
//   with Phi_B = E_C(0) - E_F = (E_C - E_F)_bulk + bandBending_eV.
//   Interface states: uniform density D_it (per eV per m^2) across the gap, donor-like below the charge-neutrality
//   level phi_0 (measured up from E_V) and acceptor-like above it, so
//   Q_it = q D_it (phi_0 - (E_F - E_V(0))) = q D_it (Phi_B - (E_g - phi_0))              (Cowley & Sze)
//   (exact for a uniform density at any temperature while E_F stays a few kT inside the gap; here the states are
//   confined to the gap and their Fermi–Dirac occupancy integrated in closed form when a temperature is given).
//   A neutrality level above the CBM (In2O3, CdO, InN: the branch point lies in the conduction band, which is why
//   their surfaces carry electron accumulation; King et al., Phys. Rev. Lett. 101, 116808 (2008)) is allowed up to
//   MAX_NEUTRAL_LEVEL_ABOVE_CBM_eV above E_C: the uniform density then continues above E_C up to
//   E_top = 2 phi_0 - E_g (as far above phi_0 as phi_0 lies above E_C; interfaceStateBandTop_eV), so the states stay
//   neutral at E_F = phi_0, donor-like below it and acceptor-like above it, as the linear Cowley–Sze relation
//   assumes. Below E_top the choice of E_top does not enter (zero-temperature step), and E_F at the interface stays
//   below it for every contact whose barrier lies above -(phi_0 - E_g).
//   Surface donors (optional): a sheet of donor-like defect states at the support surface, N_sd per m^2 at a depth
//   E_sd below E_C (e.g. the Ti3+ electrons that surface O vacancies leave on reduced TiO2(110)), ionised with the
//   donor occupancy of Sze & Ng (Physics of Semiconductor Devices, 3rd ed., ch. 1, N_D+ = N_D / (1 + g_D
//   exp((E_F - E_D)/kT)), g_D = 2): Q_sd = q N_sd / (1 + 2 exp((E_sd - Phi_B)/kT)) >= 0, non-decreasing in Phi_B.
//   They add to Q_it (Bardeen, Phys. Rev. 71, 717 (1947): surface states at one level pin E_F near it when dense).
// The residual R(V) = Phi_B(V) - phi_m + chi - Q_m(V) delta/(eps_i eps0) [+ particle term] is strictly increasing
// in V (slope >= 1: every term is non-decreasing), so it has exactly one root, and one evaluation at any V0 brackets
// it: the root lies between V0 and V0 - R(V0) (closer still, solveBending). Each evaluation costs the caller one
// Poisson solve, so the root is found with few: V0 is the root of the same residual with a cheap stand-in for Q_sc
// (no Poisson solve), then each iterate is the root of the residual with Q_sc replaced by a model through the
// evaluated charges (the stand-in plus a linear excess, then alpha E + beta V through the last two), kept inside the
// bracket, with bisection when the bracket does not shrink fast enough.
import { EPS0_F_PER_M, Q_ELEMENTARY_C, thermalEnergy_eV } from '../constants.js';
import { ConvergenceError, InputError, requireInRange } from '../errors.js';
import { empiricalPinningFactor } from '../barrier/barrier.js';

/**
 * Default interfacial-layer thickness, m, and relative permittivity: delta = 0.5 nm, eps_i = 1, the values with which
 * Cowley & Sze (1965) and Sze & Ng (Physics of Semiconductor Devices, 3rd ed., sec. 3.2) turn a measured slope S
 * into a density of interface states (from memory, verify). In the metal-induced-gap-state picture (Heine, Phys. Rev.
 * 138, A1689 (1965): the states are the tails of the metal wave functions in the gap; Mönch,
 * Electronic Properties of Semiconductor Interfaces, Springer 2004) delta is the decay length of the induced gap
 * states, a few tenths of a nm, with eps_i = 1 (from memory, verify). Only D_it delta / eps_i fixes S; D_it itself
 * (hence the interface-state charge under a particle) scales as eps_i / delta for a given S.
 * Library names (SupportRecord): `interfaceLayerThickness_nm`, `interfaceLayerPermittivity`.
 */
export const DEFAULT_INTERFACE_LAYER_THICKNESS_M = 0.5e-9;
export const DEFAULT_INTERFACE_LAYER_PERMITTIVITY = 1;

/** Interface-state parameters of a metal/support pair. */
export interface InterfaceStateParameters {
  /** D_it, states per eV per m^2, uniform in the gap; 0 to 1e21 (= 1e17 cm^-2 eV^-1) */
  stateDensity_per_eV_m2: number;
  /** phi_0: charge-neutrality level above the valence-band maximum, eV, 0..E_g + 2 (above E_g: in the conduction band; library `chargeNeutralityAboveValence_eV`) */
  neutralLevelAboveValence_eV: number;
  /** delta, m, 0 to 10 nm (library `interfaceLayerThickness_nm`) */
  layerThickness_m: number;
  /** eps_i, 1 to 1000 (library `interfaceLayerPermittivity`) */
  layerPermittivity: number;
  /** donor-like defect states at the support surface (absent or density 0: none) */
  surfaceDonors?: SurfaceDonors | undefined;
}

/** A sheet of donor-like surface states at one level (src/interface/interfaceStates.ts header). */
export interface SurfaceDonors {
  /** N_sd, donors per m^2, 0 to 1e19 (= 1e15 cm^-2, about two per surface site) */
  density_per_m2: number;
  /** E_C - E_sd, thermal depth of the level below E_C, eV, 0 to E_g */
  depthBelowConduction_eV: number;
}

/** Spin degeneracy of a singly occupied donor level, g_D = 2 (Sze & Ng, 3rd ed., ch. 1; section from memory, verify). */
export const DONOR_DEGENERACY = 2;

/**
 * Charge of ionised surface donors, C/m^2, at electron barrier Phi_B = E_C(0) - E_F (eV):
 *   T given:   Q_sd = q N_sd / (1 + g_D exp((E_sd_depth - Phi_B)/kT))   (E_F - E_sd = E_sd_depth - Phi_B)
 *   T omitted: the zero-temperature step, q N_sd where Phi_B > E_sd_depth, else 0 (half-way at equality is not
 *   used: the step takes the ionised side only strictly above the level).
 * Always in [0, q N_sd] and non-decreasing in Phi_B (the residual's monotonicity is kept).
 */
export function surfaceDonorCharge_C_per_m2(electronBarrier_eV: number, donors: SurfaceDonors | undefined, temperature_K?: number): number {
  if (donors === undefined || donors.density_per_m2 === 0) return 0;
  const full = Q_ELEMENTARY_C * donors.density_per_m2;
  const x = donors.depthBelowConduction_eV - electronBarrier_eV;
  if (temperature_K === undefined) return x < 0 ? full : 0;
  const z = x / thermalEnergy_eV(temperature_K);
  // 1 / (1 + g e^z) without overflow: for z > 0 write e^-z / (e^-z + g)
  return z > 0 ? (full * Math.exp(-z)) / (Math.exp(-z) + DONOR_DEGENERACY) : full / (1 + DONOR_DEGENERACY * Math.exp(z));
}

/**
 * Highest charge-neutrality level above the CBM accepted, eV: 2 eV. Published branch points of oxides and nitrides
 * with conduction-band accumulation lie 0.4 eV (In2O3; King et al. 2008, read) to about 1-1.5 eV (CdO, InN; from
 * memory of King, Veal et al. and Schleife et al. 2009, verify) above the CBM; 2 eV leaves room for their ranges.
 */
export const MAX_NEUTRAL_LEVEL_ABOVE_CBM_eV = 2;

/** Allowed range of the charge-neutrality level above E_V for gap E_g (eV): [0, E_g + MAX_NEUTRAL_LEVEL_ABOVE_CBM_eV]. */
export function neutralLevelRange_eV(bandGap_eV: number): [number, number] {
  return [0, bandGap_eV + MAX_NEUTRAL_LEVEL_ABOVE_CBM_eV];
}

/**
 * Top of the uniform band of interface states above E_V, eV: E_g when phi_0 lies in the gap, else 2 phi_0 - E_g
 * (the states continue as far above phi_0 as phi_0 lies above E_C; see the header). E_g > 0, phi_0 >= 0.
 */
export function interfaceStateBandTop_eV(bandGap_eV: number, neutralLevelAboveValence_eV: number): number {
  return Math.max(bandGap_eV, 2 * neutralLevelAboveValence_eV - bandGap_eV);
}

function checkParameters(p: InterfaceStateParameters, bandGap_eV: number): void {
  requireInRange('stateDensity_per_eV_m2', p.stateDensity_per_eV_m2, 0, 1e21, 'eV^-1 m^-2');
  requireInRange('neutralLevelAboveValence_eV', p.neutralLevelAboveValence_eV, ...neutralLevelRange_eV(bandGap_eV), 'eV');
  requireInRange('layerThickness_m', p.layerThickness_m, 0, 1e-8, 'm');
  requireInRange('layerPermittivity', p.layerPermittivity, 1, 1000, '');
  if (p.surfaceDonors !== undefined) {
    requireInRange('surfaceDonors.density_per_m2', p.surfaceDonors.density_per_m2, 0, 1e19, 'm^-2');
    requireInRange('surfaceDonors.depthBelowConduction_eV', p.surfaceDonors.depthBelowConduction_eV, 0, bandGap_eV, 'eV');
  }
}

/**
 * Pinning slope S = dPhi_B/dphi_m = 1 / (1 + q^2 D_it delta / (eps_i eps0)) (Cowley & Sze, J. Appl. Phys. 36, 3212
 * (1965); D_it per J m^2 there; here per eV m^2, so q^2 D_J = q D_eV). Returns S in (0, 1]; 1 without states or layer.
 */
export function pinningFactorFromStates(stateDensity_per_eV_m2: number, layerThickness_m: number, layerPermittivity: number): number {
  requireInRange('stateDensity_per_eV_m2', stateDensity_per_eV_m2, 0, 1e21, 'eV^-1 m^-2');
  requireInRange('layerThickness_m', layerThickness_m, 0, 1e-8, 'm');
  requireInRange('layerPermittivity', layerPermittivity, 1, 1000, '');
  return 1 / (1 + (Q_ELEMENTARY_C * stateDensity_per_eV_m2 * layerThickness_m) / (layerPermittivity * EPS0_F_PER_M));
}

/**
 * Inverse of pinningFactorFromStates: D_it = (1/S - 1) eps_i eps0 / (q delta), per eV per m^2 (Cowley & Sze 1965).
 * Turns a library slope (measured, or empirical S = 1/(1 + 0.1 (eps_inf - 1)^2), Mönch; library `pinningFactor`)
 * into a state density for a stated delta (m, > 0) and eps_i. S in (0, 1]; S = 1 gives 0.
 * Defaults: DEFAULT_INTERFACE_LAYER_THICKNESS_M, DEFAULT_INTERFACE_LAYER_PERMITTIVITY.
 */
export function interfaceStateDensityFromSlope(
  pinningFactor: number,
  layerThickness_m: number = DEFAULT_INTERFACE_LAYER_THICKNESS_M,
  layerPermittivity: number = DEFAULT_INTERFACE_LAYER_PERMITTIVITY,
): number {
  requireInRange('pinningFactor', pinningFactor, 1e-4, 1, '');
  requireInRange('layerThickness_m', layerThickness_m, 1e-12, 1e-8, 'm');
  requireInRange('layerPermittivity', layerPermittivity, 1, 1000, '');
  return ((1 / pinningFactor - 1) * layerPermittivity * EPS0_F_PER_M) / (Q_ELEMENTARY_C * layerThickness_m);
}

function softplus(x: number): number {
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

/**
 * Charge of the interface states, C/m^2, for an electron barrier Phi_B = E_C(0) - E_F (eV):
 *   T omitted: Q_it = q D_it (phi_0 - clamp(E_g - Phi_B, 0, E_top))   (zero-temperature occupancy)
 *   T given:   Q_it = q D_it [phi_0 + kT ln(1 + e^((mu - E_top)/kT)) - kT ln(1 + e^(mu/kT))],  mu = E_F - E_V(0) = E_g - Phi_B
 *   (Fermi–Dirac occupancy integrated exactly over a uniform density on [E_V, E_top]: int f dE = -kT ln(1 + e^((mu-E)/kT));
 *   E_top = interfaceStateBandTop_eV, = E_g while phi_0 lies in the gap.)
 * Positive when E_F lies below the neutrality level (empty donor-like states). Non-decreasing in Phi_B.
 */
export function interfaceStateCharge_C_per_m2(
  electronBarrier_eV: number,
  bandGap_eV: number,
  neutralLevelAboveValence_eV: number,
  stateDensity_per_eV_m2: number,
  temperature_K?: number,
): number {
  if (stateDensity_per_eV_m2 === 0) return 0;
  const mu = bandGap_eV - electronBarrier_eV;
  const top = interfaceStateBandTop_eV(bandGap_eV, neutralLevelAboveValence_eV);
  let occupiedBelowMinusNeutral: number;
  if (temperature_K === undefined) {
    occupiedBelowMinusNeutral = neutralLevelAboveValence_eV - Math.min(Math.max(mu, 0), top);
  } else {
    const kT = thermalEnergy_eV(temperature_K);
    occupiedBelowMinusNeutral = neutralLevelAboveValence_eV + kT * softplus((mu - top) / kT) - kT * softplus(mu / kT);
  }
  return Q_ELEMENTARY_C * stateDensity_per_eV_m2 * occupiedBelowMinusNeutral;
}

/**
 * Electrons gained by a finite particle, N = (Q_sc A_interface + Q_it A_footprint) / q: the metal holds the
 * compensating charge -(Q_sc A_interface + Q_it A_footprint) of the space charge under its whole interface area and
 * of the interface states under its footprint. Q in C/m^2 (project sign: positive = support positive), areas m^2.
 */
export function particleElectrons(spaceCharge_C_per_m2: number, interfaceStateCharge_C_per_m2: number, interfaceArea_m2: number, footprintArea_m2: number): number {
  requireInRange('interfaceArea_m2', interfaceArea_m2, 0, 1, 'm^2');
  requireInRange('footprintArea_m2', footprintArea_m2, 0, 1, 'm^2');
  return (spaceCharge_C_per_m2 * interfaceArea_m2 + interfaceStateCharge_C_per_m2 * footprintArea_m2) / Q_ELEMENTARY_C;
}

/**
 * Finite-particle term of the alignment: the particle's Fermi level rises by N / g_tot when it gains N electrons
 * (quantum capacitance of a finite density of states; S. Luryi, Appl. Phys. Lett. 52, 501 (1988), from memory,
 * verify), so its effective work function is W - N / g_tot. Its charge also sets the field in the interfacial
 * layer: Q_m = -q N / A_footprint. See src/derived/finiteParticle.ts for W(R) and g_tot.
 */
export interface ParticleTerm {
  /** g_tot: states per eV of the whole particle at E_F (both spins), > 0 */
  densityOfStates_per_eV: number;
  /** area of the metal/support contact (interfacial layer and interface states), m^2 */
  footprintArea_m2: number;
  /** area over which spaceCharge() applies (e.g. the footprint for a planar patch), m^2 */
  interfaceArea_m2: number;
}

export interface InterfaceAlignmentInput extends InterfaceStateParameters {
  /** phi_m (for a particle: the size-corrected W(R) of the neutral particle), eV */
  metalWorkFunction_eV: number;
  /** chi, eV */
  electronAffinity_eV: number;
  /** E_g, eV */
  bandGap_eV: number;
  /** bulk E_C - E_F of the support, eV (BulkState.fermiLevelBelowConduction_eV) */
  fermiLevelBelowConduction_eV: number;
  /** occupancy temperature of the interface states, K; omitted = zero-temperature step (Cowley–Sze) */
  temperature_K?: number | undefined;
  /** Q_sc(V), C/m^2, for band bending V in eV (up = positive); non-decreasing; Q_sc(0) = 0 */
  spaceCharge: (bandBending_eV: number) => number;
  /**
   * a cheap stand-in for Q_sc(V) (no Poisson solve), C/m^2, non-decreasing, e.g. the planar first-integral charge
   * (planarChargeOfBending, src/derived/exchange.ts); it only places the iterates and never decides convergence, so
   * a poor one costs evaluations, not accuracy. Omitted: 0.
   */
  spaceChargeEstimate?: ((bandBending_eV: number) => number) | undefined;
  particle?: ParticleTerm | undefined;
  /** tolerance on the band bending, eV (default 1e-12) */
  tolerance_eV?: number;
}

export interface InterfaceAlignment {
  /** Phi_B = E_C(0) - E_F, eV */
  electronBarrier_eV: number;
  /** E_C(0) - E_C(bulk), eV */
  bandBending_eV: number;
  spaceCharge_C_per_m2: number;
  /** all interface charge at the support surface, C/m^2: the gap states (Q_it) and the ionised surface donors */
  interfaceStateCharge_C_per_m2: number;
  /** the ionised surface donors' part of it, C/m^2 (0 without surface donors) */
  surfaceDonorCharge_C_per_m2: number;
  /** metal charge facing the layer, C/m^2 (= -(Q_sc + Q_it) for an extended contact) */
  metalCharge_C_per_m2: number;
  /** Delta = -Q_m delta / (eps_i eps0): rise of the electron energy across the layer, metal to support, eV */
  layerDrop_eV: number;
  /** emergent slope S = 1 / (1 + q^2 D_it delta / (eps_i eps0)) */
  pinningFactor: number;
  /** electrons gained by the particle and the resulting Fermi-level shift (null without a particle term) */
  particle: { electronsGained: number; fermiLevelShift_eV: number; effectiveWorkFunction_eV: number } | null;
  /** residual evaluations used: calls of spaceCharge, one of which was at the returned band bending */
  iterations: number;
}

function checkAlignmentInput(input: InterfaceAlignmentInput): void {
  requireInRange('bandGap_eV', input.bandGap_eV, 0.01, 20, 'eV');
  checkParameters(input, input.bandGap_eV);
  requireInRange('metalWorkFunction_eV', input.metalWorkFunction_eV, 0, 20, 'eV');
  requireInRange('electronAffinity_eV', input.electronAffinity_eV, -5, 20, 'eV');
  requireInRange('fermiLevelBelowConduction_eV', input.fermiLevelBelowConduction_eV, -50, 50, 'eV');
  if (input.temperature_K !== undefined) requireInRange('temperature_K', input.temperature_K, 1, 5000, 'K');
  const particle = input.particle;
  if (particle !== undefined) {
    requireInRange('particle.densityOfStates_per_eV', particle.densityOfStates_per_eV, 1e-6, 1e12, 'eV^-1');
    requireInRange('particle.footprintArea_m2', particle.footprintArea_m2, 1e-22, 1, 'm^2');
    requireInRange('particle.interfaceArea_m2', particle.interfaceArea_m2, 0, 1, 'm^2');
  }
}

/** The charges and the residual of the alignment at one interface band bending. */
interface AlignmentState {
  /** v, eV */
  bandBending_eV: number;
  residual: number;
  qsc: number;
  /** gap states and surface donors together */
  qit: number;
  /** surface donors alone */
  qsd: number;
  qm: number;
  electrons: number;
  shift: number;
}

/**
 * R(v) = Phi_B - (phi_m - N/g - chi + Q_m delta/(eps_i eps0)) at interface band bending v (eV) with space charge
 * Q_sc (C/m^2) given: R is affine in Q_sc with a coefficient >= 0 (delta/(eps_i eps0), or A_interface (1/g +
 * q delta/(eps_i eps0 A_footprint))/q for a particle) and its other terms rise with v at slope >= 1, so R(v, Q(v))
 * increases with slope >= 1 for every non-decreasing Q(v): the true Q_sc, the caller's stand-in, or a model of it.
 */
function alignmentState(input: InterfaceAlignmentInput): (v: number, qsc: number) => AlignmentState {
  const particle = input.particle;
  const layer = input.layerThickness_m / (input.layerPermittivity * EPS0_F_PER_M); // V per (C/m^2)
  return (v: number, qsc: number): AlignmentState => {
    const barrier = input.fermiLevelBelowConduction_eV + v;
    const qsd = surfaceDonorCharge_C_per_m2(barrier, input.surfaceDonors, input.temperature_K);
    const qit = interfaceStateCharge_C_per_m2(barrier, input.bandGap_eV, input.neutralLevelAboveValence_eV, input.stateDensity_per_eV_m2, input.temperature_K) + qsd;
    let qm = -(qsc + qit);
    let electrons = 0;
    let shift = 0;
    if (particle !== undefined) {
      electrons = particleElectrons(qsc, qit, particle.interfaceArea_m2, particle.footprintArea_m2);
      shift = electrons / particle.densityOfStates_per_eV;
      qm = (-Q_ELEMENTARY_C * electrons) / particle.footprintArea_m2;
    }
    const residual = barrier - (input.metalWorkFunction_eV - shift - input.electronAffinity_eV + qm * layer);
    return { bandBending_eV: v, residual, qsc, qit, qsd, qm, electrons, shift };
  };
}

/**
 * Bounds of the root from the theory alone: at the largest of the Schottky–Mott bending, the pinned bending and 0
 * every charge term is >= 0, so R >= 0 there; symmetric at the smallest (1e-3 eV margin). Surface donors (always
 * >= 0) can only lower the root: the lower bound then also reaches 1 eV below their level, where they are nearly
 * neutral (bracketBending widens it further if a sign is still missing).
 */
function theoryBracket(input: InterfaceAlignmentInput): { lo: number; hi: number } {
  const xiBulk = input.fermiLevelBelowConduction_eV;
  const vSchottkyMott = input.metalWorkFunction_eV - input.electronAffinity_eV - xiBulk;
  const vPinned = input.bandGap_eV - input.neutralLevelAboveValence_eV - xiBulk;
  const donors = input.surfaceDonors;
  const vDonors = donors !== undefined && donors.density_per_m2 > 0 ? donors.depthBelowConduction_eV - 1 - xiBulk : Infinity;
  return { lo: Math.min(vSchottkyMott, vPinned, 0, vDonors) - 1e-3, hi: Math.max(vSchottkyMott, vPinned, 0) + 1e-3 };
}

/**
 * Bracket of the root from evaluations at the theory bounds, widened if the caller's Q_sc or the band-edge
 * truncation of the Fermi–Dirac interface states moves the neutral points by a little. `f` is R (evaluated or
 * modelled). Throws ConvergenceError without a sign change.
 */
function bracketBending(input: InterfaceAlignmentInput, f: (v: number) => number, count: () => number): { lo: number; hi: number; fLo: number; fHi: number } {
  let { lo, hi } = theoryBracket(input);
  let fLo = f(lo);
  let fHi = f(hi);
  let widen = 0;
  while (fLo > 0 && widen < 60) {
    lo -= Math.max(1, Math.abs(lo));
    fLo = f(lo);
    widen++;
  }
  while (fHi < 0 && widen < 120) {
    hi += Math.max(1, Math.abs(hi));
    fHi = f(hi);
    widen++;
  }
  if (!(fLo <= 0 && fHi >= 0)) {
    throw new ConvergenceError('no bracket for the interface band bending (space charge not monotone?)', count());
  }
  return { lo, hi, fLo, fHi };
}

/**
 * A non-decreasing model of Q_sc(v) through the last evaluated charges, built on the stand-in E(v) and on v itself
 * (Q_sc(0) = E(0) = 0; a planar support follows E, a particle much smaller than its space-charge layer the linear
 * charge of a sphere's capacitance, a curved geometry something between):
 *   none:  E(v)
 *   one:   E(v) + (Q1 - E(v1)) v / v1 (the planar charge plus a linear excess), when that is non-decreasing; else
 *          E(v) Q1/E(v1), else the constant Q1
 *   two:   alpha E(v) + beta v through both (alpha, beta >= 0), else the secant in E (in v where E does not vary)
 * Each is exact when Q_sc lies in its family, and the two-point model makes the iteration a secant method in that
 * family: superlinear.
 */
function chargeModelThrough(estimate: (v: number) => number, points: readonly AlignmentState[]): (v: number) => number {
  const n = points.length;
  if (n === 0) return estimate;
  const p1 = points[n - 1]!;
  const v1 = p1.bandBending_eV;
  const e1 = estimate(v1);
  if (n === 1) {
    const excess = v1 === 0 ? -1 : (p1.qsc - e1) / v1;
    if (excess >= 0) return (v) => estimate(v) + excess * v;
    if (e1 !== 0 && p1.qsc / e1 > 0) {
      const ratio = p1.qsc / e1;
      return (v) => ratio * estimate(v);
    }
    return () => p1.qsc;
  }
  const p0 = points[n - 2]!;
  const v0 = p0.bandBending_eV;
  const e0 = estimate(v0);
  // alpha E + beta v through (v0, Q0) and (v1, Q1): Cramer's rule
  const det = e0 * v1 - e1 * v0;
  if (Math.abs(det) > 1e-9 * (Math.abs(e0 * v1) + Math.abs(e1 * v0))) {
    const alpha = (p0.qsc * v1 - p1.qsc * v0) / det;
    const beta = (e0 * p1.qsc - e1 * p0.qsc) / det;
    if (alpha >= 0 && beta >= 0) return (v) => alpha * estimate(v) + beta * v;
  }
  const de = e1 - e0;
  if (Math.abs(de) > 1e-9 * Math.max(Math.abs(e0), Math.abs(e1))) {
    const a = Math.max(0, (p1.qsc - p0.qsc) / de);
    return (v) => p1.qsc + a * (estimate(v) - e1);
  }
  const dv = v1 - v0;
  const a = dv === 0 ? 0 : Math.max(0, (p1.qsc - p0.qsc) / dv);
  return (v) => p1.qsc + a * (v - v1);
}

/** Root of the increasing R(v) in [lo, hi], or the end it lies beyond (no Poisson solve: `r` is cheap). */
function cheapRoot(r: (v: number) => number, lo: number, hi: number, tolerance: number): number {
  const fLo = r(lo);
  if (fLo >= 0) return lo;
  const fHi = r(hi);
  if (fHi <= 0) return hi;
  return brent(r, lo, hi, fLo, fHi, tolerance);
}

/** most evaluations of Q_sc (Poisson solves) before giving up; the old full-bracket Brent needed 7 to 15 */
const MAX_EVALUATIONS = 60;

/**
 * The interface band bending: an evaluated point within the tolerance of the root, certified by the bracket. The
 * bracket: R(v) = B(v) + c Q_sc(v) with B(v) = R(v) at Q_sc = 0 (cheap, slope >= 1) and c >= 0, so for the root
 * v* and an evaluated v, R(v) - R(v*) = B(v) - B(v*) + c (Q_sc(v) - Q_sc(v*)) has the sign of v - v* and magnitude
 * >= |B(v) - B(v*)|: v* lies between v and w = B^-1(B(v) - R(v)) (within |R(v)| of v, closer when B rises faster).
 * Each evaluation (one call of the caller's spaceCharge) intersects the bracket with its own [w, v] or [v, w].
 * Returned: the first evaluated v with |v - w| <= tolerance, or an evaluated end of a bracket no wider than it.
 * Iterates:
 *   1. V0 = root of R with Q_sc replaced by the stand-in (cheap).
 *   2. Then the root of R with Q_sc replaced by chargeModelThrough the last one or two evaluations (cheap), inside
 *      the bracket (and the theory bounds while they overlap it) and at least tolerance/2 from its evaluated ends;
 *      bisection instead when two iterates have not halved the bracket (the safeguard of Brent, Algorithms for
 *      Minimization without Derivatives, Prentice-Hall 1973, ch. 4). A secant method in the model family:
 *      superlinear.
 * Evaluations that contradict the bracket (a Q_sc that is not monotone, or noisy above the tolerance) hand over to
 * rescue: Brent's method on evaluated signs only. The returned state is one of the evaluated ones (never evaluated
 * twice). Throws ConvergenceError past MAX_EVALUATIONS or without a bracket.
 */
function solveBending(input: InterfaceAlignmentInput, tolerance: number): { root: AlignmentState; evaluations: number } {
  const stateAt = alignmentState(input);
  const evaluated: AlignmentState[] = [];
  const count = (): number => evaluated.length;
  const evaluate = (v: number): AlignmentState => {
    const qsc = input.spaceCharge(v);
    if (!Number.isFinite(qsc)) throw new RangeError(`spaceCharge(${v}) returned ${qsc}`);
    const state = stateAt(v, qsc);
    evaluated.push(state);
    return state;
  };
  const given = input.spaceChargeEstimate;
  const estimate = (v: number): number => {
    if (given === undefined) return 0;
    const q = given(v);
    if (!Number.isFinite(q)) throw new RangeError(`spaceChargeEstimate(${v}) returned ${q}`);
    return q;
  };
  const cheapTolerance = 1e-3 * tolerance;
  const theory = theoryBracket(input);
  const done = (root: AlignmentState): { root: AlignmentState; evaluations: number } => ({ root, evaluations: count() });
  const withoutCharge = (x: number): number => stateAt(x, 0).residual; // B(x)
  /** w = B^-1(B(v) - r), between v and v - r (B rises with slope >= 1), moved outward by the cheap tolerance */
  const farBound = (v: number, r: number): number => {
    const target = withoutCharge(v) - r;
    const w = cheapRoot((x) => withoutCharge(x) - target, Math.min(v, v - r), Math.max(v, v - r), cheapTolerance);
    return r > 0 ? Math.max(v - r, w - cheapTolerance) : Math.min(v - r, w + cheapTolerance);
  };

  // 1. V0 from the stand-in, bracketed by the theory bounds (cheap)
  const standIn = (x: number): number => stateAt(x, estimate(x)).residual;
  let v: number;
  try {
    const start = bracketBending(input, standIn, count);
    v = brent(standIn, start.lo, start.hi, start.fLo, start.fHi, cheapTolerance);
  } catch (error) {
    if (!(error instanceof ConvergenceError)) throw error;
    v = 0.5 * (theory.lo + theory.hi); // a stand-in that is not monotone: start anywhere, the bracket follows
  }

  let lo = -Infinity;
  let hi = Infinity;
  let loState: AlignmentState | null = null;
  let hiState: AlignmentState | null = null;
  const widths: number[] = [];
  for (;;) {
    if (count() >= MAX_EVALUATIONS) throw new ConvergenceError('evaluation limit for the interface band bending', count());
    const s = evaluate(v);
    const r = s.residual;
    if (r === 0) return done(s);
    // a sign contradicting a bound-derived end
    if (r > 0 ? loState === null && v <= lo : hiState === null && v >= hi) return done(rescue(input, evaluate, count, evaluated, tolerance));
    const w = farBound(v, r);
    if (Math.abs(v - w) <= tolerance) return done(s);
    if (r > 0) {
      hi = v;
      hiState = s;
      if (w > lo) {
        lo = w;
        loState = null;
      }
    } else {
      lo = v;
      loState = s;
      if (w < hi) {
        hi = w;
        hiState = null;
      }
    }
    if (lo > hi) return done(rescue(input, evaluate, count, evaluated, tolerance));
    const width = hi - lo;
    if (width <= tolerance) {
      const ends = [loState, hiState].filter((e): e is AlignmentState => e !== null);
      if (ends.length > 0) return done(ends.reduce((x, y) => (Math.abs(y.residual) < Math.abs(x.residual) ? y : x)));
      v = 0.5 * (lo + hi);
      continue;
    }
    widths.push(width);
    const twoBack = widths.length >= 3 ? widths[widths.length - 3]! : Infinity;
    // iterates stay inside the theory bounds too while they overlap the bracket (a bound-derived end can lie far out)
    const a = Math.max(lo, theory.lo);
    const b = Math.min(hi, theory.hi);
    const [searchLo, searchHi] = a < b ? [a, b] : [lo, hi];
    if (width > 0.5 * twoBack) {
      v = 0.5 * (searchLo + searchHi);
      widths.length = 0;
    } else {
      const model = chargeModelThrough(estimate, evaluated.slice(-2));
      v = cheapRoot((x) => stateAt(x, model(x)).residual, searchLo, searchHi, cheapTolerance);
    }
    // never within tolerance/2 of an evaluated end: the next evaluation then closes the bracket or meets the tolerance
    if (hiState !== null) v = Math.min(v, hi - 0.5 * tolerance);
    if (loState !== null) v = Math.max(v, lo + 0.5 * tolerance);
  }
}

/**
 * The evaluations contradict the bracket: Brent's method on the tightest sign change among the evaluated points,
 * or, without one, on a bracket evaluated at the theory bounds (the scheme used before issue 13). Its result is
 * always an evaluated point.
 */
function rescue(
  input: InterfaceAlignmentInput,
  evaluate: (v: number) => AlignmentState,
  count: () => number,
  evaluated: readonly AlignmentState[],
  tolerance: number,
): AlignmentState {
  const residual = (v: number): number => evaluate(v).residual;
  let below: AlignmentState | null = null;
  let above: AlignmentState | null = null;
  for (const e of evaluated) {
    if (e.residual < 0 && (below === null || e.bandBending_eV > below.bandBending_eV)) below = e;
    if (e.residual > 0 && (above === null || e.bandBending_eV < above.bandBending_eV)) above = e;
  }
  const { lo, hi, fLo, fHi } =
    below !== null && above !== null && below.bandBending_eV < above.bandBending_eV
      ? { lo: below.bandBending_eV, hi: above.bandBending_eV, fLo: below.residual, fHi: above.residual }
      : bracketBending(input, residual, count);
  const root = brent(residual, lo, hi, fLo, fHi, tolerance);
  for (let k = evaluated.length - 1; k >= 0; k--) if (evaluated[k]!.bandBending_eV === root) return evaluated[k]!;
  throw new RangeError('Brent returned a point it did not evaluate');
}

/**
 * Self-consistent barrier with interface states, interfacial layer and space charge (Cowley & Sze 1965):
 * solves Phi_B = phi_m - N/g_tot - chi + Q_m delta / (eps_i eps0), Q_m = -(Q_sc + Q_it) (extended contact) or
 * -q N / A_footprint (particle), for the band bending (solveBending: usually 2 to 4 calls of spaceCharge, the
 * returned band bending being one of them). Limits: D_it -> 0 or delta -> 0 gives the Schottky–Mott rule;
 * D_it -> infinity pins Phi_B at E_g - phi_0 (Bardeen); negligible Q_sc gives the linear
 * Phi_B = S (phi_m - chi) + (1 - S)(E_g - phi_0). Throws InputError on bad input, ConvergenceError if the caller's
 * space charge is not monotone enough to bracket a root.
 */
export function solveInterfaceAlignment(input: InterfaceAlignmentInput): InterfaceAlignment {
  checkAlignmentInput(input);
  const { root: state, evaluations } = solveBending(input, input.tolerance_eV ?? 1e-12);
  const layer = input.layerThickness_m / (input.layerPermittivity * EPS0_F_PER_M);
  const particle = input.particle;
  return {
    electronBarrier_eV: input.fermiLevelBelowConduction_eV + state.bandBending_eV,
    bandBending_eV: state.bandBending_eV,
    spaceCharge_C_per_m2: state.qsc,
    interfaceStateCharge_C_per_m2: state.qit,
    surfaceDonorCharge_C_per_m2: state.qsd,
    metalCharge_C_per_m2: state.qm,
    layerDrop_eV: -state.qm * layer,
    pinningFactor: 1 / (1 + Q_ELEMENTARY_C * input.stateDensity_per_eV_m2 * layer),
    particle:
      particle === undefined
        ? null
        : { electronsGained: state.electrons, fermiLevelShift_eV: state.shift, effectiveWorkFunction_eV: input.metalWorkFunction_eV - state.shift },
    iterations: evaluations,
  };
}

/**
 * Brent's root finder (R. P. Brent, Algorithms for Minimization without Derivatives, Prentice-Hall 1973, ch. 4):
 * inverse quadratic interpolation / secant, safeguarded by bisection; needs f(a) f(b) <= 0. Returns a point at which
 * f was evaluated (or a0 / b0).
 */
function brent(f: (x: number) => number, a0: number, b0: number, fa0: number, fb0: number, tolerance: number): number {
  let a = a0;
  let b = b0;
  let fa = fa0;
  let fb = fb0;
  if (fa === 0) return a;
  if (fb === 0) return b;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < 200; iter++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tolerance;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  throw new ConvergenceError('Brent iteration limit for the interface band bending', 200);
}

/**
 * A spaceCharge for the alignment that keeps what each call computed (e.g. the Poisson solution, C/m^2 read from it
 * by `charge`), so that the caller reuses it at the returned band bending, always one of the evaluated ones, instead
 * of solving there again: `at(bandBending_eV)`.
 */
export function keepingEvaluations<S>(
  solve: (bandBending_eV: number) => S,
  charge: (solved: S) => number,
): { spaceCharge: (bandBending_eV: number) => number; at: (bandBending_eV: number) => S | undefined } {
  const kept = new Map<number, S>();
  return {
    spaceCharge: (v) => {
      const solved = solve(v);
      kept.set(v, solved);
      return charge(solved);
    },
    at: (v) => kept.get(v),
  };
}

/** D_it per eV per cm^2 -> per eV per m^2 (x 1e4); for callers reading values quoted in cm^-2 eV^-1. Input >= 0, finite. */
export function stateDensityFromPerCm2(stateDensity_per_eV_cm2: number): number {
  if (!Number.isFinite(stateDensity_per_eV_cm2) || stateDensity_per_eV_cm2 < 0) {
    throw new InputError('stateDensity_per_eV_cm2', 'must be a finite non-negative number', '0 to 1e17 cm^-2 eV^-1');
  }
  return stateDensity_per_eV_cm2 * 1e4;
}

/** Library values of a support (plain numbers read from the PropertyValues of the same names on SupportRecord). */
export interface InterfaceLibraryValues {
  chargeNeutralityAboveValence_eV?: number | undefined;
  pinningFactor?: number | undefined;
  interfaceLayerThickness_nm?: number | undefined;
  interfaceLayerPermittivity?: number | undefined;
  /** eps_inf, for the empirical slope when no pinningFactor is given */
  opticalPermittivity: number;
}

export interface InterfaceParametersFromLibrary {
  parameters: InterfaceStateParameters;
  pinningFactor: number;
  pinningFactorOrigin: 'given' | 'empirical';
  layerOrigin: 'given' | 'default';
}

/**
 * Interface-state parameters from library values: D_it from the slope S (given, or the empirical
 * S = 1/(1 + 0.1 (eps_inf - 1)^2), empiricalPinningFactor in src/barrier/barrier.ts) with the stated layer
 * (given, or DEFAULT_INTERFACE_LAYER_THICKNESS_M / DEFAULT_INTERFACE_LAYER_PERMITTIVITY). Returns null when the
 * support has no charge-neutrality level (the interface-state model cannot be used; fall back to `ideal`).
 */
export function interfaceParametersFromLibrary(values: InterfaceLibraryValues): InterfaceParametersFromLibrary | null {
  if (values.chargeNeutralityAboveValence_eV === undefined) return null;
  const pinningFactorOrigin = values.pinningFactor === undefined ? 'empirical' : 'given';
  const pinningFactor = values.pinningFactor ?? empiricalPinningFactor(values.opticalPermittivity);
  const layerGiven = values.interfaceLayerThickness_nm !== undefined || values.interfaceLayerPermittivity !== undefined;
  const layerThickness_m = values.interfaceLayerThickness_nm === undefined ? DEFAULT_INTERFACE_LAYER_THICKNESS_M : values.interfaceLayerThickness_nm * 1e-9;
  const layerPermittivity = values.interfaceLayerPermittivity ?? DEFAULT_INTERFACE_LAYER_PERMITTIVITY;
  return {
    parameters: {
      stateDensity_per_eV_m2: interfaceStateDensityFromSlope(pinningFactor, layerThickness_m, layerPermittivity),
      neutralLevelAboveValence_eV: values.chargeNeutralityAboveValence_eV,
      layerThickness_m,
      layerPermittivity,
    },
    pinningFactor,
    pinningFactorOrigin,
    layerOrigin: layerGiven ? 'given' : 'default',
  };
}
