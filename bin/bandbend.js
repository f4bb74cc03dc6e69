#!/usr/bin/env node
// Thin launcher: the compiled CLI lives in dist/ (run `npm run build` first). `npm run build` also bundles it into
// dist/bundle/ (src/cli/bundle.ts: two files to load instead of about fifty); that bundle runs when it is at least as
// new as the compiled CLI, else (after a bare `tsc`) the compiled files do, so a stale bundle never runs.
import { statSync } from 'node:fs';

function bundleIsFresh() {
  try {
    const bundle = statSync(new URL('../dist/bundle/bandbend.mjs', import.meta.url)).mtimeMs;
    return bundle >= statSync(new URL('../dist/cli/main.js', import.meta.url)).mtimeMs;
  } catch {
    return false;
  }
}

const { main } = await import(bundleIsFresh() ? '../dist/bundle/bandbend.mjs' : '../dist/cli/main.js');

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error) => {
    const message = error instanceof Error ? error.message : String(error);
    // control characters removed (the message may quote user text); src/output/escape.ts does this inside the CLI
    // eslint-disable-next-line no-control-regex
    process.stderr.write(`bandbend: internal error: ${message.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ')}\n`);
    process.exitCode = 1;
  },
);
