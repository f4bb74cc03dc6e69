// Shared test helpers: independent reference computations written for the tests (not the project's code paths).
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../src/bulk/equilibrium.js';
import type { ContactOptions } from '../src/inputs/parameters.js';
import type { MaterialsLibrary } from '../src/materials/types.js';
import type { WarningFacts } from '../src/derived/warnings.js';

/** CODATA 2018 values (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)), typed here independently of mathjs. */
export const CODATA2018 = {
  k: 1.380649e-23,
  q: 1.602176634e-19,
  h: 6.62607015e-34,
  me: 9.1093837015e-31,
  eps0: 8.8541878128e-12,
};

/** Composite Simpson rule with n (even) intervals. */
export function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

/**
 * Exact planar surface charge from the first integral of Poisson's equation (Sze & Ng, Physics of Semiconductor
 * Devices, 3rd ed., ch. 4, surface space-charge relation): Q = sign(u_s) sqrt(2 eps eps0 kT * int_0^u_s N du),
 * with the integral of the full charge model done here by Simpson's rule on a fine grid.
 */
export function exactPlanarCharge(support: SupportElectronic, relativePermittivity: number, bandBending_eV: number): number {
  const model = makeChargeModel(support);
  const bulk = solveBulkNeutrality(model);
  const u = bandBending_eV / model.kT_eV;
  const out = new Float64Array(2);
  const integrand = (v: number): number => {
    model.netCharge(bulk.reducedFermiLevel - v, out);
    return out[0]!;
  };
  const integral = simpson(integrand, 0, u, 200000);
  return Math.sign(u) * Math.sqrt(2 * relativePermittivity * CODATA2018.eps0 * CODATA2018.k * support.temperature_K * integral);
}

/**
 * Closed-form planar charge for Boltzmann statistics and fully ionised dopants (Sze & Ng ch. 4, eq. for Q_s with
 * F(beta psi_s, n_p0/p_p0)), in this project's sign convention (u = reduced band bending, up = positive):
 * int_0^u N du = p0 (e^u - u - 1) + n0 (e^-u + u - 1).
 */
export function boltzmannPlanarCharge(n0_m3: number, p0_m3: number, u: number, relativePermittivity: number, temperature_K: number): number {
  const integral = p0_m3 * Math.expm1(u) - p0_m3 * u + n0_m3 * Math.expm1(-u) + n0_m3 * u;
  return Math.sign(u) * Math.sqrt(2 * relativePermittivity * CODATA2018.eps0 * CODATA2018.k * temperature_K * integral);
}

/** Minimal RFC 4180 reader for one line: quoted cells with "" escapes (bandbend never writes embedded newlines). */
/**
 * Root of an increasing function on [lo, hi] by plain bisection, 200 halvings (common practice, no source): an
 * independent reference for the project's safeguarded root finders. f(lo) < 0 < f(hi) is assumed.
 */
export function bisectIncreasing(f: (x: number) => number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (a + b);
    if (f(mid) > 0) b = mid;
    else a = mid;
  }
  return 0.5 * (a + b);
}

export function parseCsvLine(line: string): string[] {
  const cells: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      cells.push(cell);
      cell = '';
    } else cell += ch;
  }
  if (quoted) throw new Error(`unterminated quote in ${line}`);
  cells.push(cell);
  return cells;
}

/** All non-empty lines of a CSV text, parsed. */
export function parseCsv(text: string): string[][] {
  return text
    .split(/\r?\n/)
    .filter((l) => l !== '')
    .map(parseCsvLine);
}

// ---------------------------------------------------------------------------------------------
// shared fixture builders

/** A materials library with nothing in it: every input must come from the options. */
export function emptyLibrary(): MaterialsLibrary {
  return { metals: new Map(), supports: new Map(), references: new Map() };
}

/**
 * Tungsten on n-type silicon, N_d = 1e16 cm^-3, 300 K, Boltzmann statistics: the worked example from memory of
 * D. A. Neamen, Semiconductor Physics and Devices, 4th ed., Examples 9.1-9.2 (verify); overrides replace fields.
 */
export function tungstenOnSilicon(overrides: ContactOptions = {}): ContactOptions {
  return {
    workFunction: 4.55,
    electronAffinity: 4.01,
    bandGap: 1.12,
    permittivity: 11.7,
    electronMass: 1.08,
    holeMass: 0.81,
    donors: '1e16 cm^-3',
    temperature: 300,
    statistics: 'boltzmann',
    materials: emptyLibrary(),
    ...overrides,
  };
}

/** Warning facts of a quiet contact (no rule applies: moderate depletion, 10 nm layer, 2 nm particle); overrides replace fields. */
export function warningFacts(overrides: Partial<WarningFacts> = {}): WarningFacts {
  return {
    temperature_K: 300,
    kT_eV: 0.025852,
    nType: true,
    bandGap_eV: 3.2,
    bulkReducedFermiLevel: -6,
    bandBending_eV: 0.5,
    electronBarrier_eV: 0.7,
    particleDiameter_m: 2e-9,
    depth90_m: 10e-9,
    interfaceElectrons_m3: 1e15,
    interfaceHoles_m3: 1,
    bulkElectrons_m3: 1e23,
    bulkHoles_m3: 1,
    endMajority_m3: null,
    supportThickness_m: undefined,
    layerTruncated: false,
    domain_m: 100e-9,
    donors_m3: 1e23,
    acceptors_m3: 0,
    electronsPerParticle: 5,
    chargingEnergy_eV: 0.01,
    chargingEnergyOverKT: 0.4,
    zonesOverlap: null,
    meanSpacing_m: null,
    exchangeSlow: false,
    equilibrationTimeLog10_s: -3,
    chargeErrorEstimate: 1e-6,
    refineAbove: 1e-3,
    estimatedInputs: [],
    unverifiedInputs: [],
    meetsTolerance: true,
    chargeErrorBound: 1e-6,
    debyeLength_m: 5e-9,
    statistics: 'fermi-dirac',
    interfaceReducedFermiLevel: -25,
    atoms: 300,
    surfaceAtoms: 150,
    interfaceField_V_per_m: 1e7,
    interfaceLayer: null,
    permittivityFieldDependent: false,
    staticPermittivity: 10,
    fieldPermittivity: null,
    imageForceMaximum_m: 3e-9,
    imageForceValid: true,
    relaxationLog10_s: -3,
    donorLevel_eV: null,
    historyTemperature_K: null,
    historyRelaxationLog10_s: null,
    ...overrides,
  };
}

/**
 * Run the built CLI (bin/bandbend.js) from the package root, without colour and without the debug stack traces:
 * exit code, stdout and stderr (at most 120 s).
 */
export function runBandbend(args: string[]): { code: number | null; stdout: string; stderr: string } {
  const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1' };
  delete env['BANDBEND_DEBUG'];
  const root = fileURLToPath(new URL('..', import.meta.url));
  const r = spawnSync(process.execPath, ['bin/bandbend.js', ...args], { cwd: root, encoding: 'utf8', env, timeout: 120_000 });
  if (r.error) throw r.error;
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Every file under dir -> sha256 of its content and its mtime, to prove a refused command left them alone. */
export function folderSnapshot(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string): void => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      const st = statSync(p);
      if (st.isDirectory()) walk(p);
      else out[relative(dir, p)] = `${createHash('sha256').update(readFileSync(p)).digest('hex')} ${st.mtimeMs}`;
    }
  };
  walk(dir);
  return out;
}
