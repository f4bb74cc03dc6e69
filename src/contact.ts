// One metal/support contact, the whole pipeline:
// inputs -> materials -> bulk equilibrium -> barrier -> electrostatics -> derived results.
import { EPS0_F_PER_M, Q_ELEMENTARY_C, thermalEnergy_eV } from './constants.js';
import { InputError } from './errors.js';
import { propagateUncertainty } from './derived/uncertainty.js';
import { resolveContact, type ContactOptions, type ResolvedContact } from './inputs/contactInput.js';
import { makeChargeModel, solveBulkNeutrality, type ChargeModel, type BulkState } from './bulk/equilibrium.js';
import { barrierHeight, imageForceLowering_eV } from './barrier/barrier.js';
import { PLANAR, hemisphere, particleArray, type CrossSection } from './electrostatics/geometry.js';
import { solvePoisson, REFINE_ABOVE, type PoissonSolution } from './electrostatics/poisson.js';
import { particleAtoms, chargingSummary, effectivePermittivity, meanSpacing_m } from './derived/particle.js';
import { thermionicExchangeCurrent_A_per_m2, equilibrationTime_s, SLOW_EXCHANGE_THRESHOLD_S } from './derived/exchange.js';
import type { ContactResult, FlowDirection, ParticleInfo, Profile, Warning, ExchangeInfo } from './types.js';

export type { ContactOptions, ResolvedContact } from './inputs/contactInput.js';

/** Largest band bending accepted, eV: beyond this the contact is outside the model (and outside any oxide gap). */
export const MAX_BAND_BENDING_EV = 12;

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

function geometryOf(r: ResolvedContact): CrossSection {
  const radius = r.particleDiameter_m / 2;
  if (r.geometry === 'planar') return PLANAR;
  if (r.geometry === 'hemisphere') return hemisphere(radius);
  return particleArray(radius, r.particleDensity_m2!);
}

/** Solve one contact from resolved SI inputs (used by studies and uncertainty sampling). */
export function solveResolved(r: ResolvedContact): ContactResult {
  const s = r.support;
  const kT = thermalEnergy_eV(r.temperature_K);
  const model = makeChargeModel({
    temperature_K: r.temperature_K,
    bandGap_eV: s.bandGap_eV,
    electronMass_me: s.electronMass_me,
    holeMass_me: s.holeMass_me,
    donors: { density_m3: s.donors_m3, kind: s.donorKind, level1_eV: s.donorLevel1_eV, level2_eV: s.donorLevel2_eV },
    acceptors: { density_m3: s.acceptors_m3, level_eV: s.acceptorLevel_eV },
    statistics: r.statistics,
  });
  const bulk = solveBulkNeutrality(model);
  const nType = bulk.electronDensity_m3 >= bulk.holeDensity_m3;
  const barrier = barrierHeight({
    model: r.barrierModel,
    metalWorkFunction_eV: r.metal.workFunction_eV,
    electronAffinity_eV: s.electronAffinity_eV,
    bandGap_eV: s.bandGap_eV,
    opticalPermittivity: s.opticalPermittivity,
    carrier: nType ? 'electron' : 'hole',
    pinningFactor: s.pinningFactor,
    neutralLevel_eV: s.neutralLevel_eV,
    givenBarrier_eV: r.givenBarrier_eV,
  });
  // band bending = E_C(0) - E_C(bulk) = (E_C(0) - E_F) - (E_C - E_F)_bulk
  const bandBending_eV = barrier.electronBarrier_eV - bulk.fermiLevelBelowConduction_eV;
  if (!Number.isFinite(bandBending_eV) || Math.abs(bandBending_eV) > MAX_BAND_BENDING_EV) {
    throw new InputError(
      'band bending',
      `the inputs give ${bandBending_eV.toFixed(2)} eV between interface and bulk`,
      `|band bending| <= ${MAX_BAND_BENDING_EV} eV: check work function, electron affinity and barrier`,
    );
  }
  const geometry = geometryOf(r);
  const solution = solvePoisson({
    model,
    bulkReducedFermiLevel: bulk.reducedFermiLevel,
    surfaceBending: bandBending_eV / kT,
    relativePermittivity: s.permittivity,
    temperature_K: r.temperature_K,
    geometry,
    thickness_m: r.supportThickness_m,
    refinement: r.refinement,
  });
  return assemble(r, model, bulk, barrier, bandBending_eV, geometry, solution, nType);
}

function assemble(
  r: ResolvedContact,
  model: ChargeModel,
  bulk: BulkState,
  barrier: ReturnType<typeof barrierHeight>,
  bandBending_eV: number,
  geometry: CrossSection,
  solution: PoissonSolution,
  nType: boolean,
): ContactResult {
  const s = r.support;
  const kT = model.kT_eV;
  const warnings: Warning[] = [];
  const eps = s.permittivity * EPS0_F_PER_M;
  const radius_m = r.particleDiameter_m / 2;
  const interfaceArea = geometry.interfaceArea_m2;
  // charge on the support side per interface area (planar: per m^2 already)
  const spaceCharge_C_per_m2 = solution.totalCharge_C / interfaceArea;
  // interface field E = -dpsi/dx = (kT/q) du/dx, positive pointing into the support
  const interfaceField_V_per_m = kT * solution.interfaceSlope_per_m;
  const electronsPerParticle =
    r.geometry === 'planar' ? (spaceCharge_C_per_m2 * Math.PI * radius_m * radius_m) / Q_ELEMENTARY_C : solution.totalCharge_C / Q_ELEMENTARY_C;

  const majorityDopantCharge_m3 = nType ? bulk.donorCharge_m3 : bulk.ionisedAcceptors_m3;
  const chargeVolume = majorityDopantCharge_m3 > 0 ? Math.abs(solution.totalCharge_C) / (Q_ELEMENTARY_C * majorityDopantCharge_m3) : NaN;
  const chargeEquivalentWidth_nm = Number.isFinite(chargeVolume)
    ? (r.geometry === 'planar' ? chargeVolume : geometry.depthHoldingVolume(chargeVolume)) * 1e9
    : null;
  // depletion: majority carriers pushed away (n-type bands up, p-type bands down) by more than kT
  const depleted = nType ? bandBending_eV > kT : bandBending_eV < -kT;
  // depletion approximation W = sqrt(2 eps (V_bi - kT/q) / (q N)) (Sze & Ng eq. 3.9)
  const depletionWidthApprox_nm =
    depleted && majorityDopantCharge_m3 > 0
      ? Math.sqrt((2 * eps * (Math.abs(bandBending_eV) - kT)) / (Q_ELEMENTARY_C * majorityDopantCharge_m3)) * 1e9
      : null;
  const direction: FlowDirection =
    Math.abs(bandBending_eV) < 1e-6 || solution.totalCharge_C === 0 ? 'none' : solution.totalCharge_C > 0 ? 'support-to-metal' : 'metal-to-support';

  const profile = buildProfile(model, bulk, s.bandGap_eV, solution, kT, interfaceField_V_per_m);
  const depth90_nm = chargeDepth(solution, geometry, 0.9) * 1e9;

  // particle
  const charging = chargingSummary({ radius_m, permittivityRelative: effectivePermittivity(s.permittivity), temperature_K: r.temperature_K });
  const atomCount =
    r.metal.density_g_cm3 !== undefined && r.metal.molarMass_g_mol !== undefined && r.metal.metallicRadius_pm !== undefined
      ? particleAtoms({
          diameter_m: r.particleDiameter_m,
          density_g_cm3: r.metal.density_g_cm3,
          molarMass_g_mol: r.metal.molarMass_g_mol,
          metallicRadius_pm: r.metal.metallicRadius_pm,
        })
      : null;
  const spacing_m = r.particleDensity_m2 !== undefined ? meanSpacing_m(r.particleDensity_m2) : null;
  const zonesOverlap = spacing_m !== null ? depth90_nm * 1e-9 > spacing_m / 2 : null;
  const particle: ParticleInfo = {
    diameter_nm: r.particleDiameter_m * 1e9,
    atoms: atomCount?.atoms ?? null,
    surfaceAtoms: atomCount?.surfaceAtoms ?? null,
    dispersion: atomCount?.dispersion ?? null,
    electronsPerSurfaceAtom: atomCount ? electronsPerParticle / atomCount.surfaceAtoms : null,
    chargingEnergy_eV: charging.chargingEnergy_eV,
    chargingEnergyOverKT: charging.chargingEnergyOverKT,
    particleDensity_cm2: r.particleDensity_m2 !== undefined ? r.particleDensity_m2 * 1e-4 : null,
    meanSpacing_nm: spacing_m !== null ? spacing_m * 1e9 : null,
    zonesOverlap,
  };

  // thermionic exchange with the majority band
  let exchange: ExchangeInfo | null = null;
  const barrierForExchange = Math.max(0, barrier.barrierHeight_eV);
  if (barrierForExchange <= 20) {
    const massRatio = nType ? s.electronMass_me : s.holeMass_me;
    const j0 = thermionicExchangeCurrent_A_per_m2({ massRatio, temperature_K: r.temperature_K, barrier_eV: barrierForExchange });
    const tau = equilibrationTime_s({ charge_C_per_m2: spaceCharge_C_per_m2, log10ExchangeCurrent_A_per_m2: j0.log10Current_A_per_m2 });
    exchange = {
      richardsonConstant_A_per_cm2_K2: j0.richardsonConstant_A_per_m2_K2 * 1e-4,
      exchangeCurrentDensity_A_per_cm2: j0.current_A_per_m2 * 1e-4,
      exchangeCurrentLog10_A_per_cm2: j0.log10Current_A_per_m2 - 4,
      equilibrationTime_s: Number.isFinite(tau.seconds) ? tau.seconds : null,
      equilibrationTimeLog10_s: Number.isFinite(tau.log10Seconds) ? tau.log10Seconds : tau.log10Seconds > 0 ? 308 : -308,
      slow: tau.seconds > SLOW_EXCHANGE_THRESHOLD_S,
    };
  }

  collectWarnings(warnings, {
    r,
    bulk,
    kT,
    nType,
    bandBending_eV,
    barrier,
    solution,
    depth90_nm,
    electronsPerParticle,
    particle,
    exchange,
    profile,
  });

  const cautions = [
    ...r.cautions,
    'Screening estimate from 1D equilibrium electrostatics: interface chemistry, adsorbates, strain and particle shape can move barriers by tenths of an eV. Check against measurements before relying on it.',
  ];

  return {
    metal: r.metal.name,
    support: s.name,
    temperature_K: r.temperature_K,
    geometry: r.geometry,
    statistics: r.statistics,
    barrierModel: r.barrierModel,
    barrierCarrier: nType ? 'electron' : 'hole',
    barrierHeight_eV: barrier.barrierHeight_eV,
    electronBarrier_eV: barrier.electronBarrier_eV,
    metalWorkFunction_eV: r.metal.workFunction_eV,
    bandBending_eV,
    fermiLevelBelowConduction_eV: bulk.fermiLevelBelowConduction_eV,
    // support work function Phi_s = chi + (E_C - E_F)_bulk
    supportWorkFunction_eV: s.electronAffinity_eV + bulk.fermiLevelBelowConduction_eV,
    direction,
    spaceCharge_C_per_m2,
    chargeEquivalentWidth_nm,
    depletionWidthApprox_nm,
    debyeLength_nm: solution.firstIntegral.bulkScreening_m * 1e9,
    interfaceField_V_per_m,
    imageForceLowering_eV: imageForceLowering_eV(interfaceField_V_per_m, s.opticalPermittivity),
    electronsPerParticle,
    donorDensity_cm3: s.donors_m3 * 1e-6,
    acceptorDensity_cm3: s.acceptors_m3 * 1e-6,
    pinningFactor: barrier.pinningFactor,
    chargeDepth90_nm: depth90_nm,
    supportFullyDepleted: warnings.some((w) => w.code === 'fully-depleted'),
    bulk: {
      electronDensity_cm3: bulk.electronDensity_m3 * 1e-6,
      holeDensity_cm3: bulk.holeDensity_m3 * 1e-6,
      ionizedDonors_cm3: bulk.donorCharge_m3 * 1e-6,
      ionizedAcceptors_cm3: bulk.ionisedAcceptors_m3 * 1e-6,
      conductionDensityOfStates_cm3: bulk.conductionDos_m3 * 1e-6,
      valenceDensityOfStates_cm3: bulk.valenceDos_m3 * 1e-6,
      intrinsicDensityLog10_cm3: bulk.intrinsicDensityLog10_cm3,
    },
    particle,
    exchange,
    pretreatment: r.pretreatment,
    profile,
    solver: {
      converged: true,
      iterations: solution.iterations,
      meshPoints: solution.x_m.length,
      domainLength_nm: solution.domain_m * 1e9,
      chargeErrorEstimate: solution.chargeErrorEstimate,
    },
    warnings,
    cautions,
    inputs: r.inputs,
  };
}

function buildProfile(
  model: ChargeModel,
  bulk: BulkState,
  bandGap_eV: number,
  solution: PoissonSolution,
  kT: number,
  interfaceField_V_per_m: number,
): Profile {
  const n = solution.x_m.length;
  const x = solution.x_m;
  const u = solution.u;
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
    profile.x_nm[i] = x[i]! * 1e9;
    profile.conductionBand_eV[i] = ec;
    profile.valenceBand_eV[i] = ec - bandGap_eV;
    profile.electronDensity_cm3[i] = model.electronDensity(xi) * 1e-6;
    profile.holeDensity_cm3[i] = model.holeDensity(xi) * 1e-6;
    profile.chargeDensity_C_per_m3[i] = Q_ELEMENTARY_C * solution.netCharge_m3[i]!;
    // E = (kT/q) du/dx: centred differences inside, Gauss's law at the interface, zero at a zero-field end
    if (i === 0) profile.field_V_per_m[i] = interfaceField_V_per_m;
    else if (i === n - 1) profile.field_V_per_m[i] = kT * ((u[i]! - u[i - 1]!) / (x[i]! - x[i - 1]!));
    else profile.field_V_per_m[i] = kT * ((u[i + 1]! - u[i - 1]!) / (x[i + 1]! - x[i - 1]!));
  }
  return profile;
}

/** depth from the interface that holds the given fraction of the space charge, m */
function chargeDepth(solution: PoissonSolution, geometry: CrossSection, fraction: number): number {
  const x = solution.x_m;
  const rho = solution.netCharge_m3;
  let total = 0;
  const cumulative = new Float64Array(x.length);
  for (let i = 0; i < x.length - 1; i++) {
    total += 0.5 * (rho[i]! + rho[i + 1]!) * geometry.volume(x[i]!, x[i + 1]!);
    cumulative[i + 1] = total;
  }
  if (total === 0) return 0;
  for (let i = 1; i < x.length; i++) {
    if (cumulative[i]! / total >= fraction) {
      const a = cumulative[i - 1]! / total;
      const b = cumulative[i]! / total;
      const t = b === a ? 0 : (fraction - a) / (b - a);
      return x[i - 1]! + t * (x[i]! - x[i - 1]!);
    }
  }
  return x[x.length - 1]!;
}

interface WarningContext {
  r: ResolvedContact;
  bulk: BulkState;
  kT: number;
  nType: boolean;
  bandBending_eV: number;
  barrier: ReturnType<typeof barrierHeight>;
  solution: PoissonSolution;
  depth90_nm: number;
  electronsPerParticle: number;
  particle: ParticleInfo;
  exchange: ExchangeInfo | null;
  profile: Profile;
}

function collectWarnings(out: Warning[], w: WarningContext): void {
  const add = (code: string, message: string): void => {
    out.push({ code, message });
  };
  const s = w.r.support;
  if (w.r.particleDiameter_m < 1e-9) {
    add('continuum-doubtful', `particle diameter ${(w.r.particleDiameter_m * 1e9).toFixed(2)} nm: below ~1 nm a continuum dielectric model is doubtful`);
  }
  if (w.depth90_nm > 0 && w.depth90_nm < 1) {
    add('continuum-doubtful', `90% of the space charge lies within ${w.depth90_nm.toFixed(2)} nm of the interface: continuum electrostatics is doubtful below ~1 nm`);
  }
  const bulkDegeneracy = w.nType ? -w.bulk.reducedFermiLevel : (s.bandGap_eV / w.kT + w.bulk.reducedFermiLevel);
  if (bulkDegeneracy < 3) {
    add('degenerate-bulk', `the bulk Fermi level is within ${(bulkDegeneracy * w.kT).toFixed(3)} eV of the ${w.nType ? 'conduction' : 'valence'} band: degenerate support`);
  }
  const accumulation = w.nType ? w.bandBending_eV < -w.kT : w.bandBending_eV > w.kT;
  if (accumulation && w.depth90_nm < 0.5) {
    add('thin-accumulation', `accumulation layer about ${w.depth90_nm.toFixed(2)} nm thick (< 0.5 nm): the charge sits in the first atomic layers`);
  }
  // inversion: minority carriers outnumber majority carriers at the interface
  const n0 = w.profile.electronDensity_cm3[0]!;
  const p0 = w.profile.holeDensity_cm3[0]!;
  const majorityBulkAtSurfaceScale = (w.nType ? w.bulk.electronDensity_m3 : w.bulk.holeDensity_m3) * 1e-6 * 1e-3;
  if (w.nType ? p0 > n0 && p0 > majorityBulkAtSurfaceScale : n0 > p0 && n0 > majorityBulkAtSurfaceScale) {
    add('inversion', 'minority carriers dominate at the interface (inversion layer)');
  }
  if (w.barrier.electronBarrier_eV < 0 || w.barrier.electronBarrier_eV > s.bandGap_eV) {
    add('fermi-level-outside-gap', `the interface Fermi level lies ${w.barrier.electronBarrier_eV < 0 ? 'above the conduction band' : 'below the valence band'}: ohmic-like contact`);
  }
  if (w.r.supportThickness_m !== undefined) {
    const last = w.profile.x_nm.length - 1;
    const majorityEnd = w.nType ? w.profile.electronDensity_cm3[last]! : w.profile.holeDensity_cm3[last]!;
    const majorityBulk = (w.nType ? w.bulk.electronDensity_m3 : w.bulk.holeDensity_m3) * 1e-6;
    const depletedBand = w.nType ? w.bandBending_eV > 0 : w.bandBending_eV < 0;
    if (depletedBand && majorityEnd < 0.5 * majorityBulk) {
      add('fully-depleted', `the support (${(w.r.supportThickness_m * 1e9).toFixed(1)} nm) is depleted through its whole thickness: the transferred charge is capped by the donors available`);
    }
  } else if (w.solution.truncated) {
    add('layer-truncated', `the space-charge layer did not decay within ${(w.solution.domain_m * 1e9).toFixed(0)} nm; results are for that depth`);
  }
  if (s.donors_m3 === 0 && s.acceptors_m3 === 0) {
    add('undoped-support', 'no donor or acceptor density was given or found in the library: the support is treated as undoped (give --donors, --acceptors or reduction conditions)');
  }
  const majorityBulk_cm3 = (w.nType ? w.bulk.electronDensity_m3 : w.bulk.holeDensity_m3) * 1e-6;
  if (majorityBulk_cm3 < 1e6) {
    add('insulating-support', `bulk carrier density ${majorityBulk_cm3.toExponential(1)} cm^-3: an insulating support exchanges almost no charge`);
  }
  if (Math.abs(w.electronsPerParticle) < 1 && w.bandBending_eV !== 0) {
    add('sub-electron-transfer', `mean transfer ${w.electronsPerParticle.toPrecision(2)} electrons per particle (< 1): individual particles are either charged by one electron or not at all`);
  }
  if (w.particle.chargingEnergyOverKT > 1) {
    add('charge-quantised', `single-electron charging energy ${w.particle.chargingEnergy_eV.toFixed(3)} eV exceeds kT (${w.kT.toFixed(4)} eV): charging is quantised`);
  }
  if (w.particle.zonesOverlap === true) {
    add('zones-overlap', `space-charge zones of neighbouring particles overlap (layer ${w.depth90_nm.toFixed(1)} nm > half the spacing ${(w.particle.meanSpacing_nm! / 2).toFixed(1)} nm)`);
  }
  if (w.exchange?.slow) {
    add('slow-exchange', `thermionic exchange would take ~10^${w.exchange.equilibrationTimeLog10_s.toFixed(1)} s (> 1 h) at ${w.r.temperature_K} K: equilibrium may not be reached`);
  }
  if (w.solution.chargeErrorEstimate > REFINE_ABOVE) {
    add('mesh-accuracy', `estimated relative charge error ${w.solution.chargeErrorEstimate.toExponential(1)}; rerun with a finer mesh`);
  }
  const estimated = w.r.inputs.filter((i) => i.origin === 'estimate').map((i) => i.field);
  if (estimated.length > 0) add('estimated-input', `estimated inputs: ${estimated.join(', ')}`);
  const memory = w.r.inputs.filter((i) => i.fromMemory).map((i) => i.field);
  if (memory.length > 0) add('unverified-input', `library values not verified against a found source: ${memory.join(', ')}`);
}
