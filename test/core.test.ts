import { describe, expect, it } from 'vitest';
import {
  K_BOLTZMANN_J_PER_K,
  Q_ELEMENTARY_C,
  H_PLANCK_J_S,
  M_ELECTRON_KG,
  EPS0_F_PER_M,
} from '../src/constants.js';
import {
  fermiDiracHalf,
  fermiDiracMinusHalf,
  logFermiDiracHalf,
} from '../src/bulk/fermiDirac.js';
import { effectiveDensityOfStates_m3, makeChargeModel, solveBulkNeutrality } from '../src/bulk/equilibrium.js';
import { CODATA2018, simpson } from './helpers.js';
import { parseQuantity, unitSpecOf } from '../src/inputs/units.js';

describe('constants', () => {
  it('match CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021))', () => {
    expect(K_BOLTZMANN_J_PER_K).toBe(CODATA2018.k);
    expect(Q_ELEMENTARY_C).toBe(CODATA2018.q);
    expect(H_PLANCK_J_S).toBe(CODATA2018.h);
    expect(M_ELECTRON_KG / CODATA2018.me - 1).toBeLessThan(1e-12);
    expect(Math.abs(EPS0_F_PER_M / CODATA2018.eps0 - 1)).toBeLessThan(1e-12);
  });
});

/** Independent F_{1/2}: Simpson's rule in u = sqrt(t) with 2e5 intervals (written for this test). */
function referenceHalf(eta: number): number {
  const occupancy = (u: number): number => {
    const x = u * u - eta;
    return x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x));
  };
  const top = Math.sqrt(Math.max(eta, 0) + 80);
  // F_{1/2} = (1/Gamma(3/2)) int 2 u^2 f du
  return simpson((u) => 2 * u * u * occupancy(u), 0, top, 200000) / (Math.sqrt(Math.PI) / 2);
}

describe('Fermi-Dirac integral F_1/2', () => {
  it('agrees with an independent quadrature to 1e-6 over eta in [-50, 50]', () => {
    let worst = 0;
    for (let eta = -50; eta <= 50; eta += 0.73) {
      worst = Math.max(worst, Math.abs(fermiDiracHalf(eta) / referenceHalf(eta) - 1));
    }
    expect(worst).toBeLessThan(1e-6);
  });

  it('F_1/2(0) = 0.765147 (from memory of Blakemore, Solid-State Electron. 25 (1982) 1067, verify)', () => {
    expect(fermiDiracHalf(0)).toBeCloseTo(0.7651470246, 8);
  });

  it('F_-1/2 is the derivative of F_1/2 (numerical derivative, common practice, no source)', () => {
    for (const eta of [-30, -5, -2.01, -1.99, 0, 3.3, 15.99, 16.01, 40]) {
      const h = 1e-5;
      const numeric = (fermiDiracHalf(eta + h) - fermiDiracHalf(eta - h)) / (2 * h);
      expect(Math.abs(numeric / fermiDiracMinusHalf(eta) - 1)).toBeLessThan(1e-6);
    }
  });

  it('is finite in log form far into the non-degenerate tail (no underflow)', () => {
    expect(logFermiDiracHalf(-5000)).toBeCloseTo(-5000, 9);
    expect(Number.isFinite(logFermiDiracHalf(-1e6))).toBe(true);
  });
});

describe('bulk equilibrium', () => {
  it('N_C of Si (m* = 1.08, 300 K) is about 2.8e19 cm^-3 (Sze & Ng, 3rd ed., appendix; from memory, verify)', () => {
    const nc_cm3 = effectiveDensityOfStates_m3(1.08, 300) * 1e-6;
    expect(nc_cm3 / 2.8e19).toBeGreaterThan(0.98);
    expect(nc_cm3 / 2.8e19).toBeLessThan(1.03);
  });

  it('undoped: E_F at midgap + (3/4) kT ln(m_h/m_e) above midgap (Boltzmann intrinsic level, Sze & Ng ch. 1)', () => {
    for (const [gap, T] of [[1.12, 300], [3.3, 600], [10, 50], [10, 1500]] as const) {
      const model = makeChargeModel({
        temperature_K: T,
        bandGap_eV: gap,
        electronMass_me: 0.3,
        holeMass_me: 2.0,
        donors: { density_m3: 0, kind: 'single' },
        acceptors: { density_m3: 0 },
        statistics: 'boltzmann',
      });
      const bulk = solveBulkNeutrality(model);
      const expected = gap / 2 - 0.75 * model.kT_eV * Math.log(2.0 / 0.3); // E_C - E_F
      expect(bulk.fermiLevelBelowConduction_eV).toBeCloseTo(expected, 9);
      expect(Number.isFinite(bulk.intrinsicDensityLog10_cm3)).toBe(true);
    }
  });

  it('a 10 eV insulator at 50 K has an intrinsic density far below 1e-30 cm^-3 and still a finite Fermi level', () => {
    const model = makeChargeModel({
      temperature_K: 50,
      bandGap_eV: 10,
      electronMass_me: 0.4,
      holeMass_me: 1,
      donors: { density_m3: 1e16, kind: 'single', level1_eV: 2 },
      acceptors: { density_m3: 0 },
      statistics: 'fermi-dirac',
    });
    const bulk = solveBulkNeutrality(model);
    expect(bulk.intrinsicDensityLog10_cm3).toBeLessThan(-400);
    // uncompensated freeze-out: n = sqrt(N_C N_D / 2) exp(-E_d / 2kT), i.e. E_C - E_F = E_d/2 + (kT/2) ln(2 N_C / N_D)
    // (Sze & Ng, 3rd ed., ch. 1, low-temperature limit)
    const expected = 1 + 0.5 * model.kT_eV * Math.log((2 * model.conductionDos_m3) / 1e16);
    expect(bulk.fermiLevelBelowConduction_eV).toBeCloseTo(expected, 6);
  });

  it('shallow fully ionised donors: n = N_D when N_D >> n_i (common practice, no source)', () => {
    const model = makeChargeModel({
      temperature_K: 300,
      bandGap_eV: 3.2,
      electronMass_me: 0.3,
      holeMass_me: 1,
      donors: { density_m3: 1e22, kind: 'single' },
      acceptors: { density_m3: 0 },
      statistics: 'fermi-dirac',
    });
    const bulk = solveBulkNeutrality(model);
    expect(bulk.electronDensity_m3 / 1e22).toBeCloseTo(1, 9);
  });

  it('partially ionised single donor: n^2 / (N_D - n) = (N_C / g) exp(-E_d/kT) (Sze & Ng ch. 1, Boltzmann)', () => {
    const T = 300;
    const model = makeChargeModel({
      temperature_K: T,
      bandGap_eV: 3.2,
      electronMass_me: 0.3,
      holeMass_me: 1,
      donors: { density_m3: 1e25, kind: 'single', level1_eV: 0.1 },
      acceptors: { density_m3: 0 },
      statistics: 'boltzmann',
    });
    const bulk = solveBulkNeutrality(model);
    const n = bulk.electronDensity_m3;
    const lhs = (n * n) / (1e25 - n);
    const rhs = (model.conductionDos_m3 / 2) * Math.exp(-0.1 / model.kT_eV);
    expect(lhs / rhs).toBeCloseTo(1, 7);
  });

  it('double donor releases two electrons per defect when shallow (charge neutrality n = 2 N_V)', () => {
    const model = makeChargeModel({
      temperature_K: 600,
      bandGap_eV: 3.2,
      electronMass_me: 0.3,
      holeMass_me: 1,
      donors: { density_m3: 1e21, kind: 'double', level1_eV: 0.01, level2_eV: 0.02 },
      acceptors: { density_m3: 0 },
      statistics: 'fermi-dirac',
    });
    const bulk = solveBulkNeutrality(model);
    expect(bulk.electronDensity_m3 / 2e21).toBeCloseTo(1, 3);
  });

  it('brackets the Fermi level over the whole documented range (densities 0-1e23 cm^-3, 50-1500 K, gaps 0.1-10 eV)', () => {
    for (const density of [0, 1e4, 1e16, 1e23]) {
      for (const T of [50, 300, 1500]) {
        for (const gap of [0.1, 3, 10]) {
          for (const statistics of ['fermi-dirac', 'boltzmann'] as const) {
            const model = makeChargeModel({
              temperature_K: T,
              bandGap_eV: gap,
              electronMass_me: 0.1,
              holeMass_me: 3,
              donors: { density_m3: density * 1e6, kind: 'double', level1_eV: gap / 4, level2_eV: gap / 3 },
              acceptors: { density_m3: density * 1e5, level_eV: gap / 5 },
              statistics,
            });
            const bulk = solveBulkNeutrality(model);
            expect(Number.isFinite(bulk.reducedFermiLevel)).toBe(true);
            expect(Number.isFinite(bulk.fermiLevelBelowConduction_eV)).toBe(true);
          }
        }
      }
    }
  });
});

describe('constants and units against mathjs (general-purpose reference library)', () => {
  it('project constants equal mathjs built-in physical constants (CODATA 2018)', async () => {
    const { create, all } = await import('mathjs');
    const math = create(all) as unknown as Record<string, { toSI(): { value: number } }>;
    expect(math['boltzmann']!.toSI().value).toBe(K_BOLTZMANN_J_PER_K);
    expect(math['elementaryCharge']!.toSI().value).toBe(Q_ELEMENTARY_C);
    expect(math['planckConstant']!.toSI().value).toBe(H_PLANCK_J_S);
    expect(math['electronMass']!.toSI().value).toBe(M_ELECTRON_KG);
    expect(math['electricConstant']!.toSI().value).toBe(EPS0_F_PER_M);
  });

  it('bare-number factors equal mathjs conversions of the default units', async () => {
    const { unit } = await import('mathjs');
    for (const kind of ['energy', 'volumeDensity', 'arealDensity', 'temperature', 'length', 'pressure'] as const) {
      const spec = unitSpecOf(kind);
      expect(unit(1, spec.defaultUnit).toNumber(spec.target) / spec.bareFactor).toBeCloseTo(1, 12);
    }
    expect(parseQuantity('T', '300 degC', 'temperature')).toBeCloseTo(573.15, 10);
    expect(parseQuantity('n', '1e18 cm^-3', 'volumeDensity')).toBeCloseTo(1e24, -10);
    expect(() => parseQuantity('E', '5 nm', 'energy')).toThrow(/wrong dimension/);
  });
});
