// `study merge DIR... --out DIR`: join the folders of shards 1/N .. N/N of one study into one result
// set, identical to a single run: shard K holds the points i with i % N == K - 1 in index order, so
// point i is the (floor(i / N))-th row of shard (i % N) + 1 and the merge interleaves the shards'
// lines round robin, copying every line byte for byte (the header once). Every shard must be complete
// (status finished, all its points on disk); the study, columns and formats must agree.
import { closeSync, createReadStream, existsSync, statSync } from 'node:fs';
import { createFolder } from '../inputs/files.js';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { InputError } from '../errors.js';
import { acquireLock, appendLines, csvIndex, openAppend, shardSize, writeFileAtomic, type AppendFile, type Shard } from './outFiles.js';
import { RESULT_FILES, prepareOutDir, readStudyRecord, type StudyFormat, type StudySummary } from './runner.js';

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

const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** Check the shard folders; returns them ordered by K, with the common study record. */
function readShards(dirs: readonly string[]): { shards: ShardDir[]; record: ReturnType<typeof readStudyRecord>; formats: StudyFormat[] } {
  if (dirs.length === 0) throw new InputError('study merge', 'no shard folders given', 'the --out folders of every shard');
  let first: ReturnType<typeof readStudyRecord> | null = null;
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

/** Merge the shard folders into outDir (see the file comment). */
export async function mergeShards(options: MergeOptions): Promise<MergeSummary> {
  const { shards, record, formats } = readShards(options.dirs);
  const n = shards.length;
  const studyTotal = shards[0]!.summary.studyTotal;
  for (const s of shards) {
    if (s.summary.points !== shardSize(studyTotal, s.shard)) throw new InputError('study merge', `${s.dir}: ${s.summary.points} rows, expected ${shardSize(studyTotal, s.shard)}`);
  }
  if (existsSync(options.outDir) && !statSync(options.outDir).isDirectory()) throw new InputError('--out', 'exists and is not a folder');
  createFolder(options.outDir, '--out'); // bounded, one level at a time; bad paths exit 2 (src/inputs/files.ts)
  const lock = acquireLock(options.outDir);
  const out: { format: StudyFormat; file: AppendFile; readers: AsyncIterator<string>[] }[] = [];
  let interrupted = false;
  let written = 0;
  try {
    prepareOutDir(options.outDir, options.force === true);
    for (const format of formats) {
      const name = format === 'csv' ? RESULT_FILES.csv : RESULT_FILES.json;
      out.push({ format, file: openAppend(join(options.outDir, name), true), readers: shards.map((s) => lineReader(join(s.dir, name))) });
    }
    // headers: identical in every shard (same columns), written once
    for (const o of out) {
      if (o.format !== 'csv') continue;
      const headers = await Promise.all(o.readers.map((r) => r.next()));
      appendLines([o.file], [Buffer.from(`${String(headers[0]!.value)}\n`, 'utf8')], 0);
    }
    const chunks: string[][] = out.map(() => []);
    const flush = (): void => {
      appendLines(
        out.map((o) => o.file),
        chunks.map((c) => Buffer.from(c.join(''), 'utf8')),
        written,
      );
      for (const c of chunks) c.length = 0;
    };
    let pending = 0;
    for (let i = 0; i < studyTotal; i++) {
      for (let f = 0; f < out.length; f++) {
        const o = out[f]!;
        const it = await o.readers[i % n]!.next();
        const line = it.done === true ? undefined : it.value;
        const index = line === undefined ? -1 : o.format === 'csv' ? csvIndex(line) : Number(JSON_INDEX.exec(line)?.[1] ?? -1);
        if (index !== i) {
          throw new InputError('study merge', `${shards[i % n]!.dir}: expected the row of point ${i}, found ${line === undefined ? 'the end of the file' : `point ${index}`}`);
        }
        chunks[f]!.push(`${line}\n`);
      }
      pending++;
      if (pending >= 4096) {
        flush();
        written += pending;
        options.onProgress?.(written, studyTotal, pending);
        pending = 0;
        await yieldToEventLoop();
        if (options.signal?.aborted) {
          interrupted = true;
          break;
        }
      }
    }
    if (!interrupted && pending > 0) {
      flush();
      written += pending;
      options.onProgress?.(written, studyTotal, pending);
    }
    const failed = shards.reduce((a, s) => a + s.summary.failed, 0);
    const csvPath = formats.includes('csv') ? join(options.outDir, RESULT_FILES.csv) : null;
    const jsonlPath = formats.includes('json') ? join(options.outDir, RESULT_FILES.json) : null;
    const studyPath = join(options.outDir, RESULT_FILES.study);
    const summary: StudySummary = {
      name: shards[0]!.summary.name,
      points: written,
      total: studyTotal,
      studyTotal,
      failed,
      interrupted,
      elapsed_s: shards.reduce((a, s) => a + s.summary.elapsed_s, 0),
      jobs: shards.reduce((a, s) => a + s.summary.jobs, 0),
      shard: null,
      resumed: null,
      watchdogRestarts: shards.reduce((a, s) => a + s.summary.watchdogRestarts, 0),
      csvPath,
      jsonlPath,
      studyPath,
    };
    writeFileAtomic(
      studyPath,
      JSON.stringify(
        {
          study: record.study,
          columns: record.columns,
          formats,
          shard: null,
          status: interrupted ? 'interrupted' : 'finished',
          summary,
          mergedFrom: shards.map((s) => s.dir),
          updatedAt: new Date().toISOString(),
        },
        null,
        2,
      ) + '\n',
    );
    return { name: summary.name, points: written, failed, shards: n, interrupted, csvPath, jsonlPath, studyPath };
  } finally {
    for (const o of out) {
      for (const r of o.readers) void r.return?.();
      try {
        closeSync(o.file.fd);
      } catch {
        // closed
      }
    }
    lock.release();
  }
}
