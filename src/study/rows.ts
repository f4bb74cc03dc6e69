// The rows of a study run: a row's CSV and JSONL lines, the result files they are appended to (one row
// as one unit, see appendLines), and the writer that puts rows finishing out of order back in point
// order (see the file comment of runner.ts).
import { stringify } from 'csv-stringify/sync';
import { studyColumns, type OutputValue, type Study } from './studyFile.js';
import type { SweptValue } from './sweep.js';
import { appendLines, closeAppend, openAppend, type AppendFile } from './outFiles.js';

/** One row of results. */
export interface StudyRow {
  index: number;
  swept: Record<string, SweptValue>;
  values: OutputValue[] | null;
  error: string | null;
}

function csvCell(v: OutputValue): string {
  if (v === null) return '';
  if (Array.isArray(v)) return v.map((w) => w.code).join(';'); // warnings: the codes (the JSONL line has the messages)
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  return String(v);
}

/** The cells of a row in column order. */
export function rowCells(study: Study, row: StudyRow): OutputValue[] {
  const outputs = row.values ?? study.outputs.map(() => null);
  return [row.index, ...study.sweep.axes.map((a) => row.swept[a.field] ?? null), ...outputs, row.error];
}

/** The CSV line of a row (with its newline). */
export function csvLine(study: Study, row: StudyRow): string {
  return stringify([rowCells(study, row).map(csvCell)]);
}

/** The CSV header line of a study (without its newline). */
export function csvHeader(columns: readonly string[]): string {
  return stringify([columns]).slice(0, -1);
}

/** The JSONL line of a row (with its newline). */
export function jsonLine(study: Study, row: StudyRow, columns = studyColumns(study)): string {
  const cells = rowCells(study, row);
  return JSON.stringify(Object.fromEntries(columns.map((c, i) => [c, cells[i]]))) + '\n';
}

export interface ResultFiles {
  /** append one row to every file as one unit (rowsOnDisk: complete rows before it, for the error) */
  write(row: StudyRow, rowsOnDisk: number): void;
  close(): void;
}

/** Open results.csv / results.jsonl (null: format not written), appending or from empty; the CSV header when empty. */
export function openResultFiles(study: Study, paths: { csv: string | null; json: string | null }, append: boolean): ResultFiles {
  const columns = studyColumns(study);
  const csv = paths.csv !== null ? openAppend(paths.csv, !append) : null;
  const json = paths.json !== null ? openAppend(paths.json, !append) : null;
  const files = [csv, json].filter((f): f is AppendFile => f !== null);
  if (csv !== null && csv.size === 0) appendLines([csv], [Buffer.from(`${csvHeader(columns)}\n`, 'utf8')], 0);
  return {
    write(row, rowsOnDisk) {
      const lines: Buffer[] = [];
      if (csv !== null) lines.push(Buffer.from(csvLine(study, row), 'utf8'));
      if (json !== null) lines.push(Buffer.from(jsonLine(study, row, columns), 'utf8'));
      appendLines(files, lines, rowsOnDisk);
    },
    close() {
      for (const f of files) closeAppend(f);
    },
  };
}

export interface OrderedWriter {
  /** a finished point; rows are written in seq order */
  push(seq: number, row: StudyRow): void;
  /** next seq to be written (= rows written, counting rows kept on resume) */
  readonly next: number;
  readonly written: number;
  readonly failed: number;
}

/** Rows in seq order from `start.seq` on; `onRows(written, added)` after each push that wrote rows. */
export function createOrderedWriter(
  files: ResultFiles,
  start: { seq: number; failed: number },
  onRows: (written: number, added: number) => void,
): OrderedWriter {
  const pending = new Map<number, StudyRow>();
  let next = start.seq;
  let failed = start.failed;
  return {
    push(seq, row) {
      pending.set(seq, row);
      const before = next;
      for (let r = pending.get(next); r !== undefined; r = pending.get(next)) {
        files.write(r, next);
        pending.delete(next);
        if (r.error !== null) failed++;
        next++;
      }
      if (next > before) onRows(next, next - before);
    },
    get next() {
      return next;
    },
    get written() {
      return next;
    },
    get failed() {
      return failed;
    },
  };
}
