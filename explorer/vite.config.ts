// Build of the browser explorer: `vite build --config explorer/vite.config.ts` (part of `npm run build`).
// The page bundles the same library code as the CLI (imported from ../src); node-only modules the library
// imports are replaced by stubs in explorer/shims/ that throw if ever called. The output, dist/explorer/, is a
// static folder with relative paths (base './') that any web host can serve; `bandbend explore` serves it.
import { fileURLToPath } from 'node:url';
import { createLogger, defineConfig } from 'vite';

const here = (path: string): string => fileURLToPath(new URL(path, import.meta.url));

const NODE_SHIMS: Readonly<Record<string, string>> = {
  fs: 'shims/fs.ts',
  'fs/promises': 'shims/fs-promises.ts',
  path: 'shims/path.ts',
  url: 'shims/url.ts',
  os: 'shims/os.ts',
  module: 'shims/module.ts',
  worker_threads: 'shims/worker_threads.ts',
  child_process: 'shims/child_process.ts',
  readline: 'shims/readline.ts',
};

// `node:fs` and `fs` alike; exact matches only (so `fs/promises` is not caught by `fs`)
const alias = Object.entries(NODE_SHIMS).flatMap(([name, file]) => [
  { find: new RegExp(`^node:${name.replace('/', '\\/')}$`), replacement: here(file) },
  { find: new RegExp(`^${name.replace('/', '\\/')}$`), replacement: here(file) },
]);

// src/materials/load.ts names the package's materials folder with new URL(..., import.meta.url) for its node:fs
// reader; the page never reads it (the JSON files are bundled), so vite's note that the folder is not an asset is noise
const logger = createLogger('warn');
const [warn, warnOnce] = [logger.warn.bind(logger), logger.warnOnce.bind(logger)];
const materialsNote = (message: string) => message.includes('"../../materials/"');
logger.warn = (message, options) => void (materialsNote(message) || warn(message, options));
logger.warnOnce = (message, options) => void (materialsNote(message) || warnOnce(message, options));

export default defineConfig({
  root: here('.'),
  base: './',
  publicDir: false,
  logLevel: 'warn',
  customLogger: logger,
  resolve: { alias },
  worker: { format: 'es' },
  build: {
    outDir: here('../dist/explorer'),
    emptyOutDir: true,
    target: 'es2022',
    // one self-contained folder: nothing fetched from elsewhere, no inlined data URLs to trip a strict CSP
    assetsInlineLimit: 0,
    sourcemap: false,
    reportCompressedSize: false,
    chunkSizeWarningLimit: 2000,
  },
});
