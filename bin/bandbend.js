#!/usr/bin/env node
// Thin launcher: the compiled CLI lives in dist/ (run `npm run build` first).
import { main } from '../dist/cli/main.js';

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error) => {
    process.stderr.write(`bandbend: internal error: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  },
);
