// Ctrl-C during a long study leaves only complete rows on disk (issue 4/6), also while the report is
// written (issue 14); the watchdog replaces a silent worker (issue 14). Runs the compiled CLI / dist.
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'yaml';
import { parseCsvLine } from './helpers.js';
import * as built from '../dist/study/runner.js';
import * as builtFile from '../dist/study/studyFile.js';
import { HANG_ENV } from '../dist/study/worker.js';
import type { Study } from '../src/study/studyFile.js';

const STUDY = `
name: interrupt-check
base: { workFunction: 5.3, electronAffinity: 4.2, bandGap: 3.2, permittivity: 10, electronMass: 0.3, holeMass: 1, donorLevel: 0.1 }
sweep:
  mode: product
  axes:
    - { field: donors, log: { from: 1e16, to: 1e19, points: 200 }, unit: cm^-3 }
    - { field: temperature, linear: { from: 300, to: 700, points: 200 }, unit: K }
outputs: [bandBending_eV, electronsPerParticle]
`;

function lines(path: string): string[] {
  return existsSync(path) ? readFileSync(path, 'utf8').split('\n').filter((l) => l !== '') : [];
}

describe('interrupting a study', () => {
  it('SIGINT stops the run; every line of results.csv and results.jsonl is a complete row', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'bandbend-interrupt-'));
    try {
      const file = join(dir, 'study.yaml');
      writeFileSync(file, STUDY);
      expect(parse(STUDY)).toBeTruthy();
      const out = join(dir, 'out');
      const child = spawn(process.execPath, ['bin/bandbend.js', 'study', file, '--out', out, '--no-plots'], { stdio: ['ignore', 'ignore', 'pipe'] });
      let stderr = '';
      child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
      const csv = join(out, 'results.csv');
      // wait for some rows, then interrupt
      for (let i = 0; i < 600 && lines(csv).length < 200; i++) await new Promise((r) => setTimeout(r, 50));
      child.kill('SIGINT');
      const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
      expect(code).toBe(130);
      expect(stderr).toMatch(/interrupted/);
      const rows = lines(csv);
      const header = parseCsvLine(rows[0]!);
      expect(rows.length).toBeGreaterThan(100);
      expect(rows.length).toBeLessThan(40001);
      for (const row of rows) expect(parseCsvLine(row).length).toBe(header.length);
      for (const line of lines(join(out, 'results.jsonl'))) expect(() => JSON.parse(line)).not.toThrow();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('SIGINT while the report is written', () => {
  it('stops with exit 130, keeps the complete results and leaves no report or temporary folder', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'bandbend-interrupt-report-'));
    try {
      const file = join(dir, 'study.yaml');
      // 40 x 40 points, many outputs: the report takes several renders
      writeFileSync(
        file,
        STUDY.replace('points: 200 }, unit: cm^-3', 'points: 40 }, unit: cm^-3')
          .replace('points: 200 }, unit: K', 'points: 40 }, unit: K')
          .replace('outputs: [bandBending_eV, electronsPerParticle]', 'outputs: [bandBending_eV, electronsPerParticle, barrierHeight_eV, chargeEquivalentWidth_nm, debyeLength_nm, interfaceField_V_per_m, spaceCharge_C_per_m2, bulk.electronDensity_cm3]'),
      );
      const out = join(dir, 'out');
      const child = spawn(process.execPath, ['bin/bandbend.js', 'study', file, '--out', out, '--jobs', '1'], { stdio: ['ignore', 'ignore', 'pipe'] });
      let stderr = '';
      let sent = false;
      child.stderr.on('data', (chunk: Buffer) => {
        stderr += chunk.toString();
        // the rows are done: the report phase has started
        if (!sent && /points written/.test(stderr)) {
          sent = true;
          child.kill('SIGINT');
        }
      });
      const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
      expect(sent).toBe(true);
      expect(code).toBe(130);
      expect(stderr).toMatch(/interrupted while writing the report/);
      expect(lines(join(out, 'results.jsonl'))).toHaveLength(1600);
      expect(existsSync(join(out, 'report'))).toBe(false);
      expect(readdirSync(out).filter((f) => f.startsWith('.report.tmp'))).toEqual([]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('watchdog', () => {
  it('turns a worker that never answers into error rows and a fresh worker', async () => {
    // test hook read by worker threads only (src/study/worker.ts): point 5 hangs
    process.env[HANG_ENV] = '5';
    const dir = mkdtempSync(join(tmpdir(), 'bandbend-watchdog-'));
    try {
      const study = builtFile.parseStudy({
        name: 'watchdog',
        base: { workFunction: 5.3, electronAffinity: 4.2, bandGap: 3.2, permittivity: 10, electronMass: 0.3, holeMass: 1, donorLevel: 0.1 },
        sweep: { axes: [{ field: 'donors', log: { from: 1e16, to: 1e19, points: 12 }, unit: 'cm^-3' }] },
        outputs: ['bandBending_eV'],
      }) as Study;
      const summary = await built.runStudy({ study, outDir: join(dir, 'out'), jobs: 2, batchSize: 1, pointTimeout_s: 0.5, warmStart: false, minPointsForWorkers: 0 });
      expect(summary).toMatchObject({ points: 12, failed: 1, interrupted: false, watchdogRestarts: 1 });
      const rows = lines(join(dir, 'out', 'results.jsonl')).map((l) => JSON.parse(l) as { index: number; error: string | null; bandBending_eV: number | null });
      expect(rows.map((r) => r.index)).toEqual([...Array(12).keys()]);
      expect(rows[5]!.error).toMatch(/no answer from the worker within 0\.500 s \(watchdog: worker replaced\)/);
      for (const r of rows.filter((x) => x.index !== 5)) {
        expect(r.error).toBeNull();
        expect(typeof r.bandBending_eV).toBe('number');
      }
    } finally {
      delete process.env[HANG_ENV];
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
