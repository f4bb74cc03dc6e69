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

describe('flux tube against the 2D cell (densities 1e9-1e13 cm^-2, diameters 1 and 5 nm, layer 0.1-10x spacing)', () => {
  it('reports the deviation; the flux tube (exponent 4 chosen on this grid) stays within 12%', () => {
    const rows: string[] = [];
    let worst = 0;
    for (const density_cm2 of [1e9, 1e11, 1e12, 1e13]) {
      const n = density_cm2 * 1e4;
      const spacing = 1 / Math.sqrt(n);
      for (const diameter_nm of [1, 5]) {
        const a = diameter_nm * 0.5e-9;
        if (1 / Math.sqrt(Math.PI * n) < 1.5 * a) continue; // particles would touch
        for (const ratio of [0.1, 1, 10]) {
          // donors for a depletion width W = ratio x spacing: W = sqrt(2 eps (V - kT/q) / (q N_D)) (Sze & Ng ch. 3)
          const w = ratio * spacing;
          const donors = (2 * EPS * CODATA2018.eps0 * (BENDING_EV - 0.0259)) / (CODATA2018.q * w * w);
          if (donors < 1e18 || donors > 1e27) continue; // outside the documented 1e12-1e21 cm^-3
          const base = setup(donors);
          const tube = solvePoisson({ ...base, geometry: particleArray(a, n) });
          const cell = solveCell({ ...base, radius_m: a, particleDensity_m2: n, depth_m: Math.max(1.5 * tube.domain_m, 3 * w, 2 * spacing) });
          const deviation = tube.totalCharge_C / cell.charge_C - 1;
          worst = Math.max(worst, Math.abs(deviation));
          rows.push(`${density_cm2.toExponential(0)} cm^-2, d ${diameter_nm} nm, W/s ${ratio}: cell ${(cell.charge_C / CODATA2018.q).toPrecision(4)} e, tube ${(tube.totalCharge_C / CODATA2018.q).toPrecision(4)} e, ${(100 * deviation).toFixed(1)}%`);
        }
      }
    }
    console.log(`flux tube vs 2D cell, max |deviation| ${(100 * worst).toFixed(1)}%\n${rows.join('\n')}`);
    expect(rows.length).toBeGreaterThan(10);
    expect(worst).toBeLessThan(0.12);
  }, 600_000);
  it('held-out grid (3e10-3e12 cm^-2, 2 and 8 nm, layer 0.3 and 3x spacing, not used to choose the exponent): within 5%', () => {
    let worst = 0;
    for (const density_cm2 of [3e10, 3e11, 3e12]) {
      const n = density_cm2 * 1e4;
      const spacing = 1 / Math.sqrt(n);
      for (const diameter_nm of [2, 8]) {
        const a = diameter_nm * 0.5e-9;
        if (1 / Math.sqrt(Math.PI * n) < 1.5 * a) continue;
        for (const ratio of [0.3, 3]) {
          const w = ratio * spacing;
          const donors = (2 * EPS * CODATA2018.eps0 * (BENDING_EV - 0.0259)) / (CODATA2018.q * w * w);
          if (donors < 1e18 || donors > 1e27) continue;
          const base = setup(donors);
          const tube = solvePoisson({ ...base, geometry: particleArray(a, n) });
          const cell = solveCell({ ...base, radius_m: a, particleDensity_m2: n, depth_m: Math.max(1.5 * tube.domain_m, 3 * w, 2 * spacing) });
          worst = Math.max(worst, Math.abs(tube.totalCharge_C / cell.charge_C - 1));
        }
      }
    }
    expect(worst).toBeLessThan(0.05);
  }, 600_000);
  it.todo('within 3% of the 2D cell over the whole grid (issue 10 item 4: needs a correction or the 2D solve in src)');
});
