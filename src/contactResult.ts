import { particleWorkFunction_eV } from './derived/finiteParticle.js';
import { observedBandBending_eV, seahDenchImfpCompound_m } from './derived/photoemission.js';
import type { InterfaceAlignment, InterfaceStateParameters } from './interface/interfaceStates.js';
// The only place where the SI physics of one contact becomes the display units of the JSON contract
// (src/types.ts: nm, cm^-3, A/cm^2; add fields freely, never rename).
import { Q_ELEMENTARY_C } from './constants.js';
import type { BulkState, ChargeModel } from './bulk/equilibrium.js';
import { imageForceLowering_eV, type BarrierResult } from './barrier/barrier.js';
import type { CapacitanceBarrier } from './derived/capacitanceVoltage.js';
import type { CrossSection } from './electrostatics/geometry.js';
import type { PoissonSolution } from './electrostatics/poisson.js';
import type { ParticleAtomCount, ChargingSummary } from './derived/particle.js';
import type { EquilibrationTime, RelaxationTime, ThermionicExchange } from './derived/exchange.js';
import type { DielectricLaw, ImageForceCheck } from './electrostatics/permittivity.js';
import type { ResolvedContact } from './inputs/contactInput.js';
import { contactCautions } from './output/cautions.js';
import type { ContactResult, ExchangeInfo, FlowDirection, InterfaceStatesInfo, ParticleInfo, PhotoemissionInfo, Profile, Warning } from './types.js';

export interface ExchangeKinetics {
  current: ThermionicExchange;
  time: EquilibrationTime;
  /** no equilibrium within the threshold at the reaction temperature nor at the history's highest temperature */
  slow: boolean;
  /** log10 J0 through the computed barrier (thermionic + tunnelling), A/m^2; null when not computable */
  log10ProfileCurrent_A_per_m2: number | null;
  tunnellingEnhancement: number | null;
  /** time to 99% of the equilibrium charge at the reaction temperature */
  relaxation99: RelaxationTime | null;
  /** the same at the highest temperature of the history (reduction pretreatment), when above the reaction one */
  history: { temperature_K: number; time: RelaxationTime } | null;
}

/** One solved contact and everything derived from it, SI (energies in eV). */
export interface ContactPhysics {
  r: ResolvedContact;
  model: ChargeModel;
  bulk: BulkState;
  barrier: BarrierResult;
  nType: boolean;
  kT_eV: number;
  bandBending_eV: number;
  geometry: CrossSection;
  solution: PoissonSolution;
  spaceCharge_C_per_m2: number;
  interfaceField_V_per_m: number;
  /** the support's dielectric law used in the solve (linear, or field-dependent) */
  dielectric: DielectricLaw;
  /** (1/eps0) dD/dE of the support at the interface field (the static permittivity for a linear dielectric) */
  interfacePermittivity: number;
  electronsPerParticle: number;
  chargeEquivalentWidth_m: number | null;
  depletionWidthApprox_m: number | null;
  /** depletion approximation in a hemispherical shell (non-planar geometries only) */
  sphericalDepletionWidth_m: number | null;
  direction: FlowDirection;
  depth90_m: number;
  charging: ChargingSummary;
  atoms: ParticleAtomCount | null;
  meanSpacing_m: number | null;
  zonesOverlap: boolean | null;
  exchange: ExchangeKinetics | null;
  /** interface-states model: the self-consistent alignment (null for the other barrier models) */
  interfaceStates: (InterfaceAlignment & InterfaceStateParameters) | null;
  imageForce: ImageForceCheck;
  /** what a C-V measurement would report (planar, n-type, depleted), else null */
  capacitanceBarrier: CapacitanceBarrier | null;
}

const NM_PER_M = 1e9;
const CM3_PER_M3 = 1e-6; // a density per m^3 times 1e-6 is per cm^3
const CM2_PER_M2 = 1e-4;

/** log10 that stays finite (a time beyond a double is reported as 10^+-308). */
export function finiteLog10(log10: number): number {
  return Number.isFinite(log10) ? log10 : log10 > 0 ? 308 : -308;
}

/**
 * The bulk Debye length when it is a length at all: null where nothing screens (solver null) or where it exceeds
 * 1 m (e.g. 1e117 m for an undoped 5 eV-gap insulator at 50 K: no sample screens over such a length).
 */
export function debyeLengthOrNull(debyeLength_m: number | null): number | null {
  return debyeLength_m !== null && Number.isFinite(debyeLength_m) && debyeLength_m <= 1 ? debyeLength_m : null;
}

const nmOrNull = (x_m: number | null): number | null => (x_m === null ? null : x_m * NM_PER_M);

export function toContactResult(p: ContactPhysics, warnings: Warning[]): ContactResult {
  const { r, bulk, barrier, solution } = p;
  const s = r.support;
  return {
    metal: r.metal.name,
    support: s.name,
    temperature_K: r.temperature_K,
    geometry: r.geometry,
    statistics: r.statistics,
    barrierModel: r.barrierModel,
    barrierCarrier: p.nType ? 'electron' : 'hole',
    barrierHeight_eV: barrier.barrierHeight_eV,
    electronBarrier_eV: barrier.electronBarrier_eV,
    metalWorkFunction_eV: r.metal.workFunction_eV,
    particleWorkFunction_eV: particleWorkFunction_eV(r),
    bandBending_eV: p.bandBending_eV,
    fermiLevelBelowConduction_eV: bulk.fermiLevelBelowConduction_eV,
    // support work function Phi_s = chi + (E_C - E_F)_bulk
    supportWorkFunction_eV: s.electronAffinity_eV + bulk.fermiLevelBelowConduction_eV,
    direction: p.direction,
    spaceCharge_C_per_m2: p.spaceCharge_C_per_m2,
    chargeEquivalentWidth_nm: nmOrNull(p.chargeEquivalentWidth_m),
    depletionWidthApprox_nm: nmOrNull(p.depletionWidthApprox_m),
    depletionWidthApproxIsPlanar: r.geometry !== 'planar',
    sphericalDepletionWidth_nm: nmOrNull(p.sphericalDepletionWidth_m),
    ...headlineWidth(p),
    debyeLength_nm: nmOrNull(debyeLengthOrNull(solution.debyeLength_m)),
    interfaceField_V_per_m: p.interfaceField_V_per_m,
    interfacePermittivity: p.interfacePermittivity,
    permittivityNonlinearity_V_m5_per_C3: s.permittivityNonlinearity_V_m5_per_C3,
    imageForceLowering_eV: imageForceLowering_eV(p.interfaceField_V_per_m, s.opticalPermittivity),
    capacitanceBarrier:
      p.capacitanceBarrier === null ? null : { barrier_eV: p.capacitanceBarrier.barrier_eV, rSquared: p.capacitanceBarrier.rSquared, reverseBias_V: p.capacitanceBarrier.reverseBias_V },
    imageForceMaximum_nm: p.imageForce.maximumDistance_m * NM_PER_M,
    imageForceContinuumValid: p.imageForce.valid,
    electronsPerParticle: p.electronsPerParticle,
    donorDensity_cm3: s.donors_m3 * CM3_PER_M3,
    acceptorDensity_cm3: s.acceptors_m3 * CM3_PER_M3,
    pinningFactor: barrier.pinningFactor,
    interfaceStates: interfaceStatesInfo(p),
    photoemission: photoemissionInfo(p),
    chargeDepth90_nm: p.depth90_m * NM_PER_M,
    supportFullyDepleted: warnings.some((w) => w.code === 'fully-depleted'),
    bulk: bulkInfo(bulk),
    particle: particleInfo(p),
    exchange: exchangeInfo(p.exchange),
    pretreatment: r.pretreatment,
    defects: r.defects,
    profile: profileOf(p),
    solver: {
      converged: true,
      iterations: solution.iterations,
      meshPoints: solution.x_m.length,
      domainLength_nm: solution.domain_m * NM_PER_M,
      chargeErrorEstimate: solution.chargeErrorEstimate,
      chargeErrorBound: solution.chargeErrorBound,
      meetsTolerance: solution.meetsTolerance,
    },
    warnings,
    cautions: [...r.cautions, ...contactCautions(r.pretreatment.hydrogenToWater !== null || r.defects.reactionGas === 'H2/H2O')],
    inputs: r.inputs,
  };
}

/**
 * The width to quote: planar -> the charge-equivalent width W_Q; hemisphere and array -> the depth (shell thickness)
 * holding 90% of the charge (issue 10 item 1), since W_Q there depends on the shell shape assumed.
 */
function headlineWidth(p: ContactPhysics): Pick<ContactResult, 'width_nm' | 'widthDefinition'> {
  if (p.r.geometry === 'planar') return { width_nm: nmOrNull(p.chargeEquivalentWidth_m), widthDefinition: 'charge-equivalent' };
  return { width_nm: p.depth90_m * NM_PER_M, widthDefinition: 'charge-depth-90' };
}

function bulkInfo(bulk: BulkState): ContactResult['bulk'] {
  return {
    electronDensity_cm3: bulk.electronDensity_m3 * CM3_PER_M3,
    holeDensity_cm3: bulk.holeDensity_m3 * CM3_PER_M3,
    ionizedDonors_cm3: bulk.donorCharge_m3 * CM3_PER_M3,
    ionizedAcceptors_cm3: bulk.ionisedAcceptors_m3 * CM3_PER_M3,
    conductionDensityOfStates_cm3: bulk.conductionDos_m3 * CM3_PER_M3,
    valenceDensityOfStates_cm3: bulk.valenceDos_m3 * CM3_PER_M3,
    intrinsicDensityLog10_cm3: bulk.intrinsicDensityLog10_cm3,
    localisedElectrons_cm3: bulk.localisedElectrons_m3 * CM3_PER_M3,
  };
}

function interfaceStatesInfo(p: ContactPhysics): InterfaceStatesInfo | null {
  const a = p.interfaceStates;
  if (a === null) return null;
  const share = (p.geometry.particleFootprint_m2 ?? p.geometry.interfaceArea_m2) / Q_ELEMENTARY_C;
  return {
    stateDensity_per_eV_cm2: a.stateDensity_per_eV_m2 * CM2_PER_M2,
    neutralLevelAboveValence_eV: a.neutralLevelAboveValence_eV,
    layerThickness_nm: a.layerThickness_m * NM_PER_M,
    layerPermittivity: a.layerPermittivity,
    interfaceStateCharge_C_per_m2: a.interfaceStateCharge_C_per_m2,
    surfaceDonors_per_cm2: (a.surfaceDonors?.density_per_m2 ?? 0) * CM2_PER_M2,
    surfaceDonorLevel_eV: a.surfaceDonors?.depthBelowConduction_eV ?? null,
    surfaceDonorCharge_C_per_m2: a.surfaceDonorCharge_C_per_m2,
    surfaceDonorsIonisedFraction:
      a.surfaceDonors !== undefined && a.surfaceDonors.density_per_m2 > 0 ? a.surfaceDonorCharge_C_per_m2 / (Q_ELEMENTARY_C * a.surfaceDonors.density_per_m2) : null,
    electronsFromSurfaceDonors: a.surfaceDonorCharge_C_per_m2 * share,
    metalCharge_C_per_m2: a.metalCharge_C_per_m2,
    layerDrop_eV: a.layerDrop_eV,
    electronsFromInterfaceStates: a.interfaceStateCharge_C_per_m2 * share,
    electronsFromSpaceCharge: p.spaceCharge_C_per_m2 * share,
    evaluations: a.iterations,
  };
}

// Photoemission of the support: O 1s (binding energy ~530 eV, common practice, no source) excited by Al K-alpha
// (1486.6 eV), normal emission; monolayer thickness 0.22 nm typical of oxides (common practice, no source).
const PHOTON_ENERGY_EV = 1486.6;
const O1S_BINDING_EV = 530;
const OXIDE_MONOLAYER_M = 0.22e-9;

function photoemissionInfo(p: ContactPhysics): PhotoemissionInfo {
  const imfp_m = seahDenchImfpCompound_m(PHOTON_ENERGY_EV - O1S_BINDING_EV, OXIDE_MONOLAYER_M);
  return {
    // the average is linear in the profile: average u = (E_C - E_C,bulk)/kT on the solver's mesh, then scale by kT
    observedBandBending_eV: p.kT_eV * observedBandBending_eV(p.solution.x_m, p.solution.u, imfp_m, 0),
    inelasticMeanFreePath_nm: imfp_m * NM_PER_M,
    photonEnergy_eV: PHOTON_ENERGY_EV,
    coreLevel: 'O 1s',
    emissionAngle_deg: 0,
  };
}

function particleInfo(p: ContactPhysics): ParticleInfo {
  return {
    diameter_nm: p.r.particleDiameter_m * NM_PER_M,
    atoms: p.atoms?.atoms ?? null,
    surfaceAtoms: p.atoms?.surfaceAtoms ?? null,
    dispersion: p.atoms?.dispersion ?? null,
    electronsPerSurfaceAtom: p.atoms ? p.electronsPerParticle / p.atoms.surfaceAtoms : null,
    chargingEnergy_eV: p.charging.chargingEnergy_eV,
    chargingEnergyOverKT: p.charging.chargingEnergyOverKT,
    particleDensity_cm2: p.r.particleDensity_m2 !== undefined ? p.r.particleDensity_m2 * CM2_PER_M2 : null,
    meanSpacing_nm: nmOrNull(p.meanSpacing_m),
    zonesOverlap: p.zonesOverlap,
  };
}

function exchangeInfo(e: ExchangeKinetics | null): ExchangeInfo | null {
  if (e === null) return null;
  return {
    richardsonConstant_A_per_cm2_K2: e.current.richardsonConstant_A_per_m2_K2 * CM2_PER_M2,
    exchangeCurrentDensity_A_per_cm2: e.current.current_A_per_m2 * CM2_PER_M2,
    exchangeCurrentLog10_A_per_cm2: e.current.log10Current_A_per_m2 - 4,
    equilibrationTime_s: Number.isFinite(e.time.seconds) ? e.time.seconds : null,
    equilibrationTimeLog10_s: finiteLog10(e.time.log10Seconds),
    slow: e.slow,
    profileExchangeCurrentLog10_A_per_cm2: e.log10ProfileCurrent_A_per_m2 === null ? null : e.log10ProfileCurrent_A_per_m2 - 4,
    tunnellingEnhancement: e.tunnellingEnhancement,
    relaxationTime99_s: e.relaxation99 ? e.relaxation99.seconds : null,
    relaxationTime99Log10_s: e.relaxation99 ? e.relaxation99.log10Seconds : null,
    historyTemperature_K: e.history?.temperature_K ?? null,
    historyRelaxationTime99_s: e.history ? e.history.time.seconds : null,
    historyRelaxationTime99Log10_s: e.history ? e.history.time.log10Seconds : null,
  };
}

/** Band edges, carrier and charge densities and field along the depth, display units. */
function profileOf(p: ContactPhysics): Profile {
  const { model, bulk, solution } = p;
  const kT = p.kT_eV;
  const x = solution.x_m;
  const u = solution.u;
  const n = x.length;
  const profile: Profile = {
    x_nm: new Array<number>(n),
    conductionBand_eV: new Array<number>(n),
    valenceBand_eV: new Array<number>(n),
    electronDensity_cm3: new Array<number>(n),
    holeDensity_cm3: new Array<number>(n),
    chargeDensity_C_per_m3: new Array<number>(n),
    field_V_per_m: new Array<number>(n),
  };
  for (let i = 0; i < n; i++) {
    const xi = bulk.reducedFermiLevel - u[i]!;
    const ec = bulk.fermiLevelBelowConduction_eV + u[i]! * kT;
    profile.x_nm[i] = x[i]! * NM_PER_M;
    profile.conductionBand_eV[i] = ec;
    profile.valenceBand_eV[i] = ec - p.r.support.bandGap_eV;
    profile.electronDensity_cm3[i] = model.electronDensity(xi) * CM3_PER_M3;
    profile.holeDensity_cm3[i] = model.holeDensity(xi) * CM3_PER_M3;
    profile.chargeDensity_C_per_m3[i] = Q_ELEMENTARY_C * solution.netCharge_m3[i]!;
    // E = (kT/q) du/dx: centred differences inside, Gauss's law at the interface, one-sided at the far end
    if (i === 0) profile.field_V_per_m[i] = p.interfaceField_V_per_m;
    else if (i === n - 1) profile.field_V_per_m[i] = kT * ((u[i]! - u[i - 1]!) / (x[i]! - x[i - 1]!));
    else profile.field_V_per_m[i] = kT * ((u[i + 1]! - u[i - 1]!) / (x[i + 1]! - x[i - 1]!));
  }
  return profile;
}
