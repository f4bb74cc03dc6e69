// Build-time index of the built-in library, so that a command reads (parses) only the records it uses.
//
// Why: parsing all of materials/*.json (about 270 kB: every metal, support and reference with its notes) was the
// largest single step of a `bandbend contact` run (about 8 ms of a ~55 ms overhead over bare Node on the bench
// machine; issue 13, start-up), while a contact needs one metal, one support and the twenty-odd references they cite.
//
// File (dist/materials/builtin-index.json, written by `npm run build` via src/cli/bundle.ts): one line of index JSON,
// a newline, then the records' JSON texts one after another. The index holds, per source file, its size and
// modification time (a stale index is ignored: the files are then read as before), and per record its key, the
// names lookups match against (name, full name, formula) and the byte range of its text.
//
// Lazy records: LazyRecordMap is a Map whose values are parsed (and deep-frozen) at the first get(); keys(), has() and
// size need no parsing; anything that walks the values (values(), entries(), forEach, iteration) parses them all first,
// so every Map use sees the same contents as an eagerly built Map (test/builtinIndex.test.ts compares them).
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** The names a lookup matches a record against (src/materials/load.ts, find). */
export interface RecordNames {
  name: string;
  fullName: string;
  formula?: string;
}

type Range = [start: number, end: number];

interface IndexHeader {
  /** [file name, size in bytes, mtime in ms] of each source file when the index was written */
  sources: [string, number, number][];
  metals: [RecordNames, Range][];
  supports: [RecordNames, Range][];
  references: [string, Range][];
}

/** A Map whose values are parsed from text on first use (see the file header). */
export class LazyRecordMap<V> extends Map<string, V> {
  readonly #pending = new Map<string, () => V>();
  #names: readonly RecordNames[] | undefined;

  constructor(entries: readonly [string, () => V][], names?: readonly RecordNames[]) {
    super();
    for (const [key, parse] of entries) {
      super.set(key, undefined as V); // insertion order kept; the value comes at the first get()
      this.#pending.set(key, parse);
    }
    this.#names = names;
  }

  override get(key: string): V | undefined {
    const parse = this.#pending.get(key);
    if (parse !== undefined) {
      this.#pending.delete(key);
      super.set(key, parse());
    }
    return super.get(key);
  }

  // a changed map no longer matches the names it was made with: lookups then read the values
  override set(key: string, value: V): this {
    this.#pending.delete(key);
    this.#names = undefined;
    return super.set(key, value);
  }

  override delete(key: string): boolean {
    this.#pending.delete(key);
    this.#names = undefined;
    return super.delete(key);
  }

  override clear(): void {
    this.#pending.clear();
    this.#names = undefined;
    super.clear();
  }

  /** Parse every pending value (before anything walks the values). */
  #all(): void {
    for (const key of [...this.#pending.keys()]) this.get(key);
  }

  override values(): MapIterator<V> {
    this.#all();
    return super.values();
  }

  override entries(): MapIterator<[string, V]> {
    this.#all();
    return super.entries();
  }

  override [Symbol.iterator](): MapIterator<[string, V]> {
    return this.entries();
  }

  override forEach(callback: (value: V, key: string, map: Map<string, V>) => void, thisArg?: unknown): void {
    this.#all();
    super.forEach(callback, thisArg);
  }

  /** The names of every record without parsing any (undefined when made without them or changed since). */
  recordNames(): readonly RecordNames[] | undefined {
    return this.#names;
  }
}

/** The built-in library as lazily parsed records (raw parsed entries: the caller adds `kind`, freezing). */
export interface BuiltinIndex {
  metals: readonly [RecordNames, () => unknown][];
  supports: readonly [RecordNames, () => unknown][];
  references: readonly [string, () => unknown][];
}

function stampOf(dir: URL, name: string): [string, number, number] {
  const st = statSync(new URL(name, dir));
  return [name, st.size, st.mtimeMs];
}

/**
 * Write the index of the built-in files `files` (references.json: a list; metals.json / supports.json: objects with
 * a `metals` / `supports` list) in `dir` to `target` (written to a temporary file, then renamed).
 */
export function writeBuiltinIndex(dir: URL, files: { references: string; metals: string; supports: string }, target: URL): void {
  const parts: string[] = [];
  let offset = 0;
  const place = (record: unknown): Range => {
    const text = JSON.stringify(record);
    const start = offset;
    offset += Buffer.byteLength(text, 'utf8');
    parts.push(text);
    return [start, offset];
  };
  const read = (name: string): unknown => JSON.parse(readFileSync(new URL(name, dir), 'utf8')) as unknown;
  const names = (r: RecordNames): RecordNames => (r.formula === undefined ? { name: r.name, fullName: r.fullName } : { name: r.name, fullName: r.fullName, formula: r.formula });
  const header: IndexHeader = {
    sources: [files.references, files.metals, files.supports].map((name) => stampOf(dir, name)),
    references: (read(files.references) as { id: string }[]).map((r) => [r.id, place(r)]),
    metals: ((read(files.metals) as { metals?: RecordNames[] }).metals ?? []).map((r) => [names(r), place(r)]),
    supports: ((read(files.supports) as { supports?: RecordNames[] }).supports ?? []).map((r) => [names(r), place(r)]),
  };
  const path = fileURLToPath(target);
  mkdirSync(fileURLToPath(new URL('.', target)), { recursive: true });
  writeFileSync(`${path}.${process.pid}.tmp`, `${JSON.stringify(header)}\n${parts.join('')}`, 'utf8');
  renameSync(`${path}.${process.pid}.tmp`, path);
}

/**
 * The index at `target`, or null when it is missing, unreadable, or older than any source file in `dir` (size or
 * modification time changed since it was written): the caller then reads the files themselves.
 */
export function readBuiltinIndex(dir: URL, target: URL): BuiltinIndex | null {
  let bytes: Buffer;
  let header: IndexHeader;
  let body: number;
  try {
    bytes = readFileSync(target);
    body = bytes.indexOf(0x0a);
    if (body < 0) return null;
    header = JSON.parse(bytes.toString('utf8', 0, body)) as IndexHeader;
    for (const [name, size, mtime] of header.sources) {
      const [, nowSize, nowMtime] = stampOf(dir, name);
      if (nowSize !== size || nowMtime !== mtime) return null;
    }
  } catch {
    return null; // no index (a bare tsc, or the sources run directly): the files are read
  }
  const from = body + 1;
  const parser = ([start, end]: Range) => (): unknown => JSON.parse(bytes.toString('utf8', from + start, from + end)) as unknown;
  return {
    metals: header.metals.map(([names, range]) => [names, parser(range)]),
    supports: header.supports.map(([names, range]) => [names, parser(range)]),
    references: header.references.map(([id, range]) => [id, parser(range)]),
  };
}
