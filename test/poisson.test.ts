import { describe, expect, it } from 'vitest';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../src/bulk/equilibrium.js';
import { solvePoisson } from '../src/electrostatics/poisson.js';
import { PLANAR, hemisphere, particleArray } from '../src/electrostatics/geometry.js';
import { CODATA2018, boltzmannPlanarCharge, exactPlanarCharge } from './helpers.js';

const EPS = 8.5;

function support(overrides: Partial<SupportElectronic> = {}): SupportElectronic {
  return {
    temperature_K: 300,
    bandGap_eV: 3.3,
    electronMass_me: 0.24,
    holeMass_me: 0.59,
    donors: { density_m3: 1e24, kind: 'single' },
    acceptors: { density_m3: 0 },
    statistics: 'fermi-dirac',
    ...overrides,
  };
}

function solve(s: SupportElectronic, bandBending_eV: number, geometry = PLANAR, extra: { thickness_m?: number; refinement?: number } = {}) {
  const model = makeChargeModel(s);
  const bulk = solveBulkNeutrality(model);
  return {
    model,
    bulk,
    solution: solvePoisson({
      model,
      bulkReducedFermiLevel: bulk.reducedFermiLevel,
      surfaceBending: bandBending_eV / model.kT_eV,
      relativePermittivity: EPS,
      temperature_K: s.temperature_K,
      geometry,
      ...extra,
    }),
  };
}

// depletion (+), weak and strong accumulation (-), inversion (bending > gap - (E_C - E_F))
const BENDINGS = [-8, -1, -0.3, -0.05, 0.02, 0.3, 1, 2.5, 3.3, 8];

describe('planar contact against the exact first integral (Sze & Ng, 3rd ed., ch. 4)', () => {
  it('Boltzmann, fully ionised donors: closed form, relative charge error <= 1e-5', () => {
    const s = support({ statistics: 'boltzmann' });
    for (const bb of BENDINGS) {
      const { bulk, solution } = solve(s, bb);
      const exact = boltzmannPlanarCharge(bulk.electronDensity_m3, bulk.holeDensity_m3, bb / (CODATA2018.k * 300 / CODATA2018.q), EPS, 300);
      expect(Math.abs(solution.totalCharge_C / exact - 1), `band bending ${bb} eV`).toBeLessThan(1e-5);
    }
  });

  it('Fermi-Dirac with partially ionised single donors: relative charge error <= 1e-5', () => {
    const s = support({ donors: { density_m3: 1e25, kind: 'single', level1_eV: 0.1 } });
    for (const bb of BENDINGS) {
      const { solution } = solve(s, bb);
      const exact = exactPlanarCharge(s, EPS, bb);
      expect(Math.abs(solution.totalCharge_C / exact - 1), `band bending ${bb} eV`).toBeLessThan(1e-5);
    }
  });

  it('p-type with double donors compensating acceptors, 600 K: relative charge error <= 1e-5', () => {
    const s = support({
      temperature_K: 600,
      donors: { density_m3: 2e23, kind: 'double', level1_eV: 0.3, level2_eV: 0.8 },
      acceptors: { density_m3: 1e24, level_eV: 0.2 },
    });
    for (const bb of [-2.5, -0.6, -0.01, 0.4, 1.5]) {
      const { solution } = solve(s, bb);
      const exact = exactPlanarCharge(s, EPS, bb);
      expect(Math.abs(solution.totalCharge_C / exact - 1), `band bending ${bb} eV`).toBeLessThan(1e-5);
    }
  });

  it('converges from flat bands up to +/- 8 eV at 50 K and 1500 K', () => {
    for (const T of [50, 1500]) {
      for (const bb of [-8, 8]) {
        const s = support({ temperature_K: T, donors: { density_m3: 1e24, kind: 'single', level1_eV: 0.05 } });
        const { solution } = solve(s, bb);
        expect(Number.isFinite(solution.totalCharge_C)).toBe(true);
        expect(Math.abs(solution.totalCharge_C / exactPlanarCharge(s, EPS, bb) - 1)).toBeLessThan(1e-5);
      }
    }
  });
});

describe('hemisphere around a particle', () => {
  it('depletion limit matches the uniformly charged spherical shell (closed form derived here)', () => {
    // Shell a < r < R of uniform charge q N_D, zero field beyond R. Gauss: E(r) = -q N (R^3 - r^3) / (3 eps r^2), so
    // the band bending is V(a) = (q N / 3 eps) (R^3/a - 3R^2/2 + a^2/2), and Q = q N (2 pi / 3)(R^3 - a^3).
    // The self-consistent solution has a Debye tail at the edge; as in the planar case (Sze & Ng eq. 3.9) its
    // leading effect is V -> V - kT/q, which we apply. Agreement is then limited by the curvature of the tail (~1%).
    const nd = 1e24;
    const s = support({ statistics: 'boltzmann', donors: { density_m3: nd, kind: 'single' } });
    const a = 5e-9;
    const eps = EPS * CODATA2018.eps0;
    for (const bb of [1.0, 2.0]) {
      const { solution, model } = solve(s, bb, hemisphere(a));
      const target = bb - model.kT_eV;
      const bending = (R: number): number => ((CODATA2018.q * nd) / (3 * eps)) * (R ** 3 / a - 1.5 * R * R + 0.5 * a * a);
      let lo = a;
      let hi = a + 1e-6;
      for (let i = 0; i < 200; i++) {
        const mid = 0.5 * (lo + hi);
        if (bending(mid) < target) lo = mid;
        else hi = mid;
      }
      const R = 0.5 * (lo + hi);
      const shellCharge = CODATA2018.q * nd * ((2 * Math.PI) / 3) * (R ** 3 - a ** 3);
      expect(Math.abs(solution.totalCharge_C / shellCharge - 1), `band bending ${bb} eV`).toBeLessThan(0.02);
    }
  });

  it('the finite-volume scheme converges at second order under mesh bisection (common practice, no source)', () => {
    const s = support({ donors: { density_m3: 1e24, kind: 'single', level1_eV: 0.05 } });
    const geometry = hemisphere(1e-9);
    const reference = solve(s, 0.8, geometry, { refinement: 8 }).solution.totalCharge_C;
    const errors = [1, 2, 4].map((r) => Math.abs(solve(s, 0.8, geometry, { refinement: r }).solution.unextrapolatedCharge_C.fine - reference));
    const order1 = Math.log2(errors[0]! / errors[1]!);
    const order2 = Math.log2(errors[1]! / errors[2]!);
    expect(order1).toBeGreaterThan(1.8);
    expect(order2).toBeGreaterThan(1.8);
    expect(order1).toBeLessThan(2.3);
  });

  it('charge per particle exceeds the planar charge on the particle footprint (field lines spread, common practice)', () => {
    const s = support();
    const a = 1e-9;
    const planar = solve(s, 1, PLANAR).solution.totalCharge_C * Math.PI * a * a;
    const hemi = solve(s, 1, hemisphere(a)).solution.totalCharge_C;
    expect(hemi).toBeGreaterThan(planar);
  });
});

describe('particle array flux tube', () => {
  const a = 1e-9;
  const s = support({ donors: { density_m3: 1e23, kind: 'single' } });
  it('recovers the isolated hemisphere at low particle density within 1%', () => {
    const isolated = solve(s, 1, hemisphere(a)).solution.totalCharge_C;
    const sparse = solve(s, 1, particleArray(a, 1e10 * 1e4 / 1e4)).solution.totalCharge_C; // 1e10 per m^2 = 1e6 cm^-2
    expect(Math.abs(sparse / isolated - 1)).toBeLessThan(0.01);
  });

  it('recovers the planar charge shared among particles at high density within 1%', () => {
    const density_m2 = 1e13 * 1e4; // 1e13 cm^-2: spacing 3 nm, layer ~100 nm deep
    const planarPerParticle = solve(s, 1, PLANAR).solution.totalCharge_C / density_m2;
    const dense = solve(s, 1, particleArray(a, density_m2)).solution.totalCharge_C;
    expect(Math.abs(dense / planarPerParticle - 1)).toBeLessThan(0.01);
  });

  it('charge per particle falls as the density rises once zones overlap', () => {
    const charges = [1e10, 1e11, 1e12, 1e13].map((n) => solve(s, 1, particleArray(a, n * 1e4)).solution.totalCharge_C);
    for (let i = 1; i < charges.length; i++) expect(charges[i]!).toBeLessThan(charges[i - 1]!);
  });
});

describe('finite support thickness', () => {
  it('a grain thinner than the depletion layer holds at most q N_D L of charge', () => {
    const s = support({ donors: { density_m3: 1e23, kind: 'single' } });
    const L = 20e-9;
    const { solution } = solve(s, 1.5, PLANAR, { thickness_m: L });
    const cap = CODATA2018.q * 1e23 * L;
    expect(solution.totalCharge_C).toBeLessThanOrEqual(cap * (1 + 1e-9));
    expect(solution.totalCharge_C).toBeGreaterThan(0.95 * cap);
  });
});
