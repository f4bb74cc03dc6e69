// One metal/support contact, the whole pipeline:
// inputs -> materials -> bulk equilibrium -> barrier -> electrostatics -> derived results.
import { InputError, isModelFailure } from './errors.js';
import { capacitanceBarrier, type CapacitanceBarrier } from './derived/capacitanceVoltage.js';
import { propagateUncertainty } from './derived/uncertainty.js';
import { resolveContact, withVacancyDonors, supportElectronicOf, type ContactOptions, type ResolvedContact } from './inputs/contactInput.js';
import { makeChargeModel, solveBulkNeutrality, type ChargeModel } from './bulk/equilibrium.js';
import { barrierHeight, empiricalPinningFactor, type BarrierResult } from './barrier/barrier.js';
import {
  DEFAULT_INTERFACE_LAYER_PERMITTIVITY,
  DEFAULT_INTERFACE_LAYER_THICKNESS_M,
  interfaceStateDensityFromSlope,
  keepingEvaluations,
  solveInterfaceAlignment,
  type InterfaceAlignment,
  type InterfaceAlignmentInput,
  type InterfaceStateParameters,
} from './interface/interfaceStates.js';
import { PLANAR, disc, discArray, hemisphere, particleArray, type CrossSection } from './electrostatics/geometry.js';
import { solvePoisson, REFINE_ABOVE, type PoissonSolution } from './electrostatics/poisson.js';
import { idealParticleAlignment, particleDensityOfStates_per_eV, particleWorkFunction_eV } from './derived/finiteParticle.js';
import { particleAtoms, chargingSummary, effectivePermittivity, meanSpacing_m, type ParticleAtomCount } from './derived/particle.js';
import {
  thermionicExchangeCurrent_A_per_m2,
  equilibrationTime_s,
  SLOW_EXCHANGE_THRESHOLD_S,
  exchangeCurrentThroughProfile,
  forwardSlopeEnergy_eV,
  planarChargeOfBending,
  relaxationTime99_s,
  tunnellingEnergy_eV,
  type ChargeOfBending,
  type RelaxationTime,
} from './derived/exchange.js';
import { chargeEquivalentWidth_m, depletedChargeDensity_m3, depletionWidthApprox_m, sphericalDepletionWidth_m } from './derived/widths.js';
import { devonshirePermittivity, dielectricLaw, differentialPermittivity, imageForceValidity, isLinear, type DielectricLaw } from './electrostatics/permittivity.js';
import {
  chargeDepth_m,
  electronsPerParticle,
  flowDirection,
  flowDirectionOfCharge,
  interfaceField_V_per_m,
  spaceChargeDensity_C_per_m2,
} from './derived/spaceCharge.js';
import { evaluateWarnings, type WarningFacts } from './derived/warnings.js';
import { debyeLengthOrNull, finiteLog10, toContactResult, type ContactPhysics, type ExchangeKinetics } from './contactResult.js';
import type { ContactResult, GeometryKind } from './types.js';

export type { ContactOptions, ResolvedContact } from './inputs/contactInput.js';

/** Largest band bending accepted, eV: beyond this the contact is outside the model (and outside any oxide gap). */
export const MAX_BAND_BENDING_EV = 12;

function checkBandBending(bandBending_eV: number): void {
  if (!Number.isFinite(bandBending_eV) || Math.abs(bandBending_eV) > MAX_BAND_BENDING_EV) {
    throw new InputError(
      'band bending',
      `the inputs give ${bandBending_eV.toFixed(2)} eV between interface and bulk`,
      `|band bending| <= ${MAX_BAND_BENDING_EV} eV: check work function, electron affinity and barrier`,
    );
  }
}

/** Solve one contact from user-level options (units parsed, materials looked up). */
export function solveContact(options: ContactOptions): ContactResult {
  const resolved = resolveContact(options);
  const result = solveResolved(resolved);
  if (resolved.uncertaintySamples > 0) {
    result.uncertainty = propagateUncertainty(resolved, solveResolved, resolved.uncertaintySamples, resolved.seed);
    if (resolved.ranges.size === 0) {
      result.warnings.push({ code: 'no-ranges', message: 'no input has a published range: the uncertainty sampling varied nothing' });
    }
  }
  return result;
}

/** The cross-section of each geometry; the planar one carries the particle footprint so results are per particle. */
const GEOMETRIES: Readonly<Record<GeometryKind, (r: ResolvedContact) => CrossSection>> = {
  planar: (r) => ({ ...PLANAR, particleFootprint_m2: Math.PI * (r.particleDiameter_m / 2) ** 2 }),
  hemisphere: (r) => hemisphere(r.particleDiameter_m / 2),
  array: (r) => particleArray(r.particleDiameter_m / 2, r.particleDensity_m2!),
  disc: (r) => disc(r.particleDiameter_m / 2),
  'disc-array': (r) => discArray(r.particleDiameter_m / 2, r.particleDensity_m2!),
};

function chargeModelOf(r: ResolvedContact): ChargeModel {
  return makeChargeModel(supportElectronicOf(r.support, r.temperature_K, r.statistics));
}

/** Interface-state parameters: D_it given, or from the slope S (given or library, else empirical) and the layer. */
export function interfaceParametersOf(r: ResolvedContact): InterfaceStateParameters & { pinningFactorOrigin: 'given' | 'empirical' | 'states' } {
  const s = r.support;
  const layerThickness_m = s.interfaceLayerThickness_m ?? DEFAULT_INTERFACE_LAYER_THICKNESS_M;
  const layerPermittivity = s.interfaceLayerPermittivity ?? DEFAULT_INTERFACE_LAYER_PERMITTIVITY;
  const neutralLevelAboveValence_eV = s.neutralLevelAboveValence_eV!;
  // donor-like surface states under the metal (Ti3+ of surface O vacancies on a reduced oxide), when given
  const surfaceDonors =
    s.surfaceDonors_m2 > 0 && s.surfaceDonorLevel_eV !== undefined
      ? { surfaceDonors: { density_per_m2: s.surfaceDonors_m2, depthBelowConduction_eV: Math.min(s.surfaceDonorLevel_eV, s.bandGap_eV) } }
      : {};
  if (s.interfaceStateDensity_per_eV_m2 !== undefined) {
    return { stateDensity_per_eV_m2: s.interfaceStateDensity_per_eV_m2, neutralLevelAboveValence_eV, layerThickness_m, layerPermittivity, ...surfaceDonors, pinningFactorOrigin: 'states' };
  }
  const slope = s.pinningFactor ?? empiricalPinningFactor(s.opticalPermittivity);
  // D_it = (1/S - 1) eps_i eps0 / (q^2 delta) (Cowley & Sze 1965), capped at the solver's largest density
  const density = layerThickness_m > 0 ? Math.min(1e21, interfaceStateDensityFromSlope(Math.max(slope, 1e-4), layerThickness_m, layerPermittivity)) : 0;
  return {
    stateDensity_per_eV_m2: density,
    neutralLevelAboveValence_eV,
    layerThickness_m,
    layerPermittivity,
    ...surfaceDonors,
    pinningFactorOrigin: s.pinningFactor !== undefined ? 'given' : 'empirical',
  };
}

/**
 * The input of the interface alignment (Cowley–Sze) for this contact without a particle term: its interface-state
 * parameters, the (size-corrected) metal work function, the support's affinity and gap, the bulk E_C - E_F against
 * the metal's Fermi level (lowered by a reverse bias), the space charge Q(V) to align with and its cheap stand-in.
 */
function alignmentInputOf(
  r: ResolvedContact,
  params: InterfaceStateParameters,
  fermiLevelBelowConduction_eV: number,
  spaceCharge: (bandBending_eV: number) => number,
  spaceChargeEstimate: ChargeOfBending,
  tolerance_eV: number,
): InterfaceAlignmentInput {
  return {
    stateDensity_per_eV_m2: params.stateDensity_per_eV_m2,
    neutralLevelAboveValence_eV: params.neutralLevelAboveValence_eV,
    layerThickness_m: params.layerThickness_m,
    layerPermittivity: params.layerPermittivity,
    surfaceDonors: params.surfaceDonors,
    metalWorkFunction_eV: particleWorkFunction_eV(r),
    electronAffinity_eV: r.support.electronAffinity_eV,
    bandGap_eV: r.support.bandGap_eV,
    fermiLevelBelowConduction_eV,
    temperature_K: r.temperature_K,
    spaceCharge,
    spaceChargeEstimate,
    tolerance_eV,
  };
}

/**
 * The support's dielectric: linear with the static permittivity, or field-dependent (Landau–Devonshire) when the
 * support has a nonlinearity beta, on the optical permittivity as background (src/electrostatics/permittivity.ts).
 */
export function supportDielectric(s: ResolvedContact['support']): DielectricLaw {
  return dielectricLaw(s.permittivity, s.opticalPermittivity, s.permittivityNonlinearity_V_m5_per_C3);
}

/** Solve one contact from resolved SI inputs (used by studies and uncertainty sampling). */
export function solveResolved(resolved: ResolvedContact): ContactResult {
  const r = withVacancyDonors(resolved); // a sampled reduction enthalpy/entropy changes the vacancy donors
  const s = r.support;
  const model = chargeModelOf(r);
  const bulk = solveBulkNeutrality(model);
  const nType = bulk.electronDensity_m3 >= bulk.holeDensity_m3;
  const geometry = GEOMETRIES[r.geometry](r);
  const metalWorkFunction_eV = particleWorkFunction_eV(r);
  const dielectric = supportDielectric(s);
  const solveAt = (bandBending_eV: number): PoissonSolution => {
    checkBandBending(bandBending_eV);
    return solvePoisson({
      model,
      bulkReducedFermiLevel: bulk.reducedFermiLevel,
      surfaceBending: bandBending_eV / model.kT_eV,
      relativePermittivity: s.permittivity,
      dielectric,
      temperature_K: r.temperature_K,
      geometry,
      thickness_m: r.supportThickness_m,
      refinement: r.refinement,
    });
  };
  // the Poisson solution at each band bending an alignment evaluates: its root is one of them
  const solved = keepingEvaluations(solveAt, (p: PoissonSolution) => p.totalCharge_C / geometry.interfaceArea_m2);
  // the planar first-integral Q(V): places the alignment's iterates (cheap; the Poisson solves decide convergence)
  // and is the Q(V) of the relaxation time at this temperature (derivePhysics)
  const planarCharge = planarChargeOfBending(model, bulk.reducedFermiLevel, s.permittivity, r.temperature_K, dielectric);
  let barrier: BarrierResult;
  let bandBending_eV: number;
  let solution: PoissonSolution;
  let interfaceStates: (InterfaceAlignment & InterfaceStateParameters) | null = null;
  if (r.barrierModel === 'interface-states') {
    const params = interfaceParametersOf(r);
    // Bardeen / Cowley–Sze: the barrier, the interface-state charge and the space charge solved together
    interfaceStates = {
      ...params,
      ...solveInterfaceAlignment({
        ...alignmentInputOf(r, params, bulk.fermiLevelBelowConduction_eV, solved.spaceCharge, planarCharge, 1e-9),
        particle: finiteParticleTerm(r, geometry),
      }),
    };
    bandBending_eV = interfaceStates.bandBending_eV;
    solution = solved.at(bandBending_eV) ?? solveAt(bandBending_eV);
    const electronBarrier_eV = interfaceStates.electronBarrier_eV;
    barrier = {
      electronBarrier_eV,
      barrierHeight_eV: nType ? electronBarrier_eV : s.bandGap_eV - electronBarrier_eV,
      pinningFactor: interfaceStates.pinningFactor,
      pinningFactorOrigin: params.pinningFactorOrigin === 'given' ? 'given' : 'empirical',
    };
  } else {
    // ideal rule at a finite particle: its Fermi level moves by N/g_tot with its charge (src/derived/finiteParticle.ts)
    const particle = r.barrierModel === 'ideal' ? finiteParticleTerm(r, geometry) : undefined;
    const aligned = particle === undefined ? null : idealParticleAlignment({
      metalWorkFunction_eV, electronAffinity_eV: s.electronAffinity_eV, bandGap_eV: s.bandGap_eV, particle,
      fermiLevelBelowConduction_eV: bulk.fermiLevelBelowConduction_eV, spaceCharge: solved.spaceCharge,
      spaceChargeEstimate: planarCharge,
    });
    barrier = barrierHeight({
      model: r.barrierModel,
      metalWorkFunction_eV: metalWorkFunction_eV - (aligned?.fermiLevelShift_eV ?? 0),
      electronAffinity_eV: s.electronAffinity_eV,
      bandGap_eV: s.bandGap_eV,
      opticalPermittivity: s.opticalPermittivity,
      carrier: nType ? 'electron' : 'hole',
      pinningFactor: s.pinningFactor,
      neutralLevel_eV: s.neutralLevel_eV,
      givenBarrier_eV: r.givenBarrier_eV,
    });
    // band bending = E_C(0) - E_C(bulk) = (E_C(0) - E_F) - (E_C - E_F)_bulk; at a particle the alignment's root (equal
    // to it within the alignment's 1e-9 eV tolerance), a band bending already solved
    bandBending_eV = aligned === null ? barrier.electronBarrier_eV - bulk.fermiLevelBelowConduction_eV : aligned.bandBending_eV;
    solution = solved.at(bandBending_eV) ?? solveAt(bandBending_eV);
  }
  const physics = derivePhysics({ r, model, bulk, barrier, nType, bandBending_eV, geometry, solution, interfaceStates, dielectric }, planarCharge);
  return toContactResult(physics, evaluateWarnings(warningFacts(physics)));
}

type SolvedContact = Pick<ContactPhysics, 'r' | 'model' | 'bulk' | 'barrier' | 'nType' | 'bandBending_eV' | 'geometry' | 'solution' | 'interfaceStates' | 'dielectric'>;

/** Every derived quantity of one solved contact, SI; `planarCharge` is the planar Q(V) at the contact's temperature. */
function derivePhysics(c: SolvedContact, planarCharge: ChargeOfBending): ContactPhysics {
  const { r, solution, geometry, nType } = c;
  const kT = c.model.kT_eV;
  const s = r.support;
  // widths use the fully ionised density |Z N_D - N_A| of a depletion layer, not the bulk ionised one (issue 10 item 1)
  const dopants = { donors_m3: s.donors_m3, donorKind: s.donorKind, acceptors_m3: s.acceptors_m3 };
  const depletion = { ...dopants, bandBending_eV: c.bandBending_eV, kT_eV: kT, relativePermittivity: s.permittivity, nType };
  const spaceCharge = spaceChargeDensity_C_per_m2(solution.totalCharge_C, geometry);
  // the metal's charge balances the space charge and the interface states under it: -(Q_sc + Q_it)
  const partnerCharge_C = solution.totalCharge_C + interfaceStateCharge_C(c);
  const field_V_per_m = interfaceField_V_per_m(kT, solution.interfaceSlope_per_m);
  const depth90_m = chargeDepth_m(solution, geometry, 0.9);
  const meanSpacing = r.particleDensity_m2 !== undefined ? meanSpacing_m(r.particleDensity_m2) : null;
  return {
    ...c,
    kT_eV: kT,
    spaceCharge_C_per_m2: spaceCharge,
    interfaceField_V_per_m: field_V_per_m,
    interfacePermittivity: differentialPermittivity(c.dielectric, clamp(field_V_per_m, 1e11)),
    electronsPerParticle: electronsPerParticle(partnerCharge_C, geometry),
    chargeEquivalentWidth_m: chargeEquivalentWidth_m({ ...dopants, charge_C: solution.totalCharge_C, geometry }),
    depletionWidthApprox_m: depletionWidthApprox_m(depletion),
    sphericalDepletionWidth_m: geometry.kind === 'planar' ? null : sphericalDepletionWidth_m({ ...depletion, radius_m: r.particleDiameter_m / 2 }),
    // with interface states the metal's charge is -(Q_sc + Q_it): the direction follows it, not the band bending alone
    direction:
      c.interfaceStates === null
        ? flowDirection(c.bandBending_eV, solution.totalCharge_C)
        : flowDirectionOfCharge(partnerCharge_C),
    depth90_m,
    charging: chargingSummary({ radius_m: r.particleDiameter_m / 2, permittivityRelative: effectivePermittivity(r.support.permittivity), temperature_K: r.temperature_K }),
    atoms: particleAtomsOf(r),
    meanSpacing_m: meanSpacing,
    // neighbouring layers meet when the charge reaches half-way to the next particle
    zonesOverlap: meanSpacing !== null ? depth90_m > meanSpacing / 2 : null,
    exchange: exchangeKinetics(c, spaceCharge, planarCharge),
    imageForce: imageForceValidity(clamp(field_V_per_m, 1e12), clamp(s.opticalPermittivity, 1e3)),
    capacitanceBarrier: capacitanceBarrierOf(c, planarCharge),
  };
}

/**
 * What a C-V measurement of a planar contact on an n-type support would report (src/derived/capacitanceVoltage.ts):
 * the depletion charge at each reverse bias V_R with the metal's Fermi level fixed, from the planar first integral
 * (exact for the planar solve). A fixed barrier (ideal, pinned, given) bends the bands by V + V_R; with interface
 * states the alignment is solved again at the bias (bulk E_C - E_F lowered by V_R against the metal, the states in
 * equilibrium with the metal, Cowley & Sze 1965) and the charge is minus the metal's. Null elsewhere, or where the
 * contact is not depleted over the range or the alignment fails at a bias.
 */
function capacitanceBarrierOf(c: SolvedContact, planarCharge: ChargeOfBending): CapacitanceBarrier | null {
  // a Schottky barrier of a few kT at least (a degenerate support whose E_F stays above E_C at the interface has none)
  if (c.r.geometry !== 'planar' || !c.nType || c.bandBending_eV <= 0 || c.barrier.electronBarrier_eV <= 3 * c.model.kT_eV) return null;
  const xi = c.bulk.fermiLevelBelowConduction_eV;
  const params = c.interfaceStates; // the solved alignment carries its parameters
  const charge =
    params === null
      ? (bias: number) => planarCharge(c.bandBending_eV + bias)
      : (bias: number) => -solveInterfaceAlignment(alignmentInputOf(c.r, params, xi - bias, planarCharge, planarCharge, 1e-10)).metalCharge_C_per_m2;
  try {
    return capacitanceBarrier(charge, xi, c.model.kT_eV, c.r.support.bandGap_eV);
  } catch (error) {
    if (isModelFailure(error)) return null;
    throw error;
  }
}

/** Atoms of the particle, when the metal's density, molar mass and metallic radius are known. */
function particleAtomsOf(r: ResolvedContact): ParticleAtomCount | null {
  const m = r.metal;
  if (m.density_g_cm3 === undefined || m.molarMass_g_mol === undefined || m.metallicRadius_pm === undefined) return null;
  return particleAtoms({ diameter_m: r.particleDiameter_m, density_g_cm3: m.density_g_cm3, molarMass_g_mol: m.molarMass_g_mol, metallicRadius_pm: m.metallicRadius_pm });
}

/** The particle's finite density of states (quantum capacitance) in the alignment, when the library has it. */
function finiteParticleTerm(r: ResolvedContact, geometry: CrossSection) {
  const perAtom = r.metal.densityOfStates_per_eV_atom;
  const atoms = r.geometry === 'planar' || perAtom === undefined ? null : particleAtomsOf(r);
  if (atoms === null) return undefined;
  return {
    densityOfStates_per_eV: particleDensityOfStates_per_eV(perAtom!, atoms.atoms),
    footprintArea_m2: geometry.interfaceArea_m2,
    interfaceArea_m2: geometry.interfaceArea_m2,
  };
}

/** Interface-state charge over the whole interface of the cross-section, C (0 outside the interface-states model). */
function interfaceStateCharge_C(c: SolvedContact): number {
  return c.interfaceStates === null ? 0 : c.interfaceStates.interfaceStateCharge_C_per_m2 * c.geometry.interfaceArea_m2;
}

/** |x| capped at `max` (keeps out-of-range extremes inside the validity checks' accepted ranges). */
const clamp = (x: number, max: number): number => Math.min(Math.abs(x), max);

/**
 * Exchange with the majority band: the thermionic J0 and |Q|/J0 (kept for comparison), and the time to reach 99% of
 * the equilibrium charge (relaxationTime99_s, issue 10 item 3) at the reaction temperature (J0 through the computed
 * barrier profile, thermionic-field slope E0) and at the highest temperature of the history (the reduction
 * pretreatment; thermionic J0 over the same barrier there, since no profile is solved at that temperature, which
 * can only overstate the time). The relaxation uses the planar Q(V) per interface area for every geometry.
 * `slow` only when neither temperature reaches equilibrium within the threshold. None for barriers above 20 eV.
 */
function exchangeKinetics(c: SolvedContact, spaceCharge_C_per_m2: number, planarCharge: ChargeOfBending): ExchangeKinetics | null {
  const barrier_eV = Math.max(0, c.barrier.barrierHeight_eV);
  if (barrier_eV > 20) return null;
  const { r, nType, solution } = c;
  const s = r.support;
  const massRatio = nType ? s.electronMass_me : s.holeMass_me;
  const current = thermionicExchangeCurrent_A_per_m2({ massRatio, temperature_K: r.temperature_K, barrier_eV });
  const time = equilibrationTime_s({ charge_C_per_m2: spaceCharge_C_per_m2, log10ExchangeCurrent_A_per_m2: current.log10Current_A_per_m2 });
  const depleted = depletedChargeDensity_m3({ donors_m3: s.donors_m3, donorKind: s.donorKind, acceptors_m3: s.acceptors_m3 });
  const slope = (kT_eV: number): number => forwardSlopeEnergy_eV(Math.min(100, tunnellingEnergy_eV(depleted, massRatio, s.permittivity)), kT_eV);
  // the profile's barrier for the majority carrier: E_C - E_F (electrons) or E_F - E_V (holes), eV
  const kT = c.model.kT_eV;
  const ec0 = c.bulk.fermiLevelBelowConduction_eV;
  const barrierProfile = Array.from(solution.u, (u) => (nType ? ec0 + u * kT : s.bandGap_eV - ec0 - u * kT));
  let relaxation: RelaxationTime | null = null;
  let log10Profile: number | null = null;
  let enhancement: number | null = null;
  try {
    const through = exchangeCurrentThroughProfile({ x_m: solution.x_m, conductionBandAboveFermi_eV: barrierProfile, massRatio, temperature_K: r.temperature_K });
    log10Profile = through.log10Current_A_per_m2;
    enhancement = through.tunnellingEnhancement;
    relaxation = relaxationAt(planarCharge, c.bandBending_eV, r.temperature_K, log10Profile, slope(kT));
  } catch {
    relaxation = null; // out of the validated ranges of the exchange functions: reported as null
  }
  const history = historyRelaxation(c, barrier_eV, massRatio, slope);
  const reached = (t: RelaxationTime | null): boolean => t !== null && t.seconds <= SLOW_EXCHANGE_THRESHOLD_S;
  const anyComputed = relaxation !== null || history !== null;
  return {
    current,
    time,
    slow: anyComputed ? !reached(relaxation) && !reached(history?.time ?? null) : time.seconds > SLOW_EXCHANGE_THRESHOLD_S,
    log10ProfileCurrent_A_per_m2: log10Profile,
    tunnellingEnhancement: enhancement,
    relaxation99: relaxation,
    history,
  };
}

/** Relaxation to 99% through the planar Q(V) `charge` (planarChargeOfBending at `temperature_K`). */
function relaxationAt(charge: ChargeOfBending, bending_eV: number, temperature_K: number, log10J0: number, e0: number): RelaxationTime {
  return relaxationTime99_s({
    equilibriumBending_eV: bending_eV,
    chargeOfBending: charge,
    capacitanceOfBending: charge.capacitance,
    log10ExchangeCurrent_A_per_m2: log10J0,
    temperature_K,
    slopeEnergy_eV: e0,
  });
}

/** Relaxation at the highest temperature of the history (reduction pretreatment), when above the reaction one. */
function historyRelaxation(c: SolvedContact, barrier_eV: number, massRatio: number, slope: (kT_eV: number) => number): ExchangeKinetics['history'] {
  const t = c.r.pretreatment.reductionTemperature_K;
  if (t === null || !(t > c.r.temperature_K)) return null;
  try {
    const model = chargeModelOf({ ...c.r, temperature_K: t });
    const bulk = solveBulkNeutrality(model);
    const bending_eV = c.barrier.electronBarrier_eV - bulk.fermiLevelBelowConduction_eV;
    const j0 = thermionicExchangeCurrent_A_per_m2({ massRatio, temperature_K: t, barrier_eV });
    const charge = planarChargeOfBending(model, bulk.reducedFermiLevel, c.r.support.permittivity, t, c.dielectric);
    const time = relaxationAt(charge, bending_eV, t, j0.log10Current_A_per_m2, slope(model.kT_eV));
    return { temperature_K: t, time };
  } catch {
    return null;
  }
}

/**
 * Quartic Landau coefficient beta used only to state in the field-dependent-permittivity warning roughly how far a
 * high static permittivity falls at the interface field when the solve was linear: the library's SrTiO3 value
 * (materials/supports.json, permittivityNonlinearity_V_m5_per_C3: 4 alpha_11, flagged from memory), V m^5 C^-3.
 */
const SRTIO3_LIKE_BETA = 6.8e9;

/** What the warning rules need, read off the physics. */
function warningFacts(p: ContactPhysics): WarningFacts {
  const { r, bulk, solution, model } = p;
  const last = solution.u.length - 1;
  const xiAt = (i: number): number => bulk.reducedFermiLevel - solution.u[i]!;
  return {
    temperature_K: r.temperature_K,
    kT_eV: p.kT_eV,
    nType: p.nType,
    bandGap_eV: r.support.bandGap_eV,
    bulkReducedFermiLevel: bulk.reducedFermiLevel,
    bandBending_eV: p.bandBending_eV,
    electronBarrier_eV: p.barrier.electronBarrier_eV,
    particleDiameter_m: r.particleDiameter_m,
    depth90_m: p.depth90_m,
    interfaceElectrons_m3: model.electronDensity(xiAt(0)),
    interfaceHoles_m3: model.holeDensity(xiAt(0)),
    bulkElectrons_m3: bulk.electronDensity_m3,
    bulkHoles_m3: bulk.holeDensity_m3,
    endMajority_m3: r.supportThickness_m === undefined ? null : p.nType ? model.electronDensity(xiAt(last)) : model.holeDensity(xiAt(last)),
    supportThickness_m: r.supportThickness_m,
    layerTruncated: solution.truncated,
    domain_m: solution.domain_m,
    donors_m3: r.support.donors_m3,
    acceptors_m3: r.support.acceptors_m3,
    electronsPerParticle: p.electronsPerParticle,
    chargingEnergy_eV: p.charging.chargingEnergy_eV,
    chargingEnergyOverKT: p.charging.chargingEnergyOverKT,
    zonesOverlap: p.zonesOverlap,
    meanSpacing_m: p.meanSpacing_m,
    exchangeSlow: p.exchange?.slow ?? false,
    equilibrationTimeLog10_s: p.exchange ? finiteLog10(p.exchange.time.log10Seconds) : null,
    chargeErrorEstimate: solution.chargeErrorEstimate,
    refineAbove: REFINE_ABOVE,
    meetsTolerance: solution.meetsTolerance,
    chargeErrorBound: solution.chargeErrorBound,
    debyeLength_m: debyeLengthOrNull(solution.debyeLength_m),
    statistics: r.statistics,
    interfaceReducedFermiLevel: xiAt(0),
    atoms: p.atoms?.atoms ?? null,
    surfaceAtoms: p.atoms?.surfaceAtoms ?? null,
    interfaceField_V_per_m: p.interfaceField_V_per_m,
    interfaceLayer: p.interfaceStates === null ? null : { spaceCharge_C_per_m2: p.spaceCharge_C_per_m2, layerThickness_m: p.interfaceStates.layerThickness_m, layerPermittivity: p.interfaceStates.layerPermittivity },
    staticPermittivity: r.support.permittivity,
    permittivityFieldDependent: !isLinear(p.dielectric),
    fieldPermittivity: p.interfaceField_V_per_m !== 0 && r.support.permittivity > 50 ? devonshirePermittivity(clamp(p.interfaceField_V_per_m, 1e11), Math.min(r.support.permittivity, 1e5), SRTIO3_LIKE_BETA) : null,
    imageForceMaximum_m: p.imageForce.maximumDistance_m,
    imageForceValid: p.imageForce.valid,
    donorLevel_eV: r.support.donorLevel1_eV ?? null,
    relaxationLog10_s: p.exchange?.relaxation99 ? p.exchange.relaxation99.log10Seconds : null,
    historyTemperature_K: p.exchange?.history?.temperature_K ?? null,
    historyRelaxationLog10_s: p.exchange?.history ? p.exchange.history.time.log10Seconds : null,
    estimatedInputs: r.inputs.filter((i) => i.origin === 'estimate').map((i) => i.field),
    unverifiedInputs: r.inputs.filter((i) => i.fromMemory).map((i) => i.field),
  };
}
