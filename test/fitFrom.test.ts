// `contact --fit-from FILE`: the JSON of `mott-schottky --json` as contact inputs (bandbend issue 13, item 5).
// Reference: the generating parameters of examples/mott-schottky-sample.csv (examples/README.md: N_D = 2e18 cm^-3,
// eps = 31, V_fb = -0.42 V vs Ag/AgCl, 0.2 % deterministic noise): a contact fed with the fit must use that
// donor density and permittivity. Conflicting explicit flags exit 2 with one line.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runBandbend } from './helpers.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const SAMPLE = 'examples/mott-schottky-sample.csv';
const SHIPPED_FIT = 'examples/mott-schottky-sample.fit.json';
let work: string;

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-fit-'));
});
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

const bandbend = runBandbend; // test/helpers.ts: the built CLI from the package root

function json<T>(args: string[]): T {
  const r = bandbend(args);
  expect(r.code, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as T;
}

function expectConflict(args: string[], ...mentions: string[]): void {
  const r = bandbend(args);
  expect(r.code, r.stderr).toBe(2);
  expect(r.stdout).toBe('');
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(/^bandbend: error: /);
  for (const m of mentions) expect(lines[0]).toContain(m);
}

interface Input {
  field: string;
  value: number;
  origin: string;
  note?: string;
}

describe('contact --fit-from (mott-schottky --json as input)', () => {
  it('the shipped fit example is what mott-schottky --json prints today', () => {
    const fresh = json<Record<string, unknown>>(['mott-schottky', SAMPLE, '--permittivity', '31', '--reference', 'Ag/AgCl', '--json']);
    expect(JSON.parse(readFileSync(join(ROOT, SHIPPED_FIT), 'utf8'))).toEqual(fresh);
  });

  it('density (default): donors and permittivity of the fit, recorded as coming from it', () => {
    const fitFile = join(work, 'fit.json');
    const fit = bandbend(['mott-schottky', SAMPLE, '--permittivity', '31', '--reference', 'Ag/AgCl', '--json']);
    writeFileSync(fitFile, fit.stdout);
    const r = json<{ donorDensity_cm3: number; inputs: Input[] }>(['contact', '--metal', 'Pt', '--support', 'TiO2-anatase', '--fit-from', fitFile, '--json']);
    // generating N_D 2e18 cm^-3; the fit recovers it within the 0.2 % noise (test/cli.test.ts: 2 %)
    expect(Math.abs(r.donorDensity_cm3 / 2e18 - 1)).toBeLessThan(0.01);
    const permittivity = r.inputs.find((i) => i.field === 'static permittivity')!;
    expect(permittivity.value).toBe(31);
    expect(permittivity.note).toContain('--fit-from');
    expect(r.inputs.find((i) => i.field === 'donor density')!.note).toContain('Mott-Schottky fit');
  });

  it('work-function: the support work function of the fit fixes the Fermi level, as --support-work-function does', () => {
    const fit = JSON.parse(readFileSync(join(ROOT, SHIPPED_FIT), 'utf8')) as { supportWorkFunction_eV: number };
    const viaFit = json<{ donorDensity_cm3: number }>(['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-from', SHIPPED_FIT, '--fit-use', 'work-function', '--json']);
    const direct = json<{ donorDensity_cm3: number }>([
      'contact', '--metal', 'Pt', '--support', 'ZnO', '--support-work-function', `${fit.supportWorkFunction_eV} eV`, '--permittivity', '31', '--json',
    ]);
    expect(viaFit.donorDensity_cm3).toBe(direct.donorDensity_cm3);
  });

  it('an option the fit sets, given explicitly too, exits 2 naming both', () => {
    const base = ['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-from', SHIPPED_FIT];
    expectConflict([...base, '--donors', '1e17'], '--donors', '--fit-from');
    expectConflict([...base, '--permittivity', '9'], '--permittivity', '--fit-from');
    expectConflict([...base, '--support-work-function', '4.5'], '--support-work-function', '--fit-from');
    expectConflict([...base, '--fit-use', 'work-function', '--donors', '1e17'], '--donors', '--fit-from');
    expectConflict([...base, '--fit-use', 'work-function', '--support-work-function', '4.5'], '--support-work-function');
    expectConflict(['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-use', 'density'], '--fit-use', '--fit-from');
  });

  it('a file that is not a fit, and a fit whose slope is not significant, exit 2 naming --fit-from', () => {
    expectConflict(['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-from', SAMPLE], '--fit-from', 'not valid JSON');
    const weak = join(work, 'weak.json');
    writeFileSync(weak, JSON.stringify({ ...JSON.parse(readFileSync(join(ROOT, SHIPPED_FIT), 'utf8')), slopeSignificant: false }));
    expectConflict(['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-from', weak], '--fit-from', 'not significant');
    const partial = join(work, 'partial.json');
    writeFileSync(partial, JSON.stringify({ carrierType: 'n', supportWorkFunction_eV: 4.2 }));
    expectConflict(['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-from', partial], '--fit-from', 'dopantDensity_cm3');
    expectConflict(['contact', '--metal', 'Pt', '--support', 'ZnO', '--fit-from', join(work, 'missing.json')], '--fit-from');
  });
});
