// The explorer page on 127.0.0.1: a static file server for the built folder dist/explorer/ (GET and HEAD only,
// files inside that folder only, path traversal refused), and the copy of that folder for any web host.
import { spawn } from 'node:child_process';
import { accessSync, constants, cpSync, existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { delimiter, extname, join, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError } from '../errors.js';
import { createFolder } from '../inputs/files.js';

/** The built page: dist/explorer/ of the package (this module is dist/cli/exploreServer.js, or src/cli/ under vitest). */
export function explorerRoot(): string {
  const root = fileURLToPath(new URL('../../dist/explorer/', import.meta.url));
  if (!existsSync(join(root, 'index.html'))) {
    throw new Error(`the explorer page is not built (${join(root, 'index.html')} is missing): run \`npm run build\``);
  }
  return resolve(root);
}

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.map': 'application/json; charset=utf-8',
  '.wasm': 'application/wasm',
  '.txt': 'text/plain; charset=utf-8',
};

/** The file a URL path names inside root, or undefined (outside root, encoded separators, NUL, not a file). */
export function resolveStatic(root: string, urlPath: string): string | undefined {
  let path: string;
  try {
    path = decodeURIComponent(urlPath.split('?')[0]!.split('#')[0]!);
  } catch {
    return undefined;
  }
  if (path.includes('\0') || path.includes('\\') || !path.startsWith('/')) return undefined;
  if (path.split('/').some((part) => part === '..' || part === '.')) return undefined;
  const file = resolve(root, `.${path.endsWith('/') ? `${path}index.html` : path}`);
  if (file !== root && !file.startsWith(root + sep)) return undefined;
  try {
    return statSync(file).isFile() ? file : undefined;
  } catch {
    return undefined;
  }
}

function send(res: ServerResponse, status: number, text: string): void {
  res.writeHead(status, { 'Content-Type': 'text/plain; charset=utf-8', 'X-Content-Type-Options': 'nosniff' });
  res.end(`${text}\n`);
}

function handle(root: string, req: IncomingMessage, res: ServerResponse): void {
  if (req.method !== 'GET' && req.method !== 'HEAD') {
    res.setHeader('Allow', 'GET, HEAD');
    return send(res, 405, 'method not allowed');
  }
  const file = resolveStatic(root, req.url ?? '/');
  if (file === undefined) return send(res, 404, 'not found');
  const body = readFileSync(file);
  res.writeHead(200, {
    'Content-Type': CONTENT_TYPES[extname(file).toLowerCase()] ?? 'application/octet-stream',
    'Content-Length': body.length,
    'Cache-Control': 'no-cache',
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer',
  });
  res.end(req.method === 'HEAD' ? undefined : body);
}

export interface RunningExplorer {
  url: string;
  port: number;
  server: Server;
  /** stop serving (resolves when the server has closed) */
  close(): Promise<void>;
  /** resolves when the server has closed (by close(), or Ctrl+C when started by the CLI) */
  closed: Promise<void>;
}

/** Flags that only apply to serving, or only to --out, are refused in the other mode (nothing silently ignored). */
export function checkExploreFlags(opts: Record<string, unknown>): void {
  const out = typeof opts['out'] === 'string';
  if (out && opts['port'] !== undefined) throw new InputError('--port', 'only used when serving the page (without --out)', 'leave out --port');
  if (out && opts['open'] === false) throw new InputError('--no-open', 'only used when serving the page (without --out)', 'leave out --no-open');
  if (!out && opts['force'] === true) throw new InputError('--force', 'only used with --out DIR', 'leave out --force');
}

/** --port: a whole number 0-65535 (0 = any free port). */
export function parsePort(value: unknown): number {
  const text = String(value ?? '0').trim();
  const port = /^\d{1,5}$/.test(text) ? Number(text) : NaN;
  if (!(port >= 0 && port <= 65535)) throw new InputError('--port', `expected a port number, got "${text}"`, '0 to 65535 (0 = any free port)');
  return port;
}

/** Serve the built page on 127.0.0.1. A port in use (or not allowed) is an InputError naming --port. */
export function serveExplorer(options: { port: number; root?: string; signals?: boolean }): Promise<RunningExplorer> {
  const root = options.root ?? explorerRoot();
  const server = createServer((req, res) => handle(root, req, res));
  const closed = new Promise<void>((done) => server.once('close', () => done()));
  return new Promise((resolvePromise, reject) => {
    server.once('error', (err: NodeJS.ErrnoException) => {
      if (err.code === 'EADDRINUSE') reject(new InputError('--port', `port ${options.port} on 127.0.0.1 is in use`, 'a free port, or 0 for any free port'));
      else if (err.code === 'EACCES') reject(new InputError('--port', `port ${options.port} is not allowed for this user`, 'a port above 1023, or 0'));
      else reject(err);
    });
    server.listen(options.port, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address !== null ? address.port : options.port;
      const close = () =>
        new Promise<void>((done) => {
          server.close(() => done());
          server.closeAllConnections(); // keep-alive connections of the browser would hold the close
        });
      if (options.signals !== false) {
        for (const signal of ['SIGINT', 'SIGTERM'] as const) process.once(signal, () => void close());
      }
      resolvePromise({ url: `http://127.0.0.1:${port}/`, port, server, close, closed });
    });
  });
}

/** Copy the built page to `out` (created if missing); a non-empty folder is refused unless `force`. */
export function exportExplorer(out: string, force: boolean): string {
  const root = explorerRoot();
  const target = resolve(out);
  if (target === root || target.startsWith(root + sep) || root.startsWith(target + sep)) {
    throw new InputError('--out', `${out} overlaps the built page folder ${root}`, 'a folder outside it');
  }
  if (existsSync(out) && statSync(out).isDirectory() && readdirSync(out).length > 0 && !force) {
    throw new InputError('--out', `folder ${out} is not empty`, 'a new or empty folder, or add --force to write into it');
  }
  const dir = createFolder(out, '--out');
  cpSync(root, dir, { recursive: true, force: true });
  return dir;
}

/** Open the URL with xdg-open (`open` on macOS) when it is on the PATH; never fails (the address is printed anyway). */
export function openBrowser(url: string): void {
  const program = process.platform === 'darwin' ? 'open' : 'xdg-open';
  const opener = (process.env['PATH'] ?? '')
    .split(delimiter)
    .filter((d) => d !== '')
    .map((d) => join(d, program))
    .find((p) => {
      try {
        accessSync(p, constants.X_OK);
        return true;
      } catch {
        return false;
      }
    });
  if (opener === undefined) return;
  try {
    const child = spawn(opener, [url], { detached: true, stdio: 'ignore' });
    child.on('error', () => undefined);
    child.unref();
  } catch {
    // no browser: the printed address is enough
  }
}
