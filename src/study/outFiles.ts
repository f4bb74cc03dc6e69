// Files of a study output folder that are not rows: the lock file, line scanning of result files
// (for resume and merge), complete-line appends that undo a partial write, and shards.
//
// Lock file `<out>/.bandbend-study.lock`: one JSON object { pid, host, startedAt }, created with
// O_EXCL so that exactly one run holds the folder. A second run refuses (InputError, exit 2) while
// the holder is alive. A lock is stale when it names this host and a pid that no longer exists (the
// run was killed): it is then taken over. A lock from another host cannot be checked and is never
// taken over (the message says which file to remove once that run is known to be gone).
//
// Shards: shard K of N (1 <= K <= N) holds the points whose index i satisfies i % N == K - 1, in
// index order ("round robin": every shard gets a similar mix of cheap and expensive points, because
// the last axis varies fastest). `study merge` interleaves the shards back into index order.
import { closeSync, fstatSync, ftruncateSync, openSync, readFileSync, readSync, renameSync, rmSync, writeFileSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../errors.js';

export const LOCK_FILE = '.bandbend-study.lock';

export type StudyFormat = 'csv' | 'json';

export const RESULT_FILES = { csv: 'results.csv', json: 'results.jsonl', study: 'study.json' } as const;

/** Where the result files of a run (or a merge) with these formats are. */
export interface ResultPaths {
  csvPath: string | null;
  jsonlPath: string | null;
  studyPath: string;
}

export function resultPaths(outDir: string, formats: readonly StudyFormat[]): ResultPaths {
  return {
    csvPath: formats.includes('csv') ? join(outDir, RESULT_FILES.csv) : null,
    jsonlPath: formats.includes('json') ? join(outDir, RESULT_FILES.json) : null,
    studyPath: join(outDir, RESULT_FILES.study),
  };
}

export interface LockInfo {
  pid: number;
  host: string;
  startedAt: string;
}

/** True when a process with this pid exists on this host (signal 0 only checks). */
export function processAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: it exists but belongs to someone else
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function readLock(path: string): LockInfo | null {
  try {
    const v = JSON.parse(readFileSync(path, 'utf8')) as Partial<LockInfo>;
    if (typeof v.pid === 'number' && typeof v.host === 'string') return { pid: v.pid, host: v.host, startedAt: String(v.startedAt ?? '') };
  } catch {
    // unreadable or half-written: treated below
  }
  return null;
}

export interface HeldLock {
  path: string;
  /** the stale lock that was taken over, if any */
  replaced: LockInfo | null;
  release(): void;
}

/** Take the folder's lock or throw InputError('--out') naming the run that holds it. */
export function acquireLock(outDir: string): HeldLock {
  const path = join(outDir, LOCK_FILE);
  const me: LockInfo = { pid: process.pid, host: hostname(), startedAt: new Date().toISOString() };
  let replaced: LockInfo | null = null;
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      const fd = openSync(path, 'wx');
      try {
        writeSync(fd, JSON.stringify(me) + '\n');
      } finally {
        closeSync(fd);
      }
      let released = false;
      return {
        path,
        replaced,
        release() {
          if (released) return;
          released = true;
          // only remove our own lock
          const now = readLock(path);
          if (now !== null && now.pid === me.pid && now.host === me.host && now.startedAt === me.startedAt) rmSync(path, { force: true });
        },
      };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
    const held = readLock(path);
    if (held === null) {
      // a lock being written right now, or garbage: refuse rather than guess
      throw new InputError('--out', `${path} exists but cannot be read; another run may be starting (remove the file if no run uses ${outDir})`);
    }
    if (held.host !== me.host) {
      throw new InputError('--out', `in use by process ${held.pid} on host ${held.host} since ${held.startedAt} (remove ${path} once that run is gone)`);
    }
    if (processAlive(held.pid)) {
      throw new InputError('--out', `in use by a running study (process ${held.pid} on ${held.host}, started ${held.startedAt})`);
    }
    replaced = held;
    rmSync(path, { force: true });
  }
  throw new InputError('--out', `could not take the lock ${path}`);
}

// ---------------------------------------------------------------------------------------------
// line scanning

export interface ScannedLines {
  /** byte offset just after the n-th complete line (ends[0] = end of the first line) */
  ends: number[];
  /** bytes after the last complete line (a partial line), 0 when the file ends with a newline */
  partialBytes: number;
  /** file size */
  size: number;
}

/**
 * Read a file line by line (lines end with \n) without holding it in memory; `accept(line, n)` is
 * called for every complete line n = 0, 1, ... and returns false to stop there (that line is not kept).
 */
export function scanLines(path: string, accept: (line: string, n: number) => boolean): ScannedLines {
  const fd = openSync(path, 'r');
  const ends: number[] = [];
  const chunk = Buffer.allocUnsafe(1 << 20);
  let carry: Buffer = Buffer.alloc(0);
  let offset = 0; // file offset of carry[0]
  let stopped = false;
  let size = 0;
  try {
    for (;;) {
      const read = readSync(fd, chunk, 0, chunk.length, null);
      if (read === 0) break;
      size += read;
      if (stopped) continue;
      const buf: Buffer = carry.length > 0 ? Buffer.concat([carry, chunk.subarray(0, read)]) : chunk.subarray(0, read);
      let start = 0;
      for (let nl = buf.indexOf(10, start); nl >= 0; nl = buf.indexOf(10, start)) {
        const line = buf.toString('utf8', start, nl);
        if (!accept(line, ends.length)) {
          stopped = true;
          break;
        }
        ends.push(offset + nl + 1);
        start = nl + 1;
      }
      if (stopped) continue;
      carry = Buffer.from(buf.subarray(start));
      offset += start;
    }
  } finally {
    closeSync(fd);
  }
  const lastEnd = ends.length > 0 ? ends[ends.length - 1]! : 0;
  return { ends, partialBytes: size - lastEnd, size };
}

/** Cut a file back to `length` bytes. */
export function truncateFile(path: string, length: number): void {
  const fd = openSync(path, 'r+');
  try {
    ftruncateSync(fd, length);
  } finally {
    closeSync(fd);
  }
}

/** Number of cells of one CSV line as csv-stringify writes it (RFC 4180 quoting, no embedded newlines). */
export function csvCellCount(line: string): number {
  let cells = 1;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line.charCodeAt(i);
    if (ch === 34 /* " */) quoted = !quoted; // "" inside a quoted cell toggles twice: no net change
    else if (ch === 44 /* , */ && !quoted) cells++;
  }
  return quoted ? -1 : cells;
}

/** The first cell of a CSV line when it is a plain whole number (the index column), else -1. */
export function csvIndex(line: string): number {
  const comma = line.indexOf(',');
  const first = comma < 0 ? line : line.slice(0, comma);
  return /^\d+$/.test(first) ? Number(first) : -1;
}

// ---------------------------------------------------------------------------------------------
// writes that cannot leave a partial line

/** A failed write of results (disk full, file size limit, I/O error): exit 1 with one line. */
export class StudyWriteError extends Error {
  override readonly name = 'StudyWriteError';
  constructor(
    readonly path: string,
    readonly code: string,
    readonly rowsOnDisk: number,
  ) {
    super(`${path}: ${describeWriteCode(code)} (${code}); ${rowsOnDisk} complete rows are on disk, continue later with --resume`);
  }
}

function describeWriteCode(code: string): string {
  if (code === 'ENOSPC') return 'no space left on the device';
  if (code === 'EFBIG') return 'file size limit reached';
  if (code === 'EDQUOT') return 'disk quota exceeded';
  if (code === 'EIO') return 'input/output error';
  return 'write failed';
}

/** An append-only file whose size we track, so a failed write can be undone. */
export interface AppendFile {
  readonly path: string;
  readonly fd: number;
  size: number;
}

export function openAppend(path: string, truncate: boolean): AppendFile {
  const fd = openSync(path, truncate ? 'w' : 'a');
  const size = truncate ? 0 : fstatSync(fd).size;
  return { path, fd, size };
}

/** Close an append file; a file already closed is not an error. */
export function closeAppend(file: AppendFile): void {
  try {
    closeSync(file.fd);
  } catch {
    // already closed
  }
}

/**
 * Write `lines[i]` to `files[i]` for every i, as one unit: when any write fails (short write, EFBIG,
 * ENOSPC), every file is cut back to its size before the call and a StudyWriteError is thrown.
 */
export function appendLines(files: readonly AppendFile[], lines: readonly Buffer[], rowsOnDisk: number): void {
  let failed: { file: AppendFile; code: string } | null = null;
  for (let i = 0; i < files.length && failed === null; i++) {
    const f = files[i]!;
    const bytes = lines[i]!;
    let written = 0;
    try {
      while (written < bytes.length) {
        const n = writeSync(f.fd, bytes, written, bytes.length - written, null);
        if (n <= 0) throw Object.assign(new Error('short write'), { code: 'EIO' });
        written += n;
      }
    } catch (err) {
      failed = { file: f, code: (err as NodeJS.ErrnoException).code ?? 'EIO' };
      break;
    }
  }
  if (failed === null) {
    files.forEach((f, i) => (f.size += lines[i]!.length));
    return;
  }
  for (const f of files) {
    try {
      ftruncateSync(f.fd, f.size);
    } catch {
      // truncating to a smaller size does not need space; nothing more we can do
    }
  }
  throw new StudyWriteError(failed.file.path, failed.code, rowsOnDisk);
}

/** Write a whole small file (study.json) through a temporary name, so it is never half-written. */
export function writeFileAtomic(path: string, text: string): void {
  const tmp = `${path}.tmp-${process.pid}`;
  try {
    writeFileSync(tmp, text);
  } catch (err) {
    rmSync(tmp, { force: true });
    const code = (err as NodeJS.ErrnoException).code ?? 'EIO';
    throw new StudyWriteError(path, code, -1);
  }
  // rename is atomic on one file system
  renameSync(tmp, path);
}

// ---------------------------------------------------------------------------------------------
// shards

export interface Shard {
  /** K, from 1 */
  index: number;
  /** N */
  count: number;
}

export const MAX_SHARDS = 100_000;

/** "K/N" -> shard; InputError('--shard') otherwise. */
export function parseShard(text: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const k = m ? Number(m[1]) : NaN;
  const n = m ? Number(m[2]) : NaN;
  if (!m || !Number.isSafeInteger(k) || !Number.isSafeInteger(n) || n < 1 || n > MAX_SHARDS || k < 1 || k > n) {
    throw new InputError('--shard', `expected K/N with 1 <= K <= N <= ${MAX_SHARDS}, got "${text}"`, 'e.g. 3/8');
  }
  return { index: k, count: n };
}

/** Number of points of shard K/N of a study with `total` points. */
export function shardSize(total: number, shard: Shard | null): number {
  if (shard === null) return total;
  const first = shard.index - 1;
  return total > first ? Math.ceil((total - first) / shard.count) : 0;
}

/** Study index of the seq-th point (from 0) of a shard. */
export function shardPointIndex(seq: number, shard: Shard | null): number {
  return shard === null ? seq : shard.index - 1 + seq * shard.count;
}
