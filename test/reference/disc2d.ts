// Reference 2D axisymmetric solution (r, z) for one metal particle RESTING on a flat support and touching it through
// a flat circular footprint (a disc) of radius a, written for the tests (test/disc2d.test.ts) to check the 1D `disc`
// geometry. Independent of src/electrostatics: only the charge model is shared (as in axisymmetric2d.ts).
// Domain: the support z > 0 (depth z, radius r), r <= R_wall, z <= Z. Boundary conditions:
//   - u = u_s on the footprint (z = 0, r <= a): the metal;
//   - zero flux on the free surface z = 0, r > a (the gas above has negligible permittivity);
//   - zero flux on the wall r = R_wall; u = 0 (bulk) at z = Z.
// R_wall and Z default to many screening lengths beyond the particle, so the particle is isolated.
// Equation (reduced units, as in src/electrostatics/poisson.ts and test/reference/axisymmetric2d.ts):
//   (1/r) d/dr (r du/dr) + d2u/dz2 = beta (N(xi_b - u) - N(xi_b)),   beta = q^2 / (eps eps0 k T)
// Method: vertex-centred finite volumes on a graded tensor grid, with one node on the disc edge (r = a, z = 0) and
// the cells shrinking geometrically toward it in r (from both sides) and in z (toward the surface): the field of a
// disc is singular there like 1/sqrt(distance) (from memory of Jackson, Classical Electrodynamics, 3rd ed.,
// sec. 3.12, verify; the charge density of the disc ~ 1/sqrt(a^2 - r^2) follows from the potential read in the
// phys-l archive, https://www.phys-l.org/archives/2001/02_2001/msg00282.html), so the
// grid has to resolve every scale from the singularity up to the domain. Damped Newton with a banded LU (the
// Jacobian is an M-matrix, no pivoting), as in axisymmetric2d.ts.
// Charges (C, positive when the support is positive, i.e. u_s > 0 depletes an n-type support, as in poisson.ts):
//   charge_C     = q sum (N - N_b) V over every control volume (those of the footprint nodes included, at u = u_s);
//   fluxCharge_C = (eps eps0 kT / q) * integral over the footprint of -du/dz (Gauss), from the discrete balance of
//                  the footprint nodes' control volumes. It is the charge the support holds against the particle
//                  whether that charge is space charge (then it equals charge_C up to the flux leaving at z = Z)
//                  or, with nothing screening (N = 0), the charge at the bulk boundary: the capacitance problem.
import { CODATA2018 } from '../helpers.js';
import { dampedNewton, graded, solveBandedInPlace, type SupportProblem } from './grid2d.js';

export interface DiscProblem extends SupportProblem {
  /** radius a of the contact disc, m */
  radius_m: number;
  /** radius of the zero-flux wall, m (default: a + depth, see defaultDomain) */
  wallRadius_m?: number;
  /** depth of the bulk boundary u = 0, m (default: see defaultDomain) */
  depth_m?: number;
  /** grid cells in r and z (default 80 and 64); doubling both halves the cells (first cells halved too) */
  nodesR?: number;
  nodesZ?: number;
}

export interface DiscSolution {
  /** q sum (N - N_b) V, C */
  charge_C: number;
  /** eps eps0 (kT/q) times the flux of -du/dz through the footprint, C */
  fluxCharge_C: number;
  iterations: number;
  /** unknowns of the grid (including the Dirichlet footprint nodes) */
  nodes: number;
  wallRadius_m: number;
  depth_m: number;
  /** screening lengths used for the defaults and the grid: bulk Debye length and planar layer length, m (Infinity: none) */
  debyeLength_m: number;
  layerLength_m: number;
}


/**
 * Screening lengths of the problem, m: the bulk (linear) Debye length 1/sqrt(beta dN/du) and the planar layer
 * length |u_s / u'(0)| with u'(0)^2 = 2 beta int_0^u_s (N - N_b) du (the planar first integral; from memory of Sze & Ng, Physics of
 * Semiconductor Devices, 3rd ed., ch. 4, verify), by Simpson's rule here. Infinity when nothing screens.
 */
export function screeningLengths(p: DiscProblem): { debye_m: number; layer_m: number } {
  const beta = betaOf(p);
  const out = new Float64Array(2);
  p.model.netCharge(p.bulkReducedFermiLevel, out);
  const residue = out[0]!;
  const slope = -out[1]!;
  const debye = slope > 0 && Number.isFinite(slope) ? 1 / Math.sqrt(beta * slope) : Infinity;
  const us = p.surfaceBending;
  const m = 4000;
  const h = us / m;
  let integral = 0;
  for (let k = 0; k <= m; k++) {
    p.model.netCharge(p.bulkReducedFermiLevel - k * h, out);
    const w = k === 0 || k === m ? 1 : k % 2 === 1 ? 4 : 2;
    integral += w * (out[0]! - residue);
  }
  integral *= h / 3;
  const slope0 = Math.sqrt(Math.max(0, 2 * beta * integral));
  const layer = slope0 > 0 && Number.isFinite(slope0) ? Math.abs(us) / slope0 : Infinity;
  return { debye_m: debye, layer_m: layer };
}

function betaOf(p: DiscProblem): number {
  return (CODATA2018.q * CODATA2018.q) / (p.relativePermittivity * CODATA2018.eps0 * CODATA2018.k * p.temperature_K);
}

/**
 * Default domain: Z = 2 x (planar layer length) + 15 Debye lengths (the depletion layer is ~2 layer lengths deep,
 * and its tail decays as exp(-z/L_D): e^-15 ~ 3e-7); 1000a when nothing screens. R_wall = a + Z. Around a disc
 * much smaller than the Debye length the potential falls like a/rho and then exponentially, so Z >> a there too;
 * under a disc much wider than the layer the layer is planar and Z need not exceed a.
 */
export function defaultDomain(p: DiscProblem): { wallRadius_m: number; depth_m: number } {
  const a = p.radius_m;
  const { debye_m, layer_m } = screeningLengths(p);
  let depth = 1000 * a;
  if (Number.isFinite(debye_m)) depth = 15 * debye_m + (Number.isFinite(layer_m) ? 2 * layer_m : 0);
  return { wallRadius_m: a + depth, depth_m: depth };
}

function requirePositive(field: string, value: number | undefined): void {
  if (value !== undefined && !(value > 0 && Number.isFinite(value))) throw new RangeError(`${field} must be a positive finite number, got ${value}`);
}

export function solveDisc(p: DiscProblem): DiscSolution {
  requirePositive('radius_m', p.radius_m);
  requirePositive('wallRadius_m', p.wallRadius_m);
  requirePositive('depth_m', p.depth_m);
  requirePositive('relativePermittivity', p.relativePermittivity);
  requirePositive('temperature_K', p.temperature_K);
  if (!Number.isFinite(p.surfaceBending)) throw new RangeError(`surfaceBending must be finite, got ${p.surfaceBending}`);
  const a = p.radius_m;
  const defaults = defaultDomain(p);
  const R = p.wallRadius_m ?? defaults.wallRadius_m;
  const Z = p.depth_m ?? defaults.depth_m;
  if (!(R > a)) throw new RangeError(`wallRadius_m ${R} must exceed radius_m ${a}`);
  const cellsR = Math.round(p.nodesR ?? 80);
  const cellsZ = Math.round(p.nodesZ ?? 64);
  if (!(cellsR >= 16 && cellsZ >= 12)) throw new RangeError(`nodesR >= 16 and nodesZ >= 12 required, got ${cellsR}, ${cellsZ}`);
  const { debye_m, layer_m } = screeningLengths(p);
  // finest cell at the disc edge: a small fraction of the smallest length (disc, layer, Debye), halved when the
  // cells are halved (reference: 80 cells in r)
  const fine = Math.min(a, debye_m, layer_m);
  const h0 = (fine * 1e-3 * 80) / cellsR;
  // r: [0, a] graded toward the edge (a third of the cells), [a, R] graded away from it
  const inner = Math.max(6, Math.round(cellsR / 3));
  const outer = cellsR - inner;
  const rIn = graded(a, h0, inner).map((s) => a - s).reverse();
  const rOut = graded(R - a, h0, outer).map((s) => a + s);
  const r = [...rIn, ...rOut.slice(1)];
  r[0] = 0;
  const z = graded(Z, h0, cellsZ);
  const nr = r.length - 1;
  const nz = z.length - 1;
  const beta = betaOf(p);
  const us = p.surfaceBending;
  const cols = nr + 1;
  const rowsZ = nz; // z_nz is the Dirichlet bulk boundary, not an unknown
  const n = cols * rowsZ;
  const index = (i: number, j: number): number => j * cols + i;
  // footprint nodes: z = 0, r <= a (the node at r = a is the edge)
  const footprint = new Uint8Array(n);
  for (let i = 0; i < cols; i++) if (r[i]! <= a * (1 + 1e-12)) footprint[index(i, 0)] = 1;
  const rFace = (i: number): number => (i < 0 ? 0 : i >= nr ? R : 0.5 * (r[i]! + r[i + 1]!));
  const zFace = (j: number): number => (j < 0 ? 0 : j >= nz ? Z : 0.5 * (z[j]! + z[j + 1]!));
  const volume = new Float64Array(n);
  // coupling (face area / node distance) to the east (r+) and south (z+, bulk side) neighbours; west and north are
  // the east and south of the neighbour (symmetric)
  const cE = new Float64Array(n);
  const cS = new Float64Array(n);
  for (let j = 0; j < rowsZ; j++) {
    const dz = zFace(j) - zFace(j - 1);
    for (let i = 0; i < cols; i++) {
      const k = index(i, j);
      const ring = Math.PI * (rFace(i) ** 2 - rFace(i - 1) ** 2);
      volume[k] = ring * dz;
      if (i < nr) cE[k] = (2 * Math.PI * rFace(i) * dz) / (r[i + 1]! - r[i]!);
      cS[k] = ring / (z[j + 1]! - z[j]!);
    }
  }
  const out = new Float64Array(2);
  p.model.netCharge(p.bulkReducedFermiLevel, out);
  const residue = out[0]!;
  // initial guess: the Laplace potential of the disc, (2/pi) arcsin(2a / (rho+ + rho-)) with rho+- the distances
  // to the edge circle (the arcsin(a/u) potential on the oblate spheroids u = (rho+ + rho-)/2, phys-l archive cited
  // above), damped over the layer length beyond the disc
  const decay = Math.min(Number.isFinite(layer_m) ? layer_m : Infinity, Number.isFinite(debye_m) ? 2 * debye_m : Infinity);
  const u = new Float64Array(n);
  for (let j = 0; j < rowsZ; j++) {
    for (let i = 0; i < cols; i++) {
      const k = index(i, j);
      if (footprint[k]) {
        u[k] = us;
        continue;
      }
      const rr = r[i]!;
      const zz = z[j]!;
      const sum = Math.hypot(rr + a, zz) + Math.hypot(rr - a, zz);
      const laplace = (2 / Math.PI) * Math.asin(Math.min(1, (2 * a) / sum));
      const distance = Math.hypot(Math.max(0, rr - a), zz);
      u[k] = us * laplace * (Number.isFinite(decay) ? Math.exp(-distance / decay) : 1);
    }
  }
  // banded Jacobian, half-bandwidth cols
  const bw = cols;
  const width = 2 * bw + 1;
  const band = new Float64Array(n * width);
  const res = new Float64Array(n);
  const residual = (vals: Float64Array, withJacobian: boolean): number => {
    if (withJacobian) band.fill(0);
    let norm = 0;
    let free = 0;
    for (let j = 0; j < rowsZ; j++) {
      for (let i = 0; i < cols; i++) {
        const k = index(i, j);
        if (footprint[k]) {
          res[k] = vals[k]! - us;
          if (withJacobian) band[k * width + bw] = 1;
          continue;
        }
        const uk = vals[k]!;
        p.model.netCharge(p.bulkReducedFermiLevel - uk, out);
        // finite-volume balance: sum c (u_nb - u_k) = beta V (N - N_b); dN/du = -dN/dxi
        let f = -beta * volume[k]! * (out[0]! - residue);
        let d = beta * volume[k]! * out[1]!;
        const couple = (c: number, nb: number, value: number): void => {
          f += c * (value - uk);
          d -= c;
          if (withJacobian && nb >= 0) band[k * width + bw + (nb - k)] = footprint[nb] ? 0 : c;
        };
        if (i > 0) couple(cE[k - 1]!, k - 1, vals[k - 1]!);
        if (i < nr) couple(cE[k]!, k + 1, vals[k + 1]!);
        if (j > 0) couple(cS[k - cols]!, k - cols, vals[k - cols]!);
        couple(cS[k]!, j + 1 < rowsZ ? k + cols : -1, j + 1 < rowsZ ? vals[k + cols]! : 0);
        res[k] = f;
        if (withJacobian) band[k * width + bw] = d;
        const scaled = f / d;
        norm += scaled * scaled;
        free++;
      }
    }
    return Math.sqrt(norm / Math.max(1, free));
  };
  const solveBand = (b: Float64Array): void => solveBandedInPlace(band, width, bw, n, b);

  // cap on the largest Newton step, kT units: the exponential carrier densities punish overshoots
  const newton = dampedNewton(u, res, residual, solveBand, { cap: Math.max(5, 0.25 * Math.abs(us)), stepTolerance: 1e-10 * Math.max(1, Math.abs(us)), minStep: 1e-12, maxIterations: 300 });
  if (newton === null) throw new Error('2D disc reference: Newton did not converge in 300 iterations');
  const iterations = newton;
  // charges from the converged field
  let chargeSum = 0;
  let fluxSum = 0;
  for (let j = 0; j < rowsZ; j++) {
    for (let i = 0; i < cols; i++) {
      const k = index(i, j);
      p.model.netCharge(p.bulkReducedFermiLevel - u[k]!, out);
      const excess = out[0]! - residue;
      chargeSum += excess * volume[k]!;
      if (!footprint[k]) continue;
      // balance of the footprint node's control volume: flux in through z = 0 = space charge inside + flux out to
      // the neighbours (faces between two footprint nodes carry nothing)
      fluxSum += beta * volume[k]! * excess;
      if (i > 0) fluxSum += cE[k - 1]! * (us - u[k - 1]!);
      if (i < nr) fluxSum += cE[k]! * (us - u[k + 1]!);
      fluxSum += cS[k]! * (us - (rowsZ > 1 ? u[k + cols]! : 0));
    }
  }
  const charge_C = CODATA2018.q * chargeSum;
  const fluxCharge_C = (CODATA2018.q * fluxSum) / beta;
  if (!Number.isFinite(charge_C) || !Number.isFinite(fluxCharge_C)) throw new Error('2D disc reference: non-finite charge');
  return { charge_C, fluxCharge_C, iterations, nodes: n, wallRadius_m: R, depth_m: Z, debyeLength_m: debye_m, layerLength_m: layer_m };
}

export interface DiscExtrapolated {
  /** Richardson-extrapolated charges from the grid with half the cells and the requested grid, C */
  charge_C: number;
  fluxCharge_C: number;
  coarse: DiscSolution;
  fine: DiscSolution;
  /** |Q_fine - Q_coarse| / 3 / |Q|: the Richardson estimate of the error of the finer, unextrapolated charge */
  errorEstimate: number;
}

/**
 * Solve on the grid with half the cells (nodesR/2, nodesZ/2) and on the requested grid, and extrapolate the
 * charges as for a second-order scheme, X = Q_fine + (Q_fine - Q_coarse)/3 (L. F. Richardson, Phil. Trans. R. Soc.
 * A 210, 307 (1911); from memory, verify). Halving the first cells with the others keeps the geometric grading
 * toward the disc edge, so the scheme stays second order despite the edge singularity (checked in
 * test/disc2d.test.ts: successive differences shrink by ~4).
 */
export function solveDiscExtrapolated(p: DiscProblem): DiscExtrapolated {
  const nr = Math.round(p.nodesR ?? 80);
  const nz = Math.round(p.nodesZ ?? 64);
  const coarse = solveDisc({ ...p, nodesR: Math.round(nr / 2), nodesZ: Math.round(nz / 2) });
  const fine = solveDisc({ ...p, nodesR: nr, nodesZ: nz });
  const charge_C = fine.charge_C + (fine.charge_C - coarse.charge_C) / 3;
  const fluxCharge_C = fine.fluxCharge_C + (fine.fluxCharge_C - coarse.fluxCharge_C) / 3;
  const errorEstimate = Math.abs(fine.fluxCharge_C - coarse.fluxCharge_C) / 3 / Math.abs(fluxCharge_C);
  return { charge_C, fluxCharge_C, coarse, fine, errorEstimate };
}
