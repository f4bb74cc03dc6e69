// Widths of the space-charge layer, from the charge that is actually there (issue 10, item 1).
// Pure functions, SI inputs and outputs; null where a width is undefined (never NaN or Infinity).
import { EPS0_F_PER_M, Q_ELEMENTARY_C } from '../constants.js';
import { requireInRange } from '../errors.js';
import type { CrossSection } from '../electrostatics/geometry.js';

export interface DopantDensities {
  /** donor density, m^-3 (all donors, ionised or not), >= 0 */
  donors_m3: number;
  /** 'double' donors release two electrons each when fully ionised */
  donorKind: 'single' | 'double';
  /** acceptor density, m^-3, >= 0 */
  acceptors_m3: number;
}

/**
 * Net fixed charge density of a layer emptied of carriers with every dopant ionised, |Z N_D - N_A|, m^-3.
 *
 * Z = 1 for single and 2 for double donors. This is the density the depletion approximation assumes
 * (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3, abrupt depletion), NOT the bulk ionised density:
 * deep donors that are neutral in the bulk are ionised inside a depletion layer, where E_F lies far below them.
 * Returns 0 when donors and acceptors compensate exactly.
 */
export function depletedChargeDensity_m3(d: DopantDensities): number {
  requireInRange('donors_m3', d.donors_m3, 0, 1e30, 'm^-3');
  requireInRange('acceptors_m3', d.acceptors_m3, 0, 1e30, 'm^-3');
  const z = d.donorKind === 'double' ? 2 : 1;
  return Math.abs(z * d.donors_m3 - d.acceptors_m3);
}

export interface ChargeWidthInput extends DopantDensities {
  /** space charge on the support side: C per m^2 of interface for planar, C per particle otherwise (sign ignored) */
  charge_C: number;
  /** the cross-section the charge was computed on (planar: per m^2) */
  geometry: CrossSection;
}

/**
 * Charge-equivalent width W_Q: the thickness of a layer next to the interface that holds |Q| at the fully
 * ionised density |Z N_D - N_A| (definition of this project, issue 10 item 1).
 *   planar:                 W_Q = |Q| / (q |Z N_D - N_A|)                                   [m]
 *   hemisphere, array, ...: the depth whose volume (geometry.depthHoldingVolume) holds |Q| / (q |Z N_D - N_A|)
 * Returns null when the dopants compensate exactly (no fixed charge to deplete). Range: >= 0.
 */
export function chargeEquivalentWidth_m(input: ChargeWidthInput): number | null {
  const charge = Math.abs(requireInRange('charge_C', input.charge_C, -1e10, 1e10, 'C'));
  const density = depletedChargeDensity_m3(input);
  if (density === 0) return null;
  const volume = charge / (Q_ELEMENTARY_C * density);
  const width = input.geometry.kind === 'planar' ? volume : input.geometry.depthHoldingVolume(volume);
  return Number.isFinite(width) ? width : null;
}

export interface DepletionInput extends DopantDensities {
  /** band bending E_C(0) - E_C(bulk), eV (positive = bands bend up) */
  bandBending_eV: number;
  /** kT, eV */
  kT_eV: number;
  relativePermittivity: number;
  /** true for an n-type bulk (depletion = bands up), false for p-type (depletion = bands down) */
  nType: boolean;
}

/**
 * Planar depletion approximation with the kT correction of the majority-carrier tail,
 *   W = sqrt(2 eps (|V_bb| - kT/q) / (q |Z N_D - N_A|))
 * (Sze & Ng, 3rd ed., ch. 3, depletion width of a Schottky barrier; the equation number is from memory, verify).
 * Planar only: for curved geometries see sphericalDepletionRadius_m. Returns null when the layer is not a
 * depletion layer (|V_bb| <= kT or bands bent toward accumulation) or the dopants compensate exactly. m.
 */
export function depletionWidthApprox_m(input: DepletionInput): number | null {
  requireInRange('bandBending_eV', input.bandBending_eV, -100, 100, 'eV');
  requireInRange('kT_eV', input.kT_eV, 1e-6, 1, 'eV');
  requireInRange('relativePermittivity', input.relativePermittivity, 1, 1e5, '');
  const depleted = input.nType ? input.bandBending_eV > input.kT_eV : input.bandBending_eV < -input.kT_eV;
  const density = depletedChargeDensity_m3(input);
  if (!depleted || density === 0) return null;
  const eps = input.relativePermittivity * EPS0_F_PER_M;
  // (|V| - kT/q) in volts: energies in eV divided by q give volts numerically
  return Math.sqrt((2 * eps * (Math.abs(input.bandBending_eV) - input.kT_eV)) / (Q_ELEMENTARY_C * density));
}

/**
 * Depletion approximation for a hemispherical shell a < r < R around a particle of radius a (zero field at R):
 * Gauss's law gives E(r) = q N (R^3 - r^3) / (3 eps r^2), so the bending is
 *   V(R) = (q N / 3 eps) (R^3/a - 3R^2/2 + a^2/2)
 * (derived here; it reduces to the planar q N W^2 / 2 eps for W = R - a << a). Solved for R with V = |V_bb| - kT/q
 * by bisection. Returns the layer thickness R - a, m, or null when not depleted (same rule as the planar one).
 */
export function sphericalDepletionWidth_m(input: DepletionInput & { radius_m: number }): number | null {
  requireInRange('radius_m', input.radius_m, 1e-11, 1, 'm');
  if (depletionWidthApprox_m(input) === null) return null;
  const a = input.radius_m;
  const k = (Q_ELEMENTARY_C * depletedChargeDensity_m3(input)) / (3 * input.relativePermittivity * EPS0_F_PER_M);
  const target = Math.abs(input.bandBending_eV) - input.kT_eV;
  const bending = (r: number): number => k * ((r * r * r) / a - 1.5 * r * r + 0.5 * a * a);
  let lo = a;
  let hi = 2 * a;
  // V(R) grows monotonically (dV/dR = k (3R^2/a - 3R) > 0 for R > a): expand the bracket, then bisect
  for (let i = 0; i < 200 && bending(hi) < target; i++) hi = a + 2 * (hi - a);
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (bending(mid) < target) lo = mid;
    else hi = mid;
    if (hi - lo <= 1e-14 * hi) break;
  }
  const width = 0.5 * (lo + hi) - a;
  return Number.isFinite(width) ? width : null;
}

/**
 * Depth (planar) or shell thickness (hemisphere, array) from the interface that holds `fraction` of the space
 * charge, from a computed profile: cumulative trapezoid of rho over the geometry's slab volumes, linear
 * interpolation inside the crossing cell. x_m ascending from 0, netCharge_m3 at the nodes (any unit, only
 * ratios matter), fraction in (0, 1]. Returns 0 for a profile without charge. m.
 */
export function chargeDepth_m(x_m: ArrayLike<number>, netCharge_m3: ArrayLike<number>, geometry: CrossSection, fraction: number): number {
  requireInRange('fraction', fraction, 1e-9, 1, '');
  const n = x_m.length;
  if (n < 2) return 0;
  const cumulative = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n - 1; i++) {
    total += 0.5 * (netCharge_m3[i]! + netCharge_m3[i + 1]!) * geometry.volume(x_m[i]!, x_m[i + 1]!);
    cumulative[i + 1] = total;
  }
  if (total === 0 || !Number.isFinite(total)) return 0;
  for (let i = 1; i < n; i++) {
    if (cumulative[i]! / total >= fraction) {
      const a = cumulative[i - 1]! / total;
      const b = cumulative[i]! / total;
      const t = b === a ? 0 : (fraction - a) / (b - a);
      return x_m[i - 1]! + t * (x_m[i]! - x_m[i - 1]!);
    }
  }
  return x_m[n - 1]!;
}
