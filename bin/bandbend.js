#!/usr/bin/env node
// Thin launcher: the compiled CLI lives in dist/ (run `npm run build` first).
import { main } from '../dist/cli/main.js';

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
