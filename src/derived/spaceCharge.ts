// Quantities derived from one Poisson solution: SI in, SI out (display units are made in contactResult.ts only).
import { Q_ELEMENTARY_C } from '../constants.js';
import type { CrossSection } from '../electrostatics/geometry.js';
import type { PoissonSolution } from '../electrostatics/poisson.js';
import type { FlowDirection } from '../types.js';

/** Charge on the support side per interface area, C/m^2 (planar: the solution is per m^2 already). */
export function spaceChargeDensity_C_per_m2(totalCharge_C: number, geometry: CrossSection): number {
  return totalCharge_C / geometry.interfaceArea_m2;
}

/** Interface field E = -dpsi/dx = (kT/q) du/dx, V/m, positive pointing into the support (kT in eV = volts per unit u). */
export function interfaceField_V_per_m(kT_eV: number, interfaceSlope_per_m: number): number {
  return kT_eV * interfaceSlope_per_m;
}

/** Electrons gained by one metal particle: the support charge of its share of the interface, divided by q. */
export function electronsPerParticle(totalCharge_C: number, geometry: CrossSection): number {
  const share = (geometry.particleFootprint_m2 ?? geometry.interfaceArea_m2) / geometry.interfaceArea_m2;
  return (totalCharge_C * share) / Q_ELEMENTARY_C;
}

/**
 * @deprecated the contact pipeline uses derived/widths.ts (density |Z N_D - N_A| with every dopant ionised, issue 10
 * item 1); this form with the bulk ionised density overstates the width for deep donors.
 * Charge-equivalent width: the depth of a layer of fully ionised majority dopants holding the space charge,
 * W_Q = depth holding the volume |Q| / (q N), m; null without majority dopants.
 */
export function chargeEquivalentWidth_m(totalCharge_C: number, majorityDopantCharge_m3: number, geometry: CrossSection): number | null {
  if (!(majorityDopantCharge_m3 > 0)) return null;
  return geometry.depthHoldingVolume(Math.abs(totalCharge_C) / (Q_ELEMENTARY_C * majorityDopantCharge_m3));
}

/**
 * @deprecated the contact pipeline uses derived/widths.ts depletionWidthApprox_m (fully ionised density).
 * Depletion approximation W = sqrt(2 eps (V_bi - kT/q) / (q N)) (Sze & Ng, Physics of Semiconductor Devices, 3rd ed.,
 * eq. 3.9), m; null unless the majority carriers are depleted by more than kT.
 */
export function depletionWidthApprox_m(
  permittivity_F_per_m: number,
  bandBending_eV: number,
  kT_eV: number,
  majorityDopantCharge_m3: number,
  nType: boolean,
): number | null {
  const depleted = nType ? bandBending_eV > kT_eV : bandBending_eV < -kT_eV;
  if (!depleted || !(majorityDopantCharge_m3 > 0)) return null;
  return Math.sqrt((2 * permittivity_F_per_m * (Math.abs(bandBending_eV) - kT_eV)) / (Q_ELEMENTARY_C * majorityDopantCharge_m3));
}

/** Which way electrons flowed: positive support charge means electrons went to the metal. */
export function flowDirection(bandBending_eV: number, totalCharge_C: number): FlowDirection {
  if (Math.abs(bandBending_eV) < 1e-6 || totalCharge_C === 0) return 'none';
  return totalCharge_C > 0 ? 'support-to-metal' : 'metal-to-support';
}

/** Direction from the charge the metal's partners hold (space charge plus interface states), C: electrons follow it. */
export function flowDirectionOfCharge(supportSideCharge_C: number): FlowDirection {
  if (supportSideCharge_C === 0) return 'none';
  return supportSideCharge_C > 0 ? 'support-to-metal' : 'metal-to-support';
}

/** Depth from the interface that holds the given fraction of the space charge, m (trapezoidal cumulative charge). */
export function chargeDepth_m(solution: PoissonSolution, geometry: CrossSection, fraction: number): number {
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
