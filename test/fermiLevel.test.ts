// A measured support work function fixes the bulk Fermi level (src/derived/fermiLevel.ts, --support-work-function).
import { describe, expect, it } from 'vitest';
import { donorsForFermiLevel } from '../src/derived/fermiLevel.js';
import { solveContact } from '../src/contact.js';
import { InputError } from '../src/errors.js';
import { CODATA2018, tungstenOnSilicon } from './helpers.js';

// Non-degenerate electrons, fully ionised donors, negligible holes: n = N_C exp(-(E_C - E_F)/kT) = N_D, with
// N_C = 2 (2 pi m* kT / h^2)^(3/2) (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., eqs. 1.20-1.21),
// written here with CODATA 2018 constants independently of the project's bulk code.
function boltzmannDonors(mass_me: number, temperature_K: number, ecMinusEf_eV: number): number {
  const kT_J = CODATA2018.k * temperature_K;
  const nc = 2 * ((2 * Math.PI * mass_me * CODATA2018.me * kT_J) / CODATA2018.h ** 2) ** 1.5;
  return nc * Math.exp(-(ecMinusEf_eV * CODATA2018.q) / kT_J);
}

const support = {
  temperature_K: 300,
  bandGap_eV: 3.2,
  electronMass_me: 0.3,
  holeMass_me: 1,
  donors: { density_m3: 0, kind: 'single' as const },
  acceptors: { density_m3: 0 },
  statistics: 'boltzmann' as const,
};

describe('donors for a given Fermi level (closed form of Sze & Ng, 3rd ed., eqs. 1.20-1.21)', () => {
  for (const target of [0.1, 0.2, 0.35]) {
    it(`E_C - E_F = ${target} eV`, () => {
      const found = donorsForFermiLevel(support, target);
      expect(found / boltzmannDonors(0.3, 300, target)).toBeCloseTo(1, 6);
    });
  }
  it('refuses a Fermi level below what the support reaches without donors', () => {
    expect(() => donorsForFermiLevel(support, 2.5)).toThrow(InputError);
  });
});

describe('--support-work-function in a contact', () => {
  it('the result reports the support work function it was given (Phi_s = chi + E_C - E_F)', () => {
    const r = solveContact(tungstenOnSilicon({ donors: undefined, supportWorkFunction: '4.25 eV' }));
    expect(r.supportWorkFunction_eV).toBeCloseTo(4.25, 9);
    expect(r.fermiLevelBelowConduction_eV).toBeCloseTo(4.25 - 4.01, 9);
    // Neamen's 1e16 cm^-3 gives E_C - E_F = 0.206 eV (from memory of Neamen, 4th ed., Ex. 9.2, verify): 0.24 eV needs fewer donors
    expect(r.donorDensity_cm3).toBeLessThan(1e16);
    expect(r.inputs.find((i) => i.field === 'support work function')?.origin).toBe('user');
  });
  it('is refused together with a donor density (both set the bulk Fermi level)', () => {
    expect(() => solveContact(tungstenOnSilicon({ supportWorkFunction: 4.25 }))).toThrow(/--donors: only used without --support-work-function/);
  });
});

describe('the measured support work function is honoured where the support has localised states', () => {
  // Vacuum-level alignment E_C - E_F = Phi_s - chi (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., sec. 3.2).
  // Anatase has library small-polaron sites (Ti 3d) that take up donor electrons: the inversion must use the same
  // charge model as the solve, or the result reports another Fermi level (before: 5.0 eV given, 5.97 eV reported).
  for (const workFunction_eV of [5.0, 4.6]) {
    it(`TiO2-anatase, Phi_s = ${workFunction_eV} eV: the result's support work function is the given one`, () => {
      const r = solveContact({ metal: 'Pt', support: 'TiO2-anatase', supportWorkFunction: `${workFunction_eV} eV`, temperature: '300 K' });
      expect(Math.abs(r.supportWorkFunction_eV - workFunction_eV)).toBeLessThan(1e-6);
    });
  }
});
