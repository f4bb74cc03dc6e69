// Resume: check that the earlier run in a folder is this study (same study, shard and formats), then
// check every line of its result files and cut them back to the rows complete in all of them (see the
// file comment of runner.ts).
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { studyColumns, type Study } from './studyFile.js';
import { csvHeader } from './rows.js';
import { readStudyRecord, studyRecord } from './studyRecord.js';
import {
  RESULT_FILES,
  csvCellCount,
  csvIndex,
  scanLines,
  shardPointIndex,
  truncateFile,
  type LockInfo,
  type ScannedLines,
  type Shard,
  type StudyFormat,
} from './outFiles.js';

export interface ResumeInfo {
  /** rows found complete and kept (the first points of the run, skipped now) */
  kept: number;
  /** of which failed points */
  keptFailed: number;
  /** bytes of partial last lines cut off, per file */
  cut: { file: string; bytes: number }[];
  /** complete lines dropped (one file ahead of the other, or a line that did not check) */
  droppedLines: number;
  /** the stale lock of a run that died, taken over */
  staleLock: LockInfo | null;
}

/** The rows found on disk, before the lock is added. */
export type RowsOnDisk = Omit<ResumeInfo, 'staleLock'>;

function sameShard(a: Shard | null | undefined, b: Shard | null): boolean {
  return (a ?? null) === null ? b === null : b !== null && a!.index === b.index && a!.count === b.count;
}

function sameFormats(a: readonly StudyFormat[], b: readonly StudyFormat[]): boolean {
  return a.slice().sort().join() === b.slice().sort().join();
}

/**
 * Check that outDir's earlier run is this study with this shard (and these formats when requested);
 * returns the formats of the earlier run. InputError naming the option that differs otherwise.
 */
export function checkEarlierRun(
  study: Study,
  outDir: string,
  shard: Shard | null,
  requestedFormats: readonly StudyFormat[] | null,
): StudyFormat[] {
  const studyPath = join(outDir, RESULT_FILES.study);
  if (!existsSync(studyPath)) throw new InputError('--resume', `${outDir} has results but no ${RESULT_FILES.study}: cannot check what they belong to`);
  const record = readStudyRecord(studyPath, '--resume');
  if (JSON.stringify(record.study) !== JSON.stringify(studyRecord(study))) {
    throw new InputError('--resume', `the study in ${studyPath} differs from this study file; use another --out or --force to start over`);
  }
  if (!sameShard(record.shard, shard)) {
    const was = record.shard ? `${record.shard.index}/${record.shard.count}` : 'none';
    throw new InputError('--shard', `the earlier run in ${outDir} used shard ${was}`);
  }
  const earlierFormats = record.formats ?? requestedFormats ?? ['csv', 'json'];
  if (requestedFormats !== null && !sameFormats(requestedFormats, earlierFormats)) {
    throw new InputError('--format', `the earlier run wrote ${earlierFormats.join(',')}; resume with the same formats`);
  }
  return [...earlierFormats];
}

/** What the scan of one result file found: its complete lines that check, and a partial last line. */
interface FileScan {
  path: string;
  /** rows (lines after the header) that check */
  rows: number;
  ends: number[];
  header: boolean;
  /** bytes after the last complete line */
  partial: number;
}

/** What one line must be: the seq-th row of this run. */
interface LineCheck {
  columns: readonly string[];
  shard: Shard | null;
  runTotal: number;
}

const NO_FILE: ScannedLines = { ends: [], partialBytes: 0, size: 0 };

function scanIfExists(path: string, accept: (line: string, n: number) => boolean): ScannedLines {
  return existsSync(path) ? scanLines(path, accept) : NO_FILE;
}

function fileScan(path: string, scan: ScannedLines, header: boolean): FileScan {
  const rows = header ? Math.max(0, scan.ends.length - 1) : scan.ends.length;
  return { path, rows, ends: scan.ends, header, partial: scan.size - (scan.ends.at(-1) ?? 0) };
}

/** Scan results.csv: header, then rows in order with the right index and cell count; failed seqs into `failedSeqs`. */
function scanCsv(path: string, check: LineCheck, failedSeqs: number[]): FileScan {
  const header = csvHeader(check.columns);
  const scan = scanIfExists(path, (line, n) => {
    if (n === 0) return line === header;
    const seq = n - 1;
    if (seq >= check.runTotal || csvIndex(line) !== shardPointIndex(seq, check.shard) || csvCellCount(line) !== check.columns.length) return false;
    if (!line.endsWith(',')) failedSeqs.push(seq); // the error cell is the last one
    return true;
  });
  return fileScan(path, scan, true);
}

function parseObject(line: string): Record<string, unknown> | null {
  try {
    const o = JSON.parse(line) as unknown;
    return o !== null && typeof o === 'object' ? (o as Record<string, unknown>) : null;
  } catch {
    return null;
  }
}

/** Scan results.jsonl: objects in order with the right index and key count; failed seqs into `failedSeqs`. */
function scanJsonl(path: string, check: LineCheck, failedSeqs: number[]): FileScan {
  const scan = scanIfExists(path, (line, seq) => {
    if (seq >= check.runTotal) return false;
    const o = parseObject(line);
    if (o === null || o['index'] !== shardPointIndex(seq, check.shard) || Object.keys(o).length !== check.columns.length) return false;
    if (o['error'] !== null) failedSeqs.push(seq);
    return true;
  });
  return fileScan(path, scan, false);
}

/** Cut every file back to `kept` rows (plus its header); returns the partial lines cut and the complete lines dropped. */
function cutBack(scans: readonly FileScan[], kept: number): { cut: ResumeInfo['cut']; droppedLines: number } {
  const cut: ResumeInfo['cut'] = [];
  let droppedLines = 0;
  for (const c of scans) {
    const keepLines = c.header ? (c.ends.length === 0 ? 0 : kept + 1) : kept;
    const length = keepLines === 0 ? 0 : c.ends[keepLines - 1]!;
    droppedLines += c.ends.length - keepLines;
    if (c.partial > 0) cut.push({ file: c.path, bytes: c.partial });
    if (existsSync(c.path) && statSync(c.path).size !== length) truncateFile(c.path, length);
  }
  return { cut, droppedLines };
}

/** Check every line of the earlier run's files, cut them back to the rows complete in all of them. */
export function inspectForResume(study: Study, outDir: string, formats: readonly StudyFormat[], shard: Shard | null, runTotal: number): RowsOnDisk {
  const check: LineCheck = { columns: studyColumns(study), shard, runTotal };
  const csvFailed: number[] = [];
  const jsonFailed: number[] = [];
  const scans: FileScan[] = [];
  if (formats.includes('csv')) scans.push(scanCsv(join(outDir, RESULT_FILES.csv), check, csvFailed));
  if (formats.includes('json')) scans.push(scanJsonl(join(outDir, RESULT_FILES.json), check, jsonFailed));
  // the JSONL error cell is exact; the CSV one is used when no JSONL is written
  const failedSeqs = formats.includes('json') ? jsonFailed : csvFailed;
  const kept = Math.min(...scans.map((c) => c.rows));
  return { kept, keptFailed: failedSeqs.filter((s) => s < kept).length, ...cutBack(scans, kept) };
}
