// Sharded studies and `study merge` (issue 14): the merged files must be byte-identical to a single
// run of the whole study (the reference is that single run, computed here). Uses dist/ like study.test.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import * as built from '../dist/study/runner.js';
import * as builtFile from '../dist/study/studyFile.js';
import * as builtMerge from '../dist/study/merge.js';
import type { Study } from '../src/study/studyFile.js';
import type { MaterialsLibrary } from '../src/materials/types.js';

const BIN = join(process.cwd(), 'bin', 'bandbend.js');
const emptyLibrary = (): MaterialsLibrary => ({ metals: new Map(), supports: new Map(), references: new Map() });
const CUSTOM = { workFunction: 5.3, electronAffinity: 4.2, bandGap: 3.2, permittivity: 10, electronMass: 0.3, holeMass: 1, donorLevel: 0.1 };

let work: string;
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-shard-'));
});
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

// 7 x 5 = 35 points, with failing points (5000 K is out of range) so error rows are merged too
function study(): Study {
  const s = builtFile.parseStudy({
    name: 'shards',
    base: CUSTOM,
    sweep: {
      axes: [
        { field: 'donors', log: { from: 1e16, to: 1e19, points: 7 }, unit: 'cm^-3' },
        { field: 'temperature', values: [300, 400, 5000, 600, 700], unit: 'K' },
      ],
    },
    outputs: ['bandBending_eV', 'direction'],
  }) as Study;
  return { ...s, base: { ...s.base, materials: emptyLibrary() } };
}

describe('shards', () => {
  it('parses K/N and rejects anything else', () => {
    expect(built.parseShard('3/8')).toEqual({ index: 3, count: 8 });
    for (const bad of ['0/3', '4/3', '3', 'a/b', '1/0', '-1/2', '1.5/3']) expect(() => built.parseShard(bad)).toThrow(/--shard/);
  });

  it('shard K of N holds the points i % N == K - 1; merging 1..N equals one run byte for byte', async () => {
    const whole = await built.runStudy({ study: study(), outDir: join(work, 'whole'), jobs: 1 });
    expect(whole).toMatchObject({ points: 35, failed: 7 });
    const dirs: string[] = [];
    for (const k of [1, 2, 3, 4]) {
      const dir = join(work, `shard-${k}`);
      dirs.push(dir);
      const s = await built.runStudy({ study: study(), outDir: dir, jobs: k % 2 === 0 ? 2 : 1, minPointsForWorkers: 0, shard: { index: k, count: 4 } });
      // 35 points over 4 shards: 9, 9, 9, 8
      expect(s.total).toBe(k <= 3 ? 9 : 8);
      expect(s.studyTotal).toBe(35);
      const idx = readFileSync(join(dir, 'results.jsonl'), 'utf8')
        .trim()
        .split('\n')
        .map((l) => (JSON.parse(l) as { index: number }).index);
      expect(idx).toEqual(Array.from({ length: s.total }, (_, j) => k - 1 + 4 * j));
    }
    // in any order of the folders
    const merged = await builtMerge.mergeShards({ dirs: [dirs[2]!, dirs[0]!, dirs[3]!, dirs[1]!], outDir: join(work, 'merged') });
    expect(merged).toMatchObject({ points: 35, failed: 7, shards: 4 });
    for (const f of ['results.csv', 'results.jsonl']) {
      expect(readFileSync(join(work, 'merged', f), 'utf8')).toBe(readFileSync(join(work, 'whole', f), 'utf8'));
    }
    const record = JSON.parse(readFileSync(join(work, 'merged', 'study.json'), 'utf8')) as { shard: unknown; status: string; summary: { points: number } };
    expect(record).toMatchObject({ shard: null, status: 'finished', summary: { points: 35 } });
    // the merged folder is not merged over again without --force
    await expect(builtMerge.mergeShards({ dirs, outDir: join(work, 'merged') })).rejects.toThrow(/--force/);
  });

  it('merge refuses missing, duplicated, incomplete and foreign shards', async () => {
    const d = (k: number): string => join(work, `shard-${k}`);
    await expect(builtMerge.mergeShards({ dirs: [d(1), d(2), d(3)], outDir: join(work, 'm1') })).rejects.toThrow(/missing shard\(s\) 4 of 4/);
    await expect(builtMerge.mergeShards({ dirs: [d(1), d(1), d(2), d(3), d(4)], outDir: join(work, 'm2') })).rejects.toThrow(/given twice/);
    await expect(builtMerge.mergeShards({ dirs: [d(1), join(work, 'whole')], outDir: join(work, 'm3') })).rejects.toThrow(/is not a shard/);
    // an interrupted shard
    const controller = new AbortController();
    const cut = join(work, 'cut');
    await built.runStudy({
      study: study(),
      outDir: cut,
      shard: { index: 4, count: 4 },
      signal: controller.signal,
      onProgress: (done) => {
        if (done >= 2) controller.abort();
      },
    });
    await expect(builtMerge.mergeShards({ dirs: [d(1), d(2), d(3), cut], outDir: join(work, 'm4') })).rejects.toThrow(/shard 4\/4 is not complete .*--resume/);
    // a shard of another study
    const other = study();
    other.outputs = ['bandBending_eV'] as Study['outputs'];
    await built.runStudy({ study: other, outDir: join(work, 'other'), shard: { index: 4, count: 4 } });
    await expect(builtMerge.mergeShards({ dirs: [d(1), d(2), d(3), join(work, 'other')], outDir: join(work, 'm5') })).rejects.toThrow(/different study/);
    expect(existsSync(join(work, 'm5', 'results.csv'))).toBe(false);
  });

  it('the CLI runs shards and merges them (with a report)', () => {
    const file = join(work, 'cli.yaml');
    writeFileSync(
      file,
      `name: cli-shards\nbase: ${JSON.stringify(CUSTOM)}\nsweep:\n  axes:\n    - { field: donors, log: { from: 1e16, to: 1e19, points: 10 }, unit: cm^-3 }\n    - { field: temperature, values: [300, 500], unit: K }\noutputs: [bandBending_eV]\n`,
    );
    const cli = (args: string[]): { status: number | null; stderr: string } => spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8' });
    const one = cli(['study', file, '--out', join(work, 'cli-one'), '--jobs', '1', '--no-plots']);
    expect(one.status).toBe(0);
    for (const k of [1, 2, 3]) expect(cli(['study', file, '--out', join(work, `cli-${k}`), '--shard', `${k}/3`, '--jobs', '1', '--no-plots']).status).toBe(0);
    const m = cli(['study', 'merge', join(work, 'cli-1'), join(work, 'cli-2'), join(work, 'cli-3'), '--out', join(work, 'cli-merged')]);
    expect(m.stderr).toMatch(/20 rows merged from 3 shards/);
    expect(m.status).toBe(0);
    expect(readFileSync(join(work, 'cli-merged', 'results.csv'), 'utf8')).toBe(readFileSync(join(work, 'cli-one', 'results.csv'), 'utf8'));
    expect(existsSync(join(work, 'cli-merged', 'report', 'index.html'))).toBe(true);
    const bad = cli(['study', file, '--out', join(work, 'cli-bad'), '--shard', '4/3']);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--shard: expected K\/N/);
  });
});
