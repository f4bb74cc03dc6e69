// Study benchmarks (for `npm run bench` and by hand; never in the test suite).
//
//   benchStudyJobs()   a 10k-point study (100 donor densities x 100 temperatures, custom planar
//                      contact, CSV + JSONL) run alternately with jobs 1 and jobs 2; wall time of
//                      runStudy including worker start-up and writing; median of `repeats` runs each.
//   benchLargeStudy()  one large study (default 1e6 points: 100 x 100 x 10 x 10) with runStudy and
//                      then the streaming report; wall time of both, peak resident memory of this
//                      process (process.resourceUsage().maxRSS, worker threads included) and the size
//                      of the report folder.
//
// By hand: node dist/study/benchStudy.js jobs [points]   |   node dist/study/benchStudy.js large [points] [jobs]
// (prints one JSON object). The 1e6-point run takes tens of minutes on a busy 2-core machine.
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { writeStudyReportFromResults } from '../output/studyReport.js';
import { defaultJobs, runStudy } from './runner.js';
import { parseStudy, type Study } from './studyFile.js';

const CUSTOM = { workFunction: 5.3, electronAffinity: 4.2, bandGap: 3.2, permittivity: 10, electronMass: 0.3, holeMass: 1, donorLevel: 0.1 };

/** A product study of about `points` points: donors x temperature (x permittivity x donor level beyond 1e4). */
export function benchStudy(points: number): Study {
  const side = (n: number): number => Math.max(1, Math.round(n));
  const axes: Record<string, unknown>[] = [];
  if (points <= 10_000) {
    const a = side(Math.sqrt(points));
    axes.push({ field: 'donors', log: { from: 1e16, to: 1e19, points: Math.max(2, a) }, unit: 'cm^-3' });
    axes.push({ field: 'temperature', linear: { from: 300, to: 700, points: Math.max(2, side(points / a)) }, unit: 'K' });
  } else {
    const rest = side(points / 10_000);
    const b = side(Math.sqrt(rest));
    axes.push({ field: 'donors', log: { from: 1e16, to: 1e19, points: 100 }, unit: 'cm^-3' });
    axes.push({ field: 'temperature', linear: { from: 300, to: 700, points: 100 }, unit: 'K' });
    axes.push({ field: 'permittivity', log: { from: 5, to: 80, points: Math.max(2, b) } });
    axes.push({ field: 'donorLevel', linear: { from: 0.05, to: 0.4, points: Math.max(2, side(rest / b)) }, unit: 'eV' });
  }
  return parseStudy(
    { name: `bench-${points}`, base: CUSTOM, sweep: { mode: 'product', axes }, outputs: ['bandBending_eV', 'electronsPerParticle', 'chargeEquivalentWidth_nm', 'direction'] },
    { label: 'bench-study' },
  );
}

const median = (v: readonly number[]): number => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]!;

export interface StudyJobsBench {
  points: number;
  jobs1_s: number;
  jobs2_s: number;
  /** jobs1_s / jobs2_s (> 1: two workers are faster) */
  speedup: number;
  runs_jobs1_s: number[];
  runs_jobs2_s: number[];
  /** CPU seconds / wall seconds of the jobs 2 runs (cores actually obtained) */
  cpuPerWall_jobs2: number;
}

/** jobs 2 against jobs 1 on a 10k-point study (see the file comment). */
export async function benchStudyJobs(options: { points?: number; repeats?: number } = {}): Promise<StudyJobsBench> {
  const points = options.points ?? 10_000;
  const repeats = options.repeats ?? 3;
  const study = benchStudy(points);
  const dir = mkdtempSync(join(tmpdir(), 'bandbend-bench-jobs-'));
  const runs: Record<1 | 2, number[]> = { 1: [], 2: [] };
  let cpu2 = 0;
  let wall2 = 0;
  try {
    for (let r = 0; r < repeats; r++) {
      for (const jobs of [2, 1] as const) {
        const cpu0 = process.cpuUsage();
        const t0 = performance.now();
        await runStudy({ study, outDir: join(dir, `jobs${jobs}`), jobs, force: true });
        const wall = (performance.now() - t0) / 1000;
        runs[jobs].push(wall);
        if (jobs === 2) {
          const c = process.cpuUsage(cpu0);
          cpu2 += (c.user + c.system) / 1e6;
          wall2 += wall;
        }
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  const jobs1_s = median(runs[1]);
  const jobs2_s = median(runs[2]);
  return { points: study.sweep.axes.reduce((n, a) => n * ('log' in a ? a.log.points : 'linear' in a ? a.linear.points : a.values.length), 1), jobs1_s, jobs2_s, speedup: jobs1_s / jobs2_s, runs_jobs1_s: runs[1], runs_jobs2_s: runs[2], cpuPerWall_jobs2: cpu2 / wall2 };
}

export interface LargeStudyBench {
  points: number;
  jobs: number;
  study_s: number;
  report_s: number;
  peakRss_MB: number;
  reportBytes: number;
  resultsBytes: number;
}

function folderBytes(dir: string): number {
  return readdirSync(dir).reduce((sum, f) => {
    const s = statSync(join(dir, f));
    return sum + (s.isDirectory() ? folderBytes(join(dir, f)) : s.size);
  }, 0);
}

/** One large study and its report: time, peak RSS, report size (see the file comment). */
export async function benchLargeStudy(options: { points?: number; jobs?: number; keep?: string } = {}): Promise<LargeStudyBench> {
  const study = benchStudy(options.points ?? 1_000_000);
  const jobs = options.jobs ?? defaultJobs();
  const dir = options.keep ?? mkdtempSync(join(tmpdir(), 'bandbend-bench-large-'));
  try {
    const t0 = performance.now();
    const summary = await runStudy({ study, outDir: dir, jobs, force: true });
    const t1 = performance.now();
    await writeStudyReportFromResults({ outDir: dir, study, run: { points: summary.points, total: summary.total, failed: summary.failed }, force: true });
    const t2 = performance.now();
    const resultsBytes = ['results.csv', 'results.jsonl'].reduce((s, f) => s + statSync(join(dir, f)).size, 0);
    return {
      points: summary.points,
      jobs,
      study_s: (t1 - t0) / 1000,
      report_s: (t2 - t1) / 1000,
      peakRss_MB: process.resourceUsage().maxRSS / 1024,
      reportBytes: folderBytes(join(dir, 'report')),
      resultsBytes,
    };
  } finally {
    if (options.keep === undefined) rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const [what, n, j] = process.argv.slice(2);
  const run =
    what === 'large'
      ? benchLargeStudy({ ...(n ? { points: Number(n) } : {}), ...(j ? { jobs: Number(j) } : {}) })
      : benchStudyJobs({ ...(n ? { points: Number(n) } : {}) });
  run.then(
    (r) => process.stdout.write(`${JSON.stringify(r, null, 2)}\n`),
    (e: unknown) => {
      process.stderr.write(`${e instanceof Error ? e.message : String(e)}\n`);
      process.exitCode = 1;
    },
  );
}
