// A metal particle resting on a flat support, touching it through a flat circular footprint of radius a: the 2D
// axisymmetric reference (test/reference/disc2d.ts) checked against its two closed-form limits and for grid
// convergence, then used to measure the 1D `disc` geometry (src/electrostatics/geometry.ts).
import { describe, expect, it } from 'vitest';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../src/bulk/equilibrium.js';
import { disc, discArray } from '../src/electrostatics/geometry.js';
import { solvePoisson } from '../src/electrostatics/poisson.js';
import { solveDisc, solveDiscExtrapolated, screeningLengths, type DiscProblem } from './reference/disc2d.js';
import { CODATA2018, exactPlanarCharge } from './helpers.js';

const EPS = 8.5;
const T = 300;

/**
 * A wide-gap n-type support (3.3 eV gap, m_e* 0.24, m_h* 0.59, eps_r 8.5, fully ionised single donors), Boltzmann
 * statistics so that the Debye length is the textbook L_D = sqrt(eps eps0 kT / (q^2 N_D)) at every density used.
 */
function support(donors_m3: number, statistics: SupportElectronic['statistics'] = 'boltzmann'): SupportElectronic {
  return {
    temperature_K: T,
    bandGap_eV: 3.3,
    electronMass_me: 0.24,
    holeMass_me: 0.59,
    donors: { density_m3: donors_m3, kind: 'single' },
    acceptors: { density_m3: 0 },
    statistics,
  };
}

/** donor density giving a / L_D = ratio, L_D = sqrt(eps eps0 kT / (q^2 N_D)) (from memory of Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2, verify) */
function donorsFor(radius_m: number, ratio: number): number {
  const debye = radius_m / ratio;
  return (EPS * CODATA2018.eps0 * CODATA2018.k * T) / (CODATA2018.q * CODATA2018.q * debye * debye);
}

function problem(sup: SupportElectronic, radius_m: number, bandBending_eV: number): DiscProblem {
  const model = makeChargeModel(sup);
  const bulk = solveBulkNeutrality(model);
  return {
    model,
    bulkReducedFermiLevel: bulk.reducedFermiLevel,
    surfaceBending: bandBending_eV / model.kT_eV,
    relativePermittivity: EPS,
    temperature_K: T,
    radius_m,
  };
}

describe('2D disc reference: Laplace limit (nothing screens)', () => {
  // Undoped 3.3 eV-gap support at 300 K: intrinsic density ~1e-3 m^-3, Debye length of kilometres, so the domain holds
  // no space charge and the problem is the capacitance of a disc on a dielectric half-space. By symmetry the isolated
  // disc's potential has zero normal derivative on its plane outside the disc, so the half-space problem with a
  // flux-free surface is exactly half of it: Q = 4 eps0 eps_r a V, half of the isolated disc's C = 8 eps0 a
  // (from memory of Jackson, Classical Electrodynamics, 3rd ed., sec. 3.12, verify; the isolated disc's potential
  // Q arcsin(a/u) / (4 pi eps0 a) on the oblate spheroids u, hence C = 8 eps0 a, read in the phys-l mailing-list
  // archive, "Re: capacitance of a disk", Feb. 2001, https://www.phys-l.org/archives/2001/02_2001/msg00282.html).
  // u = 0 at finite Z and R_wall adds a little charge.
  const a = 2e-9;
  const bending_eV = 0.3;
  const base = problem(support(0), a, bending_eV);
  const volts = (base.surfaceBending * CODATA2018.k * T) / CODATA2018.q;
  const capacitor = 4 * CODATA2018.eps0 * EPS * a * volts;
  it('the flux charge tends to 4 eps0 eps_r a V as Z = R_wall grow (10a, 100a, 1000a)', () => {
    const rows: string[] = [];
    const deviations: number[] = [];
    let fineDeviation = 0;
    for (const size of [10, 100, 1000]) {
      const p = { ...base, wallRadius_m: size * a, depth_m: size * a };
      // premise: the Debye length dwarfs the domain
      expect(screeningLengths(p).debye_m).toBeGreaterThan(1e3 * size * a);
      const s = solveDiscExtrapolated(p);
      const deviation = s.fluxCharge_C / capacitor - 1;
      deviations.push(deviation);
      fineDeviation = s.fine.fluxCharge_C / capacitor - 1;
      rows.push(`Z = R_wall = ${size}a: Q/(4 eps a V) - 1 = ${(100 * deviation).toFixed(3)}% (80x64 cells ${(100 * fineDeviation).toFixed(3)}%, 40x32 ${(100 * (s.coarse.fluxCharge_C / capacitor - 1)).toFixed(3)}%)`);
      // no space charge: the support's own charge is nil against the flux charge
      expect(Math.abs(s.fine.charge_C)).toBeLessThan(1e-12 * s.fine.fluxCharge_C);
    }
    console.log(`Laplace limit, disc on a half-space (a = 2 nm, 0.3 V):\n${rows.join('\n')}`);
    // the finite domain only adds charge, less and less as it grows
    expect(deviations[0]!).toBeGreaterThan(deviations[1]!);
    expect(deviations[1]!).toBeGreaterThan(deviations[2]!);
    expect(deviations[2]!).toBeGreaterThan(-1e-3);
    expect(deviations[2]!).toBeLessThan(0.005);
    // the default grid alone (no extrapolation) within 1%
    expect(Math.abs(fineDeviation)).toBeLessThan(0.01);
  });
});

describe('2D disc reference: discrete Gauss law and signs', () => {
  // Gauss's law (common practice, no source) on the discrete system: the flux through the footprint equals the space charge
  // once the layer lies inside the domain (the default domain ends 15 Debye lengths beyond the layer)
  for (const [radius_nm, ratio, bending_eV] of [
    [3, 1, 0.8],
    [1, 0.2, 0.3],
    [3, 1, -0.2],
  ] as const) {
    it(`a = ${radius_nm} nm, a/L_D = ${ratio}, ${bending_eV} eV: flux charge = space charge to 1e-5, sign of the bending`, () => {
      const a = radius_nm * 1e-9;
      const s = solveDisc(problem(support(donorsFor(a, ratio)), a, bending_eV));
      expect(Math.abs(s.fluxCharge_C / s.charge_C - 1)).toBeLessThan(1e-5);
      // depletion of an n-type support leaves it positive, accumulation negative (sign convention of poisson.ts)
      expect(Math.sign(s.charge_C)).toBe(Math.sign(bending_eV));
    });
  }
});

describe('2D disc reference: thin-layer limit (layer << a)', () => {
  // The layer under a disc much wider than it is planar: Q -> pi a^2 Q_planar, Q_planar from the exact first
  // integral (from memory of Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 4, verify; exactPlanarCharge in test/helpers.ts),
  // plus the charge round the rim, of order perimeter x layer length / area = 2 L/a relative (an order-of-magnitude
  // estimate, common practice, no source). L = |u_s / u'(0)| of the planar layer (half the depletion width).
  for (const bending_eV of [0.3, 0.8]) {
    it(`depletion ${bending_eV} eV, a = 10 nm, a/L_D = 20, 50, 200: ratio -> 1 with a rim excess ~ L/a`, () => {
      const a = 10e-9;
      const rows: string[] = [];
      const excesses: number[] = [];
      for (const ratio of [20, 50, 200]) {
        const sup = support(donorsFor(a, ratio));
        const s = solveDiscExtrapolated(problem(sup, a, bending_eV));
        const planar = Math.PI * a * a * exactPlanarCharge(sup, EPS, bending_eV);
        const excess = s.charge_C / planar - 1;
        const layer = s.fine.layerLength_m;
        excesses.push(excess);
        rows.push(`a/L_D ${ratio}, a/L ${(a / layer).toFixed(1)}: Q2D/(pi a^2 Q_planar) = ${(1 + excess).toFixed(5)}, excess x a/L = ${((excess * a) / layer).toFixed(3)}`);
        // the rim adds charge, an order-one multiple of perimeter x L / area
        expect(excess).toBeGreaterThan(0);
        expect((excess * a) / layer).toBeGreaterThan(0.25);
        expect((excess * a) / layer).toBeLessThan(4);
      }
      console.log(`thin-layer limit, ${bending_eV} eV:\n${rows.join('\n')}`);
      expect(excesses[1]!).toBeLessThan(excesses[0]!);
      expect(excesses[2]!).toBeLessThan(excesses[1]!);
      expect(excesses[2]!).toBeLessThan(0.03);
    });
  }
  it('accumulation -0.2 eV, a = 10 nm, a/L_D = 20, 200: within 1% of pi a^2 Q_planar', () => {
    const a = 10e-9;
    for (const ratio of [20, 200]) {
      const sup = support(donorsFor(a, ratio));
      const s = solveDiscExtrapolated(problem(sup, a, -0.2));
      const planar = Math.PI * a * a * exactPlanarCharge(sup, EPS, -0.2);
      console.log(`thin-layer limit, -0.2 eV, a/L_D ${ratio}: Q2D/(pi a^2 Q_planar) = ${(s.charge_C / planar).toFixed(5)}`);
      expect(s.charge_C / planar).toBeGreaterThan(1);
      expect(s.charge_C / planar - 1).toBeLessThan(0.01);
    }
  });
});

describe('2D disc reference: grid convergence', () => {
  // Halving every cell (40x32 -> 80x64 -> 160x128 cells, first cells halved too) at a/L_D = 1, 0.8 eV: the changes
  // shrink by ~4 (second order; common practice, no source), and the last one is small
  it('a = 3 nm, a/L_D = 1, 0.8 eV: successive changes shrink by 3-5.5x, the last below 0.5%', () => {
    const a = 3e-9;
    const p = problem(support(donorsFor(a, 1)), a, 0.8);
    const q = [40, 80, 160].map((cells) => solveDisc({ ...p, nodesR: cells, nodesZ: (cells * 4) / 5 }).charge_C);
    const d1 = q[1]! - q[0]!;
    const d2 = q[2]! - q[1]!;
    console.log(`grid convergence: Q(40) ${q[0]!.toExponential(6)}, Q(80) ${q[1]!.toExponential(6)}, Q(160) ${q[2]!.toExponential(6)} C; changes ${((100 * d1) / q[2]!).toFixed(3)}%, ${((100 * d2) / q[2]!).toFixed(3)}%, ratio ${(d1 / d2).toFixed(2)}`);
    expect(d1 / d2).toBeGreaterThan(3);
    expect(d1 / d2).toBeLessThan(5.5);
    expect(Math.abs(d2 / q[2]!)).toBeLessThan(0.005);
  }, 60_000);
});

/** 1D charge of the `disc` geometry over the (Richardson-extrapolated) 2D charge, with the 2D's lengths */
function compare(sup: SupportElectronic, radius_m: number, bendingEv: number) {
  const p = problem(sup, radius_m, bendingEv);
  const reference = solveDiscExtrapolated(p);
  const oneD = solvePoisson({
    model: p.model,
    bulkReducedFermiLevel: p.bulkReducedFermiLevel,
    surfaceBending: p.surfaceBending,
    relativePermittivity: p.relativePermittivity,
    temperature_K: p.temperature_K,
    geometry: disc(radius_m),
  });
  return {
    ratio: oneD.totalCharge_C / reference.charge_C,
    aOverDebye: radius_m / reference.fine.debyeLength_m,
    aOverLayer: radius_m / reference.fine.layerLength_m,
    error2D: reference.errorEstimate,
  };
}

function tableRow(radius_nm: number, nominal: number, bendingEv: number, c: ReturnType<typeof compare>): string {
  return `${radius_nm.toString().padStart(3)} nm  a/L_D ${nominal.toString().padStart(5)} (model ${c.aOverDebye.toFixed(2).padStart(6)})  a/L ${c.aOverLayer.toFixed(2).padStart(6)}  ${bendingEv.toFixed(1).padStart(4)} eV  1D/2D ${c.ratio.toFixed(4)}  (2D unextrapolated error ${(100 * c.error2D).toFixed(2)}%)`;
}

// The 1D `disc` geometry (oblate-spheroidal flux tube, src/electrostatics/geometry.ts) against the 2D reference.
// Nothing here is tuned: the bounds are the worst deviations MEASURED on 2026-12-04 (in brackets) plus a small
// margin, so the test records them and fails if they grow. Expectation stated by the geometry's author: exact in
// the Laplace limit, sqrt(4/3) = 1.155 too high in the thin-layer limit.
describe('1D disc geometry against the 2D reference', () => {
  it('Boltzmann table: radii 1, 3, 10 nm x a/L_D 0.05-20 x +0.3, +0.8, -0.2 eV', () => {
    const rows: string[] = [];
    let worst = 0;
    let worstLaplace = 0;
    let lowest = Infinity;
    const byScale = new Map<string, number[]>();
    for (const bendingEv of [0.3, 0.8, -0.2]) {
      for (const radius_nm of [1, 3, 10]) {
        for (const nominal of [0.05, 0.2, 1, 5, 20]) {
          const a = radius_nm * 1e-9;
          const c = compare(support(donorsFor(a, nominal)), a, bendingEv);
          rows.push(tableRow(radius_nm, nominal, bendingEv, c));
          worst = Math.max(worst, Math.abs(c.ratio - 1));
          lowest = Math.min(lowest, c.ratio);
          if (nominal === 0.05) worstLaplace = Math.max(worstLaplace, Math.abs(c.ratio - 1));
          const key = `${bendingEv} ${nominal}`;
          byScale.set(key, [...(byScale.get(key) ?? []), c.ratio]);
        }
      }
    }
    console.log(`1D disc / 2D disc, Boltzmann statistics (worst |1D/2D - 1| ${(100 * worst).toFixed(2)}%, a/L_D = 0.05: ${(100 * worstLaplace).toFixed(3)}%):\n${rows.join('\n')}`);
    // with Boltzmann statistics and fully ionised donors the reduced equation has no length but L_D, so both solvers
    // must give the same ratio at the three radii for the same a/L_D and bending (dimensional analysis)
    for (const ratios of byScale.values()) expect(Math.max(...ratios) - Math.min(...ratios)).toBeLessThan(2e-4);
    // Laplace end (a/L_D = 0.05): exact, as stated [0.04%]
    expect(worstLaplace).toBeLessThan(0.002);
    // never below the 2D charge beyond the 2D's error [0.9998]
    expect(lowest).toBeGreaterThan(0.997);
    // worst over the table: the thin accumulation layer at a/L_D = 20 [15.11%]
    expect(worst).toBeLessThan(0.16);
  }, 60_000);

  it('thin-layer trend (Boltzmann, a = 10 nm, a/L_D 50, 200, 1000): 1D/2D rises toward sqrt(4/3)', () => {
    const a = 10e-9;
    const rows: string[] = [];
    for (const bendingEv of [0.3, 0.8]) {
      const ratios: number[] = [];
      for (const nominal of [50, 200, 1000]) {
        const c = compare(support(donorsFor(a, nominal)), a, bendingEv);
        ratios.push(c.ratio);
        rows.push(tableRow(10, nominal, bendingEv, c));
      }
      expect(ratios[1]!).toBeGreaterThan(ratios[0]!);
      expect(ratios[2]!).toBeGreaterThan(ratios[1]!);
      // the stated thin-layer limit sqrt(4/3) bounds the ratio from above (the 2D rim excess only lowers it)
      expect(ratios[2]!).toBeLessThan(Math.sqrt(4 / 3) + 0.003);
    }
    console.log(`1D disc / 2D disc toward the thin-layer limit (sqrt(4/3) = ${Math.sqrt(4 / 3).toFixed(4)}):\n${rows.join('\n')}`);
  }, 60_000);

  it('Fermi-Dirac rows (a = 1, 10 nm x nominal a/L_D 1, 20 x +0.3, +0.8, -0.2 eV): degenerate screening', () => {
    const rows: string[] = [];
    let worst = 0;
    for (const bendingEv of [0.3, 0.8, -0.2]) {
      for (const radius_nm of [1, 10]) {
        for (const nominal of [1, 20]) {
          const a = radius_nm * 1e-9;
          const c = compare(support(donorsFor(a, nominal), 'fermi-dirac'), a, bendingEv);
          rows.push(tableRow(radius_nm, nominal, bendingEv, c));
          worst = Math.max(worst, Math.abs(c.ratio - 1));
        }
      }
    }
    console.log(`1D disc / 2D disc, Fermi-Dirac statistics (worst ${(100 * worst).toFixed(2)}%):\n${rows.join('\n')}`);
    // [7.32%: 10 nm, -0.2 eV, nominal a/L_D 20]
    expect(worst).toBeLessThan(0.08);
  }, 60_000);
});

describe('1D disc-array cell (src/electrostatics/geometry.ts, discArray) against the 2D disc with a flux-free wall at the cell radius', () => {
  it('cells from near-touching (R = 1.5 a) to isolated (10 a) x a/L_D 0.1, 1, 5 x +0.3, +0.8 eV: within 7% (the flux-area join reuses the particle array\'s centre and steepness, not refitted)', () => {
    const a = 2e-9;
    const rows: string[] = [];
    let worst = 0;
    let lowest = Infinity;
    for (const cellRatio of [1.5, 3, 10]) {
      for (const nominal of [0.1, 1, 5]) {
        for (const bendingEv of [0.3, 0.8]) {
          const R = cellRatio * a;
          const p = problem(support(donorsFor(a, nominal)), a, bendingEv);
          const oneD = solvePoisson({ ...p, geometry: discArray(a, 1 / (Math.PI * R * R)) }).totalCharge_C;
          const isolated = solvePoisson({ ...p, geometry: disc(a) }).totalCharge_C;
          const twoD = solveDiscExtrapolated({ ...p, wallRadius_m: R }).charge_C;
          const ratio = oneD / twoD;
          worst = Math.max(worst, Math.abs(ratio - 1));
          lowest = Math.min(lowest, ratio);
          rows.push(`R/a ${cellRatio}, a/L_D ${nominal}, ${bendingEv} eV: disc-array/2D ${ratio.toFixed(4)}, isolated disc/2D ${(isolated / twoD).toFixed(3)}`);
        }
      }
    }
    console.log(`1D disc-array cell / 2D disc cell (worst ${(100 * worst).toFixed(2)}%):\n${rows.join('\n')}`);
    // measured: 0.9998-1.0631 (worst: R = 1.5 a, a/L_D = 1, +0.3 eV); the isolated disc is up to 24x off in the same cells
    expect(worst).toBeLessThan(0.07);
    expect(lowest).toBeGreaterThan(0.995);
  }, 120_000);
});
