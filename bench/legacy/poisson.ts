// FROZEN COPY of src/electrostatics/poisson.ts at commit 713f1f8 (before issue 10 error control), kept outside src/ only as
// the benchmark's in-process reference (bench/tsconfig.json compiles it for `npm run bench`). Not exported, not tested.
// Nonlinear Poisson equation for the band bending in the support, on a 1D cross-section A(x):
//   (1/A) d/dx (A du/dx) = beta * N(xi_bulk - u),   beta = q^2 / (eps eps0 k T),
// with u = (E_C(x) - E_C,bulk)/kT (positive = bands bend up), N = (p - n + N_D^+ - N_A^-) per m^3.
// Vertex-centred finite volumes on a graded mesh; Newton with an O(N) tridiagonal Jacobian and backtracking.
import { EPS0_F_PER_M, K_BOLTZMANN_J_PER_K, Q_ELEMENTARY_C } from '../../src/constants.js';
import { ConvergenceError } from '../../src/errors.js';
import type { ChargeModel } from '../../src/bulk/equilibrium.js';
import type { CrossSection } from '../../src/electrostatics/geometry.js';
import { solveTridiagonal } from '../../src/electrostatics/tridiagonal.js';
import { bisectMesh, buildMesh, planarFirstIntegral, type PlanarFirstIntegral } from './mesh.js';

export interface PoissonProblem {
  model: ChargeModel;
  /** (E_F - E_C)/kT in the bulk */
  bulkReducedFermiLevel: number;
  /** u at the interface, (E_C(0) - E_C,bulk)/kT */
  surfaceBending: number;
  relativePermittivity: number;
  temperature_K: number;
  geometry: CrossSection;
  /** finite support thickness (zero field there); undefined = semi-infinite */
  thickness_m?: number | undefined;
  /** mesh refinement factor (1 = default accuracy; 2 halves every cell) */
  refinement?: number;
  /** longest domain modelled for a semi-infinite support, m */
  maxDomain_m?: number;
  maxIterations?: number;
}

export interface PoissonSolution {
  x_m: Float64Array;
  u: Float64Array;
  /** net charge density / q at the nodes, per m^3 */
  netCharge_m3: Float64Array;
  /** total space charge on the support side, C (per m^2 for planar) */
  totalCharge_C: number;
  /** du/dx at the interface, 1/m */
  interfaceSlope_per_m: number;
  iterations: number;
  domain_m: number;
  /** u at the far end relative to the surface value: |u(L)/u(0)| */
  farEndFraction: number;
  /** semi-infinite support whose layer did not decay inside maxDomain */
  truncated: boolean;
  /** estimated relative error of totalCharge_C (Richardson: |Q_fine - Q_coarse| / 3 / |Q|) */
  chargeErrorEstimate: number;
  /** total charge on the coarse and the bisected mesh before extrapolation, C (for convergence checks) */
  unextrapolatedCharge_C: { coarse: number; fine: number };
  firstIntegral: PlanarFirstIntegral;
}

export const DEFAULT_MAX_DOMAIN_M = 100e-6;

/** Richardson correction above which the mesh is refined automatically (relative to the charge). */
export const REFINE_ABOVE = 1e-3;
const MAX_AUTOMATIC_DOUBLINGS = 3;

/**
 * Solve, and refine the mesh automatically while the Richardson correction says the mesh is outside its
 * asymptotic range (correction > REFINE_ABOVE), up to three doublings.
 */
export function solvePoisson(problem: PoissonProblem): PoissonSolution {
  let refinement = problem.refinement ?? 1;
  let solution = solvePoissonOnce({ ...problem, refinement });
  for (let k = 0; k < MAX_AUTOMATIC_DOUBLINGS && solution.chargeErrorEstimate > REFINE_ABOVE; k++) {
    refinement *= 2;
    const finer = solvePoissonOnce({ ...problem, refinement });
    const iterations = solution.iterations + finer.iterations;
    solution = { ...finer, iterations };
  }
  return solution;
}

function solvePoissonOnce(problem: PoissonProblem): PoissonSolution {
  const { model, geometry } = problem;
  const xiBulk = problem.bulkReducedFermiLevel;
  const uSurface = problem.surfaceBending;
  // beta = q^2 / (eps eps0 k T): Poisson's equation in units of kT/q
  const beta =
    (Q_ELEMENTARY_C * Q_ELEMENTARY_C) /
    (problem.relativePermittivity * EPS0_F_PER_M * K_BOLTZMANN_J_PER_K * problem.temperature_K);
  const maxIterations = problem.maxIterations ?? 200;

  const firstIntegral = planarFirstIntegral(model, xiBulk, uSurface, beta);
  const system: DiscreteSystem = { model, xiBulk, beta, geometry };
  const mesh = buildMesh({
    firstIntegral,
    thickness_m: problem.thickness_m,
    maxDomain_m: problem.maxDomain_m ?? DEFAULT_MAX_DOMAIN_M,
    refinement: problem.refinement ?? 1,
    geometry,
  });
  const coarseGuess = new Float64Array(mesh.x.length);
  for (let i = 0; i < mesh.x.length; i++) coarseGuess[i] = firstIntegral.guess(mesh.x[i]!);
  let coarse: MeshSolution;
  try {
    coarse = newtonOnMesh(system, uSurface, mesh.x, coarseGuess, maxIterations);
  } catch (error) {
    if (!(error instanceof ConvergenceError)) throw error;
    coarse = continuation(system, uSurface, mesh.x, maxIterations, error);
  }
  // Richardson extrapolation on the bisected mesh: the scheme is second order, so Q + (Q_f - Q_c)/3 is fourth order
  const fineX = bisectMesh(mesh.x);
  const fineGuess = new Float64Array(fineX.length);
  for (let i = 0; i < coarse.u.length - 1; i++) {
    fineGuess[2 * i] = coarse.u[i]!;
    fineGuess[2 * i + 1] = 0.5 * (coarse.u[i]! + coarse.u[i + 1]!);
  }
  fineGuess[fineX.length - 1] = coarse.u[coarse.u.length - 1]!;
  const fine = newtonOnMesh(system, uSurface, fineX, fineGuess, maxIterations);
  const correction = (fine.chargeSum - coarse.chargeSum) / 3;
  const chargeSum = fine.chargeSum + correction;
  const chargeErrorEstimate = chargeSum !== 0 ? Math.abs(correction / chargeSum) : 0;

  const last = fineX.length - 1;
  // Gauss's law on the discrete system: the flux into the support at x = 0 balances the total charge
  const totalCharge_C = Q_ELEMENTARY_C * chargeSum;
  const interfaceSlope_per_m = (-beta * chargeSum) / geometry.interfaceArea_m2;
  const farEndFraction = Math.abs(uSurface) > 0 ? Math.abs(fine.u[last]! / uSurface) : 0;
  return {
    x_m: fineX,
    u: fine.u,
    netCharge_m3: fine.netCharge,
    totalCharge_C,
    interfaceSlope_per_m,
    iterations: coarse.iterations + fine.iterations,
    domain_m: fineX[last]!,
    farEndFraction,
    truncated: problem.thickness_m === undefined && mesh.truncated && farEndFraction > 1e-3,
    chargeErrorEstimate,
    unextrapolatedCharge_C: { coarse: Q_ELEMENTARY_C * coarse.chargeSum, fine: Q_ELEMENTARY_C * fine.chargeSum },
    firstIntegral,
  };
}

/**
 * Fallback when Newton from the first-integral guess fails: raise the interface bending from flat bands in
 * adaptive steps, each solved from the previous solution (homotopy in the boundary value).
 */
function continuation(
  system: DiscreteSystem,
  uSurface: number,
  x: Float64Array,
  maxIterations: number,
  original: ConvergenceError,
): MeshSolution {
  let lambda = 0;
  let delta = 0.05;
  let current: Float64Array = new Float64Array(x.length);
  let iterations = original.iterations;
  let last: MeshSolution | null = null;
  while (lambda < 1) {
    const next = Math.min(1, lambda + delta);
    try {
      const solved = newtonOnMesh(system, next * uSurface, x, Float64Array.from(current), Math.min(maxIterations, 40));
      iterations += solved.iterations;
      current = solved.u;
      last = solved;
      lambda = next;
      delta = Math.min(0.5, delta * 2);
    } catch (error) {
      if (!(error instanceof ConvergenceError)) throw error;
      iterations += error.iterations;
      delta /= 4;
      if (delta < 1e-4) throw new ConvergenceError(`${original.reason}; continuation stalled at ${(lambda * 100).toFixed(1)}% of the band bending`, iterations);
    }
  }
  return { ...last!, iterations };
}

/** What every mesh solve of one problem shares. */
interface DiscreteSystem {
  model: ChargeModel;
  xiBulk: number;
  beta: number;
  geometry: CrossSection;
}

interface MeshSolution {
  u: Float64Array;
  netCharge: Float64Array;
  /** sum of N_i V_i, per m^3 times m^3 */
  chargeSum: number;
  iterations: number;
}

/** Damped Newton for the finite-volume system on one mesh; u[0] is the Dirichlet value. */
function newtonOnMesh(system: DiscreteSystem, uSurface: number, x: Float64Array, initial: Float64Array, maxIterations: number): MeshSolution {
  const { model, xiBulk, beta, geometry } = system;
  const n = x.length;
  const last = n - 1;
  // geometry factors: face coefficient A/h between node i and i+1, control volume of node i
  // one allocation for every work array of this solve (typed arrays are costly to create one by one)
  const workspace = new Float64Array(16 * n);
  let slot = 0;
  const take = (): Float64Array => workspace.subarray(n * slot++, n * slot);
  const faceCoefficient = take();
  const volume = take();
  for (let i = 0; i < last; i++) {
    const h = x[i + 1]! - x[i]!;
    faceCoefficient[i] = geometry.faceArea(x[i]!, x[i + 1]!) / h;
    const mid = 0.5 * (x[i]! + x[i + 1]!);
    volume[i] += geometry.volume(x[i]!, mid);
    volume[i + 1] += geometry.volume(mid, x[i + 1]!);
  }
  initial[0] = uSurface;
  let lower: Float64Array = take();
  let diag: Float64Array = take();
  let upper: Float64Array = take();
  let residual: Float64Array = take();
  let trialLower: Float64Array = take();
  let trialDiag: Float64Array = take();
  let trialUpper: Float64Array = take();
  const step = take();
  const work = take();
  const work2 = take();
  const simplified = take();
  let trial: Float64Array = take();
  let trialResidual: Float64Array = take();
  const charge = new Float64Array(2);
  const betaVolume = take();
  for (let i = 0; i < n; i++) betaVolume[i] = beta * volume[i]!;

  /** residual R_i = flux out - flux in - beta V_i N_i (and the Jacobian when asked); returns the scaled norm */
  const evaluate = (
    values: Float64Array,
    out: Float64Array,
    outLower: Float64Array,
    outDiag: Float64Array,
    outUpper: Float64Array,
  ): number => {
    let norm = 0;
    for (let i = 1; i < n; i++) {
      model.netCharge(xiBulk - values[i]!, charge);
      const right = i < last ? faceCoefficient[i]! : 0;
      const left = faceCoefficient[i - 1]!;
      const r =
        (i < last ? right * (values[i + 1]! - values[i]!) : 0) - left * (values[i]! - values[i - 1]!) - betaVolume[i]! * charge[0]!;
      out[i] = r;
      const d = -right - left + betaVolume[i]! * charge[1]!;
      outLower[i] = left;
      outDiag[i] = d;
      outUpper[i] = right;
      // Jacobi-scaled residual: the step a diagonal solve would take, in units of kT
      const scaled = r / d;
      norm += scaled * scaled;
    }
    return Math.sqrt(norm / (n - 1));
  };

  let iterations = 0;
  let u: Float64Array = initial;
  evaluate(u, residual, lower, diag, upper);
  let converged = false;
  const stepCap = Math.max(10, 0.25 * Math.abs(uSurface));
  while (iterations < maxIterations) {
    iterations++;
    for (let i = 1; i < n; i++) residual[i] = -residual[i]!;
    lower[1] = 0;
    upper[last] = 0;
    const ok = solveTridiagonal(n - 1, lower, diag, upper, residual, step, work, 1);
    if (!ok) throw new ConvergenceError('singular Jacobian', iterations);
    let maxStep = 0;
    for (let i = 1; i < n; i++) maxStep = Math.max(maxStep, Math.abs(step[i]!));
    if (!Number.isFinite(maxStep)) throw new ConvergenceError('non-finite Newton step', iterations);
    if (maxStep < 1e-11 * Math.max(1, Math.abs(uSurface))) {
      for (let i = 1; i < n; i++) u[i] = u[i]! + step[i]!;
      converged = true;
      break;
    }
    // damping (Deuflhard's natural monotonicity test): cap the largest move, then halve the step until the
    // simplified Newton correction J_old^-1 R(trial) is smaller than the step itself; affine invariant, so it
    // does not care that node residuals differ by tens of orders of magnitude between interface and bulk
    let stepNorm = 0;
    for (let i = 1; i < n; i++) stepNorm += step[i]! * step[i]!;
    stepNorm = Math.sqrt(stepNorm / (n - 1));
    let t = Math.min(1, stepCap / maxStep);
    let trialNorm = Infinity;
    let accepted = false;
    for (let halvings = 0; halvings < 50; halvings++) {
      for (let i = 1; i < n; i++) trial[i] = u[i]! + t * step[i]!;
      trial[0] = uSurface;
      trialNorm = evaluate(trial, trialResidual, trialLower, trialDiag, trialUpper);
      if (Number.isFinite(trialNorm)) {
        for (let i = 1; i < n; i++) work2[i] = -trialResidual[i]!;
        lower[1] = 0;
        upper[last] = 0;
        solveTridiagonal(n - 1, lower, diag, upper, work2, simplified, work, 1);
        let simplifiedNorm = 0;
        for (let i = 1; i < n; i++) simplifiedNorm += simplified[i]! * simplified[i]!;
        simplifiedNorm = Math.sqrt(simplifiedNorm / (n - 1));
        if (Number.isFinite(simplifiedNorm) && simplifiedNorm <= (1 - 0.25 * t) * stepNorm) {
          accepted = true;
          break;
        }
        // near the solution rounding stops the test from passing: accept a full step that is already tiny
        if (t === 1 && maxStep < 1e-7 * Math.max(1, Math.abs(uSurface))) {
          accepted = true;
          break;
        }
      }
      t *= 0.5;
      if (t * maxStep < 1e-14) break;
    }
    if (!accepted) throw new ConvergenceError('damped Newton step could not reduce the correction (line search failed)', iterations);
    // accept the trial point: its residual and Jacobian are already computed
    [u, trial] = [trial, u];
    [residual, trialResidual] = [trialResidual, residual];
    [lower, trialLower] = [trialLower, lower];
    [diag, trialDiag] = [trialDiag, diag];
    [upper, trialUpper] = [trialUpper, upper];
  }
  if (!converged) throw new ConvergenceError(`no convergence within ${maxIterations} Newton iterations`, iterations);

  const netCharge = new Float64Array(n);
  let chargeSum = 0;
  for (let i = 0; i < n; i++) {
    model.netCharge(xiBulk - u[i]!, charge);
    netCharge[i] = charge[0]!;
    chargeSum += charge[0]! * volume[i]!;
  }
  return { u, netCharge, chargeSum, iterations };
}
