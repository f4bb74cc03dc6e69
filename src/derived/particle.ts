// Size-derived properties of a supported metal particle: atom counts, dispersion, single-electron
// charging energy and mean spacing. Pure functions, SI inputs.
import { EPS0_F_PER_M, N_AVOGADRO_PER_MOL, Q_ELEMENTARY_C, thermalEnergy_eV } from '../constants.js';
import { InputError, requireInRange } from '../errors.js';

export interface ParticleAtomsInput {
  /** particle diameter, m (for a hemisphere: the diameter of its footprint on the support) */
  diameter_m: number;
  /** bulk density of the metal, g/cm^3 */
  density_g_cm3: number;
  /** molar mass of the metal, g/mol */
  molarMass_g_mol: number;
  /** metallic (12-coordinate) radius of the metal atom, pm */
  metallicRadius_pm: number;
}

export interface ParticleAtomCount {
  /** total atoms, continuum estimate (not rounded: a 0.4-atom result means the model is out of its depth) */
  atoms: number;
  /** atoms in the outer shell of thickness one atomic diameter on the exposed surface */
  surfaceAtoms: number;
  /** surfaceAtoms / atoms, never above 1 */
  dispersion: number;
}

const CM3_PER_M3_VOLUME = 1e6; // cm^3 in one m^3 (volume, not a density conversion)
const M_PER_PM = 1e-12;

function validateParticle(input: ParticleAtomsInput): void {
  // 0.1 nm to 1 um: below an atom the continuum count is meaningless; above 1 um the particle is bulk metal.
  requireInRange('diameter_m', input.diameter_m, 1e-10, 1e-6, 'm');
  requireInRange('density_g_cm3', input.density_g_cm3, 0.1, 30, 'g/cm^3');
  requireInRange('molarMass_g_mol', input.molarMass_g_mol, 1, 300, 'g/mol');
  requireInRange('metallicRadius_pm', input.metallicRadius_pm, 30, 300, 'pm');
}

/**
 * Shared counting rule for sphere and hemisphere: the exposed surface shell is the region within one atomic
 * diameter (2 r_metal) of the curved surface. Because a hemisphere is exactly half a sphere, both the volume
 * and the curved-surface shell halve, so the dispersion is the same; the hemisphere's flat face is the
 * metal/support interface and is deliberately not counted as exposed surface.
 */
function countAtoms(input: ParticleAtomsInput, volumeFraction: number): ParticleAtomCount {
  validateParticle(input);
  const radius_m = input.diameter_m / 2;
  const sphereVolume_m3 = (4 / 3) * Math.PI * radius_m ** 3;
  const volume_cm3 = volumeFraction * sphereVolume_m3 * CM3_PER_M3_VOLUME;
  // Atom count from mass: N = rho V N_A / M.
  const atoms = (input.density_g_cm3 * volume_cm3 * N_AVOGADRO_PER_MOL) / input.molarMass_g_mol;
  const shellThickness_m = 2 * input.metallicRadius_pm * M_PER_PM;
  const innerRadius_m = Math.max(0, radius_m - shellThickness_m);
  // Shell fraction 1 - (r_in/R)^3: the outer shell's share of the volume, hence of the atoms at uniform density.
  const shellFraction = 1 - (innerRadius_m / radius_m) ** 3;
  const dispersion = Math.min(1, shellFraction);
  return { atoms, surfaceAtoms: atoms * dispersion, dispersion };
}

/**
 * Atoms in a hemispherical particle resting on the support (V = (2/3) pi (d/2)^3).
 * Surface atoms: those in a shell one atomic diameter thick under the curved surface (see countAtoms).
 */
export function particleAtoms(input: ParticleAtomsInput): ParticleAtomCount {
  return countAtoms(input, 0.5);
}

/** Full-sphere variant (V = (4/3) pi (d/2)^3), the usual textbook count; kept for checks against it. */
export function sphereAtoms(input: ParticleAtomsInput): ParticleAtomCount {
  return countAtoms(input, 1);
}

/**
 * Effective relative permittivity around a particle at the gas/support boundary: (1 + eps_support)/2.
 * Why: for a sphere centred on a flat boundary between two dielectrics the radial field of an isolated
 * sphere already satisfies both boundary conditions, so C = 4 pi eps0 ((eps1 + eps2)/2) a holds exactly;
 * a hemisphere sitting on top of the support is approximated by that result (gas side eps = 1).
 */
export function effectivePermittivity(epsSupport: number): number {
  requireInRange('epsSupport', epsSupport, 1, 1e5, '(relative permittivity)');
  return (1 + epsSupport) / 2;
}

export interface ChargingEnergyInput {
  /** particle radius, m */
  radius_m: number;
  /** relative permittivity of the surrounding medium, e.g. effectivePermittivity(eps_support) */
  permittivityRelative: number;
}

/** Self-capacitance of an isolated sphere in a uniform dielectric, C = 4 pi eps0 eps_r a (F). */
export function selfCapacitance_F({ radius_m, permittivityRelative }: ChargingEnergyInput): number {
  requireInRange('radius_m', radius_m, 5e-11, 5e-7, 'm');
  requireInRange('permittivityRelative', permittivityRelative, 1, 1e5, '(relative permittivity)');
  return 4 * Math.PI * EPS0_F_PER_M * permittivityRelative * radius_m;
}

/**
 * Single-electron charging energy E_c = e^2/(2C), in eV, with C the sphere self-capacitance.
 * Why the sphere formula: a far-away counter-electrode (the bulk of the support) makes the self-capacitance
 * the relevant one; image charges in a nearby metal would raise C and lower E_c.
 */
export function chargingEnergy_eV(input: ChargingEnergyInput): number {
  const capacitance_F = selfCapacitance_F(input);
  // e^2/(2C) in J, divided by e to get eV, leaves e/(2C).
  return Q_ELEMENTARY_C / (2 * capacitance_F);
}

/** E_c / kT: above 1, adding one electron costs more than the thermal energy available. */
export function chargingEnergyOverKT(chargingEnergy_eV: number, kT_eV: number): number {
  requireInRange('chargingEnergy_eV', chargingEnergy_eV, 0, 1e3, 'eV');
  if (!Number.isFinite(kT_eV) || kT_eV <= 0) throw new InputError('kT_eV', `value ${kT_eV} eV is not positive`, 'greater than 0 eV');
  return chargingEnergy_eV / kT_eV;
}

/** Charge is quantised (Coulomb blockade regime) when the charging energy exceeds kT. */
export function isChargeQuantised(chargingEnergy_eV: number, kT_eV: number): boolean {
  return chargingEnergyOverKT(chargingEnergy_eV, kT_eV) > 1;
}

export interface ChargingSummary {
  chargingEnergy_eV: number;
  kT_eV: number;
  chargingEnergyOverKT: number;
  chargeQuantised: boolean;
}

/** Charging energy together with its ratio to kT at the given temperature, for reports. */
export function chargingSummary(input: ChargingEnergyInput & { temperature_K: number }): ChargingSummary {
  requireInRange('temperature_K', input.temperature_K, 1, 5000, 'K');
  const energy_eV = chargingEnergy_eV(input);
  const kT_eV = thermalEnergy_eV(input.temperature_K);
  const ratio = chargingEnergyOverKT(energy_eV, kT_eV);
  return { chargingEnergy_eV: energy_eV, kT_eV, chargingEnergyOverKT: ratio, chargeQuantised: ratio > 1 };
}

/**
 * Mean nearest-neighbour spacing of particles at areal density N (per m^2): 1/sqrt(N).
 * Square-lattice convention: each particle owns a square cell of area 1/N; a random (Poisson) arrangement
 * would give a mean nearest-neighbour distance of 0.5/sqrt(N), so treat this as the cell size, not a minimum.
 */
export function meanSpacing_m(particleDensity_per_m2: number): number {
  // 1 per m^2 (essentially isolated) to 1e20 per m^2 (particles of ~0.1 nm touching).
  requireInRange('particleDensity_per_m2', particleDensity_per_m2, 1, 1e20, 'm^-2');
  return 1 / Math.sqrt(particleDensity_per_m2);
}
