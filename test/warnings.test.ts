// Each warning rule on its own (src/derived/warnings.ts): it fires on its condition and stays quiet on a quiet contact.
import { describe, expect, it } from 'vitest';
import { WARNING_RULES, evaluateWarnings, fullyDepleted } from '../src/derived/warnings.js';
import type { WarningFacts } from '../src/derived/warnings.js';
import { warningFacts } from './helpers.js';

const codes = (overrides: Partial<WarningFacts>): string[] => evaluateWarnings(warningFacts(overrides)).map((w) => w.code);

describe('warning rules', () => {
  it('a quiet contact raises none', () => {
    expect(evaluateWarnings(warningFacts())).toEqual([]);
  });
  it('every rule has a code and a message that names no NaN', () => {
    for (const rule of WARNING_RULES) {
      expect(rule.code).toMatch(/^[a-z-]+$/);
      expect(rule.message(warningFacts())).not.toMatch(/NaN|undefined/);
    }
  });
  // thresholds are the project's stated ones; the physics behind each is named beside it
  const cases: [string, Partial<WarningFacts>][] = [
    // continuum dielectric below ~1 nm: common practice, no source
    ['continuum-doubtful', { particleDiameter_m: 0.8e-9 }],
    ['continuum-doubtful', { depth90_m: 0.6e-9 }],
    // non-degenerate when E_C - E_F > 3 kT (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., sec. 1.4.1)
    ['degenerate-bulk', { bulkReducedFermiLevel: -2 }],
    // a layer under 0.5 nm is also under the 1 nm continuum limit: both fire (see below)
    ['thin-accumulation', { bandBending_eV: -0.3, depth90_m: 0.3e-9 }],
    // inversion: minority carriers exceed majority carriers at the surface (Sze & Ng, 3rd ed., sec. 4.3.1)
    ['inversion', { interfaceHoles_m3: 1e21, interfaceElectrons_m3: 1e10 }],
    ['fermi-level-outside-gap', { electronBarrier_eV: -0.1 }],
    ['fully-depleted', { supportThickness_m: 5e-9, endMajority_m3: 1e20 }],
    ['layer-truncated', { layerTruncated: true }],
    ['undoped-support', { donors_m3: 0 }],
    ['insulating-support', { bulkElectrons_m3: 1e10 }],
    ['sub-electron-transfer', { electronsPerParticle: 0.3 }],
    // Coulomb blockade once e^2/2C exceeds kT (common practice, no source)
    ['charge-quantised', { chargingEnergyOverKT: 2, chargingEnergy_eV: 0.05 }],
    ['zones-overlap', { zonesOverlap: true, meanSpacing_m: 8e-9 }],
    ['slow-exchange', { exchangeSlow: true, equilibrationTimeLog10_s: 5 }],
    // the solver's own stated bound (src/electrostatics/poisson.ts, checked against the exact planar first integral
    // in test/errorControl.test.ts): the warning fires exactly when the bound missed the tolerance
    ['mesh-accuracy', { meetsTolerance: false, chargeErrorBound: 3e-4 }],
    // Debye length undefined when nothing screens (issue 10 item 5: Infinity before for undoped insulators < 75 K)
    ['debye-undefined', { debyeLength_m: null }],
    // ~0.1 e per Pt atom by photoemission electron counting, from memory of Lykhach et al., Nat. Mater. 15, 284
    // (2016), verify: 0.5 per surface atom is 5x that
    ['implausible-charge', { electronsPerParticle: 75, atoms: 300, surfaceAtoms: 150 }],
    // issue 10 item 6: 179 electrons on a 139-atom Pt particle (about 2 per surface atom) is unphysical
    ['unphysical-charge', { electronsPerParticle: 179, atoms: 139, surfaceAtoms: 90 }],
    // image-force maximum x_m = sqrt(q / (16 pi eps_opt eps0 E)) (Sze & Ng, 3rd ed., ch. 3) at 0.3 nm: continuum doubtful
    ['image-force-continuum', { imageForceValid: false, imageForceMaximum_m: 0.3e-9 }],
    // Cowley & Sze (J. Appl. Phys. 36, 3212 (1965)) neglect the space-charge term of the layer drop; 0.02 C/m^2 across
    // 0.5 nm of eps_i 1 is 1.13 V (Q delta / eps0): the layer, not the states, sets the barrier (threshold 0.3 V:
    // common practice, no source)
    ['space-charge-sets-barrier', { interfaceLayer: { spaceCharge_C_per_m2: 0.02, layerThickness_m: 0.5e-9, layerPermittivity: 1 } }],
    // SrTiO3 permittivity falls with field (Devonshire, Phil. Mag. 40, 1040 (1949), from memory, verify)
    ['field-dependent-permittivity', { staticPermittivity: 300, interfaceField_V_per_m: 1e9, fieldPermittivity: 40 }],
    // F centres in MgO absorb near 5 eV (Kappers, Kroes & Hensley, Phys. Rev. B 1, 4151 (1970), from memory, verify):
    // donors in a 7.8 eV-gap oxide are eV deep, not shallow and fully ionised
    ['shallow-donors-in-insulator', { bandGap_eV: 7.8, donors_m3: 1e24, donorLevel_eV: null }],
    // Boltzmann valid only 3 kT or more from a band edge (Sze & Ng, 3rd ed., sec. 1.4.1): degenerate at the interface
    ['boltzmann-invalid', { statistics: 'boltzmann', interfaceReducedFermiLevel: 2, bandBending_eV: -0.3, depth90_m: 2e-9 }],
    ['estimated-input', { estimatedInputs: ['electron affinity'] }],
    ['unverified-input', { unverifiedInputs: ['band gap'] }],
  ];
  for (const [code, overrides] of cases) {
    it(`${code} fires on its condition alone`, () => {
      const expected = code === 'thin-accumulation' ? ['continuum-doubtful', code] : [code];
      expect(codes(overrides)).toEqual(expected);
    });
  }
  it('every rule code is exercised above', () => {
    expect(new Set(cases.map(([c]) => c))).toEqual(new Set(WARNING_RULES.map((r) => r.code)));
  });
  it('a p-type support is degenerate near the valence band, not the conduction band', () => {
    // xi = (E_F - E_C)/kT; E_F 0.05 eV above E_V in a 3.2 eV gap
    const kT = 0.025852;
    const facts = { nType: false, bulkReducedFermiLevel: -(3.2 - 0.05) / kT, bulkHoles_m3: 1e25, bulkElectrons_m3: 1, interfaceHoles_m3: 1e25, interfaceElectrons_m3: 1, bandBending_eV: -0.5 };
    expect(codes(facts)).toEqual(['degenerate-bulk']);
  });
  it('fully depleted only for a finite grain whose far end lost the majority carriers', () => {
    expect(fullyDepleted(warningFacts({ supportThickness_m: 5e-9, endMajority_m3: 0.9e23 }))).toBe(false);
    expect(fullyDepleted(warningFacts({ supportThickness_m: 5e-9, endMajority_m3: 0.1e23 }))).toBe(true);
    expect(fullyDepleted(warningFacts({ supportThickness_m: 5e-9, endMajority_m3: 0.1e23, bandBending_eV: -0.2 }))).toBe(false);
    // issue 10 item 1: a 26 nm layer in a 200 nm grain with a weak Debye tail to the far end is not fully depleted
    expect(fullyDepleted(warningFacts({ supportThickness_m: 200e-9, endMajority_m3: 0.1e23, depth90_m: 26e-9 }))).toBe(false);
  });
  it('boltzmann-invalid stays quiet under Fermi-Dirac statistics and for a non-degenerate Boltzmann contact', () => {
    expect(codes({ statistics: 'fermi-dirac', interfaceReducedFermiLevel: 2, bandBending_eV: -0.3, depth90_m: 2e-9 })).toEqual([]);
    expect(codes({ statistics: 'boltzmann' })).toEqual([]);
  });
  it('plausibility thresholds: 0.3 per surface atom is quiet, 1.0 implausible, above 1 unphysical only', () => {
    expect(codes({ electronsPerParticle: 45, surfaceAtoms: 150 })).toEqual([]);
    expect(codes({ electronsPerParticle: 150, surfaceAtoms: 150 })).toEqual(['implausible-charge']);
    expect(codes({ electronsPerParticle: -151, surfaceAtoms: 150 })).toEqual(['unphysical-charge']);
  });
  it('deep donors in a wide-gap oxide, or shallow ones in a 3.2 eV-gap oxide, raise no shallow-donor warning', () => {
    expect(codes({ bandGap_eV: 7.8, donorLevel_eV: 2 })).toEqual([]);
    expect(codes({ bandGap_eV: 3.2, donorLevel_eV: null })).toEqual([]);
  });
  it('the permittivity warning needs both a high permittivity and a high field', () => {
    expect(codes({ staticPermittivity: 300, interfaceField_V_per_m: 1e7 })).toEqual([]);
    expect(codes({ staticPermittivity: 30, interfaceField_V_per_m: 1e9 })).toEqual([]);
    // modelled field-dependent permittivity: no warning asking for it
    expect(codes({ staticPermittivity: 300, interfaceField_V_per_m: 1e9, permittivityFieldDependent: true })).toEqual([]);
    // 2e-3 C/m^2 across the same layer drops 0.11 V: below the threshold
    expect(codes({ interfaceLayer: { spaceCharge_C_per_m2: 2e-3, layerThickness_m: 0.5e-9, layerPermittivity: 1 } })).toEqual([]);
  });
});
