// Build step (`npm run build`, after tsc): bundle the compiled CLI (dist/cli/main.js) into dist/bundle/ with rolldown
// (the bundler vite 8 is built on), so that `bandbend contact --json` reads and compiles three files instead of about
// fifty (each ESM file costs Node a resolve, a stat, a read and a compile; issue 13 item 2, numbers in
// src/bench/bench.ts).
//
// Layout: bandbend.cjs (entry) + core-*.cjs (the CLI and the physics a contact needs) + one chunk per lazily loaded
// part (reports, figures, screens, studies, the explorer server, ...), so those still load only where used. Every
// module of ours is in exactly one chunk (one InputError class, one library cache). Packages in node_modules stay
// external (resolved by Node as before; the ES-module-only ones, vega and vega-lite, by import() at first use,
// src/output/render.ts). dist/bundle/ sits at the same depth as dist/<folder>/ so every
// `new URL('../../materials/', import.meta.url)` and `new URL('../study/worker.js', import.meta.url)` of the
// sources resolves to the same file from a chunk as from the unbundled module.
//
// Why CommonJS chunks: Node 20 keeps no compiled code between runs for ES modules (module.enableCompileCache came
// with Node 22), and compiling the core chunk was about a tenth of a `contact` run. bin/bandbend.js loads the chunks
// itself with vm.Script and V8's code cache (`<chunk>.v8cache` beside each chunk: the bytecode of the functions a run
// compiled, checked by V8 against the source and the V8 version and flags, and recompiled from source when it does
// not match). The last step of this build makes those caches with one `contact` run (warmCodeCache below).
//
// bin/bandbend.js runs the bundle when it is at least as new as dist/cli/main.js, else the unbundled CLI (after a
// bare `tsc`), so a stale bundle never runs.
import { existsSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { rolldown } from 'rolldown';
import { parseAst } from 'rolldown/parseAst';
import { writeBuiltinLibraryIndex } from '../materials/load.js';

const DIST = fileURLToPath(new URL('../', import.meta.url));
const OUT_DIR = fileURLToPath(new URL('../bundle/', import.meta.url));

/**
 * Compiled modules that go in the core chunk: everything `contact` needs (the CLI, inputs, bulk, barrier, Poisson,
 * derived physics, materials, the contact itself). Not: the Mott–Schottky fit (ml-matrix), the explorer server
 * (node:http), output other than escaping/formatting/cautions, screens, studies, validation, demo.
 */
const CORE =
  /[\\/]dist[\\/](cli[\\/](?!exploreServer)|inputs[\\/]|bulk[\\/]|barrier[\\/]|electrostatics[\\/]|derived[\\/](?!mottSchottky)|interface[\\/]|materials[\\/]|(errors|constants|contact|contactResult|types)\.js|output[\\/](escape|format|cautions)\.js)/;

/** Bare specifiers (packages, node: builtins) stay imports, except commander (see inlineCommander); relative and
 * absolute paths are ours. */
function isExternal(id: string): boolean {
  return id !== 'commander' && !id.startsWith('.') && !id.startsWith('/') && !/^[A-Za-z]:[\\/]/.test(id);
}

/** The line of dist/cli/commander.js that loads commander at run time (src/cli/commander.ts). */
const COMMANDER_REQUIRE = "const commander = createRequire(import.meta.url)('commander');";

/**
 * commander (CommonJS, about 120 kB) goes into the core chunk, minified, instead of being resolved and compiled at
 * run time: src/cli/commander.ts's run-time require becomes an import for the bundler. Fails the build if that line
 * changes, rather than silently loading commander twice.
 */
const inlineCommander = {
  name: 'bandbend-inline-commander',
  transform(code: string, id: string): { code: string; map: null } | null {
    if (!/[\\/]dist[\\/]cli[\\/]commander\.js$/.test(id)) return null;
    if (!code.includes(COMMANDER_REQUIRE)) throw new Error(`bundle: ${id} no longer has the line ${COMMANDER_REQUIRE}`);
    // same lines as before (the import goes in front of the first line), so the source map stays right
    return { code: `import * as commanderModule from 'commander';${code.replace(COMMANDER_REQUIRE, 'const commander = commanderModule;')}`, map: null };
  },
};

/**
 * Name of the function that stands for `import(...)` in the chunks: bin/bandbend.js passes `(id) => import(id)` as
 * this extra parameter of each chunk's wrapper. A script compiled by vm.Script with a code cache has no module loader
 * of its own for import() (Node 20 lends its loader only through an experimental option), while the launcher is an
 * ordinary CommonJS module whose import() is Node's. Six characters, as long as the keyword it replaces, so the
 * source maps' columns stay right.
 */
export const DYNAMIC_IMPORT_NAME = '__imp_';

interface AstNode {
  type: string;
  start: number;
  end: number;
  [key: string]: unknown;
}

/** Start offsets of every `import(...)` expression in a chunk (found in the syntax tree, never in strings). */
function dynamicImportOffsets(code: string): number[] {
  const starts: number[] = [];
  const visit = (node: unknown): void => {
    if (Array.isArray(node)) {
      for (const child of node) visit(child);
      return;
    }
    if (typeof node !== 'object' || node === null) return;
    const n = node as AstNode;
    if (n.type === 'ImportExpression') starts.push(n.start);
    for (const key of Object.keys(n)) if (key !== 'parent') visit(n[key]);
  };
  visit(parseAst(code));
  return starts;
}

/** Every `import(` of a chunk becomes `__imp_(` (see DYNAMIC_IMPORT_NAME); fails if the name is already used. */
const launcherImport = {
  name: 'bandbend-launcher-import',
  renderChunk(code: string): { code: string; map: null } {
    if (code.includes(DYNAMIC_IMPORT_NAME)) throw new Error(`bundle: a chunk already uses the name ${DYNAMIC_IMPORT_NAME}`);
    let out = code;
    for (const start of dynamicImportOffsets(code)) {
      if (code.slice(start, start + 6) !== 'import') throw new Error(`bundle: unexpected dynamic import at offset ${start}`);
      out = `${out.slice(0, start)}${DYNAMIC_IMPORT_NAME}${out.slice(start + 6)}`;
    }
    return { code: out, map: null };
  },
};

/** The line of commander's lib/command.js that loads node:child_process (about 4 ms at start-up on the bench machine). */
const CHILD_PROCESS_REQUIRE = "const childProcess = require('node:child_process');";

/**
 * commander loads node:child_process at start-up for one feature the CLI never uses (subcommands that are separate
 * executables; every `childProcess.` use in that file is `childProcess.spawn`): in the bundle the module is required
 * at the first spawn instead. Fails the build if commander's line or its uses change.
 */
const lazyChildProcess = {
  name: 'bandbend-lazy-child-process',
  transform(code: string, id: string): { code: string; map: null } | null {
    if (!/[\\/]commander[\\/]lib[\\/]command\.js$/.test(id)) return null;
    const uses = code.match(/childProcess\.\w+/g) ?? [];
    if (!code.includes(CHILD_PROCESS_REQUIRE) || uses.some((u) => u !== 'childProcess.spawn')) {
      throw new Error(`bundle: ${id} no longer loads node:child_process as expected (line ${CHILD_PROCESS_REQUIRE}, uses ${[...new Set(uses)].join(', ')})`);
    }
    // same line count (source maps stay right)
    return { code: code.replace(CHILD_PROCESS_REQUIRE, "const childProcess = { spawn: (...args) => require('node:child_process').spawn(...args) };"), map: null };
  },
};

export async function bundleCli(): Promise<void> {
  rmSync(OUT_DIR, { recursive: true, force: true });
  const bundle = await rolldown({
    input: { bandbend: `${DIST}cli/main.js` },
    platform: 'node',
    external: isExternal,
    plugins: [inlineCommander, lazyChildProcess],
    logLevel: 'warn',
    // dynamic imports of modules that are also imported statically elsewhere are expected (they stay lazy where possible)
    onLog(level, log, handler) {
      if (log.code === 'INEFFECTIVE_DYNAMIC_IMPORT') return;
      handler(level, log);
    },
  });
  await bundle.write({
    dir: OUT_DIR,
    format: 'cjs',
    // every non-ASCII character escaped: bin/bandbend.js reads the chunks as Latin-1 (no UTF-8 decoding, and V8 keeps
    // one byte per character); checkAscii below fails the build if anything is left
    charset: 'ascii',
    plugins: [launcherImport],
    // names shortened and whitespace removed, no other rewriting (so no arithmetic is re-associated): the core chunk
    // is about half the bytes to read and parse; the source map (dist/bundle/*.map) gives the names back
    // (node --enable-source-maps)
    minify: { compress: false, mangle: true, codegen: { removeWhitespace: true } },
    sourcemap: true,
    entryFileNames: '[name].cjs',
    chunkFileNames: '[name]-[hash].cjs',
    codeSplitting: { groups: [{ name: 'core', test: (id: string) => CORE.test(id) }] },
  });
  await bundle.close();
  checkAscii();
}

/** Every chunk is 7-bit ASCII (so reading it as Latin-1 in bin/bandbend.js gives exactly its UTF-8 text). */
function checkAscii(): void {
  for (const name of readdirSync(OUT_DIR).filter((f) => f.endsWith('.cjs'))) {
    const bytes = readFileSync(`${OUT_DIR}${name}`);
    const at = bytes.findIndex((b) => b > 0x7f);
    if (at >= 0) throw new Error(`bundle: ${name} has a non-ASCII byte at offset ${at}`);
  }
}

/**
 * One `contact` run through bin/bandbend.js, which writes the V8 code cache of every chunk it loads (the caches hold
 * the bytecode of the functions that ran, so this run is a typical one: the README's first contact). Fails the
 * build if the run fails or leaves the core chunk without a cache.
 */
export function warmCodeCache(): void {
  const bin = fileURLToPath(new URL('../../bin/bandbend.js', import.meta.url));
  const run = spawnSync(process.execPath, [bin, 'contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '1e17 cm^-3', '--temperature', '473 K', '--json'], {
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  if (run.status !== 0) throw new Error(`bundle: the code-cache warm-up run exited with ${run.status ?? run.signal}`);
  const core = readdirSync(OUT_DIR).find((f) => /^core-.*\.cjs$/.test(f));
  if (core === undefined || !existsSync(`${OUT_DIR}${core}.v8cache`)) throw new Error('bundle: the warm-up run wrote no code cache for the core chunk');
}

await bundleCli();
writeBuiltinLibraryIndex(); // dist/materials/builtin-index.json (src/materials/builtinIndex.ts), before the warm-up run
warmCodeCache();
