// Ctrl-C during a long study leaves only complete rows on disk (issue 4/6). Runs the compiled CLI.
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'yaml';
import { parseCsvLine } from './helpers.js';

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
