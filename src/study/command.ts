// The `bandbend study` command behind the commander registration in src/cli/study.ts: run (with
// --resume, --shard, --point-timeout), `study merge`, progress, the report, and the exit codes
// (0 done, 1 a write failed (one line), 2 bad input, 130 interrupted in any phase).
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { writeStudyReportFromResults, checkStudyReportDir, ReportInterrupted, STUDY_REPORT_DIR } from '../output/studyReport.js';
import { mergeShards } from './merge.js';
import { createProgress, type Progress } from './progress.js';
import { runStudy, defaultJobs, checkFormats, parseShard, readStudyRecord, StudyWriteError, type StudyFormat, type StudySummary, type ResumeInfo } from './runner.js';
import { loadStudyFile, type Study } from './studyFile.js';

/** The progress bar of a run or a merge, created at the first rows. */
interface ProgressBar {
  onProgress(done: number, total: number, added: number): void;
  done(): void;
}

function progressBar(): ProgressBar {
  let progress: Progress | null = null;
  return {
    onProgress(_done, all, added) {
      progress ??= createProgress(all, 'study');
      progress.tick(added);
    },
    done() {
      progress?.done();
    },
  };
}

/** `bandbend study FILE [--options]` or `bandbend study merge DIR... --out DIR` (opts: commander's parsed options). */
export async function studyCommand(file: string, dirs: string[], opts: Record<string, unknown>): Promise<void> {
  const outDir = String(opts['out']);
  const controller = new AbortController();
  const onSignal = (): void => controller.abort();
  process.once('SIGINT', onSignal);
  process.once('SIGTERM', onSignal);
  const bar = progressBar();
  try {
    if (file === 'merge') await mergeCommand(dirs, outDir, opts, controller.signal, (d, t, a) => bar.onProgress(d, t, a));
    else await runCommand(file, dirs, outDir, opts, controller.signal, bar);
  } catch (err) {
    bar.done();
    if (!reportedFailure(err)) throw err;
  } finally {
    process.removeListener('SIGINT', onSignal);
    process.removeListener('SIGTERM', onSignal);
  }
}

/** A write failure or an interrupted report: one line and the exit code; false for anything else. */
function reportedFailure(err: unknown): boolean {
  if (err instanceof StudyWriteError) {
    // one clear line, exit 1 (the rows on disk are complete)
    process.stderr.write(`bandbend: cannot write results: ${err.message}\n`);
    process.exitCode = 1;
    return true;
  }
  if (err instanceof ReportInterrupted) {
    process.stderr.write('interrupted while writing the report; results are complete, no report written\n');
    process.exitCode = 130;
    return true;
  }
  return false;
}

/** --format csv,json -> checked formats (undefined when not given). */
function formatsOption(value: unknown): StudyFormat[] | undefined {
  if (value === undefined) return undefined;
  return checkFormats(
    String(value)
      .split(',')
      .map((f) => f.trim())
      .filter((f) => f !== ''),
  );
}

function summaryLine(summary: StudySummary): string {
  return (
    `${summary.points} of ${summary.total} points written (${summary.failed} failed) in ${summary.elapsed_s.toFixed(2)} s` +
    `${summary.shard ? ` [shard ${summary.shard.index}/${summary.shard.count} of ${summary.studyTotal} points]` : ''}` +
    `${summary.watchdogRestarts > 0 ? ` - ${summary.watchdogRestarts} silent worker(s) replaced` : ''}` +
    `${summary.interrupted ? ' - interrupted, rows on disk are complete; continue with --resume' : ''}\n`
  );
}

/** `bandbend study FILE`: run it, then write the report unless interrupted or --no-plots. */
async function runCommand(file: string, dirs: string[], outDir: string, opts: Record<string, unknown>, signal: AbortSignal, bar: ProgressBar): Promise<void> {
  if (dirs.length > 0) throw new InputError('study', `unexpected argument(s) ${dirs.join(' ')}`, 'one study file');
  const study = loadStudyFile(file);
  const jobs = opts['jobs'] === undefined ? defaultJobs() : Number(opts['jobs']);
  const formats = formatsOption(opts['format']);
  const pointTimeout_s = Number(opts['pointTimeout'] ?? opts['point-timeout']);
  const plots = opts['plots'] !== false;
  if (plots && opts['resume'] !== true) checkStudyReportDir(join(outDir, STUDY_REPORT_DIR), opts['force'] === true);
  const summary = await runStudy({
    study,
    outDir,
    jobs,
    force: opts['force'] === true,
    resume: opts['resume'] === true,
    ...(formats !== undefined ? { formats } : {}),
    shard: typeof opts['shard'] === 'string' ? parseShard(opts['shard']) : null,
    pointTimeout_s,
    signal,
    onResume: (info) => process.stderr.write(resumeLine(info)),
    onProgress: (d, t, a) => bar.onProgress(d, t, a),
  });
  bar.done();
  process.stderr.write(summaryLine(summary));
  if (summary.interrupted) {
    process.exitCode = 130;
    return;
  }
  if (plots) {
    const note = summary.shard ? `shard ${summary.shard.index}/${summary.shard.count} of a ${summary.studyTotal}-point study` : undefined;
    await writeReport(study, outDir, { points: summary.points, total: summary.total, failed: summary.failed, elapsed_s: summary.elapsed_s, ...(note ? { note } : {}) }, signal);
  }
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
