// `bandbend study FILE`: parameter sweeps from a study file, rows written as they complete, plus line plots.
import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { loadStudyFile } from '../study/studyFile.js';
import { runStudy, defaultJobs, checkFormats, parseShard, readStudyRecord, StudyWriteError, type StudyFormat, type ResumeInfo } from '../study/runner.js';
import { mergeShards } from '../study/merge.js';
import { createProgress, type Progress } from '../study/progress.js';
import { writeStudyReportFromResults, checkStudyReportDir, ReportInterrupted, STUDY_REPORT_DIR } from '../output/studyReport.js';
import { join } from 'node:path';
import { existsSync } from 'node:fs';
import type { Study } from '../study/studyFile.js';

const EXAMPLE = `
Study file (YAML or JSON):
  name: anatase-reduction
  base: { metal: Pt, support: CeO2, temperature: 473 K, geometry: hemisphere }
  sweep:
    mode: product            # or zip
    axes:
      - { field: donors, log: { from: 1e16, to: 1e19, points: 13 }, unit: cm^-3 }
      - { field: particleDiameter, values: [1, 2, 5], unit: nm }
  outputs: [bandBending_eV, electronsPerParticle, chargeEquivalentWidth_nm]

Examples:
  bandbend study examples/study-support-reduction.yaml --out out/reduction
  bandbend study sweep.json --out out/sweep --jobs 2 --format csv
  bandbend study sweep.json --out out/sweep --resume          # continue after a crash or Ctrl-C
  bandbend study sweep.json --out out/shard-3 --shard 3/8     # points i with i % 8 == 2
  bandbend study merge out/shard-* --out out/all              # join shards 1/8 .. 8/8

--resume keeps the complete rows on disk (a partial last line is cut off) and computes the rest;
a lock file (<out>/.bandbend-study.lock) makes a second run on the same folder refuse.
A full disk or file-size limit stops the study with exit 1; every line on disk stays complete.`;

export function registerStudyCommand(program: Command): void {
  program
    .command('study <FILE> [DIRS...]')
    .description('parameter study from a study file: rows written as they complete (CSV/JSONL) and plots; `study merge DIR... --out DIR` joins shards')
    .requiredOption('--out <DIR>', 'output folder')
    .option('--jobs <N>', 'worker threads (default: the available cores)')
    .option('--format <LIST>', 'result formats: csv, json or csv,json (default csv,json; on --resume: as before)')
    .option('--no-plots', 'skip the plots and HTML report')
    .option('--force', 'replace the results of an earlier run in the folder')
    .option('--resume', 'continue the run in --out from the complete rows on disk')
    .option('--shard <K/N>', 'compute only points i with i % N == K-1 (merge with `study merge`)')
    .option('--point-timeout <S>', 'watchdog: seconds without a sign of life before a worker is replaced', '300')
    .addHelpText('after', EXAMPLE)
    .action(async (file: string, dirs: string[], opts: Record<string, unknown>) => {
      const outDir = String(opts['out']);
      const controller = new AbortController();
      const onSignal = (): void => controller.abort();
      process.once('SIGINT', onSignal);
      process.once('SIGTERM', onSignal);
      const bar: { progress: Progress | null } = { progress: null };
      const onProgress = (_done: number, all: number, added: number): void => {
        bar.progress ??= createProgress(all, 'study');
        bar.progress.tick(added);
      };
      try {
        if (file === 'merge') {
          await mergeCommand(dirs, outDir, opts, controller.signal, onProgress);
          return;
        }
        if (dirs.length > 0) throw new InputError('study', `unexpected argument(s) ${dirs.join(' ')}`, 'one study file');
        const study = loadStudyFile(file);
        const jobs = opts['jobs'] === undefined ? defaultJobs() : Number(opts['jobs']);
        const formats =
          opts['format'] === undefined
            ? undefined
            : checkFormats(
                String(opts['format'])
                  .split(',')
                  .map((f) => f.trim())
                  .filter((f) => f !== ''),
              );
        const pointTimeout_s = Number(opts['pointTimeout'] ?? opts['point-timeout']);
        const plots = opts['plots'] !== false;
        if (plots && opts['resume'] !== true) checkStudyReportDir(join(outDir, STUDY_REPORT_DIR), opts['force'] === true);
        const summary = await runStudy({
          study,
          outDir,
          jobs,
          force: opts['force'] === true,
          resume: opts['resume'] === true,
          ...(formats !== undefined ? { formats: formats as StudyFormat[] } : {}),
          shard: typeof opts['shard'] === 'string' ? parseShard(opts['shard']) : null,
          pointTimeout_s,
          signal: controller.signal,
          onResume: (info) => process.stderr.write(resumeLine(info)),
          onProgress,
        });
        bar.progress?.done();
        process.stderr.write(
          `${summary.points} of ${summary.total} points written (${summary.failed} failed) in ${summary.elapsed_s.toFixed(2)} s` +
            `${summary.shard ? ` [shard ${summary.shard.index}/${summary.shard.count} of ${summary.studyTotal} points]` : ''}` +
            `${summary.watchdogRestarts > 0 ? ` - ${summary.watchdogRestarts} silent worker(s) replaced` : ''}` +
            `${summary.interrupted ? ' - interrupted, rows on disk are complete; continue with --resume' : ''}\n`,
        );
        if (summary.interrupted) {
          process.exitCode = 130;
          return;
        }
        if (plots) {
          const note = summary.shard ? `shard ${summary.shard.index}/${summary.shard.count} of a ${summary.studyTotal}-point study` : undefined;
          await writeReport(study, outDir, { points: summary.points, total: summary.total, failed: summary.failed, elapsed_s: summary.elapsed_s, ...(note ? { note } : {}) }, controller.signal);
        }
      } catch (err) {
        bar.progress?.done();
        if (err instanceof StudyWriteError) {
          // one clear line, exit 1 (the rows on disk are complete)
          process.stderr.write(`bandbend: cannot write results: ${err.message}\n`);
          process.exitCode = 1;
          return;
        }
        if (err instanceof ReportInterrupted) {
          process.stderr.write('interrupted while writing the report; results are complete, no report written\n');
          process.exitCode = 130;
          return;
        }
        throw err;
      } finally {
        process.removeListener('SIGINT', onSignal);
        process.removeListener('SIGTERM', onSignal);
      }
    });
}

function resumeLine(info: ResumeInfo): string {
  const parts = [
    info.kept === 0
      ? 'resuming: no complete rows on disk, starting at the first point'
      : `resuming: ${info.kept} complete rows kept, so the first ${info.kept} points are skipped${info.keptFailed > 0 ? ` (${info.keptFailed} of those rows are failed points, kept as results)` : ''}`,
  ];
  for (const c of info.cut) parts.push(`${c.bytes} bytes after the last complete row of ${c.file} removed`);
  if (info.droppedLines > 0) parts.push(`${info.droppedLines} line(s) without a matching row in the other file dropped`);
  if (info.staleLock) parts.push(`stale lock of process ${info.staleLock.pid} (started ${info.staleLock.startedAt}) taken over`);
  return `${parts.join('; ')}\n`;
}

async function writeReport(study: Study, outDir: string, run: { points: number; total: number; failed: number; elapsed_s?: number; note?: string }, signal: AbortSignal): Promise<void> {
  const paths = await writeStudyReportFromResults({ outDir, study, run, force: true, signal });
  process.stderr.write(`report written: ${paths.htmlPath} (${(paths.bytes / 1e6).toFixed(2)} MB)\n`);
}

async function mergeCommand(
  dirs: string[],
  outDir: string,
  opts: Record<string, unknown>,
  signal: AbortSignal,
  onProgress: (done: number, total: number, added: number) => void,
): Promise<void> {
  const plots = opts['plots'] !== false;
  if (plots) checkStudyReportDir(join(outDir, STUDY_REPORT_DIR), opts['force'] === true);
  const merged = await mergeShards({ dirs, outDir, force: opts['force'] === true, signal, onProgress });
  process.stderr.write(`${merged.points} rows merged from ${merged.shards} shards (${merged.failed} failed)${merged.interrupted ? ' - interrupted' : ''}\n`);
  if (merged.interrupted) {
    process.exitCode = 130;
    return;
  }
  const record = readStudyRecord(merged.studyPath);
  if (plots && existsSync(merged.studyPath)) {
    // the study as recorded (a materials library given in memory is not recorded: files only)
    await writeReport(record.study as Study, outDir, { points: merged.points, total: merged.points, failed: merged.failed }, signal);
  }
}
