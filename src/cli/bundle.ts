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

/** Bare specifiers (packages, node: builtins) stay imports; relative and absolute paths are ours. */
function isExternal(id: string): boolean {
  return !id.startsWith('.') && !id.startsWith('/') && !/^[A-Za-z]:[\\/]/.test(id);
}

export async function bundleCli(): Promise<void> {
  rmSync(OUT_DIR, { recursive: true, force: true });
  const bundle = await rolldown({
    input: { bandbend: `${DIST}cli/main.js` },
    platform: 'node',
    external: isExternal,
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
    entryFileNames: '[name].mjs',
    chunkFileNames: '[name]-[hash].mjs',
    codeSplitting: { groups: [{ name: 'core', test: (id: string) => CORE.test(id) }] },
  });
  await bundle.close();
}

await bundleCli();
