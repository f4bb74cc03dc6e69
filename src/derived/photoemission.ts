// What photoemission sees of the band bending: the profile u(x) averaged over the photoelectron information
// depth with the exponential attenuation weight exp(-x / (lambda cos(theta))).
import { InputError } from '../errors.js';
import type { ContactResult } from '../types.js';

const AVOGADRO_PER_MOL = 6.02214076e23;

/**
 * Mean thickness of one atomic monolayer of a compound, m: a^3 = M / (rho n N_A), the mean volume per atom
 * (Seah & Dench, Surf. Interface Anal. 1, 2 (1979); definition from memory, verify).
 */
export function monolayerThickness_m(molarMass_g_mol: number, density_g_cm3: number, atomsPerFormulaUnit: number): number {
  if (!(molarMass_g_mol > 0) || !Number.isFinite(molarMass_g_mol)) throw new InputError('molar mass', `expected a positive number, got ${molarMass_g_mol}`, '> 0 g/mol');
  if (!(density_g_cm3 > 0) || !Number.isFinite(density_g_cm3)) throw new InputError('density', `expected a positive number, got ${density_g_cm3}`, '> 0 g/cm^3');
  if (!Number.isInteger(atomsPerFormulaUnit) || atomsPerFormulaUnit < 1) {
    throw new InputError('atoms per formula unit', `expected a whole number >= 1, got ${atomsPerFormulaUnit}`, '1, 2, 3, ...');
  }
  const volumePerAtom_cm3 = molarMass_g_mol / (density_g_cm3 * atomsPerFormulaUnit * AVOGADRO_PER_MOL);
  return Math.cbrt(volumePerAtom_cm3) * 1e-2;
}

/** Kinetic energy of a photoelectron, eV: E_kin = h nu - E_B (work function of the analyser neglected, < 5 eV). */
export function kineticEnergy_eV(photonEnergy_eV: number, bindingEnergy_eV: number): number {
  if (!Number.isFinite(photonEnergy_eV) || !Number.isFinite(bindingEnergy_eV) || bindingEnergy_eV < 0) {
    throw new InputError('photon/binding energy', `expected finite energies with E_B >= 0, got ${photonEnergy_eV} and ${bindingEnergy_eV}`, 'h nu > E_B >= 0');
  }
  const e = photonEnergy_eV - bindingEnergy_eV;
  if (!(e >= 1)) throw new InputError('photon energy', `h nu = ${photonEnergy_eV} eV does not reach E_B = ${bindingEnergy_eV} eV`, 'h nu > E_B + 1 eV');
  return e;
}

/**
 * Inelastic mean free path in an inorganic compound, m, Seah & Dench (1979):
 * lambda = a (2170 / E^2 + 0.72 (a E)^0.5), E in eV above E_F, a in nm (formula from memory of the paper, verify).
 */
export function seahDenchImfpCompound_m(kineticEnergy_eV: number, monolayer_m: number): number {
  if (!(kineticEnergy_eV >= 1) || !Number.isFinite(kineticEnergy_eV)) {
    throw new InputError('kinetic energy', `expected >= 1 eV, got ${kineticEnergy_eV}`, '1 eV to 1e5 eV');
  }
  if (!(monolayer_m > 0) || !(monolayer_m < 1e-8)) throw new InputError('monolayer thickness', `expected 0 < a < 10 nm, got ${monolayer_m} m`, '0 to 10 nm');
  const a_nm = monolayer_m * 1e9;
  const monolayers = 2170 / kineticEnergy_eV ** 2 + 0.72 * Math.sqrt(a_nm * kineticEnergy_eV);
  return monolayers * monolayer_m;
}

/**
 * Band bending the instrument sees, eV: <u> = (1/L) * integral_0^inf u(x) exp(-x/L) dx with L = lambda cos(theta)
 * (Beer-Lambert attenuation of photoelectrons; theta from the surface normal). u is taken piecewise linear between
 * the mesh points (the integral of each linear piece times the exponential is done exactly, so coarse cells far
 * from the surface cost no accuracy), constant u[0] between 0 and x[0], and the bulk value 0 beyond the mesh.
 */
export function observedBandBending_eV(
  x_m: ArrayLike<number>,
  bandBending_eV: ArrayLike<number>,
  imfp_m: number,
  emissionAngle_deg: number,
): number {
  if (x_m.length !== bandBending_eV.length || x_m.length < 1) {
    throw new RangeError(`observedBandBending_eV: ${x_m.length} positions for ${bandBending_eV.length} values`);
  }
  if (!(imfp_m > 0) || !Number.isFinite(imfp_m)) throw new InputError('inelastic mean free path', `expected a positive length, got ${imfp_m} m`, '> 0');
  if (!(emissionAngle_deg >= 0 && emissionAngle_deg < 89)) {
    throw new InputError('emission angle', `expected 0 to 89 degrees from the surface normal, got ${emissionAngle_deg}`, '0 to 89 deg');
  }
  for (let i = 0; i < x_m.length; i++) {
    if (!Number.isFinite(x_m[i]!) || !Number.isFinite(bandBending_eV[i]!)) throw new RangeError(`observedBandBending_eV: non-finite value at index ${i}`);
    if (i === 0 ? x_m[0]! < 0 : x_m[i]! <= x_m[i - 1]!) throw new RangeError(`observedBandBending_eV: positions must start at >= 0 and increase (index ${i})`);
  }
  const depth = imfp_m * Math.cos((emissionAngle_deg * Math.PI) / 180);
  // integral_0^x0 u0 e^{-x/L} dx / L = u0 (1 - e^{-x0/L})
  let sum = bandBending_eV[0]! * -Math.expm1(-x_m[0]! / depth);
  for (let i = 0; i + 1 < x_m.length; i++) {
    const r = (x_m[i + 1]! - x_m[i]!) / depth;
    const start = Math.exp(-x_m[i]! / depth);
    if (start === 0) break;
    const e = Math.exp(-r);
    const m0 = -Math.expm1(-r); // (1/L) int_0^h e^{-t/L} dt
    const m1 = r < 1e-4 ? r * (0.5 - r / 3 + (r * r) / 8) : (m0 - r * e) / r; // (1/(L h)) int_0^h t e^{-t/L} dt
    const u0 = bandBending_eV[i]!;
    const du = bandBending_eV[i + 1]! - u0;
    sum += start * (u0 * m0 + du * m1);
  }
  return sum;
}

/** The band-bending profile of a solved contact, eV vs m: u(x) = (E_C(x) - E_F) - (E_C - E_F)_bulk. */
export function bandBendingProfile(result: ContactResult): { x_m: number[]; bandBending_eV: number[] } {
  const x_m = result.profile.x_nm.map((x) => x * 1e-9);
  const bandBending_eV = result.profile.conductionBand_eV.map((ec) => ec - result.fermiLevelBelowConduction_eV);
  return { x_m, bandBending_eV };
}
