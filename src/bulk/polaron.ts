// Vertical (photoemission) versus thermal (Fermi–Dirac) energy of a small polaron: the configuration-coordinate
// model of a localised electron coupled linearly to one harmonic lattice coordinate q (Holstein, Ann. Phys. 8, 343
// (1959); Austin & Mott, Adv. Phys. 18, 41 (1969), the small-polaron chapter; citation details from memory, verify).
//
//   empty site:    E_0(q) = (1/2) k q^2                  (electron in the band at E_C, lattice undistorted at q = 0)
//   occupied site: E_1(q) = -A q + (1/2) k q^2           (same curvature k: the "equal-curvature" harmonic picture)
//   occupied minimum at q* = A/k, E_1(q*) = -A^2/(2k) = -E_p           (E_p: polaron binding, the thermal depth)
//   vertical (Franck–Condon) removal at q*: E_0(q*) - E_1(q*) = A^2/k = 2 E_p
//   relaxation energy of the emptied lattice: lambda = E_0(q*) - E_0(0) = A^2/(2k) = E_p
// so the optical (vertical) depth below the band edge is twice the thermal one, E_opt = E_th + lambda = 2 E_th.
// Photoemission of a gap state (e.g. Ti3+ ~0.85 eV below E_F on reduced rutile(110), Wendt et al. 2008) removes the
// electron without letting the lattice relax: it measures the vertical energy. Fermi–Dirac occupancy in bulk
// neutrality and in the space charge needs the thermodynamic level (energy difference of relaxed states), which in
// this picture is half of it, measured from E_C. Photoemission measures from E_F, so the reference matters:
//   E_th = (E_B + (E_C - E_F)) / 2     (E_B: binding energy of the gap state below E_F)
//   - E_F at E_C (n-type reduced rutile):                   E_th = E_B / 2
//   - E_F at the partly filled polaron level (E_C - E_F = E_th, reduced ceria): E_th = E_B, the binding energy from
//     E_F then being the relaxation energy lambda of the emptied lattice.
// Limits of the conversion (stated, not modelled): the small-polaron limit neglects the
// band (kinetic) energy the electron gives up when it localises, which makes the thermal depth smaller than E_opt/2
// (Holstein: E_th = E_p - J-type transfer term), and unequal curvatures of the two parabolas shift the ratio; so
// E_opt/2 is an upper estimate of the thermal depth.
import { requireInRange } from '../errors.js';

/** Ratio of the vertical (optical) to the thermal depth of a small polaron in the equal-curvature harmonic model. */
export const EQUAL_CURVATURE_OPTICAL_TO_THERMAL = 2;

/**
 * Thermal (0/-) depth of a small-polaron level below E_C, eV, from the vertical depth measured by photoemission:
 * E_th = (E_B + (E_C - E_F)) / 2 (equal-curvature configuration-coordinate model, header; Austin & Mott 1969).
 * verticalBelowFermi_eV: binding energy of the gap state below E_F (0-20 eV);
 * fermiBelowConduction_eV: E_C - E_F of the measured surface (default 0, i.e. E_F at E_C, a lower bound of the
 * vertical depth below E_C for an n-type reduced oxide), -1 to 20 eV.
 */
export function thermalPolaronDepth_eV(verticalBelowFermi_eV: number, fermiBelowConduction_eV = 0): number {
  requireInRange('verticalBelowFermi_eV', verticalBelowFermi_eV, 0, 20, 'eV');
  requireInRange('fermiBelowConduction_eV', fermiBelowConduction_eV, -1, 20, 'eV');
  const vertical = verticalBelowFermi_eV + fermiBelowConduction_eV;
  return Math.max(0, vertical) / EQUAL_CURVATURE_OPTICAL_TO_THERMAL;
}

/** The inverse: vertical (photoemission) depth below E_C of a small polaron of thermal depth E_th, eV: 2 E_th. */
export function verticalPolaronDepth_eV(thermalDepth_eV: number): number {
  requireInRange('thermalDepth_eV', thermalDepth_eV, 0, 10, 'eV');
  return EQUAL_CURVATURE_OPTICAL_TO_THERMAL * thermalDepth_eV;
}

export interface PolaronEnergies {
  /** E_p = A^2/(2k): thermal depth of the relaxed occupied state below the empty one, eV */
  thermalDepth_eV: number;
  /** A^2/k: vertical removal energy at the relaxed geometry, eV */
  verticalDepth_eV: number;
  /** lambda: energy released by the emptied lattice relaxing back to q = 0, eV */
  relaxation_eV: number;
}

/**
 * The three energies of the configuration-coordinate model from its coupling A (eV per unit q) and stiffness k
 * (eV per unit q^2), allowing different stiffnesses of the empty (k0) and occupied (k1) site:
 *   q* = A/k1, E_th = A^2/(2 k1), vertical = E_th + (1/2) k0 q*^2, lambda = (1/2) k0 q*^2.
 * With k0 = k1 it reproduces E_opt = 2 E_th. A >= 0, k > 0.
 */
export function configurationCoordinateEnergies(coupling: number, stiffnessEmpty: number, stiffnessOccupied: number = stiffnessEmpty): PolaronEnergies {
  requireInRange('coupling', coupling, 0, 1e6, 'eV per unit coordinate');
  requireInRange('stiffnessEmpty', stiffnessEmpty, 1e-9, 1e9, 'eV per unit coordinate^2');
  requireInRange('stiffnessOccupied', stiffnessOccupied, 1e-9, 1e9, 'eV per unit coordinate^2');
  const q = coupling / stiffnessOccupied;
  const thermal = (coupling * coupling) / (2 * stiffnessOccupied);
  const relaxation = 0.5 * stiffnessEmpty * q * q;
  return { thermalDepth_eV: thermal, verticalDepth_eV: thermal + relaxation, relaxation_eV: relaxation };
}
