// `study merge DIR... --out DIR`: join the folders of shards 1/N .. N/N of one study into one result
// set, identical to a single run: shard K holds the points i with i % N == K - 1 in index order, so
// point i is the (floor(i / N))-th row of shard (i % N) + 1 and the merge interleaves the shards'
// lines round robin, copying every line byte for byte (the header once). Every shard must be complete
// (status finished, all its points on disk); the study, columns and formats must agree.
import { createReadStream, existsSync } from 'node:fs';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { InputError } from '../errors.js';
import {
  RESULT_FILES,
  appendLines,
  closeAppend,
  csvIndex,
  openAppend,
  resultPaths,
  shardSize,
  type AppendFile,
  type ResultPaths,
  type Shard,
  type StudyFormat,
} from './outFiles.js';
import { clearEarlierResults, lockOutDir, type StudySummary } from './runner.js';
import { yieldToEventLoop } from './runPoints.js';
import { readStudyRecord, writeStudyRecord, type StudyRecord } from './studyRecord.js';

export interface MergeOptions {
  dirs: readonly string[];
  outDir: string;
  force?: boolean;
  signal?: AbortSignal;
  onProgress?: (done: number, total: number, added: number) => void;
}

export interface MergeSummary {
  name: string;
  points: number;
  failed: number;
  shards: number;
  interrupted: boolean;
  csvPath: string | null;
  jsonlPath: string | null;
  studyPath: string;
}

interface ShardDir {
  dir: string;
  shard: Shard;
  summary: StudySummary;
}

/** Check the shard folders; returns them ordered by K, with the common study record. */
function readShards(dirs: readonly string[]): { shards: ShardDir[]; record: StudyRecord; formats: StudyFormat[] } {
  if (dirs.length === 0) throw new InputError('study merge', 'no shard folders given', 'the --out folders of every shard');
  let first: StudyRecord | null = null;
  const byK = new Map<number, ShardDir>();
  for (const dir of dirs) {
    const path = join(dir, RESULT_FILES.study);
    if (!existsSync(path)) throw new InputError('study merge', `${dir}: no ${RESULT_FILES.study} (not a study folder)`);
    const record = readStudyRecord(path, 'study merge');
    if (record.shard === null || record.shard === undefined) throw new InputError('study merge', `${dir} is not a shard (run with --shard K/N)`);
    if (record.status !== 'finished' || record.summary === null || record.summary.points !== record.summary.total) {
      const have = record.summary ? `${record.summary.points} of ${record.summary.total}` : 'unknown';
      throw new InputError('study merge', `${dir}: shard ${record.shard.index}/${record.shard.count} is not complete (${have} points; status ${record.status ?? 'unknown'}); finish it with --resume`);
    }
    if (first === null) first = record;
    else {
      if (JSON.stringify(record.study) !== JSON.stringify(first.study) || JSON.stringify(record.columns) !== JSON.stringify(first.columns)) {
        throw new InputError('study merge', `${dir} holds a different study than ${dirs[0]}`);
      }
      if (record.shard.count !== first.shard!.count) throw new InputError('study merge', `${dir} is one of ${record.shard.count} shards, ${dirs[0]} one of ${first.shard!.count}`);
      if (JSON.stringify([...(record.formats ?? [])].sort()) !== JSON.stringify([...(first.formats ?? [])].sort())) {
        throw new InputError('study merge', `${dir} wrote other formats than ${dirs[0]}`);
      }
    }
    if (byK.has(record.shard.index)) throw new InputError('study merge', `shard ${record.shard.index}/${record.shard.count} given twice (${byK.get(record.shard.index)!.dir} and ${dir})`);
    byK.set(record.shard.index, { dir, shard: record.shard, summary: record.summary });
  }
  const n = first!.shard!.count;
  const missing = Array.from({ length: n }, (_, i) => i + 1).filter((k) => !byK.has(k));
  if (missing.length > 0) throw new InputError('study merge', `missing shard(s) ${missing.slice(0, 10).join(', ')}${missing.length > 10 ? ', ...' : ''} of ${n}`);
  const shards = [...byK.values()].sort((a, b) => a.shard.index - b.shard.index);
  return { shards, record: first!, formats: (first!.formats ?? ['csv', 'json']) as StudyFormat[] };
}

function lineReader(path: string): AsyncIterator<string> {
  return createInterface({ input: createReadStream(path), crlfDelay: Infinity })[Symbol.asyncIterator]();
}

const JSON_INDEX = /^\{"index":(\d+),/;

/** Rows copied per write (and between progress calls and abort checks). */
const MERGE_CHUNK_ROWS = 4096;

/** Refuse a shard whose row count is not its share of the study. */
function checkShardSizes(shards: readonly ShardDir[], studyTotal: number): void {
  for (const s of shards) {
    const expected = shardSize(studyTotal, s.shard);
    if (s.summary.points !== expected) throw new InputError('study merge', `${s.dir}: ${s.summary.points} rows, expected ${expected}`);
  }
}

/** One merged result file and a line reader on the same file of every shard (in shard order). */
interface MergeOutput {
  format: StudyFormat;
  file: AppendFile;
  readers: AsyncIterator<string>[];
}

function openMergeOutputs(outDir: string, shards: readonly ShardDir[], formats: readonly StudyFormat[], out: MergeOutput[]): void {
  for (const format of formats) {
    const name = format === 'csv' ? RESULT_FILES.csv : RESULT_FILES.json;
    out.push({ format, file: openAppend(join(outDir, name), true), readers: shards.map((s) => lineReader(join(s.dir, name))) });
  }
}

function closeMergeOutputs(out: readonly MergeOutput[]): void {
  for (const o of out) {
    for (const r of o.readers) void r.return?.();
    closeAppend(o.file);
  }
}

/** The CSV header: identical in every shard (same columns), written once. */
async function copyHeaders(out: readonly MergeOutput[]): Promise<void> {
  for (const o of out) {
    if (o.format !== 'csv') continue;
    const headers = await Promise.all(o.readers.map((r) => r.next()));
    appendLines([o.file], [Buffer.from(`${String(headers[0]!.value)}\n`, 'utf8')], 0);
  }
}

/** The next line of point i's shard in one output (with its newline); InputError when it is not point i's row. */
async function rowLine(o: MergeOutput, shards: readonly ShardDir[], i: number): Promise<string> {
  const n = shards.length;
  const it = await o.readers[i % n]!.next();
  const line = it.done === true ? undefined : it.value;
  const index = line === undefined ? -1 : o.format === 'csv' ? csvIndex(line) : Number(JSON_INDEX.exec(line)?.[1] ?? -1);
  if (index !== i) {
    throw new InputError('study merge', `${shards[i % n]!.dir}: expected the row of point ${i}, found ${line === undefined ? 'the end of the file' : `point ${index}`}`);
  }
  return `${line}\n`;
}

/** Copy the rows of every point round robin from the shards; returns the rows written and whether aborted. */
async function interleaveRows(out: readonly MergeOutput[], shards: readonly ShardDir[], studyTotal: number, options: MergeOptions): Promise<{ written: number; interrupted: boolean }> {
  const chunks: string[][] = out.map(() => []);
  let written = 0;
  const flush = (rows: number): void => {
    appendLines(
      out.map((o) => o.file),
      chunks.map((c) => Buffer.from(c.join(''), 'utf8')),
      written,
    );
    for (const c of chunks) c.length = 0;
    written += rows;
    options.onProgress?.(written, studyTotal, rows);
  };
  let pending = 0;
  for (let i = 0; i < studyTotal; i++) {
    for (let f = 0; f < out.length; f++) chunks[f]!.push(await rowLine(out[f]!, shards, i));
    pending++;
    if (pending < MERGE_CHUNK_ROWS) continue;
    flush(pending);
    pending = 0;
    await yieldToEventLoop();
    if (options.signal?.aborted) return { written, interrupted: true };
  }
  if (pending > 0) flush(pending);
  return { written, interrupted: false };
}

/** The merged run's summary: the shards' counts and times added up. */
function mergedSummary(shards: readonly ShardDir[], studyTotal: number, copied: { written: number; interrupted: boolean }, paths: ResultPaths): StudySummary {
  const sum = (f: (s: StudySummary) => number): number => shards.reduce((a, s) => a + f(s.summary), 0);
  return {
    name: shards[0]!.summary.name,
    points: copied.written,
    total: studyTotal,
    studyTotal,
    failed: sum((s) => s.failed),
    interrupted: copied.interrupted,
    elapsed_s: sum((s) => s.elapsed_s),
    jobs: sum((s) => s.jobs),
    shard: null,
    resumed: null,
    watchdogRestarts: sum((s) => s.watchdogRestarts),
    ...paths,
  };
}

/** Merge the shard folders into outDir (see the file comment). */
export async function mergeShards(options: MergeOptions): Promise<MergeSummary> {
  const { shards, record, formats } = readShards(options.dirs);
  const studyTotal = shards[0]!.summary.studyTotal;
  checkShardSizes(shards, studyTotal);
  const lock = lockOutDir(options.outDir);
  const out: MergeOutput[] = [];
  try {
    clearEarlierResults(options.outDir, options.force === true);
    openMergeOutputs(options.outDir, shards, formats, out);
    await copyHeaders(out);
    const copied = await interleaveRows(out, shards, studyTotal, options);
    const paths = resultPaths(options.outDir, formats);
    const summary = mergedSummary(shards, studyTotal, copied, paths);
    const status = copied.interrupted ? 'interrupted' : 'finished';
    writeStudyRecord(paths.studyPath, { study: record.study, columns: record.columns, formats, shard: null, status, summary, mergedFrom: shards.map((s) => s.dir) });
    return { name: summary.name, points: summary.points, failed: summary.failed, shards: shards.length, interrupted: copied.interrupted, ...paths };
  } finally {
    closeMergeOutputs(out);
    lock.release();
  }
}
