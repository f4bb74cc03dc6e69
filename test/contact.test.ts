import { describe, expect, it } from 'vitest';
import { solveContact, type ContactOptions } from '../src/contact.js';
import { InputError } from '../src/errors.js';
import { CODATA2018, emptyLibrary, tungstenOnSilicon } from './helpers.js';

const EMPTY = emptyLibrary();

// Tungsten on n-type silicon, N_d = 1e16 cm^-3, 300 K: Phi_m = 4.55 V, chi = 4.01 V, eps = 11.7, N_c = 2.8e19 cm^-3.
// Worked example from memory of D. A. Neamen, Semiconductor Physics and Devices, 4th ed., Examples 9.1-9.2, verify:
// Phi_B0 = 0.54 V, phi_n = 0.206 V, V_bi = 0.334 V, x_n = 0.208 um, E_max = 3.2e4 V/cm (depletion approximation).
// (electron mass 1.08 gives N_C = 2.8e19 cm^-3 at 300 K; the builder is in test/helpers.ts)
const TUNGSTEN_ON_SILICON: ContactOptions = tungstenOnSilicon({ materials: EMPTY });

describe('textbook Schottky contact (from memory of Neamen, 4th ed., Ex. 9.1-9.2; verify)', () => {
  const r = solveContact(TUNGSTEN_ON_SILICON);
  it('barrier height 0.54 eV (Schottky-Mott)', () => {
    expect(r.barrierHeight_eV).toBeCloseTo(0.54, 10);
    expect(r.barrierCarrier).toBe('electron');
  });
  it('E_C - E_F = 0.206 eV and built-in potential 0.334 V', () => {
    expect(r.fermiLevelBelowConduction_eV).toBeCloseTo(0.206, 2);
    expect(r.bandBending_eV).toBeCloseTo(0.334, 2);
  });
  it('depletion width 0.208 um (textbook form without the kT/q term)', () => {
    const eps = 11.7 * CODATA2018.eps0;
    const w = Math.sqrt((2 * eps * r.bandBending_eV) / (CODATA2018.q * 1e22));
    expect(w * 1e6).toBeCloseTo(0.208, 2);
    // ours includes the -kT/q correction (Sze & Ng eq. 3.9): a little narrower
    expect(r.depletionWidthApprox_nm!).toBeLessThan(w * 1e9);
    expect(r.depletionWidthApprox_nm!).toBeGreaterThan(0.9 * w * 1e9);
  });
  it('maximum field about 3.2e4 V/cm (the full solution is ~4% lower because of the kT/q tail)', () => {
    const field_V_per_cm = Math.abs(r.interfaceField_V_per_m) / 100;
    expect(field_V_per_cm / 3.2e4).toBeGreaterThan(0.93);
    expect(field_V_per_cm / 3.2e4).toBeLessThan(1.0);
  });
  it('electrons flow from the semiconductor to the metal; the support is positive', () => {
    expect(r.direction).toBe('support-to-metal');
    expect(r.spaceCharge_C_per_m2).toBeGreaterThan(0);
    expect(r.electronsPerParticle).toBeGreaterThan(0);
    expect(r.interfaceField_V_per_m).toBeLessThan(0);
  });
});

describe('contract of the result object (issue 2)', () => {
  const r = solveContact({ ...TUNGSTEN_ON_SILICON, geometry: 'hemisphere', particleDiameter: '3 nm' });
  it('has every contract field with the right type', () => {
    for (const key of [
      'barrierHeight_eV',
      'bandBending_eV',
      'fermiLevelBelowConduction_eV',
      'supportWorkFunction_eV',
      'spaceCharge_C_per_m2',
      'chargeEquivalentWidth_nm',
      'interfaceField_V_per_m',
      'imageForceLowering_eV',
      'electronsPerParticle',
    ] as const) {
      expect(typeof r[key], key).toBe('number');
      expect(Number.isFinite(r[key] as number), key).toBe(true);
    }
    expect(['support-to-metal', 'metal-to-support', 'none']).toContain(r.direction);
    for (const key of ['x_nm', 'conductionBand_eV', 'valenceBand_eV', 'electronDensity_cm3', 'holeDensity_cm3', 'chargeDensity_C_per_m3'] as const) {
      expect(r.profile[key].length).toBe(r.solver.meshPoints);
    }
    expect(r.solver.converged).toBe(true);
    expect(Array.isArray(r.warnings)).toBe(true);
    expect(r.profile.x_nm[0]).toBe(0);
    // energies relative to E_F: interface E_C - E_F equals the barrier for an n-type support
    expect(r.profile.conductionBand_eV[0]).toBeCloseTo(r.barrierHeight_eV, 9);
    expect(r.supportWorkFunction_eV).toBeCloseTo(4.01 + r.fermiLevelBelowConduction_eV, 12);
  });
  it('serialises to JSON without NaN or Infinity', () => {
    const text = JSON.stringify(r);
    expect(text).not.toMatch(/NaN|Infinity/);
  });
  it('image-force lowering follows sqrt(q E / 4 pi eps eps0) with the optical permittivity (Sze & Ng ch. 3)', () => {
    const expected = Math.sqrt((CODATA2018.q * Math.abs(r.interfaceField_V_per_m)) / (4 * Math.PI * 11.7 * CODATA2018.eps0));
    expect(r.imageForceLowering_eV).toBeCloseTo(expected, 12);
  });
});

describe('barrier models', () => {
  const base: ContactOptions = { ...TUNGSTEN_ON_SILICON, workFunction: 5.0 };
  it('pinned: Phi_B = S (Phi_m - Phi_CNL) + (Phi_CNL - chi)', () => {
    const r = solveContact({ ...base, barrierModel: 'pinned', pinningFactor: 0.3, neutralLevel: 4.6 });
    expect(r.barrierHeight_eV).toBeCloseTo(0.3 * (5.0 - 4.6) + (4.6 - 4.01), 12);
  });
  it('pinned without S uses S = 1/(1 + 0.1 (eps_inf - 1)^2) (Mönch; from memory, verify)', () => {
    const r = solveContact({ ...base, opticalPermittivity: 4, barrierModel: 'pinned', neutralLevel: 4.6 });
    expect(r.pinningFactor).toBeCloseTo(1 / (1 + 0.1 * 9), 12);
  });
  it('given: the measured barrier is used as is', () => {
    const r = solveContact({ ...base, barrierModel: 'given', barrier: '0.71 eV' });
    expect(r.barrierHeight_eV).toBeCloseTo(0.71, 12);
  });
  it('metal with a smaller work function than the support: accumulation, electrons flow to the support', () => {
    const r = solveContact({ ...TUNGSTEN_ON_SILICON, workFunction: 4.0 });
    expect(r.direction).toBe('metal-to-support');
    expect(r.bandBending_eV).toBeLessThan(0);
    expect(r.electronsPerParticle).toBeLessThan(0);
    expect(r.depletionWidthApprox_nm).toBeNull();
  });
});

describe('fact of the trade (common practice, no source)', () => {
  it('a reduced oxide with 1e17-1e19 donors and 0.5-1 eV bending has a 1-100 nm space-charge layer', () => {
    for (const donors of ['1e17', '1e18', '1e19']) {
      for (const workFunction of [4.8, 5.3]) {
        const r = solveContact({
          workFunction,
          electronAffinity: 4.2,
          bandGap: 3.2,
          permittivity: 8.5, // ZnO-like; a more polarisable support (eps ~ 30) reaches ~120 nm at 1e17
          electronMass: 1,
          holeMass: 2,
          donors,
          materials: EMPTY,
        });
        expect(r.bandBending_eV).toBeGreaterThan(0.45);
        expect(r.bandBending_eV).toBeLessThan(1.15);
        expect(r.chargeEquivalentWidth_nm!).toBeGreaterThan(1);
        expect(r.chargeEquivalentWidth_nm!).toBeLessThan(100);
      }
    }
  });
});

describe('bad input gives a typed error naming the field', () => {
  const cases: [ContactOptions, RegExp][] = [
    [{ ...TUNGSTEN_ON_SILICON, temperature: '20 K' }, /--temperature/],
    [{ ...TUNGSTEN_ON_SILICON, workFunction: '5 nm' }, /work function|--work-function/],
    [{ ...TUNGSTEN_ON_SILICON, donors: -5 }, /--donors/],
    [{ ...TUNGSTEN_ON_SILICON, donors: 'NaN' }, /donor/],
    [{ ...TUNGSTEN_ON_SILICON, bandGap: 'Infinity' }, /band gap|--band-gap/],
    [{ ...TUNGSTEN_ON_SILICON, particleDiameter: '0.01 nm' }, /--particle-diameter/],
    [{ ...TUNGSTEN_ON_SILICON, barrierModel: 'pinned' }, /--neutral-level/],
    [{ ...TUNGSTEN_ON_SILICON, geometry: 'array' }, /--particle-density/],
    [{ ...TUNGSTEN_ON_SILICON, electronAffinity: undefined }, /--electron-affinity/],
  ];
  for (const [options, pattern] of cases) {
    it(`rejects ${pattern.source}`, () => {
      expect(() => solveContact(options)).toThrow(InputError);
      expect(() => solveContact(options)).toThrow(pattern);
    });
  }
});
