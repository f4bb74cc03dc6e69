// Studies that survive being killed, a full disk and a second run on the same folder (issue 14).
// Runs the compiled CLI (bin/bandbend.js -> dist/). The reference for every check is an uninterrupted
// run of the same study: "no lost or duplicated rows" means the resumed files are byte-identical to it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseCsvLine } from './helpers.js';
import { seededRandom } from '../src/derived/uncertainty.js';

const BIN = join(process.cwd(), 'bin', 'bandbend.js');

// custom metal and support (no library values): 30 x 50 = 1500 planar points, about a second
const STUDY = `
name: resume-check
base: { workFunction: 5.3, electronAffinity: 4.2, bandGap: 3.2, permittivity: 10, electronMass: 0.3, holeMass: 1, donorLevel: 0.1 }
sweep:
  mode: product
  axes:
    - { field: donors, log: { from: 1e16, to: 1e19, points: 30 }, unit: cm^-3 }
    - { field: temperature, linear: { from: 300, to: 700, points: 50 }, unit: K }
outputs: [bandBending_eV, electronsPerParticle, direction, warnings]
`;
const TOTAL = 1500;
/** Whole study runs in child processes (about 40 s of CPU for 6000 points): room for a loaded machine, no timing assertion. */
const SLOW_TEST_MS = 240_000;

let work: string;
let studyFile: string;
let refDir: string;

function run(args: string[], env: NodeJS.ProcessEnv = {}): { code: number | null; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', env: { ...process.env, ...env } });
  return { code: r.status, stderr: r.stderr };
}

function start(args: string[]): { child: ChildProcess; stderr: () => string; exit: Promise<number | null> } {
  const child = spawn(process.execPath, [BIN, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
  let err = '';
  child.stderr!.on('data', (c: Buffer) => (err += c.toString()));
  const exit = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  return { child, stderr: () => err, exit };
}

function lineCount(path: string): number {
  if (!existsSync(path)) return 0;
  const text = readFileSync(path, 'utf8');
  let n = 0;
  for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) n++;
  return n;
}

/** Every line complete: CSV lines have the header's cell count, JSONL lines parse; files end with a newline. */
function expectCompleteLines(dir: string): number {
  const csv = readFileSync(join(dir, 'results.csv'), 'utf8');
  const json = readFileSync(join(dir, 'results.jsonl'), 'utf8');
  if (csv !== '') expect(csv.endsWith('\n')).toBe(true);
  if (json !== '') expect(json.endsWith('\n')).toBe(true);
  const csvLines = csv.split('\n').filter((l) => l !== '');
  const width = parseCsvLine(csvLines[0]!).length;
  csvLines.forEach((l, i) => {
    const cells = parseCsvLine(l);
    expect(cells.length).toBe(width);
    if (i > 0) expect(cells[0]).toBe(String(i - 1)); // index order, no gaps
  });
  const jsonLines = json.split('\n').filter((l) => l !== '');
  jsonLines.forEach((l, i) => expect((JSON.parse(l) as { index: number }).index).toBe(i));
  return jsonLines.length;
}

/** Deterministic pseudo-random numbers: the project's seeded mulberry32 (src/derived/uncertainty.ts). */
const rng = seededRandom;

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-resume-'));
  studyFile = join(work, 'study.yaml');
  writeFileSync(studyFile, STUDY);
  refDir = join(work, 'reference');
  const r = run(['study', studyFile, '--out', refDir, '--jobs', '1', '--no-plots']);
  expect(r.code).toBe(0);
  expect(lineCount(join(refDir, 'results.jsonl'))).toBe(TOTAL);
});
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

describe('resume after SIGKILL', () => {
  for (const jobs of ['1', '2']) {
    it(`--jobs ${jobs}: killed at random points, resumed, the files equal an uninterrupted run`, async () => {
      const out = join(work, `killed-${jobs}`);
      const random = rng(jobs === '1' ? 20261203 : 7);
      let kills = 0;
      for (let cycle = 0; cycle < 4; cycle++) {
        const args = ['study', studyFile, '--out', out, '--jobs', jobs, '--no-plots', '--resume'];
        const p = start(args);
        if (cycle === 0) {
          // a random moment, possibly before the first row
          await new Promise((r) => setTimeout(r, 100 + random() * 700));
        } else {
          // after a random number of further rows
          const before = lineCount(join(out, 'results.jsonl'));
          const target = Math.min(TOTAL - 50, before + 20 + Math.floor(random() * 300));
          for (let i = 0; i < 400 && lineCount(join(out, 'results.jsonl')) < target; i++) await new Promise((r) => setTimeout(r, 10));
        }
        p.child.kill('SIGKILL');
        const code = await p.exit;
        if (code === 0) break; // finished before the kill: nothing left to test in this cycle
        kills++;
        if (existsSync(join(out, 'results.csv'))) {
          // the lock of the killed run is left behind; resume must take it over
          expect(existsSync(join(out, '.bandbend-study.lock'))).toBe(true);
        }
      }
      expect(kills).toBeGreaterThan(0);
      const last = run(['study', studyFile, '--out', out, '--jobs', jobs, '--no-plots', '--resume']);
      expect(last.code).toBe(0);
      expect(last.stderr).toMatch(/resuming: \d+ complete rows kept/);
      expect(last.stderr).toMatch(new RegExp(`${TOTAL} of ${TOTAL} points written`));
      expect(expectCompleteLines(out)).toBe(TOTAL);
      expect(readFileSync(join(out, 'results.csv'), 'utf8')).toBe(readFileSync(join(refDir, 'results.csv'), 'utf8'));
      expect(readFileSync(join(out, 'results.jsonl'), 'utf8')).toBe(readFileSync(join(refDir, 'results.jsonl'), 'utf8'));
      expect(existsSync(join(out, '.bandbend-study.lock'))).toBe(false);
    }, SLOW_TEST_MS);
  }

  it('cuts a partial last line and a row missing from one file, and says so', () => {
    const out = join(work, 'partial');
    mkdirSync(out);
    for (const f of ['results.csv', 'results.jsonl', 'study.json']) writeFileSync(join(out, f), readFileSync(join(refDir, f)));
    const csv = readFileSync(join(refDir, 'results.csv'), 'utf8').split('\n');
    const json = readFileSync(join(refDir, 'results.jsonl'), 'utf8').split('\n');
    // 101 rows in the CSV (+ header), 100 rows and half a line in the JSONL
    writeFileSync(join(out, 'results.csv'), csv.slice(0, 102).join('\n') + '\n');
    writeFileSync(join(out, 'results.jsonl'), json.slice(0, 100).join('\n') + '\n' + json[100]!.slice(0, 17));
    const r = run(['study', studyFile, '--out', out, '--jobs', '1', '--no-plots', '--resume']);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/resuming: 100 complete rows kept/);
    expect(r.stderr).toMatch(/17 bytes after the last complete row of .*results\.jsonl removed/);
    expect(r.stderr).toMatch(/1 line\(s\) without a matching row/);
    expect(readFileSync(join(out, 'results.csv'), 'utf8')).toBe(readFileSync(join(refDir, 'results.csv'), 'utf8'));
    expect(readFileSync(join(out, 'results.jsonl'), 'utf8')).toBe(readFileSync(join(refDir, 'results.jsonl'), 'utf8'));
  });

  it('refuses to resume a different study or with other formats', () => {
    const other = join(work, 'other.yaml');
    writeFileSync(other, STUDY.replace('points: 50', 'points: 51'));
    const r = run(['study', other, '--out', refDir, '--no-plots', '--resume']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--resume: the study in .* differs/);
    const f = run(['study', studyFile, '--out', refDir, '--no-plots', '--resume', '--format', 'csv']);
    expect(f.code).toBe(2);
    expect(f.stderr).toMatch(/--format: the earlier run wrote csv,json/);
    const both = run(['study', studyFile, '--out', refDir, '--no-plots', '--resume', '--force']);
    expect(both.code).toBe(2);
  });
});

describe('writes that cannot lie', () => {
  it('rejects an empty --format list', () => {
    const r = run(['study', studyFile, '--out', join(work, 'noformat'), '--format', '']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toBe('bandbend: error: --format: no result format given (allowed: csv, json or csv,json)');
    expect(existsSync(join(work, 'noformat', 'results.csv'))).toBe(false);
  });

  for (const jobs of ['1', '2']) {
    it(`--jobs ${jobs}: a file-size limit (ulimit -f) stops with exit 1 and one line; every line on disk is complete; resume finishes`, () => {
      const out = join(work, `fsize-${jobs}`);
      // ulimit -f counts 1024-byte blocks: results.jsonl stops growing at 64 KiB
      const r = spawnSync('bash', ['-c', `ulimit -f 64; exec "${process.execPath}" "${BIN}" study "${studyFile}" --out "${out}" --jobs ${jobs} --no-plots`], {
        encoding: 'utf8',
      });
      expect(r.status).toBe(1);
      const lines = r.stderr.trim().split('\n');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(/^bandbend: cannot write results: .*results\.jsonl: file size limit reached \(EFBIG\); \d+ complete rows are on disk, continue later with --resume$/);
      const rows = expectCompleteLines(out);
      expect(rows).toBeGreaterThan(100);
      expect(rows).toBeLessThan(TOTAL);
      expect(lineCount(join(out, 'results.csv'))).toBe(rows + 1); // both files cut back to the same row
      expect(existsSync(join(out, '.bandbend-study.lock'))).toBe(false);
      const again = run(['study', studyFile, '--out', out, '--jobs', jobs, '--no-plots', '--resume']);
      expect(again.code).toBe(0);
      expect(readFileSync(join(out, 'results.jsonl'), 'utf8')).toBe(readFileSync(join(refDir, 'results.jsonl'), 'utf8'));
    });
  }

  it('a full tmpfs (ENOSPC) stops with exit 1 and complete lines (root only: mount is needed)', () => {
    const mnt = join(work, 'tiny');
    mkdirSync(mnt);
    const mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=96k', 'tmpfs', mnt]).status === 0;
    if (!mounted) {
      // not root: the ulimit test above covers the same code path (EFBIG instead of ENOSPC)
      expect(process.getuid?.()).not.toBe(0);
      return;
    }
    try {
      const out = join(mnt, 'out');
      const r = run(['study', studyFile, '--out', out, '--jobs', '1', '--no-plots']);
      expect(r.code).toBe(1);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(/no space left on the device \(ENOSPC\)/);
      const rows = expectCompleteLines(out);
      expect(rows).toBeGreaterThan(10);
      expect(rows).toBeLessThan(TOTAL);
    } finally {
      spawnSync('umount', [mnt]);
    }
  });
});

describe('one run per folder', () => {
  it('a second run on a folder in use refuses with exit 2, even with --force or --resume; the first finishes intact', async () => {
    const out = join(work, 'busy');
    // a longer study (6000 points) so that the first run is surely still busy
    const longer = join(work, 'longer.yaml');
    writeFileSync(longer, STUDY.replace('points: 50', 'points: 200'));
    const first = start(['study', longer, '--out', out, '--jobs', '1', '--no-plots']);
    for (let i = 0; i < 500 && lineCount(join(out, 'results.jsonl')) < 10; i++) await new Promise((r) => setTimeout(r, 10));
    const second = start(['study', longer, '--out', out, '--jobs', '1', '--no-plots', '--force']);
    const resume = start(['study', longer, '--out', out, '--jobs', '1', '--no-plots', '--resume']);
    const [c1, c2, c3] = await Promise.all([first.exit, second.exit, resume.exit]);
    expect(c2).toBe(2);
    expect(second.stderr()).toMatch(/--out: in use by a running study \(process \d+ on /);
    expect(c3).toBe(2);
    expect(c1).toBe(0);
    expect(expectCompleteLines(out)).toBe(6000);
  }, SLOW_TEST_MS);

  it('a lock from another host is never taken over', () => {
    const out = join(work, 'foreign-lock');
    mkdirSync(out);
    writeFileSync(join(out, '.bandbend-study.lock'), JSON.stringify({ pid: 1, host: `${hostname()}-elsewhere`, startedAt: '2026-01-01T00:00:00Z' }));
    const r = run(['study', studyFile, '--out', out, '--no-plots', '--resume']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/in use by process 1 on host .*-elsewhere/);
  });
});

describe('no output overwritten without --force', () => {
  it('keeps a file of the user in <out>/report', () => {
    const out = join(work, 'user-report');
    mkdirSync(join(out, 'report'), { recursive: true });
    writeFileSync(join(out, 'report', 'my-notes.txt'), 'mine');
    const r = run(['study', studyFile, '--out', out, '--jobs', '1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/report holds files bandbend did not write \(my-notes\.txt\)/);
    expect(readFileSync(join(out, 'report', 'my-notes.txt'), 'utf8')).toBe('mine');
    expect(existsSync(join(out, 'results.csv'))).toBe(false);
  });

  it('mott-schottky --plot refuses an existing FILE.vl.json as well as FILE', () => {
    const dir = join(work, 'ms');
    mkdirSync(dir);
    const csv = join(dir, 'cv.csv');
    // a synthetic n-type line 1/C^2 = a (V - V_fb): any valid CSV will do for the overwrite check
    writeFileSync(csv, 'potential_V,capacitance_F_per_cm2\n' + [0.2, 0.4, 0.6, 0.8, 1.0].map((v) => `${v},${(1 / Math.sqrt(1e14 * (v + 0.3))).toExponential(6)}`).join('\n') + '\n');
    const plot = join(dir, 'ms.svg');
    writeFileSync(`${plot}.vl.json`, 'user data');
    const r = run(['mott-schottky', csv, '--permittivity', '31', '--plot', plot]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--plot: .*ms\.svg\.vl\.json exists; use --force/);
    expect(readFileSync(`${plot}.vl.json`, 'utf8')).toBe('user data');
    expect(existsSync(plot)).toBe(false);
    expect(run(['mott-schottky', csv, '--permittivity', '31', '--plot', plot, '--force']).code).toBe(0);
    expect(readdirSync(dir).sort()).toEqual(['cv.csv', 'ms.svg', 'ms.svg.vl.json']);
  });
});
