// The finite particle: size-dependent work function, density of states at E_F, quantum-capacitance feedback in
// the interface alignment, and the hard bound on transferred charge.
import { describe, expect, it } from 'vitest';
import {
  densityOfStatesFromSpecificHeat_per_eV_atom,
  freeElectronDensityOfStates_per_eV_atom,
  idealParticleAlignment,
  kuboGap_eV,
  neutralParticleWorkFunction_eV,
  particleDensityOfStates_per_eV,
  particleFermiLevelShift_eV,
  quantumCapacitance_F,
  sizeDependentElectronAffinity_eV,
  sizeDependentIonisationPotential_eV,
  sphereCoulombEnergy_eV,
  transferredChargeBound,
} from '../src/derived/finiteParticle.js';
import { solveInterfaceAlignment, type InterfaceAlignmentInput } from '../src/interface/interfaceStates.js';
import { CODATA2018, boltzmannPlanarCharge } from './helpers.js';
import { solveContact } from '../src/contact.js';
import { loadBuiltinLibrary } from '../src/materials/index.js';
import { particleAtoms } from '../src/derived/particle.js';

describe('size-dependent work function of a small metal sphere', () => {
  it('e^2/(4 pi eps0 R) = 1.440 eV at R = 1 nm; alpha = 3/8 -> +0.54 eV, alpha = 1/2 -> +0.72 eV (evidence sheet, derived from CODATA)', () => {
    expect(sphereCoulombEnergy_eV(1e-9)).toBeCloseTo(CODATA2018.q / (4 * Math.PI * CODATA2018.eps0 * 1e-9), 12);
    expect(sphereCoulombEnergy_eV(1e-9)).toBeCloseTo(1.44, 2);
    expect(sizeDependentIonisationPotential_eV(5.0, 1e-9) - 5.0).toBeCloseTo(0.54, 2);
    expect(sizeDependentIonisationPotential_eV(5.0, 1e-9, 0.5) - 5.0).toBeCloseTo(0.72, 2);
  });

  it('IP - EA = e^2/(4 pi eps0 R) (classical charging energy of an isolated sphere) and EA = W - (5/8) e^2/(4 pi eps0 R) for alpha = 3/8 (Perdew 1988, from memory)', () => {
    for (const r of [0.5e-9, 1.5e-9, 10e-9]) {
      const u = CODATA2018.q / (4 * Math.PI * CODATA2018.eps0 * r);
      expect(sizeDependentIonisationPotential_eV(4.3, r) - sizeDependentElectronAffinity_eV(4.3, r)).toBeCloseTo(u, 12);
      expect(sizeDependentElectronAffinity_eV(4.3, r)).toBeCloseTo(4.3 - (5 / 8) * u, 12);
    }
  });

  it('the neutral-particle work function is the grounded-sphere W_inf - (1/8) e^2/(4 pi eps0 R) for alpha = 3/8 (Halas 2003) and W_inf for alpha = 1/2 (Makov, Nitzan & Brus 1988)', () => {
    const u = CODATA2018.q / (4 * Math.PI * CODATA2018.eps0 * 1.2e-9);
    expect(neutralParticleWorkFunction_eV(5.65, 1.2e-9)).toBeCloseTo(5.65 - u / 8, 12);
    expect(neutralParticleWorkFunction_eV(5.65, 1.2e-9, 0.5)).toBeCloseTo(5.65, 12);
    // macroscopic limit
    expect(neutralParticleWorkFunction_eV(5.65, 5e-6)).toBeCloseTo(5.65, 3);
  });
});

describe('density of states at the Fermi level', () => {
  it('from the electronic specific heat: Ag 0.640, Cu 0.691, Au 0.689 mJ/(mol K^2) (Martin, Phys. Rev. B 8, 5357 (1973)) -> 0.272, 0.293, 0.292 states/(eV atom)', () => {
    expect(densityOfStatesFromSpecificHeat_per_eV_atom(0.64)).toBeCloseTo(0.272, 3);
    expect(densityOfStatesFromSpecificHeat_per_eV_atom(0.691)).toBeCloseTo(0.293, 3);
    expect(densityOfStatesFromSpecificHeat_per_eV_atom(0.689)).toBeCloseTo(0.292, 3);
    // independent arithmetic: N = 3 gamma / (pi^2 k^2 N_A), per J -> per eV
    const nA = 6.02214076e23;
    expect(densityOfStatesFromSpecificHeat_per_eV_atom(0.64)).toBeCloseTo(((3 * 0.64e-3) / (Math.PI ** 2 * CODATA2018.k ** 2 * nA)) * CODATA2018.q, 10);
  });

  it('free-electron Ag (z = 1, n = 5.86e28 m^-3; Ashcroft & Mermin table 2.1, E_F = 5.49 eV; from memory, verify) agrees with the specific-heat value within 2% (m*/m = 1.00 for Ag, Martin 1973)', () => {
    const g = freeElectronDensityOfStates_per_eV_atom(1, 5.86e28);
    expect(g).toBeCloseTo(3 / (2 * 5.49), 2);
    expect(Math.abs(g / densityOfStatesFromSpecificHeat_per_eV_atom(0.64) - 1)).toBeLessThan(0.02);
  });

  it('particle DOS, quantum capacitance C_q = q^2 g, Fermi shift N/g and Kubo gap 1/g', () => {
    const g = particleDensityOfStates_per_eV(0.272, 500);
    expect(g).toBeCloseTo(136, 10);
    expect(quantumCapacitance_F(g)).toBeCloseTo(CODATA2018.q ** 2 * (g / CODATA2018.q), 30);
    expect(particleFermiLevelShift_eV(13.6, g)).toBeCloseTo(0.1, 12);
    expect(kuboGap_eV(g)).toBeCloseTo(1 / 136, 12);
  });
});

// A ZnO-like support (chi 4.19, Eg 3.37; library), planar exact space charge (Boltzmann, fully ionised donors)
const T = 300;
const kT = (CODATA2018.k * T) / CODATA2018.q;
const NC = 2 * Math.pow((2 * Math.PI * 0.24 * CODATA2018.me * CODATA2018.k * T) / CODATA2018.h ** 2, 1.5);
const R = 1.5e-9;
const FOOTPRINT = Math.PI * R * R;

function alignment(overrides: Partial<InterfaceAlignmentInput> = {}, nd = 1e24): InterfaceAlignmentInput {
  return {
    metalWorkFunction_eV: neutralParticleWorkFunction_eV(5.65, R),
    electronAffinity_eV: 4.19,
    bandGap_eV: 3.37,
    fermiLevelBelowConduction_eV: kT * Math.log(NC / nd),
    stateDensity_per_eV_m2: 2e17,
    neutralLevelAboveValence_eV: 2.6,
    layerThickness_m: 0.5e-9,
    layerPermittivity: 1,
    spaceCharge: (v) => boltzmannPlanarCharge(nd, 0, v / kT, 8.656, T),
    particle: { densityOfStates_per_eV: particleDensityOfStates_per_eV(2.9, 300), footprintArea_m2: FOOTPRINT, interfaceArea_m2: FOOTPRINT },
    ...overrides,
  };
}

describe('particle term in the self-consistent alignment', () => {
  it('no space charge, linear interface states: N = C_series (phi_m - chi - (E_g - phi_0)) with 1/C = 1/(A D) + 1/g + q delta/(eps_i eps0 A) (capacitors in series; quantum capacitance, Luryi 1988)', () => {
    for (const g of [5, 50, 5000]) {
      for (const d of [1e16, 2e17, 3e18]) {
        const r = solveInterfaceAlignment(
          alignment({ stateDensity_per_eV_m2: d, spaceCharge: () => 0, particle: { densityOfStates_per_eV: g, footprintArea_m2: FOOTPRINT, interfaceArea_m2: FOOTPRINT } }),
        );
        const w = neutralParticleWorkFunction_eV(5.65, R);
        const inverse = 1 / (FOOTPRINT * d) + 1 / g + (CODATA2018.q * 0.5e-9) / (CODATA2018.eps0 * FOOTPRINT);
        const n = (w - 4.19 - (3.37 - 2.6)) / inverse;
        expect(r.particle!.electronsGained / n).toBeCloseTo(1, 9);
        expect(r.particle!.fermiLevelShift_eV).toBeCloseTo(n / g, 9);
      }
    }
  });

  it('g_tot -> infinity recovers the extended contact (metal charge -(Q_sc + Q_it))', () => {
    const big = solveInterfaceAlignment(alignment({ particle: { densityOfStates_per_eV: 1e12, footprintArea_m2: FOOTPRINT, interfaceArea_m2: FOOTPRINT } }));
    const extended = solveInterfaceAlignment(alignment({ particle: undefined }));
    expect(big.electronBarrier_eV).toBeCloseTo(extended.electronBarrier_eV, 9);
    expect(big.particle!.electronsGained).toBeCloseTo(-(extended.metalCharge_C_per_m2 * FOOTPRINT) / CODATA2018.q, 6);
  });

  it('a smaller density of states takes fewer electrons (Fermi level rises against the transfer)', () => {
    const au = solveInterfaceAlignment(alignment({ particle: { densityOfStates_per_eV: particleDensityOfStates_per_eV(0.29, 300), footprintArea_m2: FOOTPRINT, interfaceArea_m2: FOOTPRINT } }));
    const pt = solveInterfaceAlignment(alignment());
    expect(Math.abs(au.particle!.electronsGained)).toBeLessThan(Math.abs(pt.particle!.electronsGained));
  });
});

describe('hard bound on transferred charge', () => {
  // fixed-seed linear congruential generator (Numerical Recipes constants) for reproducible random cases
  let seed = 12345;
  const rand = (): number => {
    seed = (1664525 * seed + 1013904223) >>> 0;
    return seed / 2 ** 32;
  };

  it('every solved alignment lies inside the bound (300 random cases: metals, supports, D_it, layers, DOS, areas)', () => {
    for (let i = 0; i < 300; i++) {
      const nd = 10 ** (20 + 6 * rand());
      const gap = 1 + 5 * rand();
      const input = alignment(
        {
          metalWorkFunction_eV: 3.5 + 2.5 * rand(),
          electronAffinity_eV: 3 + 2 * rand(),
          bandGap_eV: gap,
          neutralLevelAboveValence_eV: gap * rand(),
          stateDensity_per_eV_m2: rand() < 0.2 ? 0 : 10 ** (15 + 4 * rand()),
          layerThickness_m: rand() < 0.2 ? 0 : 1e-9 * rand(),
          layerPermittivity: 1 + 9 * rand(),
          particle: {
            densityOfStates_per_eV: 10 ** (0 + 4 * rand()),
            footprintArea_m2: FOOTPRINT * (0.2 + 3 * rand()),
            interfaceArea_m2: FOOTPRINT * (0.2 + 3 * rand()),
          },
        },
        nd,
      );
      const r = solveInterfaceAlignment(input);
      const bound = transferredChargeBound({ ...input, ...input.particle! });
      const n = r.particle!.electronsGained;
      const slack = 1e-9 * (1 + Math.abs(n));
      expect(n, `case ${i}`).toBeLessThanOrEqual(bound.maxGained + slack);
      expect(-n, `case ${i}`).toBeLessThanOrEqual(bound.maxLost + slack);
    }
  });

  it('the bound is reached in its limit: no layer, infinite DOS -> N equals the Schottky–Mott charge of the support', () => {
    const input = alignment({ layerThickness_m: 0, particle: { densityOfStates_per_eV: 1e12, footprintArea_m2: FOOTPRINT, interfaceArea_m2: FOOTPRINT } });
    const r = solveInterfaceAlignment(input);
    const bound = transferredChargeBound({ ...input, ...input.particle! });
    expect(r.particle!.electronsGained / bound.schottkyMottCharge).toBeCloseTo(1, 6);
  });
});

describe('ideal (Schottky–Mott) rule at a finite particle: quantum capacitance in the alignment', () => {
  it('a linear Q_sc = C V gives V = (W - chi - xi) / (1 + C A / (q g)) exactly (derived: Phi_B = W - N/g - chi, N = C V A / q)', () => {
    const C = 0.05; // C/m^2 per eV of band bending (a linear test space charge, not a material)
    for (const g of [10, 100, 1e4]) {
      const input = alignment();
      const r = idealParticleAlignment({ ...input, particle: { ...input.particle!, densityOfStates_per_eV: g }, spaceCharge: (v) => C * v });
      const v = (input.metalWorkFunction_eV - input.electronAffinity_eV - input.fermiLevelBelowConduction_eV) / (1 + (C * FOOTPRINT) / (CODATA2018.q * g));
      expect(r.electronsGained).toBeCloseTo((C * v * FOOTPRINT) / CODATA2018.q, 6);
      expect(r.fermiLevelShift_eV).toBeCloseTo(r.electronsGained / g, 12);
      // the root is an evaluated band bending, within the 1e-9 eV tolerance of the closed form; a linear Q_sc is exact
      // in the one-point model (Q_1 v / v_1), so the Schottky–Mott start and one step suffice
      expect(Math.abs(r.bandBending_eV - v)).toBeLessThanOrEqual(1e-9);
      expect(r.iterations).toBeLessThanOrEqual(2);
    }
  });

  it('an infinite density of states recovers the Schottky–Mott charge (transferredChargeBound, bound 1)', () => {
    const input = alignment({ stateDensity_per_eV_m2: 0, layerThickness_m: 0, particle: { densityOfStates_per_eV: 1e12, footprintArea_m2: FOOTPRINT, interfaceArea_m2: FOOTPRINT } });
    const r = idealParticleAlignment({ ...input, particle: input.particle! });
    expect(r.electronsGained / transferredChargeBound({ ...input, ...input.particle! }).schottkyMottCharge).toBeCloseTo(1, 6);
  });

  it('contact: Au on CeO2, 2 nm hemisphere, ideal model: E_C(0) - E_F = W(R) - N/g_tot - chi with g_tot from the library', () => {
    const res = solveContact({ metal: 'Au', support: 'CeO2', geometry: 'hemisphere', particleDiameter: 2, barrierModel: 'ideal' });
    const au = loadBuiltinLibrary().metals.get('Au')!;
    const atoms = particleAtoms({ diameter_m: 2e-9, density_g_cm3: au.density_g_cm3.value, molarMass_g_mol: au.molarMass_g_mol.value, metallicRadius_pm: au.metallicRadius_pm.value }).atoms;
    const g = au.densityOfStatesAtFermi_per_eV_atom!.value * atoms;
    const chi = loadBuiltinLibrary().supports.get('CeO2')!.electronAffinity_eV.value;
    expect(res.electronBarrier_eV).toBeCloseTo(res.particleWorkFunction_eV - res.electronsPerParticle / g - chi, 6);
    // the reported N is the alignment's own (its root's Poisson solution): the relation holds to rounding
    expect(Math.abs(res.electronBarrier_eV - (res.particleWorkFunction_eV - res.electronsPerParticle / g - chi))).toBeLessThan(1e-12);
    // band bending (the alignment's root) and Phi_B - (E_C - E_F)_bulk agree within the alignment's 1e-9 eV tolerance
    expect(Math.abs(res.electronBarrier_eV - res.fermiLevelBelowConduction_eV - res.bandBending_eV)).toBeLessThanOrEqual(1e-9);
  });
});
