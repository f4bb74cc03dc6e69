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

/**
 * Field-dependent dielectric of a paraelectric support, used in the Poisson solve (issue 11: SrTiO3-like supports):
 *   D = eps0 eps_b E + P,   E = alpha P + beta P^3,   alpha = 1 / (eps0 (eps_r(0) - eps_b))
 * (Landau–Ginzburg–Devonshire, Devonshire, Phil. Mag. 40, 1040 (1949); a quartic free energy alpha P^2/2 + beta P^4/4,
 * i.e. beta = 4 alpha_11 in the phase-field convention G = alpha_1 P^2 + alpha_11 P^4). eps_b is the background
 * (electronic) permittivity the soft mode sits on; eps_r(0) the static permittivity the rest of the tool uses, which
 * the law returns at zero field; beta = 0 is the linear dielectric D = eps0 eps_r(0) E exactly.
 * Fields in V/m, D in C/m^2, energies in J/m^3. Every function is odd in E (or even, for the energy) and finite.
 */
export interface DielectricLaw {
  /** static (zero-field) relative permittivity, 1..1e5 */
  staticPermittivity: number;
  /** background relative permittivity eps_b, 1 <= eps_b < eps_r(0) when beta > 0 */
  backgroundPermittivity: number;
  /** quartic Landau coefficient beta, V m^5 C^-3 (0: linear) */
  nonlinearity_V_m5_per_C3: number;
}

/** A linear dielectric (beta = 0). */
export function linearDielectric(staticPermittivity: number): DielectricLaw {
  return { staticPermittivity, backgroundPermittivity: staticPermittivity, nonlinearity_V_m5_per_C3: 0 };
}

/** Checked law: names the field and its range on bad input (beta 0..1e13 V m^5 C^-3, eps_b below eps_r(0)). */
export function dielectricLaw(staticPermittivity: number, backgroundPermittivity: number, nonlinearity_V_m5_per_C3: number): DielectricLaw {
  requireInRange('staticPermittivity', staticPermittivity, 1, 1e5, '');
  requireInRange('permittivityNonlinearity', nonlinearity_V_m5_per_C3, 0, 1e13, 'V m^5 C^-3');
  if (nonlinearity_V_m5_per_C3 === 0) return linearDielectric(staticPermittivity);
  // the background must leave a soft-mode part: clamp it below the static value (an optical permittivity above the
  // static one is refused elsewhere; equal ones leave no lattice part, i.e. a linear dielectric)
  const background = requireInRange('backgroundPermittivity', backgroundPermittivity, 1, 1e5, '');
  if (!(background < staticPermittivity)) return linearDielectric(staticPermittivity);
  return { staticPermittivity, backgroundPermittivity: background, nonlinearity_V_m5_per_C3 };
}

export function isLinear(law: DielectricLaw): boolean {
  return law.nonlinearity_V_m5_per_C3 === 0 || !(law.backgroundPermittivity < law.staticPermittivity);
}

function softModeAlpha(law: DielectricLaw): number {
  return 1 / (EPS0_F_PER_M * (law.staticPermittivity - law.backgroundPermittivity));
}

/** D(E), C/m^2 (odd in E). */
export function displacementOfField(law: DielectricLaw, field_V_per_m: number): number {
  if (isLinear(law)) return EPS0_F_PER_M * law.staticPermittivity * field_V_per_m;
  const p = devonshirePolarisation(field_V_per_m, softModeAlpha(law), law.nonlinearity_V_m5_per_C3);
  return EPS0_F_PER_M * law.backgroundPermittivity * field_V_per_m + p;
}

/** Differential relative permittivity (1/eps0) dD/dE at field E: eps_b + 1 / (eps0 (alpha + 3 beta P^2)). */
export function differentialPermittivity(law: DielectricLaw, field_V_per_m: number): number {
  if (isLinear(law)) return law.staticPermittivity;
  const alpha = softModeAlpha(law);
  const beta = law.nonlinearity_V_m5_per_C3;
  const p = devonshirePolarisation(field_V_per_m, alpha, beta);
  return law.backgroundPermittivity + 1 / (EPS0_F_PER_M * (alpha + 3 * beta * p * p));
}

/**
 * Field energy density W(E) = int_0^D E dD' (J/m^3), the left side of the planar first integral W(E_s) =
 * int rho dpsi: W = eps0 eps_b E^2 / 2 + alpha P^2 / 2 + beta P^4 / 4 (integrating E dP = (alpha P + beta P^3) dP
 * and the background part; exact, no quadrature).
 */
export function fieldEnergyDensity(law: DielectricLaw, field_V_per_m: number): number {
  const e = field_V_per_m;
  if (isLinear(law)) return 0.5 * EPS0_F_PER_M * law.staticPermittivity * e * e;
  const alpha = softModeAlpha(law);
  const beta = law.nonlinearity_V_m5_per_C3;
  const p = devonshirePolarisation(e, alpha, beta);
  // W = int E dD = int E (eps0 eps_b dE + dP) = eps0 eps_b E^2/2 + int_0^P (alpha P' + beta P'^3) dP'
  return 0.5 * EPS0_F_PER_M * law.backgroundPermittivity * e * e + 0.5 * alpha * p * p + 0.25 * beta * p * p * p * p;
}

/**
 * The root E in [lo, hi] of an increasing g(E) = target, given g's slope: Newton safeguarded by bisection (a step
 * that leaves the shrinking bracket is replaced by its midpoint), to 1e-14 relative. Shared by the two inverses below.
 */
function increasingRoot(g: (e: number) => number, slope: (e: number) => number, target: number, lo: number, hi: number): number {
  let e = lo;
  for (let k = 0; k < 200; k++) {
    const f = g(e) - target;
    if (f > 0) hi = e;
    else lo = e;
    const s = slope(e);
    let next = s > 0 ? e - f / s : 0.5 * (lo + hi);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - e) <= 1e-14 * next || hi - lo <= 1e-14 * hi) return next;
    e = next;
  }
  return e;
}

/**
 * Inverse of fieldEnergyDensity: the field E >= 0 with W(E) = energy (J/m^3, >= 0). W is increasing and convex in
 * E with eps0 eps_b E^2/2 <= W <= eps0 eps_r(0) E^2/2, which brackets the root; Newton (dW/dE = E dD/dE) safeguarded
 * by bisection, to 1e-14 relative. Linear law: sqrt(2 W / (eps0 eps_r(0))).
 */
export function fieldOfEnergyDensity(law: DielectricLaw, energy_J_per_m3: number): number {
  const w = Math.max(0, energy_J_per_m3);
  if (w === 0) return 0;
  const low = Math.sqrt((2 * w) / (EPS0_F_PER_M * law.staticPermittivity));
  if (isLinear(law)) return low;
  const high = Math.sqrt((2 * w) / (EPS0_F_PER_M * law.backgroundPermittivity));
  return increasingRoot((e) => fieldEnergyDensity(law, e), (e) => e * EPS0_F_PER_M * differentialPermittivity(law, e), w, low, high);
}

/**
 * Inverse of displacementOfField: E with D(E) = displacement (odd). D is increasing in E with slope between eps0 eps_b
 * and eps0 eps_r(0), which brackets E; Newton safeguarded by bisection, to 1e-14 relative.
 */
export function fieldOfDisplacement(law: DielectricLaw, displacement_C_per_m2: number): number {
  const d = Math.abs(displacement_C_per_m2);
  const sign = displacement_C_per_m2 < 0 ? -1 : 1;
  if (d === 0) return 0;
  if (isLinear(law)) return (sign * d) / (EPS0_F_PER_M * law.staticPermittivity);
  const low = d / (EPS0_F_PER_M * law.staticPermittivity);
  const high = d / (EPS0_F_PER_M * law.backgroundPermittivity);
  return sign * increasingRoot((e) => displacementOfField(law, e), (e) => EPS0_F_PER_M * differentialPermittivity(law, e), d, low, high);
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
