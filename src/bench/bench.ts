// Benchmark of the solver and the pipelines built on it (a benchmark, not a test: it never fails on a
// missed target, it reports). Run with `npm run bench` (= build, then `node dist/bench/bench.js`).
//
// Output: readable tables while it runs, and as the LAST line exactly one JSON object with every number
// (keys listed in `BenchSummary` below), so scripts can `tail -n 1` it.
//
// Cases (fixed; every number below is part of the benchmark definition, change them only on purpose):
//
//  TYPICAL support (n-type, "TiO2-like"): donors 1e18 cm^-3 fully ionised (no donor level), eps_r 8.5,
//    m_e = 0.24 m0, m_h = 0.59 m0, E_g = 3.3 eV, 300 K, band bending +0.8 eV (depletion), semi-infinite support.
//    - planarSolve:     solvePoisson, PLANAR, Fermi-Dirac statistics (the tool's default)      [headline]
//    - hemisphereSolve: solvePoisson, hemisphere of radius 1 nm, Fermi-Dirac                   [headline]
//    - the same two with Boltzmann statistics (extra keys *_boltzmann). They are timed after the FD cases in the
//      same process, so the charge model's statistics call sites (makeChargeModel: stats.density/derivative) have
//      seen both statistics objects and are polymorphic: in a Boltzmann-only process the charge model is cheaper.
//    The charge model and bulk equilibrium are prepared once outside the timing: only solvePoisson is timed.
//    - nonlinearPlanarSolve: the planar FD case at 1e20 cm^-3 with SrTiO3's field-dependent dielectric (static 316.3,
//      background 5.23, beta 6.8e9 V m^5 C^-3), timed in the same rounds as the same problem with a linear dielectric
//      (eps 316.3); *_ratio = nonlinear / linear (the cost of the Landau–Devonshire flux per Newton step).
//  REFERENCE: the same four typical solves with the frozen pre-issue-10 solver (bench/legacy/ at the top level, compiled
//    by bench/tsconfig.json into dist/bench-legacy/ and loaded at run time; commit 713f1f8:
//    one mesh + its bisection, refine only above a 1e-3 Richardson correction), timed in the same interleaved
//    rounds; the summary reports medians of both and the speed-up ratio reference/current (*_speedup), plus the
//    true error of both against the exact closed form (Boltzmann cases).
//  CONTACT: full solveContact on the typical support with custom properties (bare numbers in default units,
//    so the mathjs unit parser is never loaded), empty materials library, ideal Schottky–Mott barrier with the
//    work function chosen to give +0.8 eV band bending; hemisphere of 2 nm diameter (radius 1 nm) [headline],
//    and planar (extra key).
//  ACCURACY: Boltzmann statistics, fully ionised donors, the typical support otherwise; band bending
//    {-1, -0.3, -0.05, 0.05, 0.3, 0.8, 2, 3.2} eV x T {300, 600} K x N_D {1e16, 1e19} cm^-3 = 32 planar cases.
//    The total charge is compared with the exact closed form of the first integral of Poisson–Boltzmann
//    (see exactBoltzmannPlanarCharge below; Sze & Ng ch. 4). 3.2 eV is inversion for 1e16 cm^-3 (weak inversion
//    at 1e19 cm^-3). newtonIterations and meshPoints are also collected over these cases.
//  SCALING: the planar typical case (Fermi–Dirac) at refinement 1, 2, 4, 8, 16; meshPoints are read from the
//    solution (the automatic Richardson-driven refinement and the mesh-size cap may change them).
//  SCREEN: runScreen, the first 20 metals x the first 20 supports of the built-in library (loadLibrary(), loaded
//    once outside the timing and passed in), 473 K, hemisphere 2 nm, donors 1e18 cm^-3. Median of 3 after 1 warm-up.
//  STUDY: runStudy of a 100 x 100 product study, donors log 1e16..1e19 cm^-3 x temperature 300..700 K, custom
//    support properties (typical support, work function 5.1 eV, electron affinity 4.2 eV, hemisphere 2 nm),
//    outputs bandBending_eV and electronsPerParticle, CSV + JSONL into a temporary folder (removed at the end);
//    jobs 1 and jobs 2; wall time around runStudy (includes worker start-up and file writing). Also a 4-point
//    study with jobs 2 to show the fixed worker start-up cost.
//  STARTUP: wall time of the CLI answering one contact as JSON,
//    `node bin/bandbend.js contact --metal Pt --support ZnO --donors "1e17 cm^-3" --temperature "473 K" --json`,
//    against `node -e 0` (bare Node start-up), each spawned 11 times in alternation (spawnSync, wall time around the
//    call); reported as medians and their ratio (startup_ratio = CLI / bare node). Includes module loading and the
//    library lookup, so it is what a user or a shell script waits for. bin/bandbend.js runs the rolldown bundle in
//    dist/bundle/ (src/cli/bundle.ts, made by `npm run build`, which the bench runs first) from V8's code cache
//    (made by the build's warm-up run; the bench's own first, discarded run would make it otherwise).
//  STUDY JOBS: benchStudyJobs() of src/study/benchStudy.ts: a 10k-point study (custom planar contact) run alternately
//    with jobs 2 and jobs 1, 3 repeats; median wall times and their ratio (studyJobs_speedup = jobs 1 / jobs 2).
//    BENCH_QUICK=1 runs it on 400 points with 1 repeat (studyJobs_points says which).
//  BREAKDOWN: manual timers around the pieces of one planar and one hemisphere typical solve (first integral,
//    mesh, initial guess, charge-model calls, tridiagonal solves, geometry integrals, typed-array allocations) to
//    show where the time goes; Newton's share is reconstructed from counted charge-model calls (see benchBreakdown).
//
// Timing: performance.now() around each call, warm-up first, median (and p10/p90 in the tables). The typical
// solves and contacts are timed in interleaved rounds (8 x 50 calls per case) so that load from other processes
// on a shared machine hits every case alike; the best and worst round medians are printed to show that load.
// The study runs alternate jobs 2 and jobs 1, and report CPU time / wall time (cores actually obtained).
// Run it at least twice on a shared machine and compare: the JSON carries the load average before and after.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { makeChargeModel, solveBulkNeutrality, type ChargeModel, type SupportElectronic } from '../bulk/equilibrium.js';
import { solveContact, type ContactOptions } from '../contact.js';
import { K_BOLTZMANN_J_PER_K, Q_ELEMENTARY_C, EPS0_F_PER_M, thermalEnergy_eV } from '../constants.js';
import { PLANAR, hemisphere, type CrossSection } from '../electrostatics/geometry.js';
import { bisectMesh, buildMesh, planarFirstIntegral } from '../electrostatics/mesh.js';
import { DEFAULT_MAX_DOMAIN_M, solvePoisson, type PoissonProblem, type PoissonSolution } from '../electrostatics/poisson.js';
import { solveTridiagonal } from '../electrostatics/tridiagonal.js';
import { dielectricLaw } from '../electrostatics/permittivity.js';
import { loadLibrary } from '../materials/load.js';
import type { MaterialsLibrary } from '../materials/types.js';
import { runScreen } from '../screen.js';
import { benchStudyJobs, type StudyJobsBench } from '../study/benchStudy.js';
import { benchExplorer, type ExplorerBench } from './explorerBench.js';
import { runStudy } from '../study/runner.js';
import { parseStudy } from '../study/studyFile.js';
import type { Statistics } from '../types.js';

// ---------------------------------------------------------------------------------------------
// the frozen reference solver (outside src/, so that src/ repeats no code; see the file comment)

/** what the bench reads from a reference solution */
type ReferenceSolution = Pick<PoissonSolution, 'totalCharge_C' | 'chargeErrorEstimate' | 'x_m' | 'iterations'>;

const REFERENCE_MODULE = new URL('../bench-legacy/bench/legacy/poisson.js', import.meta.url);
const { solvePoisson: solvePoissonReference } = (await import(REFERENCE_MODULE.href)) as {
  solvePoisson: (problem: PoissonProblem) => ReferenceSolution;
};

// ---------------------------------------------------------------------------------------------
// timing helpers

interface Stats {
  median: number;
  p10: number;
  p90: number;
  runs: number;
}

function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const pos = q * (sorted.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}

function statsOf(samples: readonly number[]): Stats {
  const sorted = [...samples].sort((a, b) => a - b);
  return { median: quantile(sorted, 0.5), p10: quantile(sorted, 0.1), p90: quantile(sorted, 0.9), runs: sorted.length };
}

function median(values: readonly number[]): number {
  return statsOf(values).median;
}

/** Time fn `runs` times after `warmup` untimed calls; microseconds per call. */
function timeUs(fn: () => unknown, runs: number, warmup: number): Stats {
  for (let i = 0; i < warmup; i++) fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    samples.push((performance.now() - t0) * 1000);
  }
  return statsOf(samples);
}


// ---------------------------------------------------------------------------------------------
// table printing

function pad(s: string, width: number, right = false): string {
  return right ? s.padStart(width) : s.padEnd(width);
}

function printTable(title: string, header: string[], rows: (string | number)[][]): void {
  const cells = rows.map((r) => r.map((c) => (typeof c === 'number' ? fmt(c) : c)));
  const widths = header.map((h, i) => Math.max(h.length, ...cells.map((r) => r[i]!.length)));
  console.log(`\n## ${title}`);
  console.log(header.map((h, i) => pad(h, widths[i]!, i > 0)).join('  '));
  console.log(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of cells) console.log(r.map((c, i) => pad(c, widths[i]!, i > 0)).join('  '));
}

function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  if (Number.isInteger(v) && Math.abs(v) < 1e7) return String(v);
  const a = Math.abs(v);
  if (a !== 0 && (a < 1e-3 || a >= 1e6)) return v.toExponential(2);
  return v.toPrecision(4);
}

function round(v: number, digits = 4): number {
  return Number.isFinite(v) ? Number(v.toPrecision(digits)) : v;
}

// ---------------------------------------------------------------------------------------------
// cases

const TYPICAL = {
  bandGap_eV: 3.3,
  electronMass_me: 0.24,
  holeMass_me: 0.59,
  permittivity: 8.5,
  donors_cm3: 1e18,
  temperature_K: 300,
  bandBending_eV: 0.8,
  hemisphereRadius_m: 1e-9,
} as const;

function supportElectronic(donors_cm3: number, temperature_K: number, statistics: Statistics): SupportElectronic {
  return {
    temperature_K,
    bandGap_eV: TYPICAL.bandGap_eV,
    electronMass_me: TYPICAL.electronMass_me,
    holeMass_me: TYPICAL.holeMass_me,
    donors: { density_m3: donors_cm3 * 1e6, kind: 'single' }, // no level: fully ionised
    acceptors: { density_m3: 0 },
    statistics,
  };
}

interface Prepared {
  model: ChargeModel;
  problem: PoissonProblem;
}

function preparePoisson(
  donors_cm3: number,
  temperature_K: number,
  bandBending_eV: number,
  statistics: Statistics,
  geometry: CrossSection,
  refinement?: number,
): Prepared {
  const model = makeChargeModel(supportElectronic(donors_cm3, temperature_K, statistics));
  const bulk = solveBulkNeutrality(model);
  const problem: PoissonProblem = {
    model,
    bulkReducedFermiLevel: bulk.reducedFermiLevel,
    surfaceBending: bandBending_eV / thermalEnergy_eV(temperature_K),
    relativePermittivity: TYPICAL.permittivity,
    temperature_K,
    geometry,
    ...(refinement !== undefined ? { refinement } : {}),
  };
  return { model, problem };
}

// ---------------------------------------------------------------------------------------------
// exact reference (independent of the project's bulk code: own constants, own neutrality)

/** CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)), written out independently of src/constants. */
const CODATA2018 = { k: 1.380649e-23, q: 1.602176634e-19, h: 6.62607015e-34, me: 9.1093837015e-31, eps0: 8.8541878128e-12 };

/**
 * Bulk carrier densities for Boltzmann statistics and fully ionised donors, per m^3:
 * N_C,V = 2 (2 pi m* k T / h^2)^(3/2) (Sze & Ng eq. 1.20), n0 p0 = n_i^2 = N_C N_V exp(-E_g/kT), n0 - p0 = N_D,
 * so n0 = N_D/2 + sqrt(N_D^2/4 + n_i^2) and p0 = n_i^2 / n0.
 */
function boltzmannBulk(donors_m3: number, temperature_K: number): { n0: number; p0: number } {
  const { k, h, me, q } = CODATA2018;
  const dos = (mass: number): number => 2 * Math.pow((2 * Math.PI * mass * me * k * temperature_K) / (h * h), 1.5);
  const ni2 = dos(TYPICAL.electronMass_me) * dos(TYPICAL.holeMass_me) * Math.exp(-(TYPICAL.bandGap_eV * q) / (k * temperature_K));
  const n0 = donors_m3 / 2 + Math.sqrt((donors_m3 * donors_m3) / 4 + ni2);
  return { n0, p0: ni2 / n0 };
}

/**
 * Exact planar space charge per m^2 from the first integral of the Poisson–Boltzmann equation with fully ionised
 * dopants (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 4, Q_s in terms of F(beta psi_s, n_p0/p_p0)),
 * in this project's convention (u = reduced band bending, positive = bands bend up, positive support charge):
 *   Q = sign(u) sqrt(2 eps eps0 kT * [p0 (e^u - u - 1) + n0 (e^-u + u - 1)]).
 * Copied from test/helpers.ts (boltzmannPlanarCharge) so that the bench does not depend on test code.
 */
function exactBoltzmannPlanarCharge(n0_m3: number, p0_m3: number, u: number, relativePermittivity: number, temperature_K: number): number {
  const integral = p0_m3 * Math.expm1(u) - p0_m3 * u + n0_m3 * Math.expm1(-u) + n0_m3 * u;
  return Math.sign(u) * Math.sqrt(2 * relativePermittivity * CODATA2018.eps0 * CODATA2018.k * temperature_K * integral);
}

// ---------------------------------------------------------------------------------------------
// summary

interface ScalingPoint {
  refinement: number;
  meshPoints: number;
  solve_us: number;
}

interface BenchSummary {
  explorer: ExplorerBench;
  planarSolve_us_median: number;
  /** planar FD solve at 1e20 cm^-3 with SrTiO3's field-dependent dielectric, the same with a linear one, and their ratio */
  nonlinearPlanarSolve_us_median: number;
  nonlinearPlanarSolve_linear_us_median: number;
  nonlinearPlanarSolve_ratio: number;
  hemisphereSolve_us_median: number;
  planarSolve_us_median_boltzmann: number;
  hemisphereSolve_us_median_boltzmann: number;
  /** the same medians for the pre-issue-10 solver (bench/legacy), timed in the same rounds */
  planarSolve_us_median_reference: number;
  hemisphereSolve_us_median_reference: number;
  planarSolve_us_median_boltzmann_reference: number;
  hemisphereSolve_us_median_boltzmann_reference: number;
  /** reference median / current median (> 1 = faster now) */
  planarSolve_speedup: number;
  hemisphereSolve_speedup: number;
  planarSolve_speedup_boltzmann: number;
  hemisphereSolve_speedup_boltzmann: number;
  planarRelError_max_reference: number;
  contactSolve_us_median: number;
  contactSolvePlanar_us_median: number;
  planarRelError_max: number;
  planarRelError_median: number;
  planarRelError_worstCase: string;
  newtonIterations_median: number;
  meshPoints_median: number;
  screen400_s: number;
  study10k_s_jobs1: number;
  study10k_s_jobs2: number;
  study10k_runs_jobs1: number[];
  study10k_runs_jobs2: number[];
  study10k_cpuPerWall_jobs1: number;
  study10k_cpuPerWall_jobs2: number;
  studyStartup_s_jobs2: number;
  /** median wall time of the CLI contact --json, of `node -e 0`, and their ratio (CLI / bare node) */
  startup_cli_ms_median: number;
  startup_node_ms_median: number;
  startup_ratio: number;
  startup_runs: number;
  /** benchStudyJobs(): jobs 2 vs jobs 1 (points = 10000, or 400 with BENCH_QUICK=1) */
  studyJobs_points: number;
  studyJobs_s_jobs1: number;
  studyJobs_s_jobs2: number;
  studyJobs_speedup: number;
  studyJobs_cpuPerWall_jobs2: number;
  scaling: ScalingPoint[];
  scalingExponent: number;
  breakdown_us: Record<string, number>;
  breakdownHemisphere_us: Record<string, number>;
  targets: Record<string, boolean>;
  node: string;
  cpus: number;
  loadavgStart: number[];
  loadavg: number[];
  date: string;
  bench_s: number;
}

/** least-squares slope of log y against log x */
function logLogSlope(xs: readonly number[], ys: readonly number[]): number {
  const lx = xs.map(Math.log);
  const ly = ys.map(Math.log);
  const n = lx.length;
  const mx = lx.reduce((a, b) => a + b, 0) / n;
  const my = ly.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (lx[i]! - mx) * (ly[i]! - my);
    sxx += (lx[i]! - mx) ** 2;
  }
  return sxy / sxx;
}

const EMPTY_LIBRARY = (): MaterialsLibrary => ({ metals: new Map(), supports: new Map(), references: new Map() });

// ---------------------------------------------------------------------------------------------
// sections

function contactOptions(geometry: 'planar' | 'hemisphere'): ContactOptions {
  // ideal barrier phi_B = Phi_m - chi; band bending = phi_B - (E_C - E_F)_bulk: choose Phi_m for +0.8 eV
  const model = makeChargeModel(supportElectronic(TYPICAL.donors_cm3, TYPICAL.temperature_K, 'fermi-dirac'));
  const bulk = solveBulkNeutrality(model);
  const electronAffinity = 4.2;
  return {
    workFunction: electronAffinity + TYPICAL.bandBending_eV + bulk.fermiLevelBelowConduction_eV,
    electronAffinity,
    bandGap: TYPICAL.bandGap_eV,
    permittivity: TYPICAL.permittivity,
    electronMass: TYPICAL.electronMass_me,
    holeMass: TYPICAL.holeMass_me,
    donors: TYPICAL.donors_cm3, // bare number = cm^-3
    temperature: TYPICAL.temperature_K,
    statistics: 'fermi-dirac',
    geometry,
    particleDiameter: 2 * TYPICAL.hemisphereRadius_m * 1e9, // bare number = nm
    materials: EMPTY_LIBRARY(),
  };
}

interface TimedCase {
  label: string;
  fn: () => unknown;
}

interface InterleavedStats extends Stats {
  /** median of each round: shows how much the machine load moved during the block */
  roundMedians: number[];
}

/**
 * Time several cases in interleaved rounds (warm-up of every case first), so that a burst of load from other
 * processes hits every case rather than one; per-call microseconds over all rounds.
 */
function timeInterleaved(cases: readonly TimedCase[], rounds: number, perRound: number, warmup: number): Map<string, InterleavedStats> {
  for (const c of cases) for (let i = 0; i < warmup; i++) c.fn();
  const samples = new Map<string, number[]>(cases.map((c) => [c.label, []]));
  const roundMedians = new Map<string, number[]>(cases.map((c) => [c.label, []]));
  for (let r = 0; r < rounds; r++) {
    for (const c of cases) {
      const round: number[] = [];
      for (let i = 0; i < perRound; i++) {
        const t0 = performance.now();
        c.fn();
        round.push((performance.now() - t0) * 1000);
      }
      samples.get(c.label)!.push(...round);
      roundMedians.get(c.label)!.push(median(round));
    }
  }
  return new Map(cases.map((c) => [c.label, { ...statsOf(samples.get(c.label)!), roundMedians: roundMedians.get(c.label)! }]));
}

const ROUNDS = 8;

/**
 * The typical-case solves and contacts. Fermi–Dirac cases first and together (solvePoisson planar and hemisphere,
 * solveContact hemisphere and planar: 8 rounds x 50 calls each after 100 warm-up calls), then the Boltzmann solves
 * (see the file comment on polymorphic call sites).
 */
const NONLINEAR_LABELS = { linear: 'planar FD 1e20, eps 316 linear', nonlinear: 'planar FD 1e20, eps 316 Landau-Devonshire' } as const;

function benchTypical(): { solves: Map<string, InterleavedStats>; contacts: Map<string, InterleavedStats> } {
  const solveCases: [string, Statistics, CrossSection][] = [
    ['planar FD', 'fermi-dirac', PLANAR],
    ['hemisphere r=1nm FD', 'fermi-dirac', hemisphere(TYPICAL.hemisphereRadius_m)],
    ['planar Boltzmann', 'boltzmann', PLANAR],
    ['hemisphere r=1nm Boltzmann', 'boltzmann', hemisphere(TYPICAL.hemisphereRadius_m)],
  ];
  const prepared = (statistics: Statistics): { label: string; problem: PoissonProblem; solution: PoissonSolution }[] =>
    solveCases
      .filter(([, st]) => st === statistics)
      .map(([label, st, geometry]) => {
        const { problem } = preparePoisson(TYPICAL.donors_cm3, TYPICAL.temperature_K, TYPICAL.bandBending_eV, st, geometry);
        return { label, problem, solution: solvePoisson(problem) };
      });
  const contactCases = (['hemisphere', 'planar'] as const).map((geometry) => {
    const options = contactOptions(geometry);
    return { label: geometry === 'hemisphere' ? 'contact hemisphere d=2nm' : 'contact planar', options, result: solveContact(options) };
  });

  const fd = prepared('fermi-dirac');
  const reference = (c: { label: string; problem: PoissonProblem }): TimedCase => ({ label: `${c.label} [reference]`, fn: () => solvePoissonReference(c.problem) });
  // field-dependent dielectric: the typical support at 1e20 cm^-3 with SrTiO3's permittivities (static 316.3,
  // background 5.23) and its library beta 6.8e9 V m^5 C^-3, against the same problem with a linear dielectric
  const paraelectric = { ...preparePoisson(1e20, TYPICAL.temperature_K, TYPICAL.bandBending_eV, 'fermi-dirac', PLANAR).problem, relativePermittivity: 316.3 };
  const nonlinearCases = [
    { label: NONLINEAR_LABELS.linear, problem: paraelectric },
    { label: NONLINEAR_LABELS.nonlinear, problem: { ...paraelectric, dielectric: dielectricLaw(316.3, 5.23, 6.8e9) } },
  ];
  const fdStats = timeInterleaved(
    [
      ...fd.map((c) => ({ label: c.label, fn: () => solvePoisson(c.problem) })),
      ...nonlinearCases.map((c) => ({ label: c.label, fn: () => solvePoisson(c.problem) })),
      ...fd.map(reference),
      ...contactCases.map((c) => ({ label: c.label, fn: () => solveContact(c.options) })),
    ],
    ROUNDS,
    50,
    100,
  );
  const boltzmann = prepared('boltzmann');
  const bStats = timeInterleaved(
    [...boltzmann.map((c) => ({ label: c.label, fn: () => solvePoisson(c.problem) })), ...boltzmann.map(reference)],
    ROUNDS,
    50,
    100,
  );
  const solves = new Map<string, InterleavedStats>();
  for (const c of nonlinearCases) solves.set(c.label, fdStats.get(c.label)!);
  const rows: (string | number)[][] = [];
  for (const c of [...fd, ...boltzmann]) {
    for (const [label, solution] of [
      [c.label, c.solution],
      [`${c.label} [reference]`, solvePoissonReference(c.problem)],
    ] as const) {
      const st = fdStats.get(label) ?? bStats.get(label)!;
      solves.set(label, st);
      const estimate = solution.chargeErrorEstimate;
      const speedup = label === c.label ? (fdStats.get(`${c.label} [reference]`) ?? bStats.get(`${c.label} [reference]`)!).median / st.median : 1;
      rows.push([label, st.median, st.p10, st.p90, Math.min(...st.roundMedians), Math.max(...st.roundMedians), st.runs, solution.x_m.length, solution.iterations, estimate, speedup]);
    }
  }
  printTable(
    'solvePoisson, typical case (N_D 1e18 cm^-3, 300 K, +0.8 eV), model + bulk prepared outside the timing; [reference] = pre-issue-10 solver',
    ['case', 'median us', 'p10 us', 'p90 us', 'best round', 'worst round', 'runs', 'meshPoints', 'iterations', 'error est./bound', 'speed-up vs ref'],
    rows,
  );
  const contacts = new Map<string, InterleavedStats>();
  const contactRows: (string | number)[][] = [];
  for (const c of contactCases) {
    const st = fdStats.get(c.label)!;
    contacts.set(c.label, st);
    contactRows.push([c.label, st.median, st.p10, st.p90, Math.min(...st.roundMedians), Math.max(...st.roundMedians), st.runs, c.result.bandBending_eV, c.result.solver.meshPoints]);
  }
  printTable(
    'solveContact (custom properties, empty library, FD, +0.8 eV; interleaved with the FD solves above)',
    ['case', 'median us', 'p10 us', 'p90 us', 'best round', 'worst round', 'runs', 'bandBending eV', 'meshPoints'],
    contactRows,
  );
  return { solves, contacts };
}

interface AccuracyCase {
  label: string;
  relError: number;
  /** the pre-issue-10 solver's error on the same case */
  referenceError: number;
  iterations: number;
  meshPoints: number;
  estimate: number;
}

function benchAccuracy(): AccuracyCase[] {
  const bendings = [-1, -0.3, -0.05, 0.05, 0.3, 0.8, 2, 3.2];
  const temperatures = [300, 600];
  const donors = [1e16, 1e19];
  const cases: AccuracyCase[] = [];
  const rows: (string | number)[][] = [];
  for (const nd of donors) {
    for (const T of temperatures) {
      const { n0, p0 } = boltzmannBulk(nd * 1e6, T);
      for (const bb of bendings) {
        const { problem } = preparePoisson(nd, T, bb, 'boltzmann', PLANAR);
        const t0 = performance.now();
        const solution = solvePoisson(problem);
        const us = (performance.now() - t0) * 1000;
        const u = bb / thermalEnergy_eV(T);
        const exact = exactBoltzmannPlanarCharge(n0, p0, u, TYPICAL.permittivity, T);
        const relError = Math.abs(solution.totalCharge_C - exact) / Math.abs(exact);
        const referenceError = Math.abs(solvePoissonReference(problem).totalCharge_C - exact) / Math.abs(exact);
        const label = `${nd.toExponential(0)} cm^-3 ${T} K ${bb} eV`;
        cases.push({ label, relError, referenceError, iterations: solution.iterations, meshPoints: solution.x_m.length, estimate: solution.chargeErrorEstimate });
        rows.push([label, exact, relError, solution.chargeErrorEstimate, referenceError, solution.x_m.length, solution.iterations, solution.domain_m * 1e9, us]);
      }
    }
  }
  printTable(
    'planar accuracy vs the exact first integral (Boltzmann, fully ionised donors; Sze & Ng ch. 4)',
    ['case', 'Q exact C/m^2', 'rel error', 'error bound', 'reference rel error', 'meshPoints', 'iterations', 'domain nm', 'first solve us'],
    rows,
  );
  return cases;
}

function benchScaling(): ScalingPoint[] {
  const out: ScalingPoint[] = [];
  const rows: (string | number)[][] = [];
  for (const refinement of [1, 2, 4, 8, 16]) {
    const { problem } = preparePoisson(TYPICAL.donors_cm3, TYPICAL.temperature_K, TYPICAL.bandBending_eV, 'fermi-dirac', PLANAR, refinement);
    const solution = solvePoisson(problem);
    const runs = Math.max(30, Math.round(400 / refinement));
    const stats = timeUs(() => solvePoisson(problem), runs, Math.max(5, Math.round(runs / 5)));
    out.push({ refinement, meshPoints: solution.x_m.length, solve_us: round(stats.median) });
    rows.push([refinement, solution.x_m.length, stats.median, stats.median / solution.x_m.length, solution.iterations, solution.chargeErrorEstimate, runs]);
  }
  printTable(
    'scaling: planar typical case (FD) vs refinement (meshPoints from the solution: fine mesh of the last solve)',
    ['refinement', 'meshPoints', 'median us', 'us/point', 'iterations', 'Richardson est.', 'runs'],
    rows,
  );
  return out;
}

/**
 * Where the time of one typical solve goes, with manual timers around the pieces solvePoisson uses (re-run
 * here the same way). Newton itself is not exported, so its work is reconstructed from call counts: charge-model
 * calls counted by a wrapper model; every residual evaluation is one model call per node; the tridiagonal solves
 * (one factorisation and solve per Newton step, one more solve per line-search trial of a step above 0.01 kT) are
 * estimated from those sweeps and the iteration count; solvePoisson allocates one typed array per solve, a buffer of
 * (16 x 8 + 49) x the first mesh's nodes (the first mesh is copied into it). Values are us unless the key says otherwise; *_est are estimates.
 */
const TIMED_PIECES = new Set([
  'firstIntegral',
  'buildMesh_coarse',
  'initialGuess',
  'bisectMesh',
  'netCharge_newton_est',
  'tridiagonal_total_est',
  'geometry_total_est',
  'typedArray_alloc_total_est',
  'unaccounted_est',
]);

interface BreakdownSetup {
  model: ChargeModel;
  problem: PoissonProblem;
  beta: number;
  coarse: Float64Array;
  fine: Float64Array;
}

/** First integral, first mesh, initial guess and one bisection, each timed alone. */
function setupTimes(geometry: CrossSection): { setup: BreakdownSetup; times: Record<string, number> } {
  const { model, problem } = preparePoisson(TYPICAL.donors_cm3, TYPICAL.temperature_K, TYPICAL.bandBending_eV, 'fermi-dirac', geometry);
  const beta =
    (Q_ELEMENTARY_C * Q_ELEMENTARY_C) / (problem.relativePermittivity * EPS0_F_PER_M * K_BOLTZMANN_J_PER_K * problem.temperature_K);
  const xi = problem.bulkReducedFermiLevel;
  const us = problem.surfaceBending;
  const firstIntegral = timeUs(() => planarFirstIntegral(model, xi, us, beta), 400, 100);
  const fi = planarFirstIntegral(model, xi, us, beta);
  // the solver's first mesh: a third of the generator's default density (BASE_COARSENING in poisson.ts)
  const meshOptions = { firstIntegral: fi, maxDomain_m: DEFAULT_MAX_DOMAIN_M, refinement: 1 / 3, geometry, farBoundary: 'screened' as const };
  const mesh = buildMesh(meshOptions);
  const meshTime = timeUs(() => buildMesh(meshOptions), 400, 100);
  const guessTime = timeUs(() => {
    let sum = 0;
    for (let i = 0; i < mesh.x.length; i++) sum += fi.guess(mesh.x[i]!);
    return sum;
  }, 400, 100);
  const bisectTime = timeUs(() => bisectMesh(mesh.x), 400, 100);
  return {
    setup: { model, problem, beta, coarse: mesh.x, fine: bisectMesh(mesh.x) },
    times: {
      firstIntegral: round(firstIntegral.median),
      buildMesh_coarse: round(meshTime.median),
      initialGuess: round(guessTime.median),
      bisectMesh: round(bisectTime.median),
    },
  };
}

/** Unit costs: one charge-model call, one tridiagonal node, one cell of geometry integrals, one typed array. */
function unitCosts(setup: BreakdownSetup, solved: Float64Array, geometry: CrossSection): Record<string, number> {
  const xi = setup.problem.bulkReducedFermiLevel;
  const out = new Float64Array(2);
  const perSweep = timeUs(() => {
    for (let i = 0; i < solved.length; i++) setup.model.netCharge(xi - solved[i]!, out);
  }, 400, 100);
  // one tridiagonal solve of the fine-mesh size (the Jacobian is a diagonally dominant M-matrix)
  const n = solved.length - 1;
  const lower = new Float64Array(n).fill(1);
  const upper = new Float64Array(n).fill(1);
  const diag = new Float64Array(n).fill(-2.5);
  const rhs = new Float64Array(n).fill(1);
  const sol = new Float64Array(n);
  const work = new Float64Array(n);
  const tri = timeUs(() => solveTridiagonal(n, lower, diag, upper, rhs, sol, work), 400, 100);
  // geometry integrals: newtonOnMesh calls volume twice and faceArea once per cell
  const fine = setup.fine;
  const geometryTime = timeUs(() => {
    let sum = 0;
    for (let i = 0; i < fine.length - 1; i++) sum += 2 * geometry.volume(fine[i]!, fine[i + 1]!) + geometry.faceArea(fine[i]!, fine[i + 1]!);
    return sum;
  }, 400, 100);
  // typed-array allocation (kept alive so that it cannot be optimised away)
  const keep: Float64Array[] = new Array<Float64Array>(64);
  let slot = 0;
  const allocNs = (size: number): number => {
    const t = timeUs(() => {
      for (let k = 0; k < 20; k++) keep[slot++ & 63] = new Float64Array(size);
    }, 400, 100);
    return (t.median * 1000) / 20;
  };
  return {
    netCharge_ns_per_call: round((perSweep.median * 1000) / solved.length),
    tridiagonal_ns_per_node: round((tri.median * 1000) / n),
    geometry_ns_per_cell: round((geometryTime.median * 1000) / (fine.length - 1)),
    typedArray_alloc_ns_buffer: round(allocNs((16 * 8 + 49) * setup.coarse.length)),
    typedArray_alloc_ns_mesh: round(allocNs(setup.coarse.length)),
  };
}

function benchBreakdown(label: string, geometry: CrossSection, totalSolve_us: number): Record<string, number> {
  const { setup, times } = setupTimes(geometry);
  const { model, problem, beta } = setup;
  // count charge-model calls in one solve, and those of the first integral alone
  let calls = 0;
  const counting: ChargeModel = {
    ...model,
    netCharge(x, out) {
      calls++;
      model.netCharge(x, out);
    },
  };
  planarFirstIntegral(counting, problem.bulkReducedFermiLevel, problem.surfaceBending, beta);
  const fiCalls = calls;
  calls = 0;
  const solution = solvePoisson({ ...problem, model: counting });
  const newtonCalls = calls - fiCalls;
  const unit = unitCosts(setup, solution.u, geometry);
  // nodes over all meshes: n, 2n - 1, 4n - 3, ... (meshLevels of them)
  let meshNodes = 0;
  for (let k = 0, n = setup.coarse.length; k < solution.meshLevels; k++, n = 2 * n - 1) meshNodes += n;
  const meanNodes = meshNodes / solution.meshLevels;
  // tridiagonal work: one factorisation + solve per Newton step, one solve per evaluation after the first per mesh
  const tridiagonalNodes = 2 * solution.iterations * meanNodes + Math.max(0, newtonCalls - meshNodes);
  const b: Record<string, number> = {
    solve_total: round(totalSolve_us),
    ...times,
    ...unit,
    netCharge_calls_in_newton: newtonCalls,
    netCharge_newton_est: round((newtonCalls * unit.netCharge_ns_per_call!) / 1000),
    residual_evaluations_est: round(newtonCalls / meanNodes, 3),
    tridiagonal_total_est: round((tridiagonalNodes * unit.tridiagonal_ns_per_node!) / 1000),
    geometry_total_est: round((unit.geometry_ns_per_cell! * meshNodes) / 1000),
    typedArray_allocs: 1,
    typedArray_alloc_total_est: round(unit.typedArray_alloc_ns_buffer! / 1000),
    newton_iterations: solution.iterations,
    mesh_levels: solution.meshLevels,
    coarse_points: setup.coarse.length,
    fine_points: solution.x_m.length,
  };
  let accounted = 0;
  for (const key of TIMED_PIECES) if (key !== 'unaccounted_est') accounted += b[key] ?? 0;
  b.unaccounted_est = round(totalSolve_us - accounted);
  printTable(
    `breakdown of one ${label} typical solve (FD), us unless stated; *_est are estimates`,
    ['piece', 'value', '% of solve'],
    Object.entries(b).map(([k, v]) => [k, v, TIMED_PIECES.has(k) ? ((100 * v) / totalSolve_us).toFixed(1) : '']),
  );
  return b;
}

function benchScreen(): { stats: Stats; failed: number; rows: number } {
  const library = loadLibrary();
  const metals = [...library.metals.values()].slice(0, 20).map((m) => m.name);
  const supports = [...library.supports.values()].slice(0, 20).map((s) => s.name);
  const conditions = { temperature: 473, geometry: 'hemisphere' as const, particleDiameter: 2, donors: 1e18 };
  let failed = 0;
  let count = 0;
  const run = (): void => {
    const rows = runScreen({ metals, supports, conditions, materials: library });
    failed = rows.filter((r) => r.error !== '').length;
    count = rows.length;
  };
  const stats = { stats: statsOf([]), samples: [] as number[] };
  run(); // warm-up
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    run();
    stats.samples.push((performance.now() - t0) / 1000);
  }
  stats.stats = statsOf(stats.samples);
  printTable(
    `runScreen ${metals.length} metals x ${supports.length} supports (473 K, hemisphere 2 nm, N_D 1e18 cm^-3)`,
    ['runs (s)', 'median s', 'rows', 'failed rows', 'ms per pair'],
    [[stats.samples.map((s) => s.toFixed(3)).join(' '), stats.stats.median, count, failed, (stats.stats.median * 1000) / count]],
  );
  return { stats: stats.stats, failed, rows: count };
}

function studyOf(points: number): ReturnType<typeof parseStudy> {
  return parseStudy(
    {
      name: 'bench-study',
      base: {
        workFunction: 5.1,
        electronAffinity: 4.2,
        bandGap: TYPICAL.bandGap_eV,
        permittivity: TYPICAL.permittivity,
        electronMass: TYPICAL.electronMass_me,
        holeMass: TYPICAL.holeMass_me,
        geometry: 'hemisphere',
        particleDiameter: 2,
      },
      sweep: {
        mode: 'product',
        axes: [
          { field: 'donors', log: { from: 1e16, to: 1e19, points }, unit: 'cm^-3' },
          { field: 'temperature', linear: { from: 300, to: 700, points }, unit: 'K' },
        ],
      },
      outputs: ['bandBending_eV', 'electronsPerParticle'],
    },
    { label: 'bench-study' },
  );
}

interface StudyRun {
  wall_s: number;
  /** CPU time of the whole process (all threads, from process.cpuUsage) over wall time: cores actually used */
  cpuPerWall: number;
}

async function benchStudy(): Promise<{ jobs1: StudyRun[]; jobs2: StudyRun[]; startup2: number; failed: number }> {
  const dir = mkdtempSync(join(tmpdir(), 'bandbend-bench-'));
  try {
    const big = studyOf(100);
    const small = studyOf(2);
    let failed = 0;
    const run = async (study: typeof big, jobs: number): Promise<StudyRun> => {
      const cpu0 = process.cpuUsage();
      const t0 = performance.now();
      const summary = await runStudy({ study, outDir: join(dir, `jobs${jobs}`), jobs, force: true });
      const wall_s = (performance.now() - t0) / 1000;
      const cpu = process.cpuUsage(cpu0);
      if (study === big) failed = summary.failed;
      return { wall_s, cpuPerWall: (cpu.user + cpu.system) / 1e6 / wall_s };
    };
    // start-up: 4 points on 2 workers, median of 3
    const startup: number[] = [];
    for (let i = 0; i < 3; i++) startup.push((await run(small, 2)).wall_s);
    const jobs1: StudyRun[] = [];
    const jobs2: StudyRun[] = [];
    const first1 = await run(big, 1);
    jobs1.push(first1);
    const reps = first1.wall_s > 30 ? 2 : 3;
    // alternate jobs 1 and jobs 2 so that a change in machine load hits both
    for (let i = 0; i < reps; i++) {
      jobs2.push(await run(big, 2));
      if (jobs1.length < reps) jobs1.push(await run(big, 1));
    }
    const wall = (r: StudyRun[]): number[] => r.map((x) => x.wall_s);
    printTable(
      'runStudy 100 x 100 (donors log 1e16..1e19 cm^-3 x 300..700 K, hemisphere 2 nm, CSV + JSONL), wall time',
      ['jobs', 'runs (s)', 'median s', 'points/s', 'cpu/wall', 'failed'],
      [
        [1, wall(jobs1).map((s) => s.toFixed(2)).join(' '), median(wall(jobs1)), 10000 / median(wall(jobs1)), median(jobs1.map((r) => r.cpuPerWall)), failed],
        [2, wall(jobs2).map((s) => s.toFixed(2)).join(' '), median(wall(jobs2)), 10000 / median(wall(jobs2)), median(jobs2.map((r) => r.cpuPerWall)), failed],
        ['2 (4 points: start-up)', startup.map((s) => s.toFixed(3)).join(' '), median(startup), NaN, NaN, 0],
      ],
    );
    return { jobs1, jobs2, startup2: median(startup), failed };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// ---------------------------------------------------------------------------------------------
// start-up of the command line

const PACKAGE_ROOT = fileURLToPath(new URL('../../', import.meta.url));
const STARTUP_CLI_ARGS = ['bin/bandbend.js', 'contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '1e17 cm^-3', '--temperature', '473 K', '--json'];
const STARTUP_RUNS = 11;

interface StartupBench {
  cli_ms: number[];
  node_ms: number[];
  ratio: number;
}

/** Wall time of one spawned process, ms; throws if it fails (a failing CLI would make the ratio meaningless). */
function spawnWall_ms(args: readonly string[]): number {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, args, { cwd: PACKAGE_ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  const ms = performance.now() - t0;
  if (r.error) throw r.error;
  if (r.status !== 0) throw new RangeError(`bench: \`node ${args.join(' ')}\` exited ${String(r.status)}: ${r.stderr.trim().slice(0, 300)}`);
  return ms;
}

/** CLI contact --json vs `node -e 0`, alternating, one warm-up of each (file cache). */
function benchStartup(runs = STARTUP_RUNS): StartupBench {
  spawnWall_ms(['-e', '0']);
  spawnWall_ms(STARTUP_CLI_ARGS);
  const cli_ms: number[] = [];
  const node_ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    // alternate the order too, so neither always follows the other
    if (i % 2 === 0) {
      node_ms.push(spawnWall_ms(['-e', '0']));
      cli_ms.push(spawnWall_ms(STARTUP_CLI_ARGS));
    } else {
      cli_ms.push(spawnWall_ms(STARTUP_CLI_ARGS));
      node_ms.push(spawnWall_ms(['-e', '0']));
    }
  }
  const ratio = median(cli_ms) / median(node_ms);
  printTable(
    'start-up: `bandbend contact --metal Pt --support ZnO --donors "1e17 cm^-3" --temperature "473 K" --json` vs `node -e 0`, wall time',
    ['command', 'runs', 'median ms', 'p10 ms', 'p90 ms'],
    [
      ['bandbend contact --json', runs, median(cli_ms), statsOf(cli_ms).p10, statsOf(cli_ms).p90],
      ['node -e 0', runs, median(node_ms), statsOf(node_ms).p10, statsOf(node_ms).p90],
      ['ratio (CLI / node)', '', ratio, NaN, NaN],
    ],
  );
  return { cli_ms, node_ms, ratio };
}

async function benchJobs(quick: boolean): Promise<StudyJobsBench> {
  const r = await benchStudyJobs(quick ? { points: 400, repeats: 1 } : { points: 10_000, repeats: 3 });
  printTable(
    `benchStudyJobs: ${r.points}-point study, jobs 2 vs jobs 1 (alternating), wall time`,
    ['jobs', 'runs (s)', 'median s', 'points/s'],
    [
      [1, r.runs_jobs1_s.map((x) => x.toFixed(2)).join(' '), r.jobs1_s, r.points / r.jobs1_s],
      [2, r.runs_jobs2_s.map((x) => x.toFixed(2)).join(' '), r.jobs2_s, r.points / r.jobs2_s],
      ['speed-up (jobs 1 / jobs 2)', '', r.speedup, NaN],
    ],
  );
  return r;
}

// ---------------------------------------------------------------------------------------------

interface SectionResults {
  typical: Map<string, InterleavedStats>;
  contact: Map<string, InterleavedStats>;
  accuracy: AccuracyCase[];
  scaling: ScalingPoint[];
  breakdown: Record<string, number>;
  breakdownHemisphere: Record<string, number>;
  screen: { stats: { median: number } };
  startup: StartupBench;
  jobs: StudyJobsBench;
  explorer: ExplorerBench;
  study: { jobs1: StudyRun[]; jobs2: StudyRun[]; startup2: number };
  loadavgStart: number[];
}

/** The JSON summary from the sections' results (targets and bench_s are filled by main). */
function summarise(r: SectionResults): BenchSummary {
  const { typical, contact, accuracy, scaling, breakdown, breakdownHemisphere, screen, startup, jobs, explorer, study, loadavgStart } = r;
  const relErrors = accuracy.map((c) => c.relError);
  const worst = accuracy.reduce((a, b) => (b.relError > a.relError ? b : a));
  const scalingExponent = logLogSlope(
    scaling.map((s) => s.meshPoints),
    scaling.map((s) => s.solve_us),
  );
  return {
    planarSolve_us_median: round(typical.get('planar FD')!.median),
    nonlinearPlanarSolve_us_median: round(typical.get(NONLINEAR_LABELS.nonlinear)!.median),
    nonlinearPlanarSolve_linear_us_median: round(typical.get(NONLINEAR_LABELS.linear)!.median),
    nonlinearPlanarSolve_ratio: round(typical.get(NONLINEAR_LABELS.nonlinear)!.median / typical.get(NONLINEAR_LABELS.linear)!.median),
    hemisphereSolve_us_median: round(typical.get('hemisphere r=1nm FD')!.median),
    planarSolve_us_median_boltzmann: round(typical.get('planar Boltzmann')!.median),
    hemisphereSolve_us_median_boltzmann: round(typical.get('hemisphere r=1nm Boltzmann')!.median),
    planarSolve_us_median_reference: round(typical.get('planar FD [reference]')!.median),
    hemisphereSolve_us_median_reference: round(typical.get('hemisphere r=1nm FD [reference]')!.median),
    planarSolve_us_median_boltzmann_reference: round(typical.get('planar Boltzmann [reference]')!.median),
    hemisphereSolve_us_median_boltzmann_reference: round(typical.get('hemisphere r=1nm Boltzmann [reference]')!.median),
    planarSolve_speedup: round(typical.get('planar FD [reference]')!.median / typical.get('planar FD')!.median, 3),
    hemisphereSolve_speedup: round(typical.get('hemisphere r=1nm FD [reference]')!.median / typical.get('hemisphere r=1nm FD')!.median, 3),
    planarSolve_speedup_boltzmann: round(typical.get('planar Boltzmann [reference]')!.median / typical.get('planar Boltzmann')!.median, 3),
    hemisphereSolve_speedup_boltzmann: round(typical.get('hemisphere r=1nm Boltzmann [reference]')!.median / typical.get('hemisphere r=1nm Boltzmann')!.median, 3),
    planarRelError_max_reference: round(Math.max(...accuracy.map((c) => c.referenceError)), 3),
    contactSolve_us_median: round(contact.get('contact hemisphere d=2nm')!.median),
    contactSolvePlanar_us_median: round(contact.get('contact planar')!.median),
    planarRelError_max: round(Math.max(...relErrors), 3),
    planarRelError_median: round(median(relErrors), 3),
    planarRelError_worstCase: worst.label,
    newtonIterations_median: median(accuracy.map((c) => c.iterations)),
    meshPoints_median: median(accuracy.map((c) => c.meshPoints)),
    screen400_s: round(screen.stats.median),
    study10k_s_jobs1: round(median(study.jobs1.map((r) => r.wall_s))),
    study10k_s_jobs2: round(median(study.jobs2.map((r) => r.wall_s))),
    study10k_runs_jobs1: study.jobs1.map((r) => round(r.wall_s)),
    study10k_runs_jobs2: study.jobs2.map((r) => round(r.wall_s)),
    study10k_cpuPerWall_jobs1: round(median(study.jobs1.map((r) => r.cpuPerWall)), 3),
    study10k_cpuPerWall_jobs2: round(median(study.jobs2.map((r) => r.cpuPerWall)), 3),
    studyStartup_s_jobs2: round(study.startup2),
    startup_cli_ms_median: round(median(startup.cli_ms)),
    startup_node_ms_median: round(median(startup.node_ms)),
    startup_ratio: round(startup.ratio, 3),
    startup_runs: startup.cli_ms.length,
    studyJobs_points: jobs.points,
    studyJobs_s_jobs1: round(jobs.jobs1_s),
    studyJobs_s_jobs2: round(jobs.jobs2_s),
    studyJobs_speedup: round(jobs.speedup, 3),
    studyJobs_cpuPerWall_jobs2: round(jobs.cpuPerWall_jobs2, 3),
    scaling,
    scalingExponent: round(scalingExponent, 3),
    breakdown_us: breakdown,
    breakdownHemisphere_us: breakdownHemisphere,
    explorer,
    targets: {},
    node: process.version,
    cpus: cpus().length,
    loadavgStart,
    loadavg: loadavg().map((l) => round(l, 3)),
    date: new Date().toISOString(),
    bench_s: 0,
  };
}

/** The targets of issue 10 and earlier ones, printed as a table. */
function targetsOf(summary: BenchSummary): Record<string, boolean> {
  const targets = {
    planar_speedup_ge_2: summary.planarSolve_speedup >= 2,
    hemisphere_speedup_ge_2: summary.hemisphereSolve_speedup >= 2,
    planar_le_200us: summary.planarSolve_us_median <= 200,
    hemisphere_le_1ms: summary.hemisphereSolve_us_median <= 1000,
    relError_le_1e5: summary.planarRelError_max <= 1e-5,
    scaling_linear: summary.scalingExponent <= 1.15,
    study10k_jobs2_lt_10s: summary.study10k_s_jobs2 < 10,
  };
  printTable(
    'targets',
    ['target', 'value', 'met'],
    [
      ['planar solve >= 2x faster than the reference', summary.planarSolve_speedup, String(targets.planar_speedup_ge_2)],
      ['hemisphere solve >= 2x faster than the reference', summary.hemisphereSolve_speedup, String(targets.hemisphere_speedup_ge_2)],
      ['planar solve <= 200 us', summary.planarSolve_us_median, String(targets.planar_le_200us)],
      ['hemisphere solve <= 1 ms', summary.hemisphereSolve_us_median, String(targets.hemisphere_le_1ms)],
      ['max rel error <= 1e-5', summary.planarRelError_max, String(targets.relError_le_1e5)],
      ['linear scaling (exponent <= 1.15)', summary.scalingExponent, String(targets.scaling_linear)],
      ['10k study, 2 jobs < 10 s', summary.study10k_s_jobs2, String(targets.study10k_jobs2_lt_10s)],
    ],
  );
  return targets;
}

async function main(): Promise<void> {
  const started = performance.now();
  const loadavgStart = loadavg().map((l) => round(l, 3));
  console.log(`# bandbend bench: node ${process.version}, ${cpus().length} cpus, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}`);

  const { solves: typical, contacts: contact } = benchTypical();
  const accuracy = benchAccuracy();
  const scaling = benchScaling();
  const breakdown = benchBreakdown('planar', PLANAR, typical.get('planar FD')!.median);
  const breakdownHemisphere = benchBreakdown('hemisphere r=1nm', hemisphere(TYPICAL.hemisphereRadius_m), typical.get('hemisphere r=1nm FD')!.median);
  // BENCH_QUICK=1 skips the screen and the 10k-point study (minutes on a shared machine); their keys are then 0
  const quick = process.env['BENCH_QUICK'] === '1';
  const screen = quick ? { stats: { median: 0 } } : benchScreen();
  const startup = benchStartup();
  const jobs = await benchJobs(quick);
  const explorer = await benchExplorer(); // the explorer page in Chromium: input -> band diagram (explorerBench.ts)
  const study = quick ? { jobs1: [{ wall_s: 0, cpuPerWall: 0 }], jobs2: [{ wall_s: 0, cpuPerWall: 0 }], startup2: 0, failed: 0 } : await benchStudy();

  const summary = summarise({ typical, contact, accuracy, scaling, breakdown, breakdownHemisphere, screen, startup, jobs, explorer, study, loadavgStart });
  summary.targets = targetsOf(summary);
  summary.bench_s = round((performance.now() - started) / 1000);
  console.log(JSON.stringify(summary));
}

await main();
