// Issue 10, item 4: the particle-array flux tube against a 2D axisymmetric cell solution (test/reference/
// axisymmetric2d.ts). The reference is validated first against its two limits computed by the 1D solver on exact
// geometries: the isolated hemisphere (sparse particles) and the planar charge shared among particles (dense).
import { describe, expect, it } from 'vitest';
import { makeChargeModel, solveBulkNeutrality } from '../src/bulk/equilibrium.js';
import { PLANAR, hemisphere, particleArray } from '../src/electrostatics/geometry.js';
import { solvePoisson } from '../src/electrostatics/poisson.js';
import { solveCell } from './reference/axisymmetric2d.js';
import { CODATA2018 } from './helpers.js';

const EPS = 8.5;
const BENDING_EV = 1;

function setup(donors_m3: number) {
  const model = makeChargeModel({
    temperature_K: 300,
    bandGap_eV: 3.3,
    electronMass_me: 0.24,
    holeMass_me: 0.59,
    donors: { density_m3: donors_m3, kind: 'single' },
    acceptors: { density_m3: 0 },
    statistics: 'fermi-dirac',
  });
  const bulk = solveBulkNeutrality(model);
  return { model, bulkReducedFermiLevel: bulk.reducedFermiLevel, surfaceBending: BENDING_EV / model.kT_eV, relativePermittivity: EPS, temperature_K: 300 };
}

describe('2D axisymmetric cell reference', () => {
  const base = setup(1e23);
  const a = 1e-9;
  it('sparse particles (1e9 cm^-2): the isolated hemisphere within 1%', () => {
    const hemi = solvePoisson({ ...base, geometry: hemisphere(a) });
    const cell = solveCell({ ...base, radius_m: a, particleDensity_m2: 1e13, depth_m: 2 * hemi.domain_m + 200e-9 });
    expect(Math.abs(cell.charge_C / hemi.totalCharge_C - 1)).toBeLessThan(0.01);
  });
  it('dense particles (1e13 cm^-2, layer 40x the spacing): the planar charge per particle within 1%', () => {
    const planar = solvePoisson({ ...base, geometry: PLANAR });
    const n = 1e17;
    const cell = solveCell({ ...base, radius_m: a, particleDensity_m2: n, depth_m: 3 * planar.domain_m });
    expect(Math.abs((cell.charge_C * n) / planar.totalCharge_C - 1)).toBeLessThan(0.01);
  });
});

/**
 * The array cell (src/electrostatics/geometry.ts particleArray) against the 2D cell on one grid point: donors for
 * a depletion width W = ratio x spacing, W = sqrt(2 eps (V - kT/q) / (q N_D)) (Sze & Ng, Physics of Semiconductor
 * Devices, 3rd ed., ch. 3); null where the particles would touch (the reference cannot hold overlapping particles,
 * so 1e14 cm^-2 with >= 1 nm particles is outside it) or the donors leave the documented 1e12-1e21 cm^-3.
 */
function deviation(density_cm2: number, diameter_nm: number, ratio: number): number | null {
  const n = density_cm2 * 1e4;
  const spacing = 1 / Math.sqrt(n);
  const a = diameter_nm * 0.5e-9;
  if (1 / Math.sqrt(Math.PI * n) < 1.5 * a) return null;
  const w = ratio * spacing;
  const donors = (2 * EPS * CODATA2018.eps0 * (BENDING_EV - 0.0259)) / (CODATA2018.q * w * w);
  if (donors < 1e18 || donors > 1e27) return null;
  const base = setup(donors);
  const tube = solvePoisson({ ...base, geometry: particleArray(a, n) });
  const cell = solveCell({ ...base, radius_m: a, particleDensity_m2: n, depth_m: Math.max(1.5 * tube.domain_m, 3 * w, 2 * spacing) });
  return tube.totalCharge_C / cell.charge_C - 1;
}

function worstOver(densities: number[], diameters: number[], ratios: number[]): { worst: number; rows: string[]; worstBelow: (density: number) => number } {
  const rows: string[] = [];
  const points: { density: number; deviation: number }[] = [];
  let worst = 0;
  for (const density of densities) {
    for (const diameter of diameters) {
      for (const ratio of ratios) {
        const d = deviation(density, diameter, ratio);
        if (d === null) continue;
        worst = Math.max(worst, Math.abs(d));
        points.push({ density, deviation: Math.abs(d) });
        rows.push(`${density.toExponential(0)} cm^-2, d ${diameter} nm, W/s ${ratio}: ${(100 * d).toFixed(2)}%`);
      }
    }
  }
  const worstBelow = (limit: number): number => Math.max(0, ...points.filter((p) => p.density < limit).map((p) => p.deviation));
  return { worst, rows, worstBelow };
}

// Issue 10 item 4: within 3% over densities 1e9-1e14 cm^-2, diameters 1-10 nm, layer depths 0.1-10x the spacing
// (the 2D cell cannot hold particles that overlap: above ~5e13 cm^-2 for 1 nm particles it has no answer).
// The geometry's one chosen number, the steepness 10 of the flux area's passage from spherical to flat
// equipotentials at the cell radius (src/electrostatics/geometry.ts), was chosen on two training grids: the first
// grid below and 5e9, 5e10, 5e11, 2e12, 6e12, 2e13, 5e13 cm^-2 x 1, 2, 5, 10 nm x layer 0.15, 0.5, 2, 6x the spacing
// (70 points, worst 1.81%; steepness 8: 1.96%, 12: 1.81%, 16: 1.85%). The other two grids were not used to choose
// it. Before (smooth minimum of hemisphere area and footprint): 2.16% on the first grid, 4.52% on the second,
// 9.25% on the wider training grid (2e12 cm^-2, 5 nm, layer 0.15x the spacing).
describe('particle array cell against the 2D cell (issue 10 item 4)', () => {
  it('training grid: within 3% on 1e9-3e13 cm^-2 x 1, 3, 10 nm x layer 0.1, 1, 10x the spacing', () => {
    const { worst, rows } = worstOver([1e9, 1e10, 1e11, 1e12, 1e13, 3e13], [1, 3, 10], [0.1, 1, 10]);
    console.log(`array cell vs 2D cell, max |deviation| ${(100 * worst).toFixed(2)}%\n${rows.join('\n')}`);
    expect(rows.length).toBeGreaterThan(20);
    expect(worst).toBeLessThan(0.03);
  }, 900_000);
  it('held-out grid (3e9-3e12 cm^-2 x 1.5, 3, 7 nm x layer 0.3, 3x the spacing): within 3%', () => {
    const { worst, rows } = worstOver([3e9, 3e10, 3e11, 3e12], [1.5, 3, 7], [0.3, 3]);
    console.log(`held-out grid, max |deviation| ${(100 * worst).toFixed(2)}%\n${rows.join('\n')}`);
    expect(rows.length).toBeGreaterThan(15);
    expect(worst).toBeLessThan(0.03);
  }, 900_000);
  // a second held-out grid toward touching particles (R/a 2.3-4.7) and 1e13 cm^-2; its full version (2e9-4e13 cm^-2
  // x 1.2, 2.5, 4, 8 nm x layer 0.12, 0.25, 0.7, 1.5, 4, 8x the spacing, 104 points) gave worst 2.10% (4e12 cm^-2,
  // 2.5 nm, layer 1.5x the spacing)
  it('second held-out grid (2e11-1e13 cm^-2 x 1.2, 2.5, 8 nm x layer 0.12, 1.5x the spacing): within 3%', () => {
    const { worst, rows } = worstOver([2e11, 4e12, 1e13], [1.2, 2.5, 8], [0.12, 1.5]);
    console.log(`second held-out grid, max |deviation| ${(100 * worst).toFixed(2)}%\n${rows.join('\n')}`);
    expect(rows.length).toBeGreaterThan(8);
    expect(worst).toBeLessThan(0.03);
  }, 900_000);
});
