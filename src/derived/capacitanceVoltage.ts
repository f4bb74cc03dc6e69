// The barrier a capacitance–voltage measurement reports for a planar contact: the Mott–Schottky analysis applied to
// the model's own C(V). An experimenter records C at reverse biases V_R, fits 1/C^2 = (2 / (q eps N)) (V_bi + V_R -
// kT/q) by a straight line, reads V_bi - kT/q from where it meets 1/C^2 = 0, and reports
// Phi_B = V_bi + (E_C - E_F)_bulk (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., sec. 3.4.2, eq. for the
// barrier from the C-V intercept; from memory, verify the section). For shallow donors, a constant permittivity and
// a bias-independent barrier this returns the contact's own barrier (test: the exact first integral). It differs
// where the model has more than that: interface states in equilibrium with the metal (the barrier moves with bias,
// Cowley & Sze 1965), donors or polaron sites that are only partly ionised in the depletion layer, or a
// field-dependent permittivity (SrTiO3), all of which bend the 1/C^2 line.

import { requireInRange } from '../errors.js';
import { fitStraightLine } from './mottSchottky.js';

/**
 * Reverse-bias range of the simulated measurement, V: 0 to 1 V in 0.1 V steps (common practice, no source: C-V of
 * Schottky diodes is usually recorded over the first volt or two of reverse bias, below breakdown).
 */
export const CV_MAX_REVERSE_BIAS_V = 1;
export const CV_BIAS_STEP_V = 0.1;

/**
 * Least linearity (R^2 of 1/C^2 against bias) for which an intercept is read: below it the plot is visibly curved
 * and a Mott–Schottky analysis would not be reported (common practice, no source).
 */
export const CV_MIN_R_SQUARED = 0.99;

export interface CapacitanceBarrier {
  /** the barrier the Mott–Schottky analysis reports, eV */
  barrier_eV: number;
  /** V_bi - kT/q read from the intercept, V */
  interceptBuiltIn_V: number;
  /** linearity of 1/C^2 against bias over the range (1 = a straight line) */
  rSquared: number;
  /** reverse bias range, V */
  reverseBias_V: [number, number];
}

/**
 * Mott–Schottky barrier of a planar contact. `depletionCharge(V_R)` is the charge per area on the support side
 * (C/m^2, positive in depletion of an n-type support: minus the metal's charge) at reverse bias V_R (V) with the
 * metal's Fermi level fixed; `fermiLevelBelowConduction_eV` the bulk E_C - E_F, `kT_eV` the thermal energy.
 * C is taken as the difference quotient over each 0.1 V step (second-order at the step's middle). Returns null
 * when the contact is not in depletion over the range (C not positive, or 1/C^2 not rising with reverse bias) or the
 * plot is curved (R^2 below CV_MIN_R_SQUARED), or when the barrier read lies outside (0, bandGap_eV] (a nearly flat
 * line extrapolated far away): a Mott–Schottky analysis does not apply there.
 */
export function capacitanceBarrier(
  depletionCharge: (reverseBias_V: number) => number,
  fermiLevelBelowConduction_eV: number,
  kT_eV: number,
  bandGap_eV: number = Infinity,
): CapacitanceBarrier | null {
  requireInRange('kT_eV', kT_eV, 1e-5, 1, 'eV');
  const steps = Math.round(CV_MAX_REVERSE_BIAS_V / CV_BIAS_STEP_V);
  const charge: number[] = [];
  for (let i = 0; i <= steps; i++) charge.push(depletionCharge(i * CV_BIAS_STEP_V));
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < steps; i++) {
    const c = (charge[i + 1]! - charge[i]!) / CV_BIAS_STEP_V;
    if (!(c > 0) || !Number.isFinite(c)) return null;
    x.push((i + 0.5) * CV_BIAS_STEP_V);
    y.push(1 / (c * c));
  }
  const fit = fitStraightLine(x, y);
  if (!(fit.slope > 0) || !(fit.rSquared >= CV_MIN_R_SQUARED)) return null;
  // 1/C^2 = 0 at V_R = -a/b = kT - V_bi
  const interceptBuiltIn_V = fit.intercept / fit.slope;
  const barrier_eV = interceptBuiltIn_V + kT_eV + fermiLevelBelowConduction_eV;
  // a nearly flat 1/C^2 line (the charge set by an interfacial layer, not a depletion layer) extrapolates to a
  // built-in potential no contact has: outside (0, E_g] the analysis is not reported
  if (!Number.isFinite(barrier_eV) || barrier_eV <= 0 || barrier_eV > bandGap_eV) return null;
  return {
    barrier_eV,
    interceptBuiltIn_V,
    rSquared: fit.rSquared,
    reverseBias_V: [0, CV_MAX_REVERSE_BIAS_V],
  };
}
