// Parameter studies: study files, sweep expansion, the runner (in-process and worker threads), progress.
// Runner tests use dist/ (built before the tests) because the worker threads run dist/study/worker.js.
// Materials are given as custom properties so that results do not depend on the materials library.
import { mkdtempSync, mkdirSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { solveContact } from '../src/contact.js';
import type { MaterialsLibrary } from '../src/materials/types.js';
import {
  MAX_STUDY_POINTS,
  OUTPUT_PATHS,
  countPoints,
  loadStudyFile,
  parseStudy,
  parseStudyText,
  readOutput,
  studyColumns,
  type Study,
} from '../src/study/studyFile.js';
import { axisValues, expandSweep, linearSpace, logSpace } from '../src/study/sweep.js';
import { createProgress, formatProgress } from '../src/study/progress.js';
import * as built from '../dist/study/runner.js';
import * as builtFile from '../dist/study/studyFile.js';
import { parseCsvLine } from './helpers.js';

const emptyLibrary = (): MaterialsLibrary => ({ metals: new Map(), supports: new Map(), references: new Map() });

/** Custom metal and support: no library lookups. */
const CUSTOM = {
  workFunction: 5.3,
  electronAffinity: 4.2,
  bandGap: 3.2,
  permittivity: 10,
  electronMass: 0.3,
  holeMass: 1,
  donors: '1e18',
  donorLevel: 0.1,
};

let work: string;
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-study-'));
});
afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

function study(raw: Record<string, unknown>): Study {
  return parseStudy({ name: 'test', ...raw }, { label: 'study.yaml' });
}


function readCsv(path: string): { header: string[]; rows: string[][] } {
  const text = readFileSync(path, 'utf8');
  expect(text.endsWith('\n')).toBe(true);
  const lines = text.slice(0, -1).split('\n');
  const header = parseCsvLine(lines[0]!);
  const rows = lines.slice(1).map(parseCsvLine);
  for (const r of rows) expect(r.length).toBe(header.length);
  return { header, rows };
}

function readJsonl(path: string): Record<string, unknown>[] {
  const text = readFileSync(path, 'utf8');
  if (text === '') return [];
  expect(text.endsWith('\n')).toBe(true);
  return text
    .slice(0, -1)
    .split('\n')
    .map((l) => JSON.parse(l) as Record<string, unknown>);
}

// ---------------------------------------------------------------------------------------------

describe('sweep expansion', () => {
  it('linear axes hit both endpoints exactly, evenly spaced', () => {
    const v = linearSpace(300, 700, 5);
    expect(v).toEqual([300, 400, 500, 600, 700]);
    const w = linearSpace(0.1, 0.7, 7);
    expect(w[0]).toBe(0.1);
    expect(w[6]).toBe(0.7);
    for (let i = 1; i < w.length; i++) expect(w[i]! - w[i - 1]!).toBeCloseTo(0.1, 14);
    expect(linearSpace(5, 1, 3)).toEqual([5, 3, 1]);
  });

  it('log axes have a constant ratio, exact endpoints and exact decades', () => {
    const v = logSpace(1e16, 1e19, 13);
    expect(v).toHaveLength(13);
    expect(v[0]).toBe(1e16);
    expect(v[12]).toBe(1e19);
    expect(v[4]).toBe(1e17);
    expect(v[8]).toBe(1e18);
    const ratio = 10 ** 0.25;
    for (let i = 1; i < v.length; i++) expect(v[i]! / v[i - 1]! / ratio - 1).toBeLessThan(1e-13);
    for (let i = 0; i < v.length; i++) expect(Math.abs(v[i]! / 10 ** (16 + i / 4) - 1)).toBeLessThan(1e-14);
    // descending, non-decade endpoints
    const d = logSpace(5e3, 2e-2, 4);
    expect(d[0]).toBe(5e3);
    expect(d[3]).toBe(2e-2);
    expect(d[1]! / d[0]!).toBeCloseTo(d[2]! / d[1]!, 12);
  });

  it('expands a product with the last axis fastest and counts it', () => {
    const s = study({
      base: { temperature: 400 },
      sweep: {
        mode: 'product',
        axes: [
          { field: 'donors', log: { from: 1e16, to: 1e19, points: 13 }, unit: 'cm^-3' },
          { field: 'particleDiameter', values: [1, 2, 5, 10], unit: 'nm' },
          { field: 'temperature', linear: { from: 300, to: 700, points: 5 }, unit: 'K' },
        ],
      },
    });
    expect(countPoints(s.sweep)).toBe(13 * 4 * 5);
    const points = [...expandSweep(s)];
    expect(points).toHaveLength(260);
    expect(points.map((p) => p.index)).toEqual(points.map((_, i) => i));
    expect(points[0]!.swept).toEqual({ donors: 1e16, particleDiameter: 1, temperature: 300 });
    expect(points[1]!.swept).toEqual({ donors: 1e16, particleDiameter: 1, temperature: 400 });
    expect(points[5]!.swept).toEqual({ donors: 1e16, particleDiameter: 2, temperature: 300 });
    expect(points[20]!.swept).toEqual({ donors: logSpace(1e16, 1e19, 13)[1], particleDiameter: 1, temperature: 300 });
    expect(points[20]!.swept['donors']).toBeCloseTo(10 ** 16.25, -2);
    expect(points[259]!.swept).toEqual({ donors: 1e19, particleDiameter: 10, temperature: 700 });
    // the axis value replaces the base value; bare numbers when the unit is the default one
    expect(points[1]!.options).toEqual({ temperature: 400, donors: 1e16, particleDiameter: 1 });
    // deterministic
    expect([...expandSweep(s)]).toEqual(points);
  });

  it('passes non-default units as quantity strings', () => {
    const s = study({ sweep: { axes: [{ field: 'temperature', values: [25, 200], unit: 'degC' }, { field: 'particleDiameter', values: [20], unit: 'angstrom' }] } });
    const [a, b] = [...expandSweep(s)];
    expect(a!.options).toEqual({ temperature: '25 degC', particleDiameter: '20 angstrom' });
    expect(b!.swept).toEqual({ temperature: 200, particleDiameter: 20 });
    expect(studyColumns(s)).toEqual(['index', 'temperature [degC]', 'particleDiameter [angstrom]', 'bandBending_eV', 'barrierHeight_eV', 'direction', 'electronsPerParticle', 'chargeEquivalentWidth_nm', 'error']);
  });

  it('zips axes side by side', () => {
    const s = study({
      sweep: {
        mode: 'zip',
        axes: [
          { field: 'temperature', linear: { from: 300, to: 600, points: 4 } },
          { field: 'metal', values: ['Pt', 'Au', 'Pd', 'Rh'] },
        ],
      },
    });
    expect(countPoints(s.sweep)).toBe(4);
    expect([...expandSweep(s)].map((p) => p.swept)).toEqual([
      { temperature: 300, metal: 'Pt' },
      { temperature: 400, metal: 'Au' },
      { temperature: 500, metal: 'Pd' },
      { temperature: 600, metal: 'Rh' },
    ]);
  });

  it('is lazy: the first points of a million-point study come at once', () => {
    const s = study({
      sweep: {
        axes: [
          { field: 'donors', log: { from: 1e15, to: 1e20, points: 1000 } },
          { field: 'temperature', linear: { from: 300, to: 900, points: 1000 } },
        ],
      },
    });
    expect(countPoints(s.sweep)).toBe(MAX_STUDY_POINTS);
    const t0 = performance.now();
    const it = expandSweep(s);
    const first = it.next().value!;
    const second = it.next().value!;
    expect(performance.now() - t0).toBeLessThan(200);
    expect(first.swept).toEqual({ donors: 1e15, temperature: 300 });
    expect(second.index).toBe(1);
    expect(axisValues(s.sweep.axes[1]!)).toHaveLength(1000);
  });
});

describe('study file validation', () => {
  const ok = { name: 'v', sweep: { axes: [{ field: 'donors', log: { from: 1e16, to: 1e19, points: 13 }, unit: 'cm^-3' }] } };
  const rejects = (raw: unknown, message: string | RegExp): void => {
    expect(() => parseStudy(raw, { label: 'study.yaml' })).toThrow(message);
    try {
      parseStudy(raw, { label: 'study.yaml' });
    } catch (err) {
      expect((err as Error).name).toBe('InputError');
      expect((err as Error).message).not.toContain('\n');
    }
  };

  it('accepts a valid study and fills defaults', () => {
    const s = parseStudy(ok, { label: 'study.yaml' });
    expect(s.sweep.mode).toBe('product');
    expect(s.base).toEqual({});
    expect(s.outputs).toContain('bandBending_eV');
  });

  it('names the file and path of a bad value', () => {
    rejects({ ...ok, sweep: { axes: [{ field: 'donors', log: { from: 1e16, to: 1e19, points: 1 } }] } }, 'study.yaml: sweep.axes[0].log.points: expected an integer >= 2');
    rejects({ ...ok, sweep: { axes: [{ field: 'donors', log: { from: 0, to: 1e19, points: 3 } }] } }, 'study.yaml: sweep.axes[0].log.from: expected a number > 0');
    rejects({ ...ok, base: { temperature: Number.NaN } }, /^study\.yaml: base\.temperature: expected a number/);
    rejects({ ...ok, base: { temperature: '300 eV' } }, /^study\.yaml: base\.temperature: .*wrong dimension/);
    rejects({ ...ok, base: { geometry: 'cube' } }, /base\.geometry: expected one of planar, hemisphere, array, disc, disc-array/);
  });

  it('rejects unknown keys with one line naming the key', () => {
    rejects({ ...ok, base: { temprature: 300 } }, 'study.yaml: base.temprature: unknown field (did you mean "temperature"?)');
    rejects({ ...ok, outptus: ['direction'] }, 'study.yaml: outptus: unknown field (did you mean "outputs"?)');
    rejects({ ...ok, sweep: { axes: [{ field: 'donors', log: { from: 1, to: 2, n: 3 } }] } }, /sweep\.axes\[0\]\.log\.n: unknown field/);
  });

  it('rejects unknown and non-numeric sweep fields', () => {
    rejects({ ...ok, sweep: { axes: [{ field: 'donor', values: [1] }] } }, 'study.yaml: sweep.axes[0].field: unknown field "donor" (did you mean "donors"?)');
    rejects({ ...ok, sweep: { axes: [{ field: 'metal', linear: { from: 1, to: 2, points: 2 } }] } }, /"metal" is categorical: give a list of names in values/);
    rejects({ ...ok, sweep: { axes: [{ field: 'materials', values: ['a.yaml'] }] } }, /"materials" cannot be swept/);
    rejects({ ...ok, sweep: { axes: [{ field: 'temperature', values: ['300 K'] }] } }, /sweep\.axes\[0\]\.values\[0\]: expected a number/);
    rejects({ ...ok, sweep: { axes: [{ field: 'temperature', values: [300], unit: 'nm' }] } }, /sweep\.axes\[0\]\.unit: "nm" is not a unit of a temperature/);
    rejects({ ...ok, sweep: { axes: [{ field: 'donors', values: [1], linear: { from: 1, to: 2, points: 2 } }] } }, /give only one of values, linear, log/);
    rejects({ ...ok, sweep: { axes: [{ field: 'donors', values: [1] }, { field: 'donors', values: [2] }] } }, /sweep\.axes\[1\]\.field: "donors" is already swept/);
    rejects({ ...ok, sweep: { mode: 'zip', axes: [{ field: 'donors', values: [1, 2] }, { field: 'temperature', values: [300] }] } }, /zip mode needs axes of equal length/);
  });

  it('accepts categorical axes of names', () => {
    const s = parseStudy({ ...ok, sweep: { axes: [{ field: 'metal', values: ['Pt', 'Au'] }, { field: 'support', values: ['ZnO'] }, { field: 'geometry', values: ['planar', 'hemisphere'] }] } });
    expect(countPoints(s.sweep)).toBe(4);
  });

  it('rejects unknown outputs', () => {
    rejects({ ...ok, outputs: ['bandbending_eV'] }, 'study.yaml: outputs[0]: unknown output "bandbending_eV" (did you mean "bandBending_eV"?)');
    rejects({ ...ok, outputs: ['profile.x_nm'] }, /unknown output "profile\.x_nm"/);
    rejects({ ...ok, outputs: ['direction', 'direction'] }, /outputs\[1\]: "direction" is listed twice/);
    expect(parseStudy({ ...ok, outputs: ['particle.atoms', 'exchange.equilibrationTimeLog10_s', 'warnings'] }).outputs).toHaveLength(3);
  });

  it('rejects more than a million points', () => {
    rejects(
      {
        ...ok,
        sweep: {
          axes: [
            { field: 'donors', log: { from: 1e16, to: 1e19, points: 1001 } },
            { field: 'temperature', linear: { from: 300, to: 700, points: 1000 } },
          ],
        },
      },
      'study.yaml: sweep: 1001000 points exceed the limit of 1,000,000',
    );
  });

  it('rejects malformed YAML and JSON, and non-mappings', () => {
    expect(() => parseStudyText('name: [1,\n  base: {', 'study.yaml')).toThrow(/^study\.yaml: not valid YAML: /);
    expect(() => parseStudyText('name: a\nname: b\n', 'study.yaml')).toThrow(/not valid YAML: Map keys must be unique/);
    expect(() => parseStudyText('{"name": NaN}', 'study.json')).toThrow(/^study\.json: not valid JSON/);
    expect(() => parseStudyText('name: x\nbase: {temperature: .nan}\nsweep: {axes: [{field: donors, values: [1]}]}\n', 'study.yaml')).toThrow(
      /study\.yaml: base\.temperature/,
    );
    expect(() => parseStudyText('- 1\n- 2\n', 'study.yaml')).toThrow(/study\.yaml: expected a study/);
  });

  it('reads files, resolves materials paths next to the file, refuses huge files before parsing', () => {
    const dir = join(work, 'files');
    mkdirSync(dir, { recursive: true });
    const path = join(dir, 'study.yaml');
    writeFileSync(
      path,
      ['name: f', 'base:', '  materials: [extra.yaml]', 'sweep:', '  axes:', '    - { field: donors, values: [1e17, 1e18], unit: cm^-3 }', ''].join('\n'),
    );
    const s = loadStudyFile(path);
    expect(s.base.materials).toEqual([join(dir, 'extra.yaml')]);
    expect(() => loadStudyFile(join(dir, 'missing.yaml'))).toThrow(/missing\.yaml: file not found/);
    const huge = join(dir, 'huge.yaml');
    // not even YAML: the size check must come first
    writeFileSync(huge, '{'.repeat(5 * 1024 * 1024 + 1));
    expect(() => loadStudyFile(huge)).toThrow(/huge\.yaml: file is larger than the 5 MB limit/);
  });
});

describe('outputs', () => {
  it('list every scalar leaf of a real result', () => {
    // interface-states model, so the interface-state fields are filled in too
    const result = solveContact({
      ...CUSTOM,
      geometry: 'array',
      particleDensity: '1e11',
      barrierModel: 'interface-states',
      neutralLevelAboveValence: '1.5 eV',
      materials: emptyLibrary(),
    });
    const leaves: string[] = [];
    const listedPaths = OUTPUT_PATHS as readonly string[];
    const walk = (node: unknown, prefix: string): void => {
      for (const [k, v] of Object.entries(node as Record<string, unknown>)) {
        const path = prefix + k;
        if (Array.isArray(v)) continue;
        // an object that is null in this result (capacitanceBarrier of a particle array): its listed fields read null
        const children = listedPaths.filter((p) => p.startsWith(`${path}.`));
        if (v === null && children.length > 0) {
          for (const c of children) expect(readOutput(result, c), c).toBeNull();
          leaves.push(...children);
          continue;
        }
        if (v !== null && typeof v === 'object') walk(v, `${path}.`);
        else leaves.push(path);
      }
    };
    walk(result, '');
    const listed = OUTPUT_PATHS.filter((p) => p !== 'warnings' && !p.startsWith('uncertainty.'));
    expect([...leaves].sort()).toEqual([...listed].sort());
    expect(readOutput(result, 'bandBending_eV')).toBe(result.bandBending_eV);
    expect(readOutput(result, 'particle.meanSpacing_nm')).toBe(result.particle.meanSpacing_nm);
    expect(readOutput(result, 'uncertainty.bandBending_eV.p50')).toBeNull();
    // the same {code, message} array as the contact result (issue 13 item 7); results.csv joins the codes (rows.ts)
    expect(readOutput(result, 'warnings')).toEqual(result.warnings);
  });
});

// ---------------------------------------------------------------------------------------------

/** ~20 points with custom materials; `materials` is set by the caller. */
function smallStudy(materials: unknown): Study {
  const s = builtFile.parseStudy({
    name: 'small',
    base: { ...CUSTOM, geometry: 'hemisphere', particleDiameter: '3 nm' },
    sweep: {
      axes: [
        { field: 'donors', log: { from: 1e16, to: 1e19, points: 5 }, unit: 'cm^-3' },
        { field: 'temperature', linear: { from: 300, to: 700, points: 4 }, unit: 'K' },
      ],
    },
    outputs: ['bandBending_eV', 'barrierHeight_eV', 'electronsPerParticle', 'chargeEquivalentWidth_nm', 'direction', 'exchange.slow', 'particle.atoms'],
  }) as Study;
  return withMaterials(s, materials);
}

function withMaterials(s: Study, materials: unknown): Study {
  return { ...s, base: { ...s.base, materials: materials as Study['base']['materials'] } };
}

describe('runStudy', () => {
  it('gives identical rows with jobs 1 (in-process) and jobs 2 (worker threads)', async () => {
    const one = await built.runStudy({ study: smallStudy(emptyLibrary()), outDir: join(work, 'jobs1'), jobs: 1 });
    const two = await built.runStudy({ study: smallStudy([]), outDir: join(work, 'jobs2'), jobs: 2, batchSize: 3, minPointsForWorkers: 0 });
    expect(one).toMatchObject({ points: 20, total: 20, failed: 0, interrupted: false });
    expect(two).toMatchObject({ points: 20, total: 20, failed: 0, interrupted: false, jobs: 2 });
    const a = readCsv(one.csvPath!);
    const b = readCsv(two.csvPath!);
    expect(a.header).toEqual([
      'index',
      'donors [cm^-3]',
      'temperature [K]',
      'bandBending_eV',
      'barrierHeight_eV',
      'electronsPerParticle',
      'chargeEquivalentWidth_nm',
      'direction',
      'exchange.slow',
      'particle.atoms',
      'error',
    ]);
    const byIndex = (rows: string[][]): string[][] => [...rows].sort((x, y) => Number(x[0]) - Number(y[0]));
    expect(byIndex(b.rows)).toEqual(byIndex(a.rows));
    // rows are written in index order whatever the number of jobs: the files are identical
    expect(readFileSync(two.csvPath!, 'utf8')).toBe(readFileSync(one.csvPath!, 'utf8'));
    // an in-memory library reaches the workers as plain entries
    const three = await built.runStudy({ study: smallStudy(emptyLibrary()), outDir: join(work, 'jobs2-library'), jobs: 2, minPointsForWorkers: 0 });
    expect(readFileSync(three.csvPath!, 'utf8')).toBe(readFileSync(one.csvPath!, 'utf8'));
    expect(a.rows.map((r) => Number(r[0]))).toEqual([...Array(20).keys()]);
    expect(a.rows[0]!.slice(1, 3)).toEqual(['10000000000000000', '300']);
    const ja = readJsonl(one.jsonlPath!);
    const jb = readJsonl(two.jsonlPath!);
    expect(jb.sort((x, y) => Number(x['index']) - Number(y['index']))).toEqual(ja);
    expect(ja[0]).toMatchObject({ index: 0, 'donors [cm^-3]': 1e16, 'temperature [K]': 300, error: null, 'particle.atoms': null });
    expect(typeof ja[0]!['bandBending_eV']).toBe('number');
    // the in-process values are those of solveContact itself
    const direct = solveContact({ ...CUSTOM, geometry: 'hemisphere', particleDiameter: '3 nm', donors: 1e16, temperature: 300, materials: emptyLibrary() });
    expect(ja[0]!['bandBending_eV']).toBe(direct.bandBending_eV);
    const record = JSON.parse(readFileSync(join(work, 'jobs2', 'study.json'), 'utf8')) as { study: Study; summary: { points: number } };
    expect(record.study.name).toBe('small');
    expect(record.summary.points).toBe(20);
  });

  it('records a failing point with its error and goes on', async () => {
    for (const [jobs, materials] of [
      [1, emptyLibrary()],
      [2, []],
    ] as const) {
      const s = builtFile.parseStudy({
        name: 'failing',
        base: CUSTOM,
        sweep: { axes: [{ field: 'temperature', values: [300, 2000, 500, 400], unit: 'K' }] },
        outputs: ['bandBending_eV', 'direction'],
      }) as Study;
      const out = join(work, `failing-${jobs}`);
      const summary = await built.runStudy({ study: withMaterials(s, materials), outDir: out, jobs, formats: ['csv', 'json'], minPointsForWorkers: 0 });
      expect(summary).toMatchObject({ points: 4, failed: 1, interrupted: false });
      const { rows } = readCsv(summary.csvPath!);
      expect(rows.map((r) => r[0])).toEqual(['0', '1', '2', '3']);
      expect(rows[1]!.slice(2, 4)).toEqual(['', '']);
      expect(rows[1]![4]).toMatch(/--temperature: value 2000 K is out of range/);
      for (const i of [0, 2, 3]) {
        expect(rows[i]![4]).toBe('');
        expect(Number.isFinite(Number(rows[i]![2]))).toBe(true);
      }
      const json = readJsonl(summary.jsonlPath!);
      expect(json[1]).toMatchObject({ bandBending_eV: null, direction: null });
      expect(json[1]!['error']).toMatch(/out of range/);
    }
  });

  it('quotes error messages with commas and quotes in the CSV', async () => {
    const name = 'Made, "up"';
    const s = builtFile.parseStudy({ name: 'q', base: CUSTOM, sweep: { axes: [{ field: 'metal', values: [name] }] }, outputs: ['direction'] }) as Study;
    const summary = await built.runStudy({ study: withMaterials(s, emptyLibrary()), outDir: join(work, 'quoting') });
    const { rows } = readCsv(summary.csvPath!);
    expect(rows).toEqual([['0', name, '', expect.stringContaining(`unknown metal "${name}"`) as unknown as string]]);
    expect(readJsonl(summary.jsonlPath!)[0]).toMatchObject({ metal: name, direction: null });
  });

  it('refuses to overwrite earlier results unless forced', async () => {
    const out = join(work, 'overwrite');
    const s = withMaterials(
      builtFile.parseStudy({ name: 'o', base: CUSTOM, sweep: { axes: [{ field: 'temperature', values: [300, 400] }] } }) as Study,
      emptyLibrary(),
    );
    mkdirSync(out, { recursive: true });
    writeFileSync(join(out, 'notes.txt'), 'unrelated');
    await built.runStudy({ study: s, outDir: out }); // a folder without results is fine
    await expect(built.runStudy({ study: s, outDir: out })).rejects.toThrow('--out: folder exists; use --force to overwrite');
    await expect(built.runStudy({ study: s, outDir: out })).rejects.toMatchObject({ name: 'InputError' });
    const summary = await built.runStudy({ study: s, outDir: out, force: true, formats: ['csv'] });
    expect(summary.points).toBe(2);
    expect(summary.jsonlPath).toBeNull();
    expect(existsSync(join(out, 'results.jsonl'))).toBe(false);
    expect(readFileSync(join(out, 'notes.txt'), 'utf8')).toBe('unrelated');
  });

  it('rejects bad jobs and a materials file that does not load, before writing', async () => {
    const s = builtFile.parseStudy({ name: 'j', base: CUSTOM, sweep: { axes: [{ field: 'temperature', values: [300] }] } }) as Study;
    await expect(built.runStudy({ study: withMaterials(s, emptyLibrary()), outDir: join(work, 'jobs0'), jobs: 0 })).rejects.toThrow(/--jobs/);
    await expect(built.runStudy({ study: withMaterials(s, [join(work, 'nope.yaml')]), outDir: join(work, 'nomat'), jobs: 2, minPointsForWorkers: 0 })).rejects.toThrow(/nope\.yaml/);
    expect(existsSync(join(work, 'nomat', 'results.csv'))).toBe(false);
  });

  it('stops on abort and leaves only complete rows', async () => {
    for (const [jobs, materials] of [
      [1, emptyLibrary()],
      [2, []],
    ] as const) {
      const s = builtFile.parseStudy({
        name: 'interrupt',
        base: CUSTOM,
        sweep: {
          axes: [
            { field: 'donors', log: { from: 1e16, to: 1e19, points: 40 } },
            // 5000 K fails: error rows are written like the others
            { field: 'temperature', values: [300, 400, 5000, 600, 700] },
          ],
        },
        outputs: ['bandBending_eV', 'direction', 'warnings'],
      }) as Study;
      const controller = new AbortController();
      const summary = await built.runStudy({
        study: withMaterials(s, materials),
        outDir: join(work, `interrupt-${jobs}`),
        jobs,
        batchSize: 4,
        minPointsForWorkers: 0,
        signal: controller.signal,
        onProgress: (done) => {
          if (done >= 6) controller.abort();
        },
      });
      expect(summary.interrupted).toBe(true);
      expect(summary.points).toBeGreaterThanOrEqual(6);
      expect(summary.points).toBeLessThan(200);
      const { header, rows } = readCsv(summary.csvPath!);
      expect(header).toHaveLength(7);
      expect(rows).toHaveLength(summary.points);
      const indices = rows.map((r) => Number(r[0]));
      expect(new Set(indices).size).toBe(indices.length);
      expect(readJsonl(summary.jsonlPath!)).toHaveLength(summary.points);
      const record = JSON.parse(readFileSync(summary.studyPath, 'utf8')) as { summary: { interrupted: boolean } };
      expect(record.summary.interrupted).toBe(true);
    }
  });

  it('returns at once when aborted before the start', async () => {
    const s = withMaterials(
      builtFile.parseStudy({ name: 'a', base: CUSTOM, sweep: { axes: [{ field: 'temperature', values: [300, 400] }] } }) as Study,
      emptyLibrary(),
    );
    const summary = await built.runStudy({ study: s, outDir: join(work, 'aborted'), signal: AbortSignal.abort() });
    expect(summary).toMatchObject({ points: 0, interrupted: true });
    expect(readCsv(summary.csvPath!).rows).toHaveLength(0);
  });
});

describe('progress', () => {
  it('is silent when stderr is not a terminal', () => {
    const written: string[] = [];
    const p = createProgress(10, 'study', { stream: { isTTY: false, write: (t: string) => written.push(t) } });
    p.tick(5);
    p.done();
    expect(written).toEqual([]);
  });

  it('draws at most every interval on a terminal and ends the line', () => {
    const written: string[] = [];
    let now = 0;
    const p = createProgress(100, 'study', { stream: { isTTY: true, columns: 120, write: (t: string) => written.push(t) }, now: () => now });
    for (let i = 0; i < 100; i++) {
      now += 5; // 100 ticks over 0.5 s
      p.tick(1);
    }
    p.done();
    expect(written.length).toBeLessThanOrEqual(8);
    expect(written.at(-1)).toBe('\n');
    expect(written.at(-2)).toContain('100/100');
    expect(formatProgress('x', 25, 100, 10, 8)).toBe('x [##......]  25% 25/100 10s eta 30s');
  });
});

describe('study report (streaming aggregation)', () => {
  it('reservoir quantiles are exact below capacity and bounded above it', async () => {
    const { Reservoir } = await import('../src/study/aggregate.js');
    // order statistics of 1..101: median 51, 5th percentile 6, 95th 96 (linear interpolation, Hyndman & Fan type 7)
    const r = new Reservoir(256);
    for (let v = 101; v >= 1; v--) r.add(v);
    expect([r.quantile(0.5), r.quantile(0.05), r.quantile(0.95), r.min, r.max, r.n]).toEqual([51, 6, 96, 1, 101, 101]);
    // 1e5 values from a uniform grid on [0, 1): sample median within 0.1 of 0.5 with 256 kept values
    const big = new Reservoir(256, 7);
    for (let i = 0; i < 100_000; i++) big.add(((i * 7919) % 100_000) / 100_000);
    expect(Math.abs(big.quantile(0.5) - 0.5)).toBeLessThan(0.1);
    expect(big.n).toBe(100_000);
  });

  it('plans x, colour and panels; names and units instead of raw field names', async () => {
    const { planAggregation, outputTitle, inputTitle } = await import('../src/study/aggregate.js');
    const s = study({
      base: { metal: 'Pt', support: 'CeO2' },
      sweep: {
        axes: [
          { field: 'reductionTemperature', values: [573, 673, 773], unit: 'K' },
          { field: 'hydrogenToWater', log: { from: 1e-2, to: 1e4, points: 13 } },
          { field: 'particleDiameter', values: [1, 2, 5, 10], unit: 'nm' },
          { field: 'donorLevel', values: [0.1, 0.2] },
        ],
      },
      outputs: ['pretreatment.vacancyDensity_cm3', 'bandBending_eV'],
    });
    const plan = planAggregation(s);
    expect(plan.x.axis.field).toBe('hydrogenToWater');
    expect(plan.x.log).toBe(true);
    expect(plan.color?.axis.field).toBe('reductionTemperature');
    expect(plan.facet?.axis.field).toBe('particleDiameter');
    expect(plan.rest.map((a) => a.field)).toEqual(['donorLevel']);
    expect(outputTitle('pretreatment.vacancyDensity_cm3')).toBe('oxygen-vacancy density (cm^-3)');
    expect(outputTitle('bandBending_eV')).toBe('band bending (eV)');
    expect(outputTitle('exchange.equilibrationTimeLog10_s')).toBe('log10 equilibration time (log10 s)');
    expect(inputTitle({ field: 'donors', unit: 'cm^-3' })).toBe('donor density (cm^-3)');
    expect(inputTitle({ field: 'particleDiameter' })).toBe('particle diameter (nm)');
  });

  it('writes a bounded report with the system and base conditions at the top', async () => {
    const s = withMaterials(
      builtFile.parseStudy({
        name: 'report-check',
        base: { ...CUSTOM, geometry: 'planar' },
        sweep: {
          axes: [
            { field: 'donors', log: { from: 1e16, to: 1e19, points: 7 }, unit: 'cm^-3' },
            { field: 'temperature', values: [300, 500], unit: 'K' },
            { field: 'permittivity', values: [5, 20] },
            { field: 'donorLevel', values: [0.05, 0.2] },
          ],
        },
        outputs: ['bandBending_eV', 'bulk.electronDensity_cm3', 'direction'],
      }) as Study,
      emptyLibrary(),
    );
    const out = join(work, 'report-check');
    const summary = await built.runStudy({ study: s, outDir: out, jobs: 1 });
    const { writeStudyReportFromResults } = await import('../dist/output/studyReport.js');
    const paths = await writeStudyReportFromResults({ outDir: out, study: s, run: { points: summary.points, total: summary.total, failed: summary.failed } });
    const html = readFileSync(paths.htmlPath, 'utf8');
    const top = html.slice(0, html.indexOf('<h2>Sweep'));
    expect(top).toContain('custom metal (work function 5.3 eV) on custom support');
    expect(top).toContain('<td>electron effective mass (m_e)</td><td>electronMass</td><td>0.3</td>');
    expect(top).toContain('custom support (electron affinity 4.2 eV, band gap 3.2 eV)');
    expect(top).toContain('planar');
    expect(html).not.toContain('>bulk.electronDensity_cm3 against');
    expect(html).toContain('bulk electron density (cm^-3) against donor density (cm^-3)');
    // 7 x 2 x 2 x 2 = 56 rows; donorLevel aggregated: median line and 5-95 % band
    expect(paths.rows).toBe(56);
    expect(html).toContain('band: 5-95 % over donor level below E_C (eV)');
    const spec = JSON.parse(readFileSync(join(out, 'report', 'plot-bulk_electronDensity_cm3.vl.json'), 'utf8')) as { facet?: unknown; spec: { layer: { encoding: { y: { scale: { type?: string } } } }[] } };
    expect(spec.facet).toBeDefined();
    expect(spec.spec.layer[0]!.encoding.y.scale.type).toBe('log'); // electron density spans decades
    // a second report replaces our own files without --force, but not a user's file
    await writeStudyReportFromResults({ outDir: out, study: s });
    writeFileSync(join(out, 'report', 'notes.txt'), 'mine');
    await expect(writeStudyReportFromResults({ outDir: out, study: s })).rejects.toThrow(/did not write \(notes\.txt\)/);
  });
});
