// End-to-end tests of `bandbend validate` (src/cli/validate.ts): spawns the compiled CLI (`node bin/bandbend.js`,
// built by `npm test` before vitest runs) from the package root, like test/cli.test.ts; outputs go only into a fresh
// temporary folder.
//
// Checked against things outside the command: the published measurements in validation/*.json (the rows must carry
// them unchanged), the statistics definitions written out in validation/README.md (recomputed here from the rows),
// the Schottky-Mott rule for the ideal model, and the CLI contract (exit 2 + one line on bad input, refusal of a
// non-empty report folder). The statistics' values are not fixed here: they change when the library default model
// does (test/validation.test.ts guards them against baseline.json).
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { folderSnapshot } from './helpers.js';
import type { ValidationRow } from '../src/validation/gallery.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

function bandbend(args: string[]): Run {
  const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1' };
  delete env['BANDBEND_DEBUG'];
  const r = spawnSync(process.execPath, ['bin/bandbend.js', ...args], { cwd: ROOT, encoding: 'utf8', env, timeout: 120_000, maxBuffer: 64 * 1024 * 1024 });
  if (r.error) throw r.error;
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function show(r: Run): string {
  return `exit ${String(r.code)}\n--- stderr\n${r.stderr}\n--- stdout (start)\n${r.stdout.slice(0, 600)}`;
}

function expectBadInput(r: Run, ...mentions: string[]): void {
  expect(r.code, show(r)).toBe(2);
  expect(r.stdout, show(r)).toBe('');
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines, show(r)).toHaveLength(1);
  expect(lines[0], show(r)).toMatch(/^bandbend: error: \S/);
  expect(r.stderr, show(r)).not.toMatch(/^\s*at\s|internal error/m);
  for (const m of mentions) expect(lines[0], show(r)).toContain(m);
}

const snapshot = folderSnapshot; // test/helpers.ts

type Row = ValidationRow; // the rows of `validate --json` are the gallery's rows (src/validation/gallery.ts)
interface Stats {
  barrier: { meanAbsoluteError_eV: number | null; rowMeanAbsoluteError_eV: number | null; pairs: number; rows: number };
  charge: { signAgreement: number | null; signRows: number; withinFactor3: number | null; magnitudeRows: number };
  bandBending: { meanAbsoluteError_eV: number | null; rows: number };
}
interface Out {
  models: { model: string; barrierModel: string | null; statistics: Stats; rows: Row[] }[];
  report?: string[];
}

let work = '';
let out: Out;
beforeAll(() => {
  expect(existsSync(join(ROOT, 'dist', 'cli', 'main.js')), 'dist/ is missing: run `npm run build` (npm test does)').toBe(true);
  work = mkdtempSync(join(tmpdir(), 'bandbend-validate-'));
  const r = bandbend(['validate', '--json']);
  expect(r.code, show(r)).toBe(0);
  out = JSON.parse(r.stdout) as Out;
});
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

describe('bandbend validate --json', () => {
  it('runs the ideal model and the library default (barrierModel left unset)', () => {
    expect(out.models.map((m) => m.model)).toEqual(['ideal', 'default']);
    expect(out.models[0]!.barrierModel).toBe('ideal');
    expect(out.models[1]!.barrierModel).toBeNull();
  });

  it('carries the published measurements of validation/*.json unchanged', () => {
    // source: the gallery files themselves (each row cites its paper in validation/references.json)
    const barriers = JSON.parse(readFileSync(join(ROOT, 'validation', 'barriers.json'), 'utf8')) as { rows: { id: string; value: number }[] };
    for (const m of out.models) {
      const byId = new Map(m.rows.filter((r) => r.kind === 'barrier').map((r) => [r.id, r]));
      expect(byId.size).toBe(barriers.rows.length);
      for (const b of barriers.rows) expect(byId.get(b.id)?.measured, b.id).toBe(b.value);
    }
  });

  it('statistics follow the definitions of validation/README.md (recomputed from the rows)', () => {
    for (const m of out.models) {
      const ok = (k: Row['kind']) => m.rows.filter((r) => r.kind === k && r.status === 'ok' && r.predicted !== null);
      // barrier: mean over metal/support pairs of |mean prediction - mean measurement|
      const groups = new Map<string, Row[]>();
      for (const r of ok('barrier')) {
        const key = `${r.metalKey ?? r.metal}|${r.supportKey ?? r.support}${r.quantity === 'holeBarrier_eV' ? '|hole' : ''}`;
        groups.set(key, [...(groups.get(key) ?? []), r]);
      }
      const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
      const pairErrors = [...groups.values()].map((g) => Math.abs(mean(g.map((r) => r.predicted!)) - mean(g.map((r) => r.measured!))));
      const s = m.statistics;
      expect(s.barrier.pairs, m.model).toBe(groups.size);
      if (pairErrors.length) expect(s.barrier.meanAbsoluteError_eV!, m.model).toBeCloseTo(mean(pairErrors), 10);
      // charge sign: 'mixed' rows excluded; |N| < 0.5 counts as 'none'
      const definite = ok('charge').filter((r) => r.measuredSign !== undefined && r.measuredSign !== 'mixed');
      const signOf = (n: number) => (Math.abs(n) < 0.5 ? 'none' : n > 0 ? 'to-metal' : 'to-support');
      expect(s.charge.signRows, m.model).toBe(definite.length);
      if (definite.length) expect(s.charge.signAgreement!, m.model).toBeCloseTo(definite.filter((r) => signOf(r.predicted!) === r.measuredSign).length / definite.length, 12);
      // charge magnitude: |N| within [lo/3, 3 hi]
      const ranged = ok('charge').filter((r) => r.measuredRange);
      const within = ranged.filter((r) => {
        const [a, b] = r.measuredRange!;
        const p = Math.abs(r.predicted!);
        return p >= Math.min(a, b) / 3 && p <= Math.max(a, b) * 3;
      });
      expect(s.charge.magnitudeRows, m.model).toBe(ranged.length);
      if (ranged.length) expect(s.charge.withinFactor3!, m.model).toBeCloseTo(within.length / ranged.length, 12);
      const bb = ok('bandBending');
      expect(s.bandBending.rows, m.model).toBe(bb.length);
      if (bb.length) expect(s.bandBending.meanAbsoluteError_eV!, m.model).toBeCloseTo(mean(bb.map((r) => Math.abs(r.predicted! - r.measured!))), 10);
    }
  });

  it('ideal model: each predicted barrier is the Schottky-Mott value phi_M - chi of the library', () => {
    // Schottky-Mott rule q phi_Bn = q(phi_m - chi): Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3
    // (from memory of the section on barrier formation, verify). Library values read through `materials show --json`.
    const ideal = out.models[0]!;
    // rows whose technique sees the barrier itself (internal photoemission; I-V and BEEM rows subtract the image-force
    // lowering, C-V rows read the Mott–Schottky intercept of the contact's C(V): validation/README.md, "How a row is
    // compared")
    const rows = ideal.rows.filter((r) => r.kind === 'barrier' && r.status === 'ok' && /^photoresponse/.test(r.method)).slice(0, 4);
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) {
      const metal = JSON.parse(bandbend(['materials', 'show', r.metalKey!, '--json']).stdout) as { workFunction_eV: { value: number } };
      const support = JSON.parse(bandbend(['materials', 'show', r.supportKey!, '--json']).stdout) as { electronAffinity_eV: { value: number } };
      expect(r.predicted!, r.id).toBeCloseTo(metal.workFunction_eV.value - support.electronAffinity_eV.value, 6);
    }
  });
});

describe('bandbend validate: text, report, bad input', () => {
  it('--ignore-support-state gives every compared row library defaults; by default some rows carry their support state', () => {
    // the support state of each row is read from the paper (validation/README.md, "Support state")
    const mapped = out.models[0]!.rows.filter((r) => r.status === 'ok' && r.supportState && r.supportState.mapping !== 'library-defaults');
    expect(mapped.length).toBeGreaterThan(0);
    const r = bandbend(['validate', '--model', 'ideal', '--ignore-support-state', '--json']);
    expect(r.code, show(r)).toBe(0);
    const rows = (JSON.parse(r.stdout) as Out).models[0]!.rows.filter((x) => x.status === 'ok');
    for (const x of rows) expect(x.supportState?.mapping, x.id).toBe('library-defaults');
  });

  it('prints a table of the statistics with one column per model', () => {
    const r = bandbend(['validate', '--model', 'ideal']);
    expect(r.code, show(r)).toBe(0);
    expect(r.stdout).toMatch(/^statistic\s+ideal/);
    for (const s of ['barrier MAE', 'sign agreement', 'factor 3', 'band bending']) expect(r.stdout).toContain(s);
  });

  it('accepts every barrier model of the parameter table and "default"', () => {
    // the allowed list comes from `contact --help` (generated from the same table): --barrier-model choices
    const help = bandbend(['contact', '--help']).stdout;
    const entry = /--barrier-model <MODEL>([\s\S]*?)\n\s*--/.exec(help)?.[1] ?? '';
    const choices = [...(entry.split('choices:')[1] ?? '').matchAll(/"([^"]+)"/g)].map((m) => m[1]!);
    expect(choices && choices.length, help.slice(0, 400)).toBeGreaterThan(0);
    const bad = bandbend(['validate', '--model', 'no-such-model']);
    expectBadInput(bad, '--model', 'default', ...choices!);
    const r = bandbend(['validate', '--model', choices![0]!, 'default', '--json']);
    expect(r.code, show(r)).toBe(0);
    expect((JSON.parse(r.stdout) as Out).models.map((m) => m.model)).toEqual([choices![0], 'default']);
  });

  it('--report writes per-model folders and refuses a non-empty folder without --force', () => {
    const dir = join(work, 'report');
    const r = bandbend(['validate', '--model', 'ideal', '--report', dir]);
    expect(r.code, show(r)).toBe(0);
    for (const f of ['statistics.txt', 'ideal/validation.txt', 'ideal/validation.json', 'ideal/barrier-predicted-vs-measured.svg']) {
      expect(existsSync(join(dir, f)), f).toBe(true);
    }
    const before = snapshot(dir);
    expectBadInput(bandbend(['validate', '--model', 'ideal', '--report', dir]), '--report');
    expect(snapshot(dir)).toEqual(before);
    const forced = bandbend(['validate', '--model', 'ideal', '--report', dir, '--force', '--json']);
    expect(forced.code, show(forced)).toBe(0);
    expect((JSON.parse(forced.stdout) as Out).report).toContain(join(dir, 'statistics.txt'));

    const other = join(work, 'occupied');
    mkdirSync(other);
    writeFileSync(join(other, 'keep.txt'), 'mine');
    expectBadInput(bandbend(['validate', '--report', other]), '--report');
    expect(readFileSync(join(other, 'keep.txt'), 'utf8')).toBe('mine');
  });

  it('validate --help exits 0 with Examples, and bandbend --help lists it', () => {
    const r = bandbend(['validate', '--help']);
    expect(r.code, show(r)).toBe(0);
    expect(r.stdout).toContain('Usage: bandbend validate');
    expect(r.stdout).toContain('Examples');
    expect(r.stderr).toBe('');
    expect(bandbend(['--help']).stdout).toMatch(/^\s+validate\b/m);
  });

  it('unknown options are usage errors (exit 2)', () => {
    const r = bandbend(['validate', '--no-such-flag']);
    expect(r.code, show(r)).toBe(2);
    expect(r.stdout).toBe('');
  });

  it('--scatter N adds 5-95% bands to every compared row and their statistics; bad counts and a lone --seed are refused', () => {
    const r = bandbend(['validate', '--model', 'default', '--scatter', '3', '--seed', '9', '--json']);
    expect(r.code, show(r)).toBe(0);
    expect(r.stderr).toBe(''); // no progress bar in a pipe
    const out = JSON.parse(r.stdout) as { models: { statistics: { scatter?: { samples: number; seed: number; barrierRows: number } }; rows: Row[] }[] };
    const m = out.models[0]!;
    expect(m.statistics.scatter).toMatchObject({ samples: 3, seed: 9 });
    const compared = m.rows.filter((row) => row.status === 'ok');
    expect(compared.every((row) => row.scatter !== undefined || row.scatterFailure !== undefined)).toBe(true);
    expect(m.statistics.scatter!.barrierRows).toBe(compared.filter((row) => row.kind === 'barrier' && row.scatter).length);
    const text = bandbend(['validate', '--model', 'ideal', '--scatter', '2']);
    expect(text.code, show(text)).toBe(0);
    expect(text.stdout).toContain('scatter: barrier measured inside 5-95% band');
    expectBadInput(bandbend(['validate', '--scatter', '1.5']), '--scatter');
    expectBadInput(bandbend(['validate', '--scatter', 'many']), '--scatter');
    expectBadInput(bandbend(['validate', '--scatter', '100000']), '--scatter');
    expectBadInput(bandbend(['validate', '--seed', '3']), '--seed');
    expectBadInput(bandbend(['validate', '--scatter', '2', '--seed', '-1']), '--seed');
  });
});
