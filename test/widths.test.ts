import { describe, expect, it } from 'vitest';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../src/bulk/equilibrium.js';
import { PLANAR, hemisphere } from '../src/electrostatics/geometry.js';
import { solvePoisson } from '../src/electrostatics/poisson.js';
import {
  chargeDepth_m,
  chargeEquivalentWidth_m,
  depletedChargeDensity_m3,
  depletionWidthApprox_m,
  sphericalDepletionWidth_m,
} from '../src/derived/widths.js';
import { CODATA2018, boltzmannPlanarCharge, exactPlanarCharge } from './helpers.js';

const EPS = 8.5;

function support(overrides: Partial<SupportElectronic> = {}): SupportElectronic {
  return {
    temperature_K: 300,
    bandGap_eV: 3.3,
    electronMass_me: 0.24,
    holeMass_me: 0.59,
    donors: { density_m3: 1e24, kind: 'single', level1_eV: 0.5 },
    acceptors: { density_m3: 0 },
    statistics: 'fermi-dirac',
    ...overrides,
  };
}

describe('charge-equivalent width (issue 10 item 1)', () => {
  it('planar, 1e18 cm^-3 donors 0.5 eV deep, 300 K: W_Q from the fully ionised density, ~30 nm, not 1e5 nm', () => {
    // exact planar charge from the first integral (Sze & Ng, 3rd ed., ch. 4); the issue reports Q/(q N_D) = 29 nm
    // against 2.2e5 nm from the bulk ionised density for this support
    const s = support();
    const bb = 1.0;
    const q = exactPlanarCharge(s, EPS, bb);
    const model = makeChargeModel(s);
    const bulk = solveBulkNeutrality(model);
    const wq = chargeEquivalentWidth_m({ charge_C: q, geometry: PLANAR, donors_m3: 1e24, donorKind: 'single', acceptors_m3: 0 })!;
    const wd = depletionWidthApprox_m({ bandBending_eV: bb, kT_eV: model.kT_eV, relativePermittivity: EPS, nType: true, donors_m3: 1e24, donorKind: 'single', acceptors_m3: 0 })!;
    expect(wq * 1e9).toBeGreaterThan(20);
    expect(wq * 1e9).toBeLessThan(40);
    // the deep donors ionise only where E_F is below them, so the depletion approximation overestimates a little
    expect(wq / wd).toBeGreaterThan(0.8);
    expect(wq / wd).toBeLessThanOrEqual(1);
    // the old definition (bulk ionised donors) is more than 1000x too wide here
    expect(q / (CODATA2018.q * bulk.donorCharge_m3) / wq).toBeGreaterThan(1000);
  });

  it('Boltzmann, fully ionised donors, deep depletion: W_Q equals sqrt(2 eps (V - kT/q) / q N_D) (Sze & Ng ch. 3 and ch. 4)', () => {
    // closed form: int_0^u N du = N_D (u - 1 + e^-u) for n0 = N_D, p0 ~ 0, so Q / (q N_D) = sqrt(2 eps (V - kT/q)/(q N_D)) (1 + O(e^-u))
    const s = support({ statistics: 'boltzmann', donors: { density_m3: 1e23, kind: 'single' } });
    const model = makeChargeModel(s);
    const bulk = solveBulkNeutrality(model);
    for (const bb of [0.5, 1.2, 2.0]) {
      const q = boltzmannPlanarCharge(bulk.electronDensity_m3, bulk.holeDensity_m3, bb / model.kT_eV, EPS, 300);
      const wq = chargeEquivalentWidth_m({ charge_C: q, geometry: PLANAR, donors_m3: 1e23, donorKind: 'single', acceptors_m3: 0 })!;
      const wd = depletionWidthApprox_m({ bandBending_eV: bb, kT_eV: model.kT_eV, relativePermittivity: EPS, nType: true, donors_m3: 1e23, donorKind: 'single', acceptors_m3: 0 })!;
      expect(Math.abs(wq / wd - 1)).toBeLessThan(1e-6);
    }
  });

  it('double donors count twice, acceptors compensate', () => {
    expect(depletedChargeDensity_m3({ donors_m3: 1e24, donorKind: 'double', acceptors_m3: 5e23 })).toBe(1.5e24);
    expect(depletedChargeDensity_m3({ donors_m3: 1e24, donorKind: 'single', acceptors_m3: 3e24 })).toBe(2e24);
    expect(chargeEquivalentWidth_m({ charge_C: 1, geometry: PLANAR, donors_m3: 1e24, donorKind: 'single', acceptors_m3: 1e24 })).toBeNull();
  });

  it('no depletion width in accumulation or below kT', () => {
    const base = { kT_eV: 0.025852, relativePermittivity: EPS, donors_m3: 1e24, donorKind: 'single' as const, acceptors_m3: 0 };
    expect(depletionWidthApprox_m({ ...base, bandBending_eV: -0.5, nType: true })).toBeNull();
    expect(depletionWidthApprox_m({ ...base, bandBending_eV: 0.02, nType: true })).toBeNull();
    expect(depletionWidthApprox_m({ ...base, bandBending_eV: -0.5, nType: false })).not.toBeNull();
  });
});

describe('spherical depletion width', () => {
  it('tends to the planar depletion width for a large particle (limit of the shell formula)', () => {
    const base = { kT_eV: 0.025852, relativePermittivity: EPS, donors_m3: 1e24, donorKind: 'single' as const, acceptors_m3: 0, bandBending_eV: 1, nType: true };
    const planar = depletionWidthApprox_m(base)!;
    const sphere = sphericalDepletionWidth_m({ ...base, radius_m: 1e-3 })!;
    expect(Math.abs(sphere / planar - 1)).toBeLessThan(1e-3);
    // curvature: the shell formula expands to V = q N W^2 / 2 eps + q N W^3 / (3 eps a) + ..., so a small particle
    // holds the same bending with a thinner shell (the field is wider near the particle)
    expect(sphericalDepletionWidth_m({ ...base, radius_m: 1e-9 })!).toBeLessThan(planar);
  });

  it('agrees with the hemisphere solve within 2% in deep depletion (uniform shell + Debye tail, derived here)', () => {
    const s = support({ statistics: 'boltzmann', donors: { density_m3: 1e24, kind: 'single' } });
    const model = makeChargeModel(s);
    const bulk = solveBulkNeutrality(model);
    const a = 5e-9;
    const geometry = hemisphere(a);
    const solution = solvePoisson({ model, bulkReducedFermiLevel: bulk.reducedFermiLevel, surfaceBending: 1.5 / model.kT_eV, relativePermittivity: EPS, temperature_K: 300, geometry });
    const wq = chargeEquivalentWidth_m({ charge_C: solution.totalCharge_C, geometry, donors_m3: 1e24, donorKind: 'single', acceptors_m3: 0 })!;
    const ws = sphericalDepletionWidth_m({ kT_eV: model.kT_eV, relativePermittivity: EPS, donors_m3: 1e24, donorKind: 'single', acceptors_m3: 0, bandBending_eV: 1.5, nType: true, radius_m: a })!;
    expect(Math.abs(wq / ws - 1)).toBeLessThan(0.02);
  });
});

describe('depth holding 90% of the charge', () => {
  it('uniform planar slab of width W: 0.9 W (exact)', () => {
    const x = Array.from({ length: 1001 }, (_, i) => (i * 200e-9) / 1000);
    const rho = x.map((v) => (v <= 100e-9 ? 1 : 0));
    expect(chargeDepth_m(x, rho, PLANAR, 0.9) / 90e-9).toBeCloseTo(1, 2);
  });

  it('uniform hemispherical shell a..R: the radius enclosing 90% of the shell volume (exact)', () => {
    const a = 2e-9;
    const R = 12e-9;
    const x = Array.from({ length: 4001 }, (_, i) => (i * 20e-9) / 4000);
    const rho = x.map((v) => (v <= R - a ? 1 : 0));
    const r90 = Math.cbrt(a ** 3 + 0.9 * (R ** 3 - a ** 3));
    expect(chargeDepth_m(x, rho, hemisphere(a), 0.9) / (r90 - a)).toBeCloseTo(1, 2);
  });
});
