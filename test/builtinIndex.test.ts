// The build's index of the built-in library (src/materials/builtinIndex.ts): a library read through it must be the
// library read from materials/*.json, record for record, and a stale index must never be used. The reference is the
// files themselves, parsed eagerly (loadBuiltinLibraryFromFiles); Map semantics are those of ECMA-262 (Map objects).
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { LazyRecordMap, readBuiltinIndex, writeBuiltinIndex } from '../src/materials/builtinIndex.js';
import { findMetal, findSupport, loadBuiltinLibrary, loadBuiltinLibraryFromFiles, SUPPORT_ALIASES, METAL_ALIASES } from '../src/materials/load.js';
import { InputError } from '../src/errors.js';
import type { MaterialsLibrary } from '../src/materials/types.js';

const MATERIALS = new URL('../materials/', import.meta.url);
const FILES = { references: 'references.json', metals: 'metals.json', supports: 'supports.json' };
const temporary: string[] = [];
afterAll(() => {
  for (const dir of temporary) rmSync(dir, { recursive: true, force: true });
});

function tempDir(): string {
  const dir = mkdtempSync(join(tmpdir(), 'bandbend-index-'));
  temporary.push(dir);
  return dir;
}

function expectSameLibrary(lazy: MaterialsLibrary, eager: MaterialsLibrary): void {
  for (const section of ['metals', 'supports', 'references'] as const) {
    expect([...lazy[section].keys()], section).toEqual([...eager[section].keys()]);
    expect(lazy[section].size).toBe(eager[section].size);
    for (const key of eager[section].keys()) expect(lazy[section].get(key), `${section} ${key}`).toEqual(eager[section].get(key));
  }
}

describe('the built-in library through the build index', () => {
  const eager = loadBuiltinLibraryFromFiles();

  it('the library commands use is read through the index after `npm run build`, and equals the files', () => {
    const lib = loadBuiltinLibrary();
    expect(lib.metals instanceof LazyRecordMap, 'dist/materials/builtin-index.json missing or stale: run npm run build').toBe(true);
    expectSameLibrary(lib, eager);
  });

  it('a freshly written index gives every record of the files', () => {
    const target = pathToFileURL(join(tempDir(), 'index.json'));
    writeBuiltinIndex(MATERIALS, FILES, target);
    const index = readBuiltinIndex(MATERIALS, target);
    expect(index).not.toBeNull();
    const lib: MaterialsLibrary = {
      metals: new LazyRecordMap(index!.metals.map(([n, parse]) => [n.name, () => ({ kind: 'metal', ...(parse() as object) }) as never])),
      supports: new LazyRecordMap(index!.supports.map(([n, parse]) => [n.name, () => ({ kind: 'support', ...(parse() as object) }) as never])),
      references: new LazyRecordMap(index!.references.map(([id, parse]) => [id, parse as never])),
    };
    expectSameLibrary(lib, eager);
  });

  it('an index older than a source file (size or time changed), a missing one or a damaged one is not used', () => {
    const dir = tempDir();
    for (const name of Object.values(FILES)) copyFileSync(new URL(name, MATERIALS), join(dir, name));
    const dirUrl = pathToFileURL(`${dir}/`);
    const target = pathToFileURL(join(dir, 'index.json'));
    writeBuiltinIndex(dirUrl, FILES, target);
    expect(readBuiltinIndex(dirUrl, target)).not.toBeNull();
    writeFileSync(join(dir, 'metals.json'), `${readFileSync(join(dir, 'metals.json'), 'utf8')}\n`);
    expect(readBuiltinIndex(dirUrl, target)).toBeNull();
    expect(readBuiltinIndex(dirUrl, pathToFileURL(join(dir, 'none.json')))).toBeNull();
    writeFileSync(join(dir, 'index.json'), '{"sources": [');
    expect(readBuiltinIndex(dirUrl, target)).toBeNull();
  });

  it('lookups by key, full name, formula and alias, and unknown names, give what the files give', () => {
    const lib = loadBuiltinLibrary();
    const queries = [
      ...[...eager.metals.values()].flatMap((m) => [m.name, m.fullName, m.name.toLowerCase()]),
      ...Object.keys(METAL_ALIASES),
    ];
    for (const q of queries) expect(findMetal(lib, q), q).toEqual(findMetal(eager, q));
    const supportQueries = [...eager.supports.values()].flatMap((s) => [s.name, s.fullName, ...(s.formula !== undefined ? [s.formula] : [])]);
    for (const q of [...supportQueries, ...Object.keys(SUPPORT_ALIASES)]) {
      let expected: unknown;
      try {
        expected = findSupport(eager, q);
      } catch (error) {
        expected = (error as Error).message;
      }
      let actual: unknown;
      try {
        actual = findSupport(lib, q);
      } catch (error) {
        actual = (error as Error).message;
      }
      expect(actual, q).toEqual(expected);
    }
    for (const typo of ['Ptt', 'ZnOO', 'titanai', 'xyz']) {
      const message = (f: () => unknown): string => {
        try {
          f();
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
          return (error as Error).message;
        }
        return 'no error';
      };
      expect(message(() => findSupport(lib, typo))).toBe(message(() => findSupport(eager, typo)));
      expect(message(() => findMetal(lib, typo))).toBe(message(() => findMetal(eager, typo)));
    }
  });
});

describe('LazyRecordMap', () => {
  const make = () => {
    const calls: string[] = [];
    const map = new LazyRecordMap<{ v: string }>(
      ['a', 'b', 'c'].map((k) => [k, () => (calls.push(k), { v: k.toUpperCase() })]),
      ['a', 'b', 'c'].map((k) => ({ name: k, fullName: `full ${k}` })),
    );
    return { map, calls };
  };

  it('parses a value once, at its first get; keys, has and size parse nothing', () => {
    const { map, calls } = make();
    expect([...map.keys()]).toEqual(['a', 'b', 'c']);
    expect(map.has('b') && map.size === 3).toBe(true);
    expect(calls).toEqual([]);
    expect(map.get('b')).toEqual({ v: 'B' });
    expect(map.get('b')).toBe(map.get('b'));
    expect(calls).toEqual(['b']);
    expect(map.get('z')).toBeUndefined();
  });

  it('values, entries, forEach and iteration see every value, like a Map built eagerly', () => {
    const reference = new Map([['a', { v: 'A' }], ['b', { v: 'B' }], ['c', { v: 'C' }]]);
    for (const walk of [(m: Map<string, { v: string }>) => [...m.values()], (m: Map<string, { v: string }>) => [...m.entries()], (m: Map<string, { v: string }>) => [...m], (m: Map<string, { v: string }>) => { const out: unknown[] = []; m.forEach((v, k) => out.push([k, v])); return out; }, (m: Map<string, { v: string }>) => [...new Map(m)]]) {
      expect(walk(make().map)).toEqual(walk(reference));
    }
  });

  it('set, delete and clear behave as on a Map and drop the names (lookups then read the values)', () => {
    const { map } = make();
    expect(map.recordNames()?.map((n) => n.name)).toEqual(['a', 'b', 'c']);
    map.set('b', { v: 'new' });
    expect(map.get('b')).toEqual({ v: 'new' });
    expect(map.recordNames()).toBeUndefined();
    expect(map.delete('a')).toBe(true);
    expect([...map.keys()]).toEqual(['b', 'c']);
    expect([...map.values()]).toEqual([{ v: 'new' }, { v: 'C' }]);
    map.clear();
    expect(map.size).toBe(0);
  });
});
