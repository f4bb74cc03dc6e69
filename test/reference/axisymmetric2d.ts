// Reference 2D axisymmetric cell solution (r, z) for a particle array, written for the tests (issue 10 item 4).
// One particle per cylindrical cell of radius R_cell = 1/sqrt(pi N) (the circle with the same area as the
// hexagonal/square cell): a hemispherical particle of radius a at the origin on the free surface z = 0, the
// support below (z > 0). Boundary conditions: u = u_s on the particle (fixed band bending), zero flux on the cell
// wall r = R_cell and on the free surface z = 0 outside the particle, u = 0 (bulk) at depth z = Z.
// Equation (reduced units, as in src/electrostatics/poisson.ts):
//   (1/r) d/dr (r du/dr) + d2u/dz2 = beta (N(xi_b - u) - N(xi_b))
// Method: vertex-centred finite volumes on a graded tensor grid; control volumes cut by the particle keep only
// their support part (volume fraction by 16 x 16 sub-sampling, uniform in r^2 and z); a face whose neighbour lies
// inside the particle takes the particle value at the boundary crossing along the grid line (Shortley & Weller,
// J. Appl. Phys. 9, 334 (1938)); damped Newton with a banded LU (the Jacobian is an M-matrix, no pivoting).
// Total support charge = sum of q N V over the cut control volumes.
import { CODATA2018 } from '../helpers.js';
import { dampedNewton, graded, solveBandedInPlace, type SupportProblem } from './grid2d.js';

export interface CellProblem extends SupportProblem {
  radius_m: number;
  particleDensity_m2: number;
  /** depth of the bulk boundary, m */
  depth_m: number;
  /** grid nodes in r and z (graded) */
  nodesR?: number;
  nodesZ?: number;
}

export interface CellSolution {
  charge_C: number;
  iterations: number;
  nodes: number;
}


export function solveCell(p: CellProblem): CellSolution {
  const a = p.radius_m;
  const R = 1 / Math.sqrt(Math.PI * p.particleDensity_m2);
  const Z = p.depth_m;
  const nr = p.nodesR ?? 70;
  const nz = p.nodesZ ?? 90;
  const r = graded(R, Math.min(a / 12, R / nr), nr);
  const z = graded(Z, Math.min(a / 12, Z / nz), nz);
  const beta = (CODATA2018.q * CODATA2018.q) / (p.relativePermittivity * CODATA2018.eps0 * CODATA2018.k * p.temperature_K);
  const us = p.surfaceBending;
  const inside = (rr: number, zz: number): boolean => rr * rr + zz * zz <= a * a;
  const cols = nr + 1;
  const rowsZ = nz; // z_nz is Dirichlet (bulk)
  const index = (i: number, j: number): number => j * cols + i;
  const n = cols * rowsZ;
  const metal = new Uint8Array(n);
  const volume = new Float64Array(n);
  const rFace = (i: number): number => (i < 0 ? 0 : i >= nr ? R : 0.5 * (r[i]! + r[i + 1]!));
  const zFace = (j: number): number => (j < 0 ? 0 : j >= nz ? Z : 0.5 * (z[j]! + z[j + 1]!));
  for (let j = 0; j < rowsZ; j++) {
    for (let i = 0; i < cols; i++) {
      const k = index(i, j);
      if (inside(r[i]!, z[j]!)) {
        metal[k] = 1;
        continue;
      }
      const r0 = rFace(i - 1);
      const r1 = rFace(i);
      const z0 = zFace(j - 1);
      const z1 = zFace(j);
      let free = 0;
      const m = 16;
      for (let s = 0; s < m; s++) {
        const rr = Math.sqrt(r0 * r0 + ((s + 0.5) / m) * (r1 * r1 - r0 * r0));
        for (let t = 0; t < m; t++) if (!inside(rr, z0 + ((t + 0.5) / m) * (z1 - z0))) free++;
      }
      volume[k] = Math.PI * (r1 * r1 - r0 * r0) * (z1 - z0) * (free / (m * m));
    }
  }
  // face coefficients (area / distance) to the four neighbours; a metal neighbour is replaced by the boundary point
  const cW = new Float64Array(n);
  const cE = new Float64Array(n);
  const cN = new Float64Array(n); // toward z - dz (surface side)
  const cS = new Float64Array(n); // toward z + dz (bulk side)
  const metalW = new Float64Array(n); // coefficient to u_s from a metal neighbour
  for (let j = 0; j < rowsZ; j++) {
    for (let i = 0; i < cols; i++) {
      const k = index(i, j);
      if (metal[k]) continue;
      const dz = zFace(j) - zFace(j - 1);
      const ringArea = Math.PI * (rFace(i) ** 2 - rFace(i - 1) ** 2);
      const couple = (ni: number, nj: number, area: number, distance: number, along: 'r' | 'z', sign: number): [number, number] => {
        if (!metal[index(ni, nj)]) return [area / distance, 0];
        // distance to the sphere along the grid line
        const d = along === 'r' ? r[i]! - Math.sqrt(Math.max(0, a * a - z[j]! * z[j]!)) : z[j]! - Math.sqrt(Math.max(0, a * a - r[i]! * r[i]!));
        void sign;
        return [0, area / Math.max(d, 1e-3 * distance)];
      };
      if (i > 0) {
        const [c, m] = couple(i - 1, j, 2 * Math.PI * rFace(i - 1) * dz, r[i]! - r[i - 1]!, 'r', -1);
        cW[k] = c;
        metalW[k] += m;
      }
      if (i < nr) cE[k] = (2 * Math.PI * rFace(i) * dz) / (r[i + 1]! - r[i]!);
      if (j > 0) {
        const [c, m] = couple(i, j - 1, ringArea, z[j]! - z[j - 1]!, 'z', -1);
        cN[k] = c;
        metalW[k] += m;
      }
      // bulk side: node j+1 (Dirichlet u = 0 at j = nz)
      cS[k] = ringArea / (z[j + 1]! - z[j]!);
    }
  }
  // initial guess: planar-like decay with distance from the particle surface
  const u = new Float64Array(n);
  for (let j = 0; j < rowsZ; j++) for (let i = 0; i < cols; i++) u[index(i, j)] = metal[index(i, j)] ? us : us * Math.exp(-(Math.hypot(r[i]!, z[j]!) - a) / (0.3 * Z));
  // banded Jacobian, bandwidth cols
  const bw = cols;
  const width = 2 * bw + 1;
  const band = new Float64Array(n * width);
  const res = new Float64Array(n);
  const out = new Float64Array(2);
  const residue = (() => {
    p.model.netCharge(p.bulkReducedFermiLevel, out);
    return out[0]!;
  })();
  const residual = (vals: Float64Array, withJacobian: boolean): number => {
    if (withJacobian) band.fill(0);
    let norm = 0;
    for (let j = 0; j < rowsZ; j++) {
      for (let i = 0; i < cols; i++) {
        const k = index(i, j);
        if (metal[k]) {
          res[k] = vals[k]! - us;
          if (withJacobian) band[k * width + bw] = 1;
          continue;
        }
        p.model.netCharge(p.bulkReducedFermiLevel - vals[k]!, out);
        const uk = vals[k]!;
        let f = -beta * volume[k]! * (out[0]! - residue) + metalW[k]! * (us - uk) - cS[k]! * uk;
        let d = beta * volume[k]! * out[1]! - metalW[k]! - cS[k]!;
        if (j + 1 < rowsZ) {
          f += cS[k]! * vals[index(i, j + 1)]!;
          if (withJacobian) band[k * width + bw + (index(i, j + 1) - k)] = cS[k]!;
        }
        if (i > 0 && cW[k]! > 0) {
          f += cW[k]! * (vals[k - 1]! - uk);
          d -= cW[k]!;
          if (withJacobian) band[k * width + bw - 1] = cW[k]!;
        }
        if (i < nr && cE[k]! > 0) {
          f += cE[k]! * (vals[k + 1]! - uk);
          d -= cE[k]!;
          if (withJacobian) band[k * width + bw + 1] = cE[k]!;
        }
        if (j > 0 && cN[k]! > 0) {
          f += cN[k]! * (vals[index(i, j - 1)]! - uk);
          d -= cN[k]!;
          if (withJacobian) band[k * width + bw - cols] = cN[k]!;
        }
        res[k] = f;
        if (withJacobian) band[k * width + bw] = d;
        const scaled = f / d;
        norm += scaled * scaled;
      }
    }
    return Math.sqrt(norm / n);
  };
  const solveBand = (b: Float64Array): void => solveBandedInPlace(band, width, bw, n, b);

  const iterations = dampedNewton(u, res, residual, solveBand, { cap: Math.max(5, 0.25 * Math.abs(us)), stepTolerance: 1e-9 * Math.max(1, Math.abs(us)), minStep: 1e-10, maxIterations: 200 });
  if (iterations === null) throw new Error('2D reference: Newton did not converge');
  let chargeSum = 0;
  for (let k = 0; k < n; k++) {
    if (metal[k]) continue;
    p.model.netCharge(p.bulkReducedFermiLevel - u[k]!, out);
    chargeSum += (out[0]! - residue) * volume[k]!;
  }
  return { charge_C: CODATA2018.q * chargeSum, iterations, nodes: n };
}
