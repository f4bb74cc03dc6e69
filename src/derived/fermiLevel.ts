// A measured support work function fixes the bulk Fermi level: E_C - E_F = Phi_s - chi (vacuum-level alignment,
// Sze & Ng, Physics of Semiconductor Devices, 3rd ed., sec. 3.2). The donor density that puts E_F there follows from
// charge neutrality, n + N_A^- = p + N_D^+, solved here for N_D by bisection in log N_D (E_C - E_F falls monotonically
// as donors are added).
import { InputError } from '../errors.js';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../bulk/equilibrium.js';

/** Largest donor density searched, m^-3 (1e23 cm^-3: beyond any oxide's cation density). */
const MAX_DONORS_M3 = 1e29;

function fermiLevelBelowConduction_eV(support: SupportElectronic, donors_m3: number): number {
  return solveBulkNeutrality(makeChargeModel({ ...support, donors: { ...support.donors, density_m3: donors_m3 } })).fermiLevelBelowConduction_eV;
}

/** Donor density (m^-3) at which the bulk E_C - E_F equals the target; the support's own donor density is ignored. */
export function donorsForFermiLevel(support: SupportElectronic, target_eV: number, field = '--support-work-function'): number {
  const withoutDonors = fermiLevelBelowConduction_eV(support, 0);
  if (target_eV > withoutDonors) {
    throw new InputError(field, `puts E_F ${(target_eV - withoutDonors).toFixed(3)} eV below where the support sits without donors`, 'a larger work function needs acceptors: give --acceptors');
  }
  if (target_eV < fermiLevelBelowConduction_eV(support, MAX_DONORS_M3)) {
    throw new InputError(field, `needs more than ${MAX_DONORS_M3 * 1e-6} donors per cm^3`, 'a work function closer to the electron affinity plus a few kT');
  }
  let low = 0; // log10 N_D, m^-3
  let high = Math.log10(MAX_DONORS_M3);
  // 60 halvings of 29 decades: relative precision 1e-17 in N_D, below double rounding
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (low + high);
    if (fermiLevelBelowConduction_eV(support, 10 ** mid) > target_eV) low = mid;
    else high = mid;
  }
  return 10 ** (0.5 * (low + high));
}
