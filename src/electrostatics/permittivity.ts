// Field-dependent permittivity of incipient ferroelectrics (SrTiO3-like supports) and a validity check for the
// continuum image-force lowering (issue 10, item 6). Pure functions, SI units.
import { EPS0_F_PER_M, Q_ELEMENTARY_C } from '../constants.js';
import { requireInRange } from '../errors.js';

/**
 * Landau–Ginzburg–Devonshire dielectric response of a paraelectric with a quartic free energy:
 *   E = alpha P + beta P^3,  alpha = 1 / (eps0 eps_r(0)),   eps_r(E) = (1/eps0) dP/dE = 1 / (eps0 (alpha + 3 beta P^2))
 * (Devonshire, Phil. Mag. 40, 1040 (1949); used for SrTiO3 films by e.g. Vendik & Zubko, J. Appl. Phys. 82, 4475
 * (1997); citations from memory, verify). P(E) is the real root of the depressed cubic, by Cardano's formula.
 * Inputs: field |E| in V/m (0..1e11); eps_r(0) (1..1e5); beta in V m^5 / C^3 (> 0). For SrTiO3 at room
 * temperature beta ~ 8e9 V m^5 C^-3 is a value recalled from memory (verify before use): it gives a permittivity
 * that falls from ~300 to roughly a third at ~1e8 V/m. Returns eps_r(E) (>= 1 is not enforced: the lattice part
 * only; add the background permittivity yourself).
 * Limits: eps_r(0) at E = 0; eps_r ~ (1/3) (beta^-1/3 / eps0) |E|^(-2/3) at large fields.
 */
export function devonshirePermittivity(field_V_per_m: number, zeroFieldPermittivity: number, beta_V_m5_per_C3: number): number {
  const e = Math.abs(requireInRange('field_V_per_m', field_V_per_m, -1e11, 1e11, 'V/m'));
  const eps0r = requireInRange('zeroFieldPermittivity', zeroFieldPermittivity, 1, 1e5, '');
  const beta = requireInRange('beta_V_m5_per_C3', beta_V_m5_per_C3, 1e-30, 1e30, 'V m^5 C^-3');
  const alpha = 1 / (EPS0_F_PER_M * eps0r);
  const p = devonshirePolarisation(e, alpha, beta);
  return 1 / (EPS0_F_PER_M * (alpha + 3 * beta * p * p));
}

/** Real root of beta P^3 + alpha P - E = 0 (alpha, beta > 0: one real root), Cardano; C/m^2. */
export function devonshirePolarisation(field_V_per_m: number, alpha: number, beta: number): number {
  // P^3 + p P + q = 0 with p = alpha/beta > 0, q = -E/beta: P = cbrt(-q/2 + s) + cbrt(-q/2 - s), s = sqrt(q^2/4 + p^3/27)
  const p = alpha / beta;
  const q = -field_V_per_m / beta;
  const s = Math.sqrt((q * q) / 4 + (p * p * p) / 27);
  const a = Math.cbrt(-q / 2 + s);
  // the second cube root cancels the first for small fields: write it as -p/(3a) (a * b = -p/3)
  const b = a !== 0 ? -p / (3 * a) : 0;
  // two Newton polishing steps on beta P^3 + alpha P - E remove the rounding of the cube roots
  let root = a + b;
  for (let k = 0; k < 2; k++) root -= (beta * root * root * root + alpha * root - field_V_per_m) / (3 * beta * root * root + alpha);
  return root;
}

export interface ImageForceCheck {
  /** distance of the image-force barrier maximum from the metal, x_m = sqrt(q / (16 pi eps_opt eps0 E)), m */
  maximumDistance_m: number;
  /** false when x_m is below the continuum limit (default 1 nm): the lowering formula should not be trusted */
  valid: boolean;
  reason: string | null;
}

/**
 * Validity of the continuum image-force (Schottky) lowering: the barrier maximum sits at
 *   x_m = sqrt(q / (16 pi eps_opt eps0 E))     (Sze & Ng, 3rd ed., ch. 3, image-force lowering)
 * and a continuum image charge and a macroscopic optical permittivity are doubtful closer than about one nanometre
 * (a few lattice spacings) to the metal. Inputs: interface field |E| in V/m (> 0), optical (image-force)
 * permittivity eps_opt (1..1e3), limit in m (default 1e-9). Returns x_m and the verdict; zero field gives an
 * infinitely distant maximum, reported as valid with x_m = 1 m (capped, never Infinity).
 */
export function imageForceValidity(field_V_per_m: number, opticalPermittivity: number, limit_m = 1e-9): ImageForceCheck {
  const e = Math.abs(requireInRange('field_V_per_m', field_V_per_m, -1e12, 1e12, 'V/m'));
  const epsOpt = requireInRange('opticalPermittivity', opticalPermittivity, 1, 1e3, '');
  requireInRange('limit_m', limit_m, 1e-11, 1e-6, 'm');
  const xm = e > 0 ? Math.min(1, Math.sqrt(Q_ELEMENTARY_C / (16 * Math.PI * epsOpt * EPS0_F_PER_M * e))) : 1;
  const valid = xm >= limit_m;
  return {
    maximumDistance_m: xm,
    valid,
    reason: valid ? null : `the image-force maximum lies ${(xm * 1e9).toFixed(2)} nm from the metal, below the ${(limit_m * 1e9).toFixed(1)} nm continuum limit`,
  };
}
