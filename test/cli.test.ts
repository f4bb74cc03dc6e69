// End-to-end tests of the `bandbend` command line: every command, happy paths and bad input.
// Each test spawns the compiled CLI (`node bin/bandbend.js ...`, built by `npm test` before vitest runs)
// from the package root and writes outputs only into a fresh temporary folder.
//
// Contract under test (src/cli/main.ts): exit 0 ok, 2 bad input, 1 internal error. Bad input prints exactly one
// line on stderr, starting "bandbend: error:", naming the field (the flag the user typed, or the file) and where
// it applies the allowed range; no stack trace; nothing half-written on disk. Commander usage errors exit 2.
//
// Physics checks name their source next to them. Material values are read through `materials show --json`
// or given as custom inputs, so the tests do not hard-code library numbers.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { folderSnapshot, parseCsv } from './helpers.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));

/** CODATA 2018 (E. Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)); written out here, independent of src/. */
const Q = 1.602176634e-19; // C
const K_B = 1.380649e-23; // J/K
const H = 6.62607015e-34; // J s
const M_E = 9.1093837015e-31; // kg
const EPS0 = 8.8541878128e-12; // F/m

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Run the CLI the way a user does, from the package root. */
function bandbend(args: string[]): Run {
  const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1' };
  delete env['BANDBEND_DEBUG'];
  const r = spawnSync(process.execPath, ['bin/bandbend.js', ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    env,
    timeout: 120_000,
    maxBuffer: 64 * 1024 * 1024,
  });
  if (r.error) throw r.error;
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function show(r: Run): string {
  return `exit ${String(r.code)}\n--- stderr\n${r.stderr}\n--- stdout (start)\n${r.stdout.slice(0, 600)}`;
}

/** Exit 0 with nothing alarming on stderr. */
function expectOk(r: Run): void {
  expect(r.code, show(r)).toBe(0);
  expect(r.stderr, show(r)).not.toMatch(/error|^\s+at\s/im);
}

/** No stack frames, no internal paths: what a user sees must be a message, not a trace. */
function expectNoTrace(r: Run): void {
  expect(r.stderr, show(r)).not.toMatch(/^\s*at\s/m);
  expect(r.stderr, show(r)).not.toMatch(/node:internal|\.[cm]?js:\d+:\d+|\.ts:\d+:\d+/);
  expect(r.stderr, show(r)).not.toMatch(/internal error/);
}

/**
 * Bad input: exit 2, nothing on stdout, exactly one line on stderr starting "bandbend: error:",
 * containing every string in `mentions` (the field, the file, the allowed range ...).
 */
function expectBadInput(r: Run, ...mentions: (string | RegExp)[]): string {
  expect(r.code, show(r)).toBe(2);
  expectNoTrace(r);
  expect(r.stdout, show(r)).toBe('');
  expect(r.stderr.endsWith('\n'), show(r)).toBe(true);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines, show(r)).toHaveLength(1);
  const line = lines[0]!;
  expect(line, show(r)).toMatch(/^bandbend: error: \S/);
  for (const m of mentions) {
    if (typeof m === 'string') expect(line, show(r)).toContain(m);
    else expect(line, show(r)).toMatch(m);
  }
  return line;
}

/** Commander usage errors (unknown option, bad choice, missing required option): exit 2, short, no trace. */
function expectUsageError(r: Run, mention: string): void {
  expect(r.code, show(r)).toBe(2);
  expectNoTrace(r);
  expect(r.stdout).toBe('');
  expect(r.stderr).toContain(mention);
  expect(r.stderr.trimEnd().split('\n').length).toBeLessThanOrEqual(2);
}

function parseJson<T = Record<string, unknown>>(r: Run): T {
  expectOk(r);
  return JSON.parse(r.stdout) as T;
}


const snapshot = folderSnapshot; // test/helpers.ts

function relClose(actual: number, expected: number, tolerance: number, label: string): void {
  expect(Math.abs(actual / expected - 1), `${label}: ${actual} vs ${expected}`).toBeLessThan(tolerance);
}

interface PV {
  value: number;
}
const shownMaterials = new Map<string, Record<string, PV>>();
/** A library value, read through the CLI (cached per name). */
function materialValue(name: string, field: string): number {
  let record = shownMaterials.get(name);
  if (record === undefined) {
    record = parseJson<Record<string, PV>>(bandbend(['materials', 'show', name, '--json']));
    shownMaterials.set(name, record);
  }
  const pv = record[field];
  if (pv === undefined || typeof pv.value !== 'number') throw new Error(`materials show ${name}: no ${field}`);
  return pv.value;
}

let work: string;
let counter = 0;
/** A fresh path inside the temporary folder (not created). */
function tmpPath(name: string): string {
  counter += 1;
  return join(work, `${String(counter).padStart(3, '0')}-${name}`);
}

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-cli-'));
  expect(existsSync(join(ROOT, 'dist', 'cli', 'main.js')), 'dist/ is missing: run `npm run build` (npm test does)').toBe(true);
});
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

/** A custom contact with no library lookups: fully ionised donors, so N_D^+ = N_D exactly. */
const CUSTOM = {
  workFunction: 5.3,
  electronAffinity: 4.2,
  bandGap: 3.2,
  permittivity: 10,
  opticalPermittivity: 5,
  electronMass: 0.3,
  holeMass: 1,
  donors_cm3: 1e17,
  temperature: 300,
};
const CUSTOM_ARGS = [
  '--work-function', String(CUSTOM.workFunction),
  '--electron-affinity', String(CUSTOM.electronAffinity),
  '--band-gap', String(CUSTOM.bandGap),
  '--permittivity', String(CUSTOM.permittivity),
  '--optical-permittivity', String(CUSTOM.opticalPermittivity),
  '--electron-mass', String(CUSTOM.electronMass),
  '--hole-mass', String(CUSTOM.holeMass),
  '--donors', String(CUSTOM.donors_cm3),
  '--temperature', `${CUSTOM.temperature} K`,
];

// =====================================================================================================
describe('bandbend contact', () => {
  it('prints a readable summary (library metal and support)', () => {
    const r = bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '1e18']);
    expectOk(r);
    expect(r.stdout).toMatch(/^Pt \| ZnO at 300 K/);
    for (const label of ['barrier height', 'band bending', 'direction', 'space charge', 'charge-equivalent width', 'electrons per particle']) {
      expect(r.stdout).toContain(label);
    }
  });

  it('--json carries every contract field with the right types (library metal and support)', () => {
    const j = parseJson(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '1e18', '--json']));
    expect(j['metal']).toBe('Pt');
    expect(j['support']).toBe('ZnO');
    for (const key of [
      'barrierHeight_eV',
      'bandBending_eV',
      'fermiLevelBelowConduction_eV',
      'supportWorkFunction_eV',
      'spaceCharge_C_per_m2',
      'chargeEquivalentWidth_nm',
      'depletionWidthApprox_nm',
      'interfaceField_V_per_m',
      'imageForceLowering_eV',
      'electronsPerParticle',
    ]) {
      expect(typeof j[key], key).toBe('number');
      expect(Number.isFinite(j[key]), key).toBe(true);
    }
    expect(['support-to-metal', 'metal-to-support', 'none']).toContain(j['direction']);
    const profile = j['profile'] as Record<string, number[]>;
    const n = profile['x_nm']!.length;
    expect(n).toBeGreaterThan(10);
    for (const key of ['x_nm', 'conductionBand_eV', 'valenceBand_eV', 'electronDensity_cm3', 'holeDensity_cm3', 'chargeDensity_C_per_m3', 'field_V_per_m']) {
      expect(Array.isArray(profile[key]), key).toBe(true);
      expect(profile[key]!.length, key).toBe(n);
      expect(profile[key]!.every((v) => typeof v === 'number' && Number.isFinite(v)), key).toBe(true);
    }
    const solver = j['solver'] as Record<string, unknown>;
    expect(solver['converged']).toBe(true);
    expect(typeof solver['iterations']).toBe('number');
    expect(typeof solver['meshPoints']).toBe('number');
    const warnings = j['warnings'] as { code: string; message: string }[];
    expect(Array.isArray(warnings)).toBe(true);
    for (const w of warnings) {
      expect(typeof w.code).toBe('string');
      expect(typeof w.message).toBe('string');
    }
    expect(j['uncertainty']).toBeUndefined();
  });

  it('--json obeys the textbook contact relations (custom inputs, no library)', () => {
    const j = parseJson(bandbend(['contact', ...CUSTOM_ARGS, '--json'])) as Record<string, number> & {
      direction: string;
      profile: Record<string, number[]>;
      bulk: Record<string, number>;
      solver: { converged: boolean };
    };
    const kT_eV = (K_B * CUSTOM.temperature) / Q;
    const eps = CUSTOM.permittivity * EPS0;
    const nD = CUSTOM.donors_cm3 * 1e6; // m^-3
    expect(j.solver.converged).toBe(true);
    expect(j['donorDensity_cm3']).toBeCloseTo(CUSTOM.donors_cm3, -6);

    // Schottky–Mott rule, ideal barrier Phi_B = Phi_M - chi (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3)
    expect(j['barrierHeight_eV']).toBeCloseTo(CUSTOM.workFunction - CUSTOM.electronAffinity, 9);
    // Support work function Phi_S = chi + (E_C - E_F)_bulk (Sze & Ng, 3rd ed., ch. 3, band diagram of the isolated semiconductor)
    expect(j['supportWorkFunction_eV']).toBeCloseTo(CUSTOM.electronAffinity + j['fermiLevelBelowConduction_eV']!, 9);
    // Built-in potential q V_bi = Phi_M - Phi_S (Sze & Ng, 3rd ed., ch. 3)
    expect(j['bandBending_eV']).toBeCloseTo(CUSTOM.workFunction - j['supportWorkFunction_eV']!, 9);
    // Phi_M > Phi_S on an n-type support: electrons flow into the metal, bands bend up (Sze & Ng, 3rd ed., ch. 3)
    expect(j['bandBending_eV']).toBeGreaterThan(0);
    expect(j.direction).toBe('support-to-metal');
    expect(j['spaceCharge_C_per_m2']).toBeGreaterThan(0);

    // Bulk Fermi level: N_C = 2 (2 pi m* kT / h^2)^(3/2) (Sze & Ng, 3rd ed., ch. 1) and, for n << N_C,
    // E_C - E_F = kT [ln(N_C/n) - n/(sqrt(8) N_C)] (Joyce–Dixon first-order correction to Boltzmann,
    // Appl. Phys. Lett. 31, 354 (1977)); n = N_D for fully ionised donors and negligible holes.
    const nC = 2 * ((2 * Math.PI * CUSTOM.electronMass * M_E * K_B * CUSTOM.temperature) / (H * H)) ** 1.5;
    relClose(j.bulk['conductionDensityOfStates_cm3']! * 1e6, nC, 1e-6, 'N_C');
    const r = nD / nC;
    expect(Math.abs(j['fermiLevelBelowConduction_eV']! - kT_eV * (Math.log(1 / r) - r / Math.SQRT2 / 2))).toBeLessThan(2e-5);

    // Gauss's law at the interface: E(0) = -Q_s / (eps eps0), field positive into the support
    // (any electrostatics text, e.g. Jackson, Classical Electrodynamics, 3rd ed., ch. 1)
    relClose(j['interfaceField_V_per_m']!, -j['spaceCharge_C_per_m2']! / eps, 1e-3, 'Gauss');
    // Charge-equivalent width W_Q = |Q_s| / (q N_D^+) (definition, common practice, no source)
    relClose(j['chargeEquivalentWidth_nm']! * 1e-9, j['spaceCharge_C_per_m2']! / (Q * nD), 1e-6, 'W_Q');
    // Depletion approximation W = sqrt(2 eps (V_bi - kT/q) / (q N_D)) (Sze & Ng, 3rd ed., ch. 3, eq. for W_D)
    const wDep = Math.sqrt((2 * eps * (j['bandBending_eV']! - kT_eV)) / (Q * nD));
    relClose(j['depletionWidthApprox_nm']! * 1e-9, wDep, 1e-6, 'W_D');
    // The exact planar charge for bands bent by many kT equals q N_D W_D to O(exp(-qV/kT)): Boltzmann first
    // integral Q = sqrt(2 eps kT N_D (e^-u + u - 1)) (Sze & Ng, 3rd ed., ch. 4, surface space-charge relation)
    relClose(j['spaceCharge_C_per_m2']!, Q * nD * wDep, 2e-3, 'Q_s vs depletion approximation');
    // Image-force lowering d_phi = sqrt(q E / (4 pi eps_opt eps0)) (Sze & Ng, 3rd ed., ch. 3)
    const imageForce = Math.sqrt((Q * Math.abs(j['interfaceField_V_per_m']!)) / (4 * Math.PI * CUSTOM.opticalPermittivity * EPS0));
    relClose(j['imageForceLowering_eV']!, imageForce, 1e-6, 'image force');
    // Planar geometry: electrons per particle = Q_s pi (d/2)^2 / q over the particle footprint, default d = 2 nm
    // (this project's definition, common practice, no source)
    relClose(j['electronsPerParticle']!, (j['spaceCharge_C_per_m2']! * Math.PI * 1e-18) / Q, 1e-9, 'electrons per particle');

    // Band profile: E_C(0) - E_F = barrier, E_C - E_F -> bulk value deep inside, E_V = E_C - E_g (common practice, no source)
    const p = j.profile;
    const last = p['x_nm']!.length - 1;
    expect(p['x_nm']![0]).toBe(0);
    for (let i = 1; i <= last; i++) expect(p['x_nm']![i]!).toBeGreaterThan(p['x_nm']![i - 1]!);
    expect(p['conductionBand_eV']![0]).toBeCloseTo(j['barrierHeight_eV']!, 6);
    expect(p['conductionBand_eV']![last]).toBeCloseTo(j['fermiLevelBelowConduction_eV']!, 4);
    for (let i = 0; i <= last; i++) expect(p['conductionBand_eV']![i]! - p['valenceBand_eV']![i]!).toBeCloseTo(CUSTOM.bandGap, 9);
    expect(p['field_V_per_m']![0]).toBeCloseTo(j['interfaceField_V_per_m']!, 0);
  });

  it('a metal with a smaller work function than the support gives accumulation, electrons into the support', () => {
    const args = CUSTOM_ARGS.slice();
    args[1] = '4.0'; // --work-function below Phi_S ~ 4.3 eV
    const j = parseJson<Record<string, number | string>>(bandbend(['contact', ...args, '--json']));
    // Phi_M < Phi_S on n-type: bands bend down, metal loses electrons (Sze & Ng, 3rd ed., ch. 3, ohmic/accumulation contact)
    expect(j['bandBending_eV'] as number).toBeLessThan(0);
    expect(j['direction']).toBe('metal-to-support');
    expect(j['electronsPerParticle'] as number).toBeLessThan(0);
    expect(j['bandBending_eV'] as number).toBeCloseTo(4.0 - (j['supportWorkFunction_eV'] as number), 9);
  });

  it('--report DIR writes HTML, Markdown and SVG figures', () => {
    const dir = tmpPath('contact-report');
    const r = bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--report', dir]);
    expect(r.code, show(r)).toBe(0);
    expect(r.stderr).toContain('report written');
    expect(r.stdout).toContain('barrier height');
    const files = readdirSync(dir);
    expect(files).toContain('index.html');
    expect(files).toContain('summary.md');
    expect(files.filter((f) => f.endsWith('.svg')).length).toBeGreaterThanOrEqual(2);
    const html = readFileSync(join(dir, 'index.html'), 'utf8');
    expect(html).toContain('<svg');
    expect(html).toContain('ZnO');
  });

  it('--report into an existing non-empty folder without --force exits 2 and leaves the files untouched', () => {
    const dir = tmpPath('contact-report-existing');
    const first = bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--report', dir]);
    expect(first.code, show(first)).toBe(0);
    writeFileSync(join(dir, 'my-notes.txt'), 'keep me\n');
    const before = snapshot(dir);
    expectBadInput(bandbend(['contact', '--metal', 'Au', '--support', 'ZnO', '--report', dir]), '--report', '--force');
    expect(snapshot(dir)).toEqual(before);
    // and the JSON variant refuses the same way
    expectBadInput(bandbend(['contact', '--metal', 'Au', '--support', 'ZnO', '--json', '--report', dir]), '--report');
    expect(snapshot(dir)).toEqual(before);
    // --force overwrites the report files and keeps unrelated ones
    const forced = bandbend(['contact', '--metal', 'Au', '--support', 'ZnO', '--report', dir, '--force']);
    expect(forced.code, show(forced)).toBe(0);
    expect(readFileSync(join(dir, 'my-notes.txt'), 'utf8')).toBe('keep me\n');
    expect(readFileSync(join(dir, 'index.html'), 'utf8')).toContain('Au');
  });

  it('a contact with bad input and --report creates no report folder', () => {
    const dir = tmpPath('contact-report-bad');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '5000', '--report', dir]), '--temperature');
    expect(existsSync(dir)).toBe(false);
    expectBadInput(bandbend(['contact', '--metal', 'Unobtainium', '--support', 'ZnO', '--report', dir]), 'Unobtainium');
    expect(existsSync(dir)).toBe(false);
  });

  it('--materials FILE adds a custom support that contact, materials list and materials show use', () => {
    const file = join(tmpPath('materials'), 'extra.json');
    mkdirSync(join(file, '..'));
    // Invented test oxide "Testite-X"; numbers are not data. Format: materials/README.md, src/materials/schema.ts.
    const pv = (value: number, extra: Record<string, unknown> = {}) => ({ value, source: 'bandbend-cli-test', note: 'invented for a test', ...extra });
    const materials = {
      references: [{ id: 'bandbend-cli-test', type: 'report', title: 'Invented values for the bandbend CLI tests (not data)' }],
      supports: [
        {
          name: 'Testite-X',
          fullName: 'Testite X (invented test oxide)',
          formula: 'Zn2TiO4',
          electronAffinity_eV: pv(4.0, { min: 3.8, max: 4.2 }),
          bandGap_eV: pv(3.0),
          staticPermittivity: pv(12),
          opticalPermittivity: pv(5),
          electronMass_me: pv(0.4),
          holeMass_me: pv(1.0),
          conductionType: 'n',
          typicalDensity_cm3: pv(1e18),
        },
      ],
    };
    writeFileSync(file, JSON.stringify(materials, null, 2));
    const platinum = materialValue('Pt', 'workFunction_eV');
    const j = parseJson<Record<string, unknown>>(bandbend(['contact', '--metal', 'Pt', '--support', 'Testite-X', '--materials', file, '--json']));
    expect(j['support']).toBe('Testite-X');
    // Schottky–Mott rule with the file's electron affinity (Sze & Ng, 3rd ed., ch. 3)
    expect(j['barrierHeight_eV'] as number).toBeCloseTo(platinum - 4.0, 9);
    expect(j['donorDensity_cm3'] as number).toBeCloseTo(1e18, -8);
    const inputs = j['inputs'] as { field: string; source?: string }[];
    expect(inputs.some((i) => i.source === 'bandbend-cli-test')).toBe(true);

    const list = parseJson<{ supports: { name: string }[] }>(bandbend(['materials', 'list', '--materials', file, '--json']));
    expect(list.supports.map((s) => s.name)).toContain('Testite-X');
    const shown = bandbend(['materials', 'show', 'Testite-X', '--materials', file]);
    expectOk(shown);
    expect(shown.stdout).toContain('Invented values for the bandbend CLI tests');
    // without the file the support is unknown
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'Testite-X']), 'Testite-X');
  });

  it('a malformed materials file exits 2 with one line naming the file', () => {
    const dir = tmpPath('materials-bad');
    mkdirSync(dir);
    const broken = join(dir, 'broken.json');
    writeFileSync(broken, '{ "supports": [ { "name": "Testite-Y", ');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--materials', broken]), broken, /JSON/);
    const wrongType = join(dir, 'wrong-type.json');
    writeFileSync(wrongType, JSON.stringify({ metals: [{ name: 'Testium', fullName: 'Testium', workFunction_eV: { value: '5.0', source: 'michaelson1977' } }] }));
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--materials', wrongType]), wrongType, 'workFunction_eV');
    const missing = join(dir, 'not-there.json');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--materials', missing]), missing);
  });

  it('an unknown metal exits 2 naming it and listing the allowed names', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Unobtainium', '--support', 'ZnO']), 'metal', 'Unobtainium', 'allowed:', 'Pt');
  });

  it('units of the wrong dimension exit 2 naming the flag (--temperature "5 nm", --particle-diameter "2 K")', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '5 nm']), '--temperature', 'wrong dimension', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--particle-diameter', '2 K']), '--particle-diameter', 'wrong dimension');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--geometry', 'array', '--particle-density', '1e11 cm^-3']), '--particle-density', 'wrong dimension');
  });

  it('--work-function "3 nm" exits 2 naming --work-function (the flag the user typed)', () => {
    expectBadInput(bandbend(['contact', '--support', 'ZnO', '--work-function', '3 nm']), '--work-function', 'wrong dimension', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--electron-affinity', '4 K']), '--electron-affinity', 'wrong dimension');
  });

  it('NaN and Infinity exit 2 naming the flag (--temperature, --particle-diameter, --particle-density)', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', 'NaN']), '--temperature');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', 'Infinity']), '--temperature');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--particle-diameter', 'Infinity']), '--particle-diameter');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--geometry', 'array', '--particle-density', 'NaN']), '--particle-density');
  });

  it('--donors NaN / Infinity / 1e999 (and NaN for --permittivity, --band-gap) exit 2 naming the flag', () => {
    for (const bad of ['NaN', 'Infinity', '-Infinity', '1e999']) {
      expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', bad]), '--donors');
    }
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--permittivity', 'NaN']), '--permittivity');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--band-gap', 'NaN']), '--band-gap');
  });

  it('negative densities and zero sizes exit 2 with the allowed range', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '-1e18']), '--donors', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--acceptors', '-5']), '--acceptors', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--particle-diameter', '0']), '--particle-diameter', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--particle-diameter', '-2 nm']), '--particle-diameter', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--geometry', 'array', '--particle-density', '0']), '--particle-density', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--permittivity', '0']), '--permittivity', 'allowed:');
    // zero donors is a valid (intrinsic or compensated) support: the allowed range starts at 0
    expect(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '0']).code).toBe(0);
  });

  it('an out-of-range temperature exits 2 with the allowed range', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '10']), '--temperature', 'allowed: 50 to 1500 K');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '2000 K']), '--temperature', 'allowed:');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '-300 degC']), '--temperature', 'allowed:');
    // a unit conversion inside the range is accepted: 200 degC = 473.15 K
    const j = parseJson<Record<string, number>>(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '200 degC', '--json']));
    expect(j['temperature_K']).toBeCloseTo(473.15, 9);
  });

  it('--uncertainty 20 --seed 3 is reproducible: the same uncertainty block twice', () => {
    const args = ['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '1e18', '--uncertainty', '20', '--seed', '3', '--json'];
    const a = parseJson<{ uncertainty: Record<string, unknown> }>(bandbend(args));
    const b = parseJson<{ uncertainty: Record<string, unknown> }>(bandbend(args));
    expect(a.uncertainty).toBeDefined();
    expect(b.uncertainty).toEqual(a.uncertainty);
    expect(a.uncertainty['samples']).toBe(20);
    expect(a.uncertainty['seed']).toBe(3);
    const sampled = a.uncertainty['sampledInputs'] as string[];
    expect(sampled.length).toBeGreaterThan(0);
    // percentiles are ordered and the direction probabilities sum to 1 (common practice, no source)
    for (const key of ['barrierHeight_eV', 'bandBending_eV', 'electronsPerParticle']) {
      const p = a.uncertainty[key] as { p05: number; p50: number; p95: number };
      expect(p.p05, key).toBeLessThanOrEqual(p.p50);
      expect(p.p50, key).toBeLessThanOrEqual(p.p95);
    }
    const dp = a.uncertainty['directionProbability'] as Record<string, number>;
    expect(Object.values(dp).reduce((s, v) => s + v, 0)).toBeCloseTo(1, 12);
    // another seed samples other inputs
    const c = parseJson<{ uncertainty: Record<string, unknown> }>(bandbend(args.map((x) => (x === '3' ? '4' : x))));
    expect(c.uncertainty['seed']).toBe(4);
    expect(c.uncertainty['bandBending_eV']).not.toEqual(a.uncertainty['bandBending_eV']);
  });

  it('invalid --uncertainty and --seed values exit 2 naming the flag', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--uncertainty', '2.5']), '--uncertainty');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--uncertainty', 'NaN']), '--uncertainty');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--uncertainty', '5', '--seed', 'abc']), '--seed');
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--uncertainty', '200000']), '--uncertainty', 'allowed:');
  });

  it('--uncertainty -3 exits 2: a negative number of samples is refused, not silently taken as "off"', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--uncertainty', '-3']), '--uncertainty', 'allowed:');
  });

  it('usage errors (unknown option, bad choice) exit 2 without a stack trace', () => {
    expectUsageError(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--bogus']), "unknown option '--bogus'");
    expectUsageError(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--geometry', 'cube']), '--geometry');
    expectUsageError(bandbend(['no-such-command']), 'no-such-command');
  });

  it('missing metal and support inputs exit 2 naming what to give', () => {
    expectBadInput(bandbend(['contact', '--support', 'ZnO']), '--metal');
    expectBadInput(bandbend(['contact', '--metal', 'Pt']), '--band-gap');
  });
});

// =====================================================================================================
describe('bandbend screen', () => {
  const BASE = ['screen', '--metals', 'Pt,Au', '--supports', 'ZnO,CeO2'];

  it('--csv - writes the sorted table to stdout', () => {
    // the ideal (Schottky–Mott) model, so the barrier check below holds exactly
    const r = bandbend([...BASE, '--barrier-model', 'ideal', '--csv', '-']);
    expectOk(r);
    const [header, ...rows] = parseCsv(r.stdout);
    expect(header).toEqual(expect.arrayContaining(['metal', 'support', 'direction', 'barrierHeight_eV', 'bandBending_eV', 'electronsPerParticle', 'error']));
    expect(rows).toHaveLength(4);
    const col = (name: string) => header!.indexOf(name);
    const pairs = rows.map((row) => `${row[col('metal')]}/${row[col('support')]}`).sort();
    expect(pairs).toEqual(['Au/CeO2', 'Au/ZnO', 'Pt/CeO2', 'Pt/ZnO']);
    for (const row of rows) expect(row[col('error')]).toBe('');
    // sorted by electronsPerParticle, largest first (the default --sort-by)
    const electrons = rows.map((row) => Number(row[col('electronsPerParticle')]));
    for (let i = 1; i < electrons.length; i++) expect(electrons[i]!).toBeLessThanOrEqual(electrons[i - 1]!);
    // Schottky–Mott rule: on one support the barrier difference of two metals equals their work-function
    // difference (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3)
    const barrier = (pair: string) => Number(rows.find((row) => `${row[col('metal')]}/${row[col('support')]}` === pair)![col('barrierHeight_eV')]);
    const dPhi = materialValue('Pt', 'workFunction_eV') - materialValue('Au', 'workFunction_eV');
    expect(barrier('Pt/ZnO') - barrier('Au/ZnO')).toBeCloseTo(dPhi, 9);
  });

  it('--json prints one object per pair', () => {
    const rows = parseJson<Record<string, unknown>[]>(bandbend([...BASE, '--json']));
    expect(rows).toHaveLength(4);
    for (const row of rows) {
      expect(typeof row['metal']).toBe('string');
      expect(typeof row['support']).toBe('string');
      expect(typeof row['barrierHeight_eV']).toBe('number');
      expect(row['error']).toBe('');
    }
  });

  it('--json warnings are the {code, message} objects of contact --json for the same pair (one API style)', () => {
    const rows = parseJson<{ metal: string; support: string; warnings: unknown }[]>(bandbend([...BASE, '--json']));
    for (const row of rows) {
      const contact = parseJson<{ warnings: unknown }>(bandbend(['contact', '--metal', row.metal, '--support', row.support, '--json']));
      expect(Array.isArray(row.warnings)).toBe(true);
      expect(row.warnings).toEqual(contact.warnings);
    }
    // the CSV keeps one cell: the codes
    const csv = parseCsv(bandbend([...BASE, '--csv', '-']).stdout);
    const col = csv[0]!.indexOf('warnings');
    for (const line of csv.slice(1)) expect(line[col]).toMatch(/^[a-z0-9-]*( [a-z0-9-]+)*$/);
  });

  it('--csv FILE refuses to overwrite without --force', () => {
    const file = tmpPath('screen.csv');
    expectOk(bandbend([...BASE, '--csv', file]));
    const before = readFileSync(file, 'utf8');
    expect(parseCsv(before)).toHaveLength(5);
    const mtime = statSync(file).mtimeMs;
    expectBadInput(bandbend([...BASE, '--csv', file]), '--csv', '--force');
    expect(readFileSync(file, 'utf8')).toBe(before);
    expect(statSync(file).mtimeMs).toBe(mtime);
  });

  it('--report DIR writes an HTML report with heat maps', () => {
    const dir = tmpPath('screen-report');
    const r = bandbend([...BASE, '--report', dir]);
    expect(r.code, show(r)).toBe(0);
    expect(r.stderr).toContain('report written');
    const files = readdirSync(dir);
    expect(files).toContain('index.html');
    for (const metric of ['bandBending_eV', 'barrierHeight_eV', 'electronsPerParticle']) expect(files).toContain(`heatmap-${metric}.svg`);
    expect(readFileSync(join(dir, 'index.html'), 'utf8')).toContain('<svg');
  });

  it('an unknown support exits 2 naming it, and no report folder is created', () => {
    const dir = tmpPath('screen-report-bad');
    expectBadInput(bandbend(['screen', '--metals', 'Pt,Au', '--supports', 'ZnO,Kryptonite', '--report', dir]), 'support', 'Kryptonite', 'allowed:');
    expect(existsSync(dir)).toBe(false);
    expectBadInput(bandbend(['screen', '--metals', 'Pt,Unobtainium', '--supports', 'ZnO']), 'Unobtainium');
  });

  it('an unknown --sort-by column exits 2 with the allowed columns; missing --metals is a usage error', () => {
    expectBadInput(bandbend([...BASE, '--sort-by', 'happiness']), '--sort-by', 'happiness', 'allowed:');
    expectUsageError(bandbend(['screen', '--supports', 'ZnO']), '--metals');
  });
});

// =====================================================================================================
describe('bandbend study', () => {
  /** Custom support properties (fully ionised donors), metals from the library. */
  function studyText(axes: string[], outputs = 'bandBending_eV, barrierHeight_eV, metalWorkFunction_eV, supportWorkFunction_eV, direction, electronsPerParticle', base: string[] = []): string {
    return [
      '# small study for the CLI tests',
      'name: cli-test-study',
      'base:',
      '  temperature: 300 K',
      '  electronAffinity: 4.2',
      '  bandGap: 3.2',
      '  permittivity: 10',
      '  opticalPermittivity: 5',
      '  electronMass: 0.3',
      '  holeMass: 1',
      ...base.map((b) => `  ${b}`),
      'sweep:',
      '  mode: product',
      '  axes:',
      ...axes.map((a) => `    - ${a}`),
      `outputs: [${outputs}]`,
      '',
    ].join('\n');
  }
  /** 2 metals x 3 donor densities = 6 points. */
  const STUDY = studyText(['{ field: metal, values: [Pt, Au] }', '{ field: donors, log: { from: 1e16, to: 1e18, points: 3 }, unit: cm^-3 }']);

  function writeStudy(name: string, text: string): string {
    const dir = tmpPath('study');
    mkdirSync(dir);
    const file = join(dir, name);
    writeFileSync(file, text);
    return file;
  }

  it('runs a 6-point YAML study and writes results.csv, results.jsonl and plots', () => {
    const file = writeStudy('metals.yaml', STUDY);
    const out = tmpPath('study-out');
    const r = bandbend(['study', file, '--out', out]);
    expect(r.code, show(r)).toBe(0);
    expect(r.stderr).toContain('6 of 6 points written (0 failed)');
    expect(readdirSync(out)).toEqual(expect.arrayContaining(['results.csv', 'results.jsonl', 'study.json', 'report']));
    const [header, ...rows] = parseCsv(readFileSync(join(out, 'results.csv'), 'utf8'));
    expect(header).toEqual([
      'index',
      'metal',
      'donors [cm^-3]',
      'bandBending_eV',
      'barrierHeight_eV',
      'metalWorkFunction_eV',
      'supportWorkFunction_eV',
      'direction',
      'electronsPerParticle',
      'error',
    ]);
    expect(rows.map((row) => row[0])).toEqual(['0', '1', '2', '3', '4', '5']);
    // product mode: the last axis varies fastest
    expect(rows.map((row) => row[1])).toEqual(['Pt', 'Pt', 'Pt', 'Au', 'Au', 'Au']);
    relClose(Number(rows[1]![2]), 1e17, 1e-9, 'log axis midpoint');
    const jsonl = readFileSync(join(out, 'results.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(jsonl).toHaveLength(6);
    for (const [i, row] of jsonl.entries()) {
      expect(row['index']).toBe(i);
      expect(row['error']).toBeNull();
      expect(row['bandBending_eV']).toBeCloseTo(Number(rows[i]![3]), 12);
      // q V_bi = Phi_M - Phi_S (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3)
      expect(row['bandBending_eV'] as number).toBeCloseTo((row['metalWorkFunction_eV'] as number) - (row['supportWorkFunction_eV'] as number), 9);
    }
    // Schottky–Mott: at equal donor density, Pt and Au differ by their work-function difference (Sze & Ng, 3rd ed., ch. 3)
    const dPhi = materialValue('Pt', 'workFunction_eV') - materialValue('Au', 'workFunction_eV');
    for (let i = 0; i < 3; i++) {
      expect((jsonl[i]!['bandBending_eV'] as number) - (jsonl[i + 3]!['bandBending_eV'] as number)).toBeCloseTo(dPhi, 9);
    }
    expect(existsSync(join(out, 'report', 'index.html'))).toBe(true);
  });

  it('study warnings: results.jsonl has the {code, message} array of contact --json, results.csv the codes joined by ";" (one API style)', () => {
    const file = writeStudy('warnings.yaml', studyText(['{ field: metal, values: [Pt, Au] }', '{ field: donors, values: [1e16, 1e19], unit: cm^-3 }'], 'bandBending_eV, warnings'));
    const out = tmpPath('study-warnings');
    const r = bandbend(['study', file, '--out', out]);
    expect(r.code, show(r)).toBe(0);
    const [header, ...rows] = parseCsv(readFileSync(join(out, 'results.csv'), 'utf8'));
    const col = header!.indexOf('warnings');
    const jsonl = readFileSync(join(out, 'results.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    const custom = ['--temperature', '300 K', '--electron-affinity', '4.2', '--band-gap', '3.2', '--permittivity', '10', '--optical-permittivity', '5', '--electron-mass', '0.3', '--hole-mass', '1'];
    let withWarnings = 0;
    for (const [i, row] of jsonl.entries()) {
      const contact = parseJson<{ warnings: { code: string; message: string }[] }>(
        bandbend(['contact', '--metal', String(row['metal']), '--donors', `${String(row['donors [cm^-3]'])} cm^-3`, ...custom, '--json']),
      );
      expect(row['warnings']).toEqual(contact.warnings);
      expect(rows[i]![col]).toBe(contact.warnings.map((w) => w.code).join(';'));
      if (contact.warnings.length > 0) withWarnings++;
    }
    expect(withWarnings).toBeGreaterThan(0); // the check above compared some non-empty arrays
  });

  it('records a failing point with its message and completes the others', () => {
    const file = writeStudy(
      'one-bad.yaml',
      studyText(['{ field: donors, values: [1e16, 1e17, -5, 1e18, 1e19], unit: cm^-3 }'], 'bandBending_eV, direction, electronsPerParticle', ['metal: Pt']),
    );
    const out = tmpPath('study-out-one-bad');
    const r = bandbend(['study', file, '--out', out]);
    expect(r.code, show(r)).toBe(0);
    expect(r.stderr).toContain('5 of 5 points written (1 failed)');
    const jsonl = readFileSync(join(out, 'results.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(jsonl).toHaveLength(5);
    for (const row of jsonl) {
      if (row['index'] === 2) {
        expect(row['error']).toMatch(/--donors.*allowed/);
        expect(row['bandBending_eV']).toBeNull();
      } else {
        expect(row['error'], JSON.stringify(row)).toBeNull();
        expect(typeof row['bandBending_eV']).toBe('number');
      }
    }
    const [header, ...rows] = parseCsv(readFileSync(join(out, 'results.csv'), 'utf8'));
    const errorCol = header!.indexOf('error');
    expect(rows.map((row) => row[errorCol] !== '')).toEqual([false, false, true, false, false]);
  });

  it('refuses to overwrite earlier results without --force and leaves them untouched', () => {
    const file = writeStudy('metals.yaml', STUDY);
    const out = tmpPath('study-out-twice');
    expect(bandbend(['study', file, '--out', out, '--no-plots']).code).toBe(0);
    const before = snapshot(out);
    expectBadInput(bandbend(['study', file, '--out', out]), '--out', '--force');
    expect(snapshot(out)).toEqual(before);
    const forced = bandbend(['study', file, '--out', out, '--force']);
    expect(forced.code, show(forced)).toBe(0);
    expect(parseCsv(readFileSync(join(out, 'results.csv'), 'utf8'))).toHaveLength(7);
  });

  it('a malformed YAML file exits 2 naming the file, and no output folder is created', () => {
    const file = writeStudy('broken.yaml', 'name: broken\nbase: { metal: Pt\n  sweep: [\n');
    const out = tmpPath('study-out-broken');
    expectBadInput(bandbend(['study', file, '--out', out]), file, /YAML/);
    expect(existsSync(out)).toBe(false);
  });

  it('an unknown output exits 2 naming it and its place in the file', () => {
    const file = writeStudy('unknown-output.yaml', studyText(['{ field: metal, values: [Pt, Au] }'], 'bandBending_eV, happiness_eV'));
    const out = tmpPath('study-out-unknown');
    expectBadInput(bandbend(['study', file, '--out', out]), file, 'outputs[1]', 'happiness_eV');
    expect(existsSync(out)).toBe(false);
  });

  it('a missing study file, an unknown --format and a missing --out exit 2', () => {
    const missing = join(work, 'no-such-study.yaml');
    expectBadInput(bandbend(['study', missing, '--out', tmpPath('x')]), 'no-such-study.yaml');
    const file = writeStudy('metals.yaml', STUDY);
    expectBadInput(bandbend(['study', file, '--out', tmpPath('y'), '--format', 'xlsx']), '--format', 'allowed:');
    expectUsageError(bandbend(['study', file]), '--out');
  });
});

// =====================================================================================================
describe('bandbend mott-schottky', () => {
  // Synthetic, exact data from the Mott–Schottky relation for an n-type electrode
  //   1/C^2 = 2 (V - V_fb - kT/q) / (q eps eps0 N_D)
  // (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3 (C-V of a Schottky barrier); with the kT/q term
  // as in A. W. Bott, Current Separations 17, 87 (1998) and common practice), C per electrode area.
  const ND_CM3 = 5e17;
  const EPS_R = 31;
  const VFB = -0.35; // V vs Ag/AgCl
  const T = 298.15;
  const AG_AGCL_V_SHE = 0.197; // saturated KCl, Bard & Faulkner, Electrochemical Methods, 2nd ed. (2001), table of reference potentials
  const ABSOLUTE_SHE_V = 4.44; // Trasatti, Pure Appl. Chem. 58, 955 (1986), IUPAC

  function exactCsv(points = 15): string {
    const kTq = (K_B * T) / Q;
    const lines = ['# exact synthetic Mott-Schottky data for a test', 'potential_V,capacitance_F_per_cm2'];
    for (let i = 0; i < points; i++) {
      const V = -0.2 + (1.4 * i) / (points - 1);
      const invC2 = (2 * (V - VFB - kTq)) / (Q * EPS_R * EPS0 * ND_CM3 * 1e6); // m^4/F^2
      lines.push(`${V},${(1 / Math.sqrt(invC2)) * 1e-4}`); // F/cm^2, full double precision
    }
    return `${lines.join('\n')}\n`;
  }

  function writeCsv(name: string, text: string): string {
    const dir = tmpPath('ms');
    mkdirSync(dir);
    const file = join(dir, name);
    writeFileSync(file, text);
    return file;
  }

  it('--json recovers N_D and V_fb from exact data to 1e-6 relative', () => {
    const file = writeCsv('exact.csv', exactCsv());
    const fit = parseJson<Record<string, number | string | boolean>>(
      bandbend(['mott-schottky', file, '--permittivity', String(EPS_R), '--temperature', String(T), '--reference', 'Ag/AgCl', '--json']),
    );
    expect(fit['carrierType']).toBe('n');
    expect(fit['points']).toBe(15);
    relClose(fit['dopantDensity_cm3'] as number, ND_CM3, 1e-6, 'N_D');
    relClose(fit['flatBandPotential_V'] as number, VFB, 1e-6, 'V_fb');
    expect(fit['rSquared'] as number).toBeCloseTo(1, 10);
    expect(fit['reference']).toBe('Ag/AgCl');
    // reference scale: E(SHE) = E(Ag/AgCl) + 0.197 V; vacuum scale Phi = 4.44 eV + q V_fb(SHE) (sources above)
    expect(fit['flatBandPotential_V_SHE'] as number).toBeCloseTo(VFB + AG_AGCL_V_SHE, 6);
    expect(fit['supportWorkFunction_eV'] as number).toBeCloseTo(ABSOLUTE_SHE_V + VFB + AG_AGCL_V_SHE, 6);
  });

  it('prints a readable fit, and --plot writes an SVG that is not overwritten without --force', () => {
    const file = writeCsv('exact.csv', exactCsv());
    const plot = join(tmpPath('ms-plot'), 'fit.svg');
    mkdirSync(join(plot, '..'));
    const r = bandbend(['mott-schottky', file, '--permittivity', String(EPS_R), '--reference', 'Ag/AgCl', '--plot', plot]);
    expectOk(r);
    expect(r.stdout).toContain('donor density');
    expect(r.stdout).toContain('flat-band potential');
    expect(readFileSync(plot, 'utf8')).toContain('<svg');
    expect(existsSync(`${plot}.vl.json`)).toBe(true);
    const before = snapshot(join(plot, '..'));
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', String(EPS_R), '--plot', plot]), '--plot', '--force');
    expect(snapshot(join(plot, '..'))).toEqual(before);
  });

  it('fits the shipped example examples/mott-schottky-sample.csv close to its generating parameters', () => {
    // generated with N_D = 2e18 cm^-3, eps = 31, V_fb = -0.42 V vs Ag/AgCl, 298.15 K, 0.2 % noise (examples/README.md)
    const fit = parseJson<Record<string, number>>(
      bandbend(['mott-schottky', 'examples/mott-schottky-sample.csv', '--permittivity', '31', '--reference', 'Ag/AgCl', '--json']),
    );
    expect(fit['points']).toBe(12);
    relClose(fit['dopantDensity_cm3']!, 2e18, 0.02, 'example N_D');
    expect(Math.abs(fit['flatBandPotential_V']! - -0.42)).toBeLessThan(0.01);
  });

  it('a malformed CSV (unclosed quote) exits 2 naming the file and row', () => {
    const file = writeCsv('unclosed.csv', 'potential_V,capacitance_F_per_cm2\n0,1e-6\n0.1,"9e-7\n0.2,8e-7\n');
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31']), file, 'row');
    const ragged = writeCsv('ragged.csv', 'potential_V,capacitance_F_per_cm2\n0,1e-6,7\n0.1,9e-7\n0.2,8e-7\n');
    expectBadInput(bandbend(['mott-schottky', ragged, '--permittivity', '31']), ragged, 'row 2');
    const noHeader = writeCsv('no-header.csv', 'voltage,capacitance_F_per_cm2\n0,1e-6\n0.1,9e-7\n0.2,8e-7\n');
    expectBadInput(bandbend(['mott-schottky', noHeader, '--permittivity', '31']), noHeader, 'potential_V');
  });

  it('a non-numeric or non-positive cell exits 2 naming file, row and column', () => {
    const file = writeCsv('text-cell.csv', 'potential_V,capacitance_F_per_cm2\n0,1e-6\n0.1,abc\n0.2,8e-7\n');
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31']), file, 'row 3', 'capacitance_F_per_cm2', '"abc"');
    const negative = writeCsv('negative.csv', 'potential_V,capacitance_F_per_cm2\n0,1e-6\n0.1,-9e-7\n0.2,8e-7\n');
    expectBadInput(bandbend(['mott-schottky', negative, '--permittivity', '31']), negative, 'row 3', 'allowed:');
  });

  it('fewer than 3 rows exits 2', () => {
    const file = writeCsv('two-rows.csv', 'potential_V,capacitance_F_per_cm2\n0,1e-6\n0.1,9e-7\n');
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31']), file, 'at least 3');
  });

  it('a file over 5 MB exits 2 before it is parsed', () => {
    const chunk = '0.1,1e-6\n'.repeat(1000);
    const big = `potential_V,capacitance_F_per_cm2\n${chunk.repeat(Math.ceil((5.2 * 1024 * 1024) / chunk.length))}`;
    expect(big.length).toBeGreaterThan(5 * 1024 * 1024);
    const file = writeCsv('huge.csv', big);
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31']), file, 'MB', 'allowed:');
  });

  it('a missing file and bad options exit 2 naming the flag', () => {
    const missing = join(work, 'no-such-data.csv');
    expectBadInput(bandbend(['mott-schottky', missing, '--permittivity', '31']), missing);
    const file = writeCsv('exact.csv', exactCsv());
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', 'abc']), '--permittivity');
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31', '--temperature', '5 nm']), '--temperature');
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31', '--area', '3 nm']), '--area');
    expectUsageError(bandbend(['mott-schottky', file]), '--permittivity');
    expectUsageError(bandbend(['mott-schottky', file, '--permittivity', '31', '--reference', 'XYZ']), '--reference');
  });

  it('out-of-range --permittivity 0 and --temperature 1000 exit 2 naming those flags, not internal names', () => {
    const file = writeCsv('exact.csv', exactCsv());
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '0']), '--permittivity', 'allowed:');
    expectBadInput(bandbend(['mott-schottky', file, '--permittivity', '31', '--temperature', '1000']), '--temperature', 'allowed:');
  });
});

// =====================================================================================================
describe('bandbend demo', () => {
  it('--out TMP writes the demo report, and refuses a non-empty folder without --force', () => {
    const out = tmpPath('demo');
    const r = bandbend(['demo', '--out', out]);
    expect(r.code, show(r)).toBe(0);
    expect(r.stdout).toContain('demo report written');
    const files = readdirSync(out);
    for (const f of ['index.html', 'summary.md', 'screen.csv', 'density-sweep.csv', 'screen']) expect(files).toContain(f);
    expect(existsSync(join(out, 'screen', 'index.html'))).toBe(true);
    expect(readFileSync(join(out, 'index.html'), 'utf8')).toContain('<svg');

    const before = snapshot(out);
    expectBadInput(bandbend(['demo', '--out', out]), '--out', '--force');
    expect(snapshot(out)).toEqual(before);

    const forced = bandbend(['demo', '--out', out, '--force']);
    expect(forced.code, show(forced)).toBe(0);
  });
});

// =====================================================================================================
describe('bandbend materials', () => {
  it('list --json gives metals and supports', () => {
    const j = parseJson<{ metals: { name: string; workFunction_eV: number }[]; supports: { name: string; bandGap_eV: number }[] }>(
      bandbend(['materials', 'list', '--json']),
    );
    expect(j.metals.map((m) => m.name)).toEqual(expect.arrayContaining(['Pt', 'Au', 'Pd']));
    expect(j.supports.map((s) => s.name)).toEqual(expect.arrayContaining(['ZnO', 'CeO2', 'TiO2-anatase']));
    for (const m of j.metals) expect(typeof m.workFunction_eV).toBe('number');
    const onlyMetals = parseJson<{ metals: unknown[]; supports: unknown[] }>(bandbend(['materials', 'list', '--kind', 'metal', '--json']));
    expect(onlyMetals.supports).toHaveLength(0);
    expect(onlyMetals.metals.length).toBe(j.metals.length);
  });

  it('show Pt prints its values with a citation', () => {
    const r = bandbend(['materials', 'show', 'Pt']);
    expectOk(r);
    expect(r.stdout).toMatch(/^Pt \(Platinum\)/);
    expect(r.stdout).toContain('workFunction_eV');
    expect(r.stdout).toContain('references');
    // a numbered citation with a year, e.g. "[1] Author, Journal 48, 4729 (1977), doi:..."
    expect(r.stdout).toMatch(/\[1\] .+\(.*\d{4}\)/);
    const j = parseJson<{ references: Record<string, string> }>(bandbend(['materials', 'show', 'Pt', '--json']));
    expect(Object.keys(j.references).length).toBeGreaterThan(0);
  });

  it('show with an unknown name exits 2 naming it', () => {
    expectBadInput(bandbend(['materials', 'show', 'Unobtainium']), 'Unobtainium');
    expectUsageError(bandbend(['materials', 'list', '--kind', 'gas']), '--kind');
  });
});

// =====================================================================================================
describe('--help', () => {
  const COMMANDS: string[][] = [['contact'], ['screen'], ['study'], ['mott-schottky'], ['demo'], ['materials'], ['materials', 'list'], ['materials', 'show']];
  for (const command of COMMANDS) {
    it(`${command.join(' ')} --help exits 0 and shows Examples`, () => {
      const r = bandbend([...command, '--help']);
      expect(r.code, show(r)).toBe(0);
      expect(r.stdout).toContain(`Usage: bandbend ${command.join(' ')}`);
      expect(r.stdout).toContain('Examples');
      expect(r.stderr).toBe('');
    });
  }

  it('bandbend --help and --version exit 0', () => {
    const help = bandbend(['--help']);
    expect(help.code).toBe(0);
    for (const c of ['contact', 'screen', 'study', 'mott-schottky', 'demo', 'materials']) expect(help.stdout).toContain(c);
    const version = bandbend(['--version']);
    expect(version.code).toBe(0);
    expect(version.stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
  });
});

// every --help and README example runs: test/examples.test.ts

describe('no silent options (bandbend issue 13, item 4)', () => {
  it('--particle-density outside the array geometry exits 2 naming the condition', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--particle-density', '1e11']), '--particle-density', '--geometry array');
  });
  it('--barrier without --barrier-model given exits 2', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--barrier', '0.7']), '--barrier', 'given');
  });
  it('an empty --donors is an error, not the library default', () => {
    expectBadInput(bandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '']), '--donors');
  });
  it('screen --work-function exits 2 unless --override-materials', () => {
    expectBadInput(bandbend(['screen', '--metals', 'Pt,Au', '--supports', 'ZnO', '--work-function', '4.0']), '--work-function', '--override-materials');
    const r = bandbend(['screen', '--metals', 'Pt,Au', '--supports', 'ZnO', '--work-function', '4.0', '--override-materials', '--json']);
    expect(r.code, show(r)).toBe(0);
  });
  it('screen --temperature -5 exits 2 instead of a table of failed rows', () => {
    expectBadInput(bandbend(['screen', '--metals', 'Pt', '--supports', 'ZnO,CeO2', '--temperature', '-5']), '--temperature');
  });
});
