import type { ResolvedContact } from '../inputs/contactInput.js';
// The finite metal particle in the contact: size-dependent work function, density of states at E_F (quantum
// capacitance) and a hard bound on the charge it can exchange with the support. Pure functions; energies in eV,
// lengths in m. Library names (MetalRecord): `densityOfStatesAtFermi_per_eV_atom`, `sizeWorkFunctionCoefficient`.
//
// Which work function governs a neutral supported particle (our choice, documented):
//   A classical conducting sphere of radius R has (e^2/(4 pi eps0 R) = 1.440 eV nm / R)
//     IP(R) = W_inf + alpha e^2/(4 pi eps0 R)          (ionisation potential)
//     EA(R) = W_inf - (1 - alpha) e^2/(4 pi eps0 R)    (electron affinity; IP - EA = e^2/(4 pi eps0 R), the
//                                                      classical charging energy of the isolated sphere)
//   with alpha = 3/8 (Wood, Phys. Rev. Lett. 46, 749 (1981); Perdew, Phys. Rev. B 37, 6175 (1988); Seidl & Perdew,
//   Phys. Rev. B 50, 5744 (1994)) or alpha = 1/2 (Makov, Nitzan & Brus, J. Chem. Phys. 88, 5076 (1988), who call
//   3/8 an artefact); Halas (Chem. Phys. Lett. 2003) reconciles them: the plane W_inf vs the grounded sphere
//   W_inf - (1/8) e^2/(4 pi eps0 R). (Citation details from memory, verify.)
//   The Fermi level of a neutral particle exchanging a fractional charge is the chemical potential
//   mu = -(IP + EA)/2 (the slope of E(N) at the neutral point when E(N) is quadratic), so the work function that
//   enters the alignment is
//     W_neutral(R) = (IP + EA)/2 = W_inf + (alpha - 1/2) e^2/(4 pi eps0 R)
//   i.e. W_inf - 0.18 eV / R[nm] for alpha = 3/8 and W_inf for alpha = 1/2. The +-(1/2) e^2/(4 pi eps0 R)
//   charging parts of IP and EA are not added: in the contact the particle's charge is compensated inside the
//   support, and that electrostatic energy is what the space charge / interfacial layer (and, for R comparable
//   with the layer depth, the hemisphere geometry) already computes; adding the isolated-sphere charging energy
//   would count it twice.
//   Limits: jellium-like sphere, R >~ 1 nm (a few hundred atoms); below that shell structure and discrete levels
//   (mean level spacing 1/g_tot, see kuboGap_eV) dominate; the support's own interface dipole and the particle's
//   shape are outside this correction.
import { K_BOLTZMANN_J_PER_K, M_ELECTRON_KG, H_PLANCK_J_S, N_AVOGADRO_PER_MOL, Q_ELEMENTARY_C, EPS0_F_PER_M } from '../constants.js';
import { InputError, requireInRange } from '../errors.js';
import { interfaceStateCharge_C_per_m2, solveInterfaceAlignment, type ParticleTerm } from '../interface/interfaceStates.js';

/** alpha = 3/8 for the ionisation potential of a small metal sphere (Wood 1981; from memory, verify). */
export const WOOD_IONISATION_COEFFICIENT = 3 / 8;

/** e^2 / (4 pi eps0 R) in eV for R in m (= 1.440 eV nm / R). */
export function sphereCoulombEnergy_eV(radius_m: number): number {
  requireInRange('radius_m', radius_m, 1e-10, 1e-5, 'm');
  return Q_ELEMENTARY_C / (4 * Math.PI * EPS0_F_PER_M * radius_m);
}

function checkCoefficient(alpha: number): number {
  return requireInRange('sizeWorkFunctionCoefficient', alpha, 0, 1, '');
}

/** IP(R) = W_inf + alpha e^2/(4 pi eps0 R), eV (Wood, PRL 46, 749 (1981), alpha = 3/8). W_inf 0-20 eV, R 0.1 nm-10 um. */
export function sizeDependentIonisationPotential_eV(workFunctionInfinite_eV: number, radius_m: number, alpha = WOOD_IONISATION_COEFFICIENT): number {
  requireInRange('workFunctionInfinite_eV', workFunctionInfinite_eV, 0, 20, 'eV');
  return workFunctionInfinite_eV + checkCoefficient(alpha) * sphereCoulombEnergy_eV(radius_m);
}

/** EA(R) = W_inf - (1 - alpha) e^2/(4 pi eps0 R), eV (Perdew, PRB 37, 6175 (1988): 5/8 for alpha = 3/8; from memory, verify). */
export function sizeDependentElectronAffinity_eV(workFunctionInfinite_eV: number, radius_m: number, alpha = WOOD_IONISATION_COEFFICIENT): number {
  requireInRange('workFunctionInfinite_eV', workFunctionInfinite_eV, 0, 20, 'eV');
  return workFunctionInfinite_eV - (1 - checkCoefficient(alpha)) * sphereCoulombEnergy_eV(radius_m);
}

/**
 * Work function that sets the Fermi level of a neutral particle of radius R in the contact alignment, eV:
 * W_neutral = (IP + EA)/2 = W_inf + (alpha - 1/2) e^2/(4 pi eps0 R) (see the header for why and its limits).
 * alpha = library `sizeWorkFunctionCoefficient` (IP coefficient), default 3/8.
 */
export function neutralParticleWorkFunction_eV(workFunctionInfinite_eV: number, radius_m: number, alpha = WOOD_IONISATION_COEFFICIENT): number {
  return 0.5 * (sizeDependentIonisationPotential_eV(workFunctionInfinite_eV, radius_m, alpha) + sizeDependentElectronAffinity_eV(workFunctionInfinite_eV, radius_m, alpha));
}

/**
 * Density of states at E_F per atom (both spins), states / (eV atom), from the electronic specific-heat coefficient
 * gamma (mJ mol^-1 K^-2): N(E_F) = 3 gamma / (pi^2 k_B^2) per mole (Ashcroft & Mermin, Solid State Physics, eq. 2.80;
 * Kittel ch. 6). Includes the electron–phonon enhancement (1 + lambda), which is what a slow charge transfer sees
 * only approximately; the bare band DOS is lower by that factor. gamma 0.01-100.
 */
export function densityOfStatesFromSpecificHeat_per_eV_atom(gamma_mJ_per_mol_K2: number): number {
  requireInRange('gamma_mJ_per_mol_K2', gamma_mJ_per_mol_K2, 0.01, 100, 'mJ/(mol K^2)');
  const perJoulePerMole = (3 * gamma_mJ_per_mol_K2 * 1e-3) / (Math.PI ** 2 * K_BOLTZMANN_J_PER_K ** 2);
  return (perJoulePerMole / N_AVOGADRO_PER_MOL) * Q_ELEMENTARY_C;
}

/**
 * Free-electron density of states at E_F per atom (both spins): g = 3 z / (2 E_F), E_F = hbar^2 (3 pi^2 n)^(2/3) / (2 m)
 * (Ashcroft & Mermin, eqs. 2.21 and 2.64). valence z (electrons per atom, 0.5-12), conduction-electron density n (m^-3).
 * A fair estimate for s-p metals (Ag, Au, Cu); it misses the d-band DOS of Pt, Pd, Ni, Rh by a factor of about 10.
 */
export function freeElectronDensityOfStates_per_eV_atom(valence: number, electronDensity_m3: number): number {
  requireInRange('valence', valence, 0.5, 12, '');
  requireInRange('electronDensity_m3', electronDensity_m3, 1e27, 1e31, 'm^-3');
  const hbar = H_PLANCK_J_S / (2 * Math.PI);
  const fermiEnergy_eV = (hbar ** 2 * (3 * Math.PI ** 2 * electronDensity_m3) ** (2 / 3)) / (2 * M_ELECTRON_KG) / Q_ELEMENTARY_C;
  return (3 * valence) / (2 * fermiEnergy_eV);
}

/** g_tot = g_atom x atoms: states per eV of the whole particle at E_F (feeds ParticleTerm.densityOfStates_per_eV). */
export function particleDensityOfStates_per_eV(perAtom_per_eV: number, atoms: number): number {
  requireInRange('densityOfStatesAtFermi_per_eV_atom', perAtom_per_eV, 1e-3, 100, 'eV^-1 atom^-1');
  requireInRange('atoms', atoms, 1, 1e12, '');
  return perAtom_per_eV * atoms;
}

/** Quantum capacitance C_q = q^2 g_tot (Luryi, Appl. Phys. Lett. 52, 501 (1988); from memory, verify), F, g in eV^-1. */
export function quantumCapacitance_F(densityOfStates_per_eV: number): number {
  requireInRange('densityOfStates_per_eV', densityOfStates_per_eV, 0, 1e15, 'eV^-1');
  // q^2 g_J = q^2 (g_eV / q) = q g_eV
  return Q_ELEMENTARY_C * densityOfStates_per_eV;
}

/** Fermi-level rise of a particle that gained N electrons: N / g_tot, eV (rigid band, N << g_tot x bandwidth). */
export function particleFermiLevelShift_eV(electronsGained: number, densityOfStates_per_eV: number): number {
  requireInRange('densityOfStates_per_eV', densityOfStates_per_eV, 1e-6, 1e15, 'eV^-1');
  if (!Number.isFinite(electronsGained)) throw new InputError('electronsGained', 'must be finite', 'a finite number');
  return electronsGained / densityOfStates_per_eV;
}

/**
 * Mean level spacing at E_F (Kubo gap) delta = 1 / g_tot, eV (Kubo, J. Phys. Soc. Jpn. 17, 975 (1962); from memory,
 * verify). The continuum density of states used here needs delta << kT; above that the particle is molecule-like.
 */
export function kuboGap_eV(densityOfStates_per_eV: number): number {
  requireInRange('densityOfStates_per_eV', densityOfStates_per_eV, 1e-6, 1e15, 'eV^-1');
  return 1 / densityOfStates_per_eV;
}

export interface TransferBoundInput {
  /** W of the particle entering the alignment (e.g. neutralParticleWorkFunction_eV), eV */
  metalWorkFunction_eV: number;
  electronAffinity_eV: number;
  bandGap_eV: number;
  /** bulk E_C - E_F of the support, eV */
  fermiLevelBelowConduction_eV: number;
  /** charge-neutrality level above E_V, eV (any value in the gap when there are no interface states) */
  neutralLevelAboveValence_eV: number;
  stateDensity_per_eV_m2: number;
  layerThickness_m: number;
  layerPermittivity: number;
  /** g_tot of the particle, eV^-1; Infinity allowed (extended metal) */
  densityOfStates_per_eV: number;
  footprintArea_m2: number;
  interfaceArea_m2: number;
  /** the same non-decreasing Q_sc(V) as in the alignment, C/m^2 */
  spaceCharge: (bandBending_eV: number) => number;
  /** interface-state occupancy temperature, K, as passed to the alignment (omitted = zero-temperature step) */
  temperature_K?: number | undefined;
}

export interface TransferBound {
  /** most electrons the particle can gain (>= 0) */
  maxGained: number;
  /** most electrons the particle can lose (>= 0) */
  maxLost: number;
  /** the signed charge the support would hold at the Schottky–Mott barrier, electrons */
  schottkyMottCharge: number;
  /** the series-capacitance (quantum + layer) bound on the energy window, electrons (gain, loss) */
  capacitanceLimit: { gained: number; lost: number };
}

/**
 * Hard bound on the electrons N a particle exchanges with the support, derived from the alignment equations
 * (solveInterfaceAlignment with a ParticleTerm; our derivation, each step uses only that Q_sc and Q_it are
 * non-decreasing and vanish at their neutral points):
 *   1. N lies between 0 and B = [A_interface Q_sc(phi_m - chi - xi_b) + A_footprint Q_it(Phi_B = phi_m - chi)] / q,
 *      the charge the support would hold if the whole contact potential difference fell inside it (no layer
 *      drop, infinite density of states): both the layer and the particle's Fermi-level shift only reduce it.
 *   2. N (1/g_tot + q delta/(eps_i eps0 A_footprint)) < phi_m - min(phi_s, phi_CNL) when gaining
 *      (> phi_m - max(...) when losing), phi_s = chi + xi_b, phi_CNL = chi + E_g - phi_0: the quantum capacitance
 *      (Luryi 1988) in series with the interfacial-layer capacitance eps_i eps0 A / delta cannot hold more than
 *      the widest energy window between the particle's Fermi level and the support's two reference levels.
 * Bound 1 holds for any occupancy; bound 2 takes the neutral point of the interface states at phi_0 (exact for the
 * zero-temperature step; Fermi–Dirac moves it by far less than kT while E_F is a few kT inside the gap).
 */
export function transferredChargeBound(input: TransferBoundInput): TransferBound {
  requireInRange('footprintArea_m2', input.footprintArea_m2, 1e-22, 1, 'm^2');
  requireInRange('interfaceArea_m2', input.interfaceArea_m2, 0, 1, 'm^2');
  if (!(input.densityOfStates_per_eV > 0)) throw new InputError('densityOfStates_per_eV', 'must be positive', '> 0 (Infinity allowed)');
  const chi = input.electronAffinity_eV;
  const phiM = input.metalWorkFunction_eV;
  const xi = input.fermiLevelBelowConduction_eV;
  const smBarrier = phiM - chi;
  const qsc = input.spaceCharge(smBarrier - xi);
  if (!Number.isFinite(qsc)) throw new RangeError('spaceCharge returned a non-finite value');
  const qit = interfaceStateCharge_C_per_m2(smBarrier, input.bandGap_eV, input.neutralLevelAboveValence_eV, input.stateDensity_per_eV_m2, input.temperature_K);
  const b = (input.interfaceArea_m2 * qsc + input.footprintArea_m2 * qit) / Q_ELEMENTARY_C;
  // eV per electron: 1/g (quantum) + q delta / (eps_i eps0 A) (layer)
  const perElectron_eV =
    1 / input.densityOfStates_per_eV + (Q_ELEMENTARY_C * input.layerThickness_m) / (input.layerPermittivity * EPS0_F_PER_M * input.footprintArea_m2);
  const phiS = chi + xi;
  const phiCnl = chi + input.bandGap_eV - input.neutralLevelAboveValence_eV;
  const windowGain = Math.max(0, phiM - Math.min(phiS, phiCnl));
  const windowLoss = Math.max(0, Math.max(phiS, phiCnl) - phiM);
  const capGain = perElectron_eV > 0 ? windowGain / perElectron_eV : Number.MAX_VALUE;
  const capLoss = perElectron_eV > 0 ? windowLoss / perElectron_eV : Number.MAX_VALUE;
  return {
    maxGained: Math.min(Math.max(0, b), capGain),
    maxLost: Math.min(Math.max(0, -b), capLoss),
    schottkyMottCharge: b,
    capacitanceLimit: { gained: capGain, lost: capLoss },
  };
}

/**
 * Work function that sets the Fermi level of a small particle (hemisphere and array geometry, library metals with a
 * size coefficient): W(R) = W + (alpha - 1/2) e^2/(4 pi eps0 R) (Wood, PRL 46, 749 (1981); src/derived/finiteParticle.ts).
 */
export function particleWorkFunction_eV(r: Pick<ResolvedContact, 'metal' | 'geometry' | 'particleDiameter_m'>): number {
  const alpha = r.metal.sizeWorkFunctionCoefficient;
  if (r.geometry === 'planar' || alpha === undefined) return r.metal.workFunction_eV;
  return neutralParticleWorkFunction_eV(r.metal.workFunction_eV, r.particleDiameter_m / 2, alpha);
}

export interface IdealParticleInput {
  /** W of the neutral particle (e.g. neutralParticleWorkFunction_eV), eV */
  metalWorkFunction_eV: number;
  electronAffinity_eV: number;
  bandGap_eV: number;
  /** bulk E_C - E_F of the support, eV */
  fermiLevelBelowConduction_eV: number;
  particle: ParticleTerm;
  /** non-decreasing Q_sc(V), C/m^2, for band bending V in eV (one Poisson solve per call) */
  spaceCharge: (bandBending_eV: number) => number;
  /** cheap non-decreasing stand-in for Q_sc(V), C/m^2 (e.g. planarChargeOfBending); see InterfaceAlignmentInput */
  spaceChargeEstimate?: ((bandBending_eV: number) => number) | undefined;
}

/**
 * Schottky–Mott rule for a finite particle: the particle's Fermi level rises by N/g_tot when it gains N electrons
 * (quantum capacitance, Luryi 1988), so Phi_B = (W - N/g_tot) - chi with N = Q_sc(Phi_B - xi_b) A / q, solved
 * self-consistently. This is the D_it = 0, delta = 0 limit of solveInterfaceAlignment, used for it. Returns the
 * Fermi-level shift N/g_tot (eV, positive when the particle gained electrons) and N; the effective work function is
 * W - shift. |N| never exceeds the Schottky–Mott charge (transferredChargeBound, bound 1). `bandBending_eV` is the
 * root, a band bending at which spaceCharge was called (its Poisson solution can be reused); W - shift - chi - xi_b
 * equals it to within the 1e-9 eV tolerance.
 */
export function idealParticleAlignment(input: IdealParticleInput): { fermiLevelShift_eV: number; electronsGained: number; bandBending_eV: number; iterations: number } {
  const aligned = solveInterfaceAlignment({
    ...input,
    stateDensity_per_eV_m2: 0,
    neutralLevelAboveValence_eV: input.bandGap_eV / 2, // irrelevant without states
    layerThickness_m: 0,
    layerPermittivity: 1,
    tolerance_eV: 1e-9,
  });
  return {
    fermiLevelShift_eV: aligned.particle!.fermiLevelShift_eV,
    electronsGained: aligned.particle!.electronsGained,
    bandBending_eV: aligned.bandBending_eV,
    iterations: aligned.iterations,
  };
}
