// Files and folders named by the user: the only place they are opened for reading or created.
//
// - Only regular files are read: the type is checked with fstat on the opened descriptor (opened non-blocking, so
//   a FIFO cannot hang the open), and paths that resolve into /proc, /sys or /dev are refused before opening.
// - One size limit with one wording (MAX_INPUT_FILE_BYTES): bytes are counted while reading, never trusting
//   stat alone (files under /proc report size 0, a growing file can pass a stat check).
// - Text must be UTF-8 without NUL bytes; errors are InputError naming the path, never echoing file contents.
// - Folders are created one level at a time (never recursive mkdir, which loops forever under /proc), at most
//   MAX_NEW_FOLDER_LEVELS new levels, never inside /proc, /sys or /dev; a read-only folder is reported as such.
// - parseCsvRecords splits CSV text in one pass with no array spread into function calls (130k+ rows are fine).
import {
  accessSync,
  closeSync,
  constants,
  existsSync,
  fstatSync,
  mkdirSync,
  openSync,
  readSync,
  realpathSync,
  statSync,
  writeFileSync,
  type Stats,
} from 'node:fs';
import { dirname, isAbsolute, resolve } from 'node:path';
import { InputError } from '../errors.js';

/** Largest user file read (materials, study files, CSV data): 5 MB. */
export const MAX_INPUT_FILE_BYTES = 5_000_000;
const SIZE_LIMIT_TEXT = 'files of at most 5 MB (5,000,000 bytes)';

/** Most folder levels createFolder makes below the nearest existing folder. */
export const MAX_NEW_FOLDER_LEVELS = 16;

const SYSTEM_ROOTS = ['/proc', '/sys', '/dev'];
const READ_CHUNK_BYTES = 64 * 1024;
const MAX_PATH_CHARS = 4096;

/** A path as it may appear in an error message: no control characters, at most 200 characters. */
export function shownPath(path: string): string {
  // eslint-disable-next-line no-control-regex
  const clean = path.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, '?');
  return clean.length > 200 ? `${clean.slice(0, 100)}…${clean.slice(-99)}` : clean;
}

/** Throw an InputError naming the path once: in the field when it already holds the path, else in the message. */
function refuse(path: string, field: string, reason: string, allowed?: string): never {
  const shown = shownPath(path);
  throw new InputError(field, field.includes(shown) ? reason : `${shown}: ${reason}`, allowed);
}

function isUnder(path: string, root: string): boolean {
  return path === root || path.startsWith(`${root}/`);
}

function systemRootOf(absolute: string): string | undefined {
  return SYSTEM_ROOTS.find((root) => isUnder(absolute, root));
}

function describeErrno(err: unknown): string {
  const code = (err as NodeJS.ErrnoException).code;
  switch (code) {
    case 'ENOENT':
      return 'file not found';
    case 'ENOTDIR':
      return 'a part of the path is not a folder';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'ELOOP':
      return 'too many symbolic links';
    case 'ENAMETOOLONG':
      return 'the path is too long';
    case 'EISDIR':
      return 'is a folder, not a file';
    case 'EROFS':
      return 'the file system is read-only';
    case 'ENOSPC':
      return 'no space left on the device';
    default:
      return `cannot be read (${code ?? 'unknown error'})`;
  }
}

function describeType(st: Stats): string {
  if (st.isDirectory()) return 'is a folder, not a file';
  if (st.isFIFO()) return 'is a pipe (FIFO), not a regular file';
  if (st.isCharacterDevice() || st.isBlockDevice()) return 'is a device, not a regular file';
  if (st.isSocket()) return 'is a socket, not a regular file';
  return 'is not a regular file';
}

function checkPathText(path: unknown, field: string): asserts path is string {
  if (typeof path !== 'string' || path.trim() === '') throw new InputError(field, 'missing path', 'a file path');
  if (path.includes('\u0000')) throw new InputError(field, 'the path contains a NUL character', 'a file path');
  if (path.length > MAX_PATH_CHARS) throw new InputError(field, `the path is too long (${path.length} characters)`, `at most ${MAX_PATH_CHARS} characters`);
}

/**
 * Read a user text file (UTF-8) of at most maxBytes bytes. Refuses anything but a regular file, paths into
 * /proc, /sys and /dev, binary data (NUL bytes, invalid UTF-8) and oversized files, with an InputError naming
 * `field` and the path. A leading byte-order mark is removed.
 */
export function readTextFile(path: string, field: string, maxBytes: number = MAX_INPUT_FILE_BYTES): string {
  const bytes = readFileBytes(path, field, maxBytes);
  if (bytes.includes(0)) refuse(path, field, 'contains NUL bytes: not a text file', 'UTF-8 text');
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return refuse(path, field, 'is not UTF-8 text', 'UTF-8 text');
  }
}

/** Read a regular file of at most maxBytes bytes (counted while reading). Same refusals as readTextFile. */
export function readFileBytes(path: string, field: string, maxBytes: number = MAX_INPUT_FILE_BYTES): Buffer {
  checkPathText(path, field);
  const limitText = maxBytes === MAX_INPUT_FILE_BYTES ? SIZE_LIMIT_TEXT : `files of at most ${maxBytes} bytes`;
  const tooLarge = (): never => refuse(path, field, `file is larger than the ${maxBytes === MAX_INPUT_FILE_BYTES ? '5 MB' : `${maxBytes}-byte`} limit`, limitText);
  let real: string;
  try {
    real = realpathSync(path);
  } catch (err) {
    return refuse(path, field, describeErrno(err));
  }
  const root = systemRootOf(real);
  if (root !== undefined) return refuse(path, field, `is inside ${root}: only regular files are read`);
  let fd: number;
  try {
    // non-blocking, so that opening a FIFO with no writer returns at once (it is refused after fstat)
    fd = openSync(real, constants.O_RDONLY | constants.O_NONBLOCK | constants.O_NOCTTY);
  } catch (err) {
    return refuse(path, field, describeErrno(err));
  }
  try {
    const st = fstatSync(fd);
    if (!st.isFile()) return refuse(path, field, describeType(st));
    if (st.size > maxBytes) return tooLarge();
    const chunks: Buffer[] = [];
    let total = 0;
    for (;;) {
      const chunk = Buffer.allocUnsafe(READ_CHUNK_BYTES);
      let n: number;
      try {
        n = readSync(fd, chunk, 0, READ_CHUNK_BYTES, null);
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'EAGAIN') continue; // regular files do not block; be safe
        return refuse(path, field, describeErrno(err));
      }
      if (n === 0) break;
      total += n;
      if (total > maxBytes) return tooLarge();
      chunks.push(n === READ_CHUNK_BYTES ? chunk : chunk.subarray(0, n));
    }
    return Buffer.concat(chunks, total);
  } finally {
    closeSync(fd);
  }
}

/**
 * Create a folder for output (and its missing parents, at most MAX_NEW_FOLDER_LEVELS of them) and return its
 * absolute path. An existing folder is accepted when writable. Refuses /proc, /sys, /dev, a path through a
 * file, and read-only folders, each with its own one-line InputError naming `field` and the path.
 */
export function createFolder(path: string, field: string): string {
  const { absolute, missing } = planFolder(path, field);
  // create from the top down, one level at a time
  for (let k = missing.length - 1; k >= 0; k--) {
    const level = missing[k]!;
    try {
      mkdirSync(level);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'EEXIST' && statSync(level).isDirectory()) continue;
      return refuse(path, field, describeFolderErrno(err, dirname(level)));
    }
  }
  return absolute;
}

/**
 * Write a user-named output file (CSV, SVG, JSON): the folder it goes into must exist (checked like createFolder:
 * not in /proc, /sys, /dev, writable), a folder of that name is refused, and write errors (read-only file, full
 * disk) are an InputError naming `field` and the path.
 */
export function writeTextFile(path: string, text: string, field: string): void {
  checkPathText(path, field);
  const absolute = resolve(path);
  const parent = dirname(absolute);
  if (!existsSync(parent)) refuse(path, field, 'its folder does not exist');
  checkFolderPath(parent, field);
  if (systemRootOf(absolute) !== undefined) refuse(path, field, 'output files cannot be written there');
  try {
    writeFileSync(absolute, text);
  } catch (err) {
    refuse(path, field, describeErrno(err));
  }
}

/**
 * The checks of createFolder without creating anything: for commands that refuse a bad output path at once but
 * create the folder only after their input is known to be good. Returns the absolute path.
 */
export function checkFolderPath(path: string, field: string): string {
  return planFolder(path, field).absolute;
}

/** Every check of createFolder; the folders still missing, deepest first. */
function planFolder(path: string, field: string): { absolute: string; missing: string[] } {
  checkPathText(path, field);
  const absolute = resolve(path);
  // the nearest existing ancestor, resolved through symbolic links
  const missing: string[] = [];
  let existing = absolute;
  for (;;) {
    try {
      statSync(existing);
      break;
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (code === 'ENOTDIR') return refuse(path, field, 'a part of the path is a file, not a folder');
      if (code !== 'ENOENT') return refuse(path, field, describeFolderErrno(err, existing));
    }
    missing.push(existing);
    if (missing.length > MAX_NEW_FOLDER_LEVELS) {
      return refuse(path, field, `would create more than ${MAX_NEW_FOLDER_LEVELS} new folder levels`, `at most ${MAX_NEW_FOLDER_LEVELS} new levels`);
    }
    const parent = dirname(existing);
    if (parent === existing) return refuse(path, field, 'no part of the path exists');
    existing = parent;
  }
  let real: string;
  try {
    real = realpathSync(existing);
  } catch (err) {
    return refuse(path, field, describeFolderErrno(err, existing));
  }
  const root = systemRootOf(real) ?? systemRootOf(absolute);
  if (root !== undefined) return refuse(path, field, `is inside ${root}: output folders cannot be created there`);
  if (!statSync(real).isDirectory()) {
    return refuse(path, field, missing.length === 0 ? 'exists and is not a folder' : `${shownPath(existing)} is a file, not a folder`);
  }
  checkWritable(path, field, real, existing);
  return { absolute: isAbsolute(absolute) ? absolute : resolve(absolute), missing };
}

function checkWritable(path: string, field: string, real: string, shown: string): void {
  try {
    accessSync(real, constants.W_OK | constants.X_OK);
  } catch (err) {
    return refuse(path, field, describeFolderErrno(err, shown));
  }
}

function describeFolderErrno(err: unknown, folder: string): string {
  const code = (err as NodeJS.ErrnoException).code;
  const where = shownPath(folder);
  switch (code) {
    case 'EACCES':
    case 'EPERM':
      return `folder ${where} is read-only for this user (permission denied)`;
    case 'EROFS':
      return `folder ${where} is on a read-only file system`;
    case 'ENOSPC':
      return `no space left on the device of ${where}`;
    case 'ENOTDIR':
      return 'a part of the path is a file, not a folder';
    case 'ENAMETOOLONG':
      return 'the path is too long';
    case 'ELOOP':
      return 'too many symbolic links';
    default:
      return `cannot create the folder (${code ?? 'unknown error'})`;
  }
}

// ---------------------------------------------------------------------------------------------
// CSV

export interface CsvRecord {
  /** 1-based line of the file where the record starts */
  line: number;
  cells: string[];
}

/**
 * Split CSV text into records (RFC 4180 style): comma separators, double-quoted cells with "" escapes,
 * LF or CRLF line ends. Blank lines and lines starting with '#' are skipped. One pass, constant stack depth,
 * no spread of arrays into calls, so 130k+ rows are fine. Every error names the file and line.
 */
export function parseCsvRecords(text: string, fileLabel: string): CsvRecord[] {
  const st: CsvScan = { fileLabel, records: [], cells: [], cell: '', quoted: false, cellWasQuoted: false, line: 1, recordLine: 1, atRecordStart: true, skipping: false };
  const source = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  for (let i = 0; i < source.length; ) {
    const ch = source[i]!;
    if (commentOrRecordStart(st, ch)) i++;
    else if (st.quoted) i += quotedChar(st, ch, source[i + 1]);
    else {
      plainChar(st, ch);
      i++;
    }
  }
  if (st.quoted) {
    throw new InputError(`${fileLabel}: row ${st.recordLine}`, 'a quoted cell is never closed', 'matching double quotes');
  }
  if (!st.skipping && !st.atRecordStart) {
    if (st.cell.endsWith('\r')) st.cell = st.cell.slice(0, -1);
    endRecord(st);
  }
  return st.records;
}

/** State of the one-pass CSV scan. */
interface CsvScan {
  fileLabel: string;
  records: CsvRecord[];
  cells: string[];
  cell: string;
  quoted: boolean;
  cellWasQuoted: boolean;
  /** current line (1-based) and the line where the current record started */
  line: number;
  recordLine: number;
  atRecordStart: boolean;
  /** inside a comment line ("#" at the start of a record) */
  skipping: boolean;
}

function endRecord(st: CsvScan): void {
  st.cells.push(st.cell);
  const blank = st.cells.length === 1 && st.cells[0]!.trim() === '' && !st.cellWasQuoted;
  if (!blank) st.records.push({ line: st.recordLine, cells: st.cells });
  st.cells = [];
  st.cell = '';
  st.cellWasQuoted = false;
  st.atRecordStart = true;
}

/** Comment lines and the start of a record; true when the character was used up here. */
function commentOrRecordStart(st: CsvScan, ch: string): boolean {
  if (st.skipping) {
    if (ch === '\n') {
      st.skipping = false;
      st.line++;
      st.atRecordStart = true;
    }
    return true;
  }
  if (!st.atRecordStart) return false;
  st.recordLine = st.line;
  st.atRecordStart = false;
  st.skipping = ch === '#';
  return st.skipping;
}

/** One character inside a quoted cell ("" is a literal quote); returns the number of characters used. */
function quotedChar(st: CsvScan, ch: string, next: string | undefined): number {
  if (ch === '"') {
    if (next === '"') {
      st.cell += '"';
      return 2;
    }
    st.quoted = false;
    return 1;
  }
  if (ch === '\n') st.line++;
  st.cell += ch;
  return 1;
}

/** One character outside quotes: a quote opens a cell, a comma ends one, a line feed ends the record. */
function plainChar(st: CsvScan, ch: string): void {
  if (ch === '"') {
    if (st.cell.trim() !== '') {
      throw new InputError(`${st.fileLabel}: row ${st.line}`, 'stray double quote inside an unquoted cell', 'quote whole cells: "like this"');
    }
    st.cell = '';
    st.quoted = true;
    st.cellWasQuoted = true;
  } else if (ch === ',') {
    st.cells.push(st.cell);
    st.cell = '';
    st.cellWasQuoted = false;
  } else if (ch === '\n') {
    if (st.cell.endsWith('\r')) st.cell = st.cell.slice(0, -1);
    endRecord(st);
    st.line++;
  } else {
    st.cell += ch;
  }
}
