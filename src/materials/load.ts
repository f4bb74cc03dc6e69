// Loading, merging and looking up materials records.
//
// Built-in data: materials/metals.json, materials/supports.json, materials/references.json in the
// package root, found relative to this module (src/materials/load.ts under vitest,
// dist/materials/load.js when compiled: both are two levels below the root).
// User files (--materials FILE, JSON or YAML) may hold any of "metals", "supports", "references";
// an entry whose name (or reference id) already exists replaces the earlier one as a whole.
//
// Start-up cost: the built-in files are validated by test/materials.test.ts (validateBuiltinLibrary) and
// trusted at run time (JSON.parse only); zod (src/materials/schema.ts) and yaml are loaded only when a user
// file needs them.
import { fileURLToPath } from 'node:url';
import { extname } from 'node:path';
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
import type { ZodError, ZodIssue } from 'zod';
import { InputError } from '../errors.js';
import { MAX_INPUT_FILE_BYTES, readTextFile } from '../inputs/files.js';
import type { CslItem, InputProvenance, MaterialsLibrary, MetalRecord, PropertyValue, SupportRecord } from './types.js';
import { materialsSchemas, type MaterialsFile, type MetalEntry, type SupportEntry } from './schema.js';
import { LazyRecordMap, readBuiltinIndex, writeBuiltinIndex, type BuiltinIndex } from './builtinIndex.js';

const BUILTIN_DIR = new URL('../../materials/', import.meta.url);
const BUILTIN_FILES = ['references.json', 'metals.json', 'supports.json'] as const;
/** Index of the built-in files for lazy record parsing (src/materials/builtinIndex.ts), written by the build. */
const BUILTIN_INDEX = new URL('../../dist/materials/builtin-index.json', import.meta.url);

type Section = 'metals' | 'supports' | 'references';

/** One parsed file, with the label used in messages and its raw data (to name entries in messages). */
interface ParsedFile {
  label: string;
  data: MaterialsFile;
  /** the package's own files: validated by the tests, so their sources are not re-checked at run time */
  trusted?: boolean;
}

// ---------------------------------------------------------------------------------------------
// reading and validating one file

function oneLine(s: string): string {
  return s.replace(/\s+/g, ' ').trim();
}

function fail(label: string, message: string): never {
  throw new InputError(`materials file ${label}`, oneLine(message));
}

/** Read a JSON or YAML file into plain data. Malformed text gives an InputError naming the file. */
/** Largest materials file accepted (a library of thousands of entries is far below this). */
export const MAX_MATERIALS_FILE_BYTES = MAX_INPUT_FILE_BYTES;

export function readDataFile(path: string, label: string = path): unknown {
  const text = readTextFile(path, `materials file ${label}`); // regular files of at most 5 MB (src/inputs/files.ts)
  const ext = extname(path).toLowerCase();
  if (ext === '.yaml' || ext === '.yml') {
    try {
      // yaml is loaded only for YAML files (synchronously, its CommonJS build)
      const { parse } = createRequire(import.meta.url)('yaml') as typeof import('yaml');
      return parse(text) as unknown;
    } catch (err) {
      return fail(label, `not valid YAML: ${(err as Error).message}`);
    }
  }
  try {
    return JSON.parse(text) as unknown;
  } catch (err) {
    return fail(label, `not valid JSON: ${(err as Error).message}`);
  }
}

const EXPECTED_WORDS: Record<string, string> = {
  number: 'a number',
  string: 'a string',
  boolean: 'true or false',
  object: 'an object',
  array: 'a list',
};

function issueMessage(issue: ZodIssue): string {
  if (issue.code === 'invalid_type') {
    if (issue.received === 'undefined') return 'required field is missing';
    const expected = EXPECTED_WORDS[issue.expected] ?? issue.expected;
    return `expected ${expected}, got ${issue.received}`;
  }
  if (issue.code === 'unrecognized_keys') {
    return `unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}`;
  }
  return issue.message;
}

function entryName(raw: unknown, section: string, index: number): string | undefined {
  if (typeof raw !== 'object' || raw === null) return undefined;
  const list = Array.isArray(raw) ? raw : (raw as Record<string, unknown>)[section];
  if (!Array.isArray(list)) return undefined;
  const entry = list[index] as Record<string, unknown> | undefined;
  const name = entry?.['name'] ?? entry?.['id'];
  return typeof name === 'string' ? name : undefined;
}

/** "supports[2] "ZnO-x": electronAffinity_eV.value" for a zod path inside a materials file. */
function describePath(path: (string | number)[], raw: unknown): string {
  if (path.length === 0) return '';
  const [section, index, ...rest] = path;
  if (typeof section !== 'string' || typeof index !== 'number') return path.join('.');
  const name = entryName(raw, section, index);
  const head = `${section}[${index}]${name !== undefined ? ` "${name}"` : ''}`;
  return rest.length > 0 ? `${head}: ${rest.join('.')}` : head;
}

function formatZodError(error: ZodError, raw: unknown): string {
  const first = error.issues[0]!;
  const where = describePath(first.path, raw);
  const more = error.issues.length > 1 ? ` (and ${error.issues.length - 1} more problem${error.issues.length > 2 ? 's' : ''})` : '';
  return `${where ? where + ': ' : ''}${issueMessage(first)}${more}`;
}

/** Validate the data of one materials file against the schema. */
export function parseMaterialsData(raw: unknown, label: string): MaterialsFile {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    return fail(label, 'expected an object with any of the keys "metals", "supports", "references"');
  }
  const result = materialsSchemas().MaterialsFileSchema.safeParse(raw);
  if (!result.success) return fail(label, formatZodError(result.error, raw));
  checkUniqueNames(result.data, label);
  return result.data;
}

function parseReferencesData(raw: unknown, label: string): MaterialsFile {
  const result = materialsSchemas().ReferencesFileSchema.safeParse(raw);
  if (!result.success) {
    const issue = result.error.issues[0]!;
    const [index, ...rest] = issue.path;
    const shifted = { ...result.error, issues: [{ ...issue, path: ['references', ...(index === undefined ? [] : [index]), ...rest] }] } as ZodError;
    return fail(label, formatZodError(shifted, { references: raw }));
  }
  const data: MaterialsFile = { references: result.data };
  checkUniqueNames(data, label);
  return data;
}

function checkUniqueNames(file: MaterialsFile, label: string): void {
  const lists: [Section, { name?: string; id?: string }[] | undefined][] = [
    ['metals', file.metals],
    ['supports', file.supports],
    ['references', file.references as { id: string }[] | undefined],
  ];
  for (const [section, list] of lists) {
    const seen = new Map<string, number>();
    (list ?? []).forEach((entry, i) => {
      const key = (section === 'references' ? entry.id : entry.name) ?? '';
      const earlier = seen.get(key);
      if (earlier !== undefined) fail(label, `${section}[${i}] "${key}": duplicate ${section === 'references' ? 'id' : 'name'} (also ${section}[${earlier}])`);
      seen.set(key, i);
    });
  }
}

// ---------------------------------------------------------------------------------------------
// building a library

function isPropertyValue(x: unknown): x is PropertyValue {
  return typeof x === 'object' && x !== null && 'value' in x && 'source' in x;
}

/** Every PropertyValue inside an entry, with its dotted path. */
function propertyValues(obj: unknown, prefix = ''): [string, PropertyValue][] {
  if (typeof obj !== 'object' || obj === null) return [];
  if (isPropertyValue(obj)) return [[prefix, obj]];
  return Object.entries(obj as Record<string, unknown>).flatMap(([k, v]) => propertyValues(v, prefix ? `${prefix}.${k}` : k));
}

function checkSources(file: ParsedFile, references: Map<string, CslItem>): void {
  for (const section of ['metals', 'supports'] as const) {
    (file.data[section] ?? []).forEach((entry, i) => {
      for (const [path, pv] of propertyValues(entry)) {
        if (!references.has(pv.source)) {
          fail(file.label, `${section}[${i}] "${entry.name}": ${path}.source: unknown reference "${pv.source}" (not in any references list)`);
        }
      }
    });
  }
}

function toMetal(entry: MetalEntry): MetalRecord {
  return { kind: 'metal', ...entry };
}

function toSupport(entry: SupportEntry): SupportRecord {
  return { kind: 'support', ...entry };
}

/** Merge parsed files in order (later entries replace earlier ones of the same name) and check sources. */
export function buildLibrary(files: ParsedFile[]): MaterialsLibrary {
  const references = new Map<string, CslItem>();
  const metals = new Map<string, MetalRecord>();
  const supports = new Map<string, SupportRecord>();
  for (const f of files) for (const ref of f.data.references ?? []) references.set(ref.id, ref as CslItem);
  for (const f of files) {
    if (f.trusted !== true) checkSources(f, references);
    for (const m of f.data.metals ?? []) metals.set(m.name, toMetal(m));
    for (const s of f.data.supports ?? []) supports.set(s.name, toSupport(s));
  }
  return { metals, supports, references };
}

function deepFreeze<T>(x: T): T {
  if (typeof x === 'object' && x !== null && !Object.isFrozen(x)) {
    Object.freeze(x);
    for (const k in x) deepFreeze((x as Record<string, unknown>)[k]); // for-in: no array per object (start-up time)
  }
  return x;
}

/** The built-in files; `validate` runs the full schema and source checks (tests), otherwise they are trusted. */
function readBuiltinFiles(validate: boolean): ParsedFile[] {
  return BUILTIN_FILES.map((name) => {
    const path = fileURLToPath(new URL(name, BUILTIN_DIR));
    const label = `materials/${name}`;
    if (!validate) {
      // the package's own files: a plain read (the user-file checks of readDataFile are for untrusted paths)
      const raw = JSON.parse(readFileSync(path, 'utf8')) as unknown;
      return { label, data: (name === 'references.json' ? { references: raw } : raw) as MaterialsFile, trusted: true };
    }
    const raw = readDataFile(path, label);
    return { label, data: name === 'references.json' ? parseReferencesData(raw, label) : parseMaterialsData(raw, label) };
  });
}

/** The built-in library with every check a user file gets (schema, unique names, sources); for tests. */
export function validateBuiltinLibrary(): MaterialsLibrary {
  return buildLibrary(readBuiltinFiles(true));
}

// Pure memo: the built-in files are part of the package and do not change while the process runs;
// the records are frozen so that no caller can alter the cached copy.
let builtinFilesMemo: ParsedFile[] | undefined;

function builtinFiles(): ParsedFile[] {
  builtinFilesMemo ??= deepFreeze(readBuiltinFiles(false));
  return builtinFilesMemo;
}

/** Write the index of the built-in files (`npm run build`, src/cli/bundle.ts); see src/materials/builtinIndex.ts. */
export function writeBuiltinLibraryIndex(target: URL = BUILTIN_INDEX): void {
  writeBuiltinIndex(BUILTIN_DIR, { references: 'references.json', metals: 'metals.json', supports: 'supports.json' }, target);
}

/** A function's value, computed once and deep-frozen (the records shared by every library built from the index). */
function frozenOnce<T>(compute: () => T): () => T {
  let done = false;
  let value: T;
  return () => {
    if (!done) {
      value = deepFreeze(compute());
      done = true;
    }
    return value;
  };
}

// Pure memo, like builtinFilesMemo: the index of the package's files, its records parsed and frozen at first use.
let builtinIndexMemo: BuiltinIndex | null | undefined;

/** The built-in library from the build's index, records parsed at first use; null without a current index. */
function lazyBuiltinLibrary(): MaterialsLibrary | null {
  if (builtinIndexMemo === undefined) {
    const read = readBuiltinIndex(BUILTIN_DIR, BUILTIN_INDEX);
    builtinIndexMemo =
      read === null
        ? null
        : {
            metals: read.metals.map(([names, parse]) => [names, frozenOnce(parse)]),
            supports: read.supports.map(([names, parse]) => [names, frozenOnce(parse)]),
            references: read.references.map(([id, parse]) => [id, frozenOnce(parse)]),
          };
  }
  const i = builtinIndexMemo;
  if (i === null) return null;
  return {
    metals: new LazyRecordMap(i.metals.map(([n, parse]) => [n.name, () => toMetal(parse() as MetalEntry)]), i.metals.map(([n]) => n)),
    supports: new LazyRecordMap(i.supports.map(([n, parse]) => [n.name, () => toSupport(parse() as SupportEntry)]), i.supports.map(([n]) => n)),
    references: new LazyRecordMap(i.references.map(([id, parse]) => [id, () => parse() as CslItem])),
  };
}

/**
 * The library shipped in materials/ (validated by the tests; records are frozen). Read through the build's index
 * when it is current (records parsed at first use), else from the files.
 */
export function loadBuiltinLibrary(): MaterialsLibrary {
  return lazyBuiltinLibrary() ?? buildLibrary(builtinFiles());
}

/** The built-in library from the files themselves (every record parsed at once); for tests of the index. */
export function loadBuiltinLibraryFromFiles(): MaterialsLibrary {
  return buildLibrary(builtinFiles());
}

/** A library given as an object, as extra files on top of the built-in one, or nothing (the built-in one). */
export function resolveLibrary(materials: MaterialsLibrary | readonly string[] | undefined): MaterialsLibrary {
  if (materials === undefined) return loadLibrary();
  return isFileList(materials) ? loadLibrary([...materials]) : materials;
}

function isFileList(materials: MaterialsLibrary | readonly string[]): materials is readonly string[] {
  return Array.isArray(materials);
}

/** The built-in library plus user files (JSON or YAML) that add or replace entries, in the order given. */
export function loadLibrary(extraFiles: string[] = []): MaterialsLibrary {
  if (extraFiles.length === 0) return loadBuiltinLibrary();
  const user = extraFiles.map((path) => ({ label: path, data: parseMaterialsData(readDataFile(path, path), path) }));
  return buildLibrary([...builtinFiles(), ...user]);
}

// ---------------------------------------------------------------------------------------------
// lookup

/**
 * Extra names accepted by findSupport / findMetal besides the canonical key, the full name and
 * (for supports) an unambiguous formula. Matching ignores case, spaces, '-' and '_', and reads
 * α β γ as alpha beta gamma.
 */
export const SUPPORT_ALIASES: Readonly<Record<string, string>> = {
  TiO2: 'TiO2-anatase',
  anatase: 'TiO2-anatase',
  titania: 'TiO2-anatase',
  'anatase-TiO2': 'TiO2-anatase',
  rutile: 'TiO2-rutile',
  'rutile-TiO2': 'TiO2-rutile',
  ceria: 'CeO2',
  'zinc oxide': 'ZnO',
  zincite: 'ZnO',
  magnesia: 'MgO',
  periclase: 'MgO',
  lime: 'CaO',
  corundum: 'Al2O3-alpha',
  sapphire: 'Al2O3-alpha',
  'alpha-alumina': 'Al2O3-alpha',
  'alpha-Al2O3': 'Al2O3-alpha',
  'gamma-alumina': 'Al2O3-gamma',
  'gamma-Al2O3': 'Al2O3-gamma',
  silica: 'SiO2',
  zirconia: 'ZrO2',
  hafnia: 'HfO2',
  'tin oxide': 'SnO2',
  cassiterite: 'SnO2',
  'indium oxide': 'In2O3',
  gallia: 'Ga2O3',
  'beta-Ga2O3': 'Ga2O3',
  hematite: 'Fe2O3',
  'alpha-Fe2O3': 'Fe2O3',
  'nickel oxide': 'NiO',
  bunsenite: 'NiO',
  cuprite: 'Cu2O',
  STO: 'SrTiO3',
  'strontium titanate': 'SrTiO3',
  lanthana: 'La2O3',
  yttria: 'Y2O3',
  'tantalum oxide': 'Ta2O5',
};

export const METAL_ALIASES: Readonly<Record<string, string>> = {
  aluminum: 'Al',
  wolfram: 'W',
};

function normalize(s: string): string {
  return s
    .trim()
    .toLowerCase()
    .replace(/α/g, 'alpha')
    .replace(/β/g, 'beta')
    .replace(/γ/g, 'gamma')
    .replace(/[\s_\-–]+/g, '');
}

function levenshtein(a: string, b: string): number {
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j]! + 1, cur[j - 1]! + 1, prev[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length]!;
}

interface Named {
  name: string;
  fullName: string;
  formula?: string;
}

function find<T extends Named>(kind: 'metal' | 'support', map: Map<string, T>, aliases: Readonly<Record<string, string>>, query: string): T {
  const q = normalize(query);
  // the names alone (a library from the build's index parses no record to look one up), else the records
  const records: readonly Named[] = (map instanceof LazyRecordMap ? (map as LazyRecordMap<T>).recordNames() : undefined) ?? [...map.values()];
  const byKey = records.find((r) => normalize(r.name) === q);
  if (byKey) return map.get(byKey.name)!;
  const aliasTarget = Object.entries(aliases).find(([alias]) => normalize(alias) === q)?.[1];
  if (aliasTarget !== undefined && map.has(aliasTarget)) return map.get(aliasTarget)!;
  const byName = records.filter((r) => normalize(r.fullName) === q || (r.formula !== undefined && normalize(r.formula) === q));
  if (byName.length === 1) return map.get(byName[0]!.name)!;
  if (byName.length > 1) {
    throw new InputError(kind, `"${query}" is ambiguous; say which: ${byName.map((r) => r.name).join(', ')}`);
  }
  // close matches: compare against every accepted spelling, report canonical keys
  const spellings: [string, string][] = [];
  for (const r of records) {
    spellings.push([r.name, r.name], [r.fullName, r.name]);
    if (r.formula !== undefined) spellings.push([r.formula, r.name]);
  }
  for (const [alias, target] of Object.entries(aliases)) if (map.has(target)) spellings.push([alias, target]);
  const scored = spellings
    .map(([s, key]) => ({ key, d: levenshtein(q, normalize(s)) }))
    .filter(({ d }) => d <= Math.max(1, Math.floor(q.length / 3)))
    .sort((a, b) => a.d - b.d);
  const close = [...new Set(scored.map((s) => s.key))].slice(0, 5);
  if (close.length > 0) throw new InputError(kind, `unknown ${kind} "${query}"; close matches: ${close.join(', ')}`);
  throw new InputError(kind, `unknown ${kind} "${query}"`, [...map.keys()].join(', '));
}

/** Look up a metal by symbol, name or alias, ignoring case. Unknown names throw InputError with close matches. */
export function findMetal(lib: MaterialsLibrary, name: string): MetalRecord {
  return find('metal', lib.metals, METAL_ALIASES, name);
}

/** Look up a support by key, full name, formula (when unambiguous) or alias, ignoring case. */
export function findSupport(lib: MaterialsLibrary, name: string): SupportRecord {
  return find('support', lib.supports, SUPPORT_ALIASES, name);
}

// ---------------------------------------------------------------------------------------------
// citations and provenance

/** Author part of a short citation. An author entry { "literal": "et al." } marks an abbreviated list. */
function authorPart(item: CslItem): string | undefined {
  const all = (item.author ?? []).map((a) => a.family ?? a.literal ?? a.given ?? '').filter((n) => n !== '');
  const names = all.filter((n) => n !== 'et al.');
  if (names.length === 0) return undefined;
  if (names.length < all.length) return `${names[0]} et al.`;
  if (names.length === 1) return names[0];
  if (names.length === 2) return `${names[0]} & ${names[1]}`;
  return `${names[0]} et al.`;
}

function yearOf(item: CslItem): string | undefined {
  const y = item.issued?.['date-parts']?.[0]?.[0];
  return y === undefined ? undefined : String(y);
}

/** Short human citation, e.g. "Michaelson, J. Appl. Phys. 48, 4729 (1977), doi:10.1063/1.323539". */
export function formatCitation(item: CslItem): string {
  const extra = item as CslItem & { 'container-title-short'?: string };
  const authors = authorPart(item);
  const year = yearOf(item);
  const journal = extra['container-title-short'] ?? item['container-title'];
  const firstPage = item.page?.split(/[-–]/)[0];
  let body: string;
  if (journal !== undefined && journal.toLowerCase() === 'arxiv') {
    body = `arXiv:${item.page ?? ''}${year ? ` (${year})` : ''}`;
  } else if (journal !== undefined) {
    const vol = item.volume !== undefined ? ` ${item.volume}` : '';
    const page = firstPage !== undefined ? `, ${firstPage}` : '';
    body = `${journal}${vol}${page}${year ? ` (${year})` : ''}`;
  } else {
    const ed = item.edition !== undefined ? `, ${item.edition} ed.` : '';
    const pub = [item.publisher, year].filter((x) => x !== undefined).join(', ');
    body = `${item.title}${ed}${pub ? ` (${pub})` : ''}`;
  }
  // without authors, a journal citation is introduced by its title; a book or page citation already starts with it
  const head = authors !== undefined ? `${authors}, ${body}` : journal !== undefined ? `${item.title}, ${body}` : body;
  const link = item.DOI !== undefined ? `, doi:${item.DOI}` : item.URL !== undefined && journal === undefined ? `, ${item.URL}` : '';
  return head + link;
}

/** Provenance of a library value for properties tables. */
export function provenanceOf(lib: MaterialsLibrary, field: string, pv: PropertyValue, unit: string): InputProvenance {
  const ref = lib.references.get(pv.source);
  return {
    field,
    value: pv.value,
    unit,
    ...(pv.min !== undefined ? { min: pv.min } : {}),
    ...(pv.max !== undefined ? { max: pv.max } : {}),
    origin: 'library',
    source: pv.source,
    ...(ref !== undefined ? { citation: formatCitation(ref) } : {}),
    ...(pv.note !== undefined ? { note: pv.note } : {}),
    fromMemory: pv.fromMemory ?? false,
  };
}
