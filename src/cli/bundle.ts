// Build step (`npm run build`, after tsc): bundle the compiled CLI (dist/cli/main.js) into dist/bundle/ with rolldown
// (the bundler vite 8 is built on), so that `bandbend contact --json` loads two files instead of about fifty
// (each ESM file costs Node a resolve, a stat, a read and a compile; issue 13 item 2, numbers in src/bench/bench.ts).
//
// Layout: bandbend.mjs (entry) + core-*.mjs (the CLI and the physics a contact needs) + one chunk per lazily loaded
// part (reports, figures, screens, studies, the explorer server, ...), so those still load only where used. Every
// module of ours is in exactly one chunk (one InputError class, one library cache). Packages in node_modules stay
// external (resolved by Node as before). dist/bundle/ sits at the same depth as dist/<folder>/ so every
// `new URL('../../materials/', import.meta.url)` and `new URL('../study/worker.js', import.meta.url)` of the
// sources resolves to the same file from a chunk as from the unbundled module.
//
// bin/bandbend.js runs the bundle when it is at least as new as dist/cli/main.js, else the unbundled CLI (after a
// bare `tsc`), so a stale bundle never runs.
import { rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { rolldown } from 'rolldown';

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

export async function bundleCli(): Promise<void> {
  rmSync(OUT_DIR, { recursive: true, force: true });
  const bundle = await rolldown({
    input: { bandbend: `${DIST}cli/main.js` },
    platform: 'node',
    external: isExternal,
    plugins: [inlineCommander],
    logLevel: 'warn',
    // dynamic imports of modules that are also imported statically elsewhere are expected (they stay lazy where possible)
    onLog(level, log, handler) {
      if (log.code === 'INEFFECTIVE_DYNAMIC_IMPORT') return;
      handler(level, log);
    },
  });
  await bundle.write({
    dir: OUT_DIR,
    format: 'esm',
    // names shortened and whitespace removed, no other rewriting (so no arithmetic is re-associated): the core chunk
    // is about half the bytes to read and parse; the source map (dist/bundle/*.map) gives the names back
    // (node --enable-source-maps)
    minify: { compress: false, mangle: true, codegen: { removeWhitespace: true } },
    sourcemap: true,
    entryFileNames: '[name].mjs',
    chunkFileNames: '[name]-[hash].mjs',
    codeSplitting: { groups: [{ name: 'core', test: (id: string) => CORE.test(id) }] },
  });
  await bundle.close();
}

await bundleCli();
