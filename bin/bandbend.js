#!/usr/bin/env node
// Thin launcher (CommonJS: bin/package.json says so; plain Node, no build step of its own).
//
// The compiled CLI lives in dist/ (`npm run build`). The build also bundles it into dist/bundle/ as CommonJS chunks
// (src/cli/bundle.ts: three files to load for a `contact` instead of about fifty), and this launcher loads those
// chunks with vm.Script and V8's code cache, `<chunk>.v8cache` beside each chunk: V8 then deserialises the bytecode of
// the functions an earlier run compiled instead of parsing and compiling the source again (Node 20 has no compile
// cache of its own for either module kind). V8 checks each cache against the source text, its own version and its
// flags; a cache that does not match is ignored (the chunk compiles from source as usual) and replaced after the run,
// so a stale or foreign cache costs time once and is never wrong. Cache files are written atomically (a temporary
// file renamed over the old one) and only when missing or rejected; a read-only install simply runs without them.
//
// The bundle runs when it is at least as new as the compiled CLI; otherwise (after a bare `tsc`) the compiled ES
// modules in dist/cli/ do, so a stale bundle never runs.
'use strict';
const { readFileSync, renameSync, statSync, unlinkSync, writeFileSync } = require('node:fs');
const { createRequire } = require('node:module');
const { dirname, join } = require('node:path');
const { pathToFileURL } = require('node:url');
const vm = require('node:vm');

const ENTRY = join(__dirname, '..', 'dist', 'bundle', 'bandbend.cjs');
const UNBUNDLED = join(__dirname, '..', 'dist', 'cli', 'main.js');
// import() inside a chunk (node: built-ins; vega and vega-lite, which are ES modules only) is this module's import(),
// passed to every chunk as `__imp_` (src/cli/bundle.ts, DYNAMIC_IMPORT_NAME): a vm.Script has no module loader
const dynamicImport = (id) => import(id);

function bundleIsFresh() {
  try {
    return statSync(ENTRY).mtimeMs >= statSync(UNBUNDLED).mtimeMs;
  } catch {
    return false;
  }
}

/** A minimal CommonJS loader for the bundle's own chunks ('./x.cjs'); anything else is Node's require. */
function bundleLoader() {
  const modules = new Map();
  const uncached = [];
  const nodeRequire = createRequire(ENTRY);
  function load(file) {
    const known = modules.get(file);
    if (known !== undefined) return known.exports;
    const source = readFileSync(file, 'latin1'); // the build makes every chunk ASCII (src/cli/bundle.ts, checkAscii)
    let cachedData;
    try {
      cachedData = readFileSync(`${file}.v8cache`);
    } catch {
      cachedData = undefined;
    }
    // Node's CommonJS wrapper plus __imp_, on the source's first line (line numbers unchanged)
    const script = new vm.Script(`(function (exports, require, module, __filename, __dirname, __imp_) {${source}\n})`, {
      filename: file,
      cachedData,
    });
    if (cachedData === undefined || script.cachedDataRejected === true) uncached.push({ file, script });
    const module = { exports: {} };
    modules.set(file, module); // before running: chunks that require each other get the partial exports, as in Node
    const dir = dirname(file);
    const requireFromChunk = (id) => (id.startsWith('./') ? load(join(dir, id)) : nodeRequire(id));
    script.runInThisContext()(module.exports, requireFromChunk, module, file, dir, dynamicImport);
    return module.exports;
  }
  /** After the run: the code cache of every chunk that had none (or a rejected one), with what this run compiled. */
  function writeCaches() {
    for (const { file, script } of uncached) {
      const temporary = `${file}.v8cache.${process.pid}.tmp`;
      try {
        writeFileSync(temporary, script.createCachedData());
        renameSync(temporary, `${file}.v8cache`);
      } catch {
        try {
          unlinkSync(temporary);
        } catch {
          // nothing was written
        }
      }
    }
  }
  return { load, writeCaches };
}

function internalError(error) {
  const message = error instanceof Error ? error.message : String(error);
  // control characters removed (the message may quote user text); src/output/escape.ts does this inside the CLI
  // eslint-disable-next-line no-control-regex
  process.stderr.write(`bandbend: internal error: ${message.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ')}\n`);
  process.exitCode = 1;
}

async function run() {
  const argv = process.argv.slice(2);
  if (bundleIsFresh()) {
    const loader = bundleLoader();
    try {
      return await loader.load(ENTRY).main(argv);
    } finally {
      loader.writeCaches();
    }
  }
  const { main } = await import(pathToFileURL(UNBUNDLED).href);
  return main(argv);
}

// Exit as soon as the command is done and nothing else is pending (no server, timer, worker or open file): Node's
// natural exit would first wait for V8's background work (optimising compiles, GC tasks) of a run that has already
// written everything (synchronously: src/cli/io.ts). A command with something still running (the explorer's
// server) ends the natural way.
function done(code) {
  process.exitCode = code;
  if (process.getActiveResourcesInfo().length === 0) process.exit(code);
}

run().then(done, internalError);
