// bin/bandbend.js: the CommonJS launcher that loads the bundle's chunks with V8's code cache (src/cli/bundle.ts), and
// the direct writes to the standard streams' file descriptors (src/cli/io.ts, writeToFd).
// Sources: Node.js documentation, vm.Script options `cachedData` and property `cachedDataRejected` (a cache that does
// not match the source is rejected, never used); "A note on process I/O" (stdout/stderr synchronous for files and
// pipes on Linux). That a command whose reader has gone ends quietly (`cmd | head`) is common practice, no source.
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { runBandbend } from './helpers.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const ARGS = ['contact', '--metal', 'Pt', '--support', 'ZnO', '--donors', '1e17 cm^-3', '--temperature', '473 K', '--json'];

/** A private copy of the installed layout (bin, dist/bundle, dist/cli/main.js for the freshness check, materials). */
function privateInstall(): string {
  const dir = mkdtempSync(join(tmpdir(), 'bandbend-launcher-'));
  cpSync(join(ROOT, 'bin'), join(dir, 'bin'), { recursive: true, preserveTimestamps: true });
  cpSync(join(ROOT, 'dist', 'bundle'), join(dir, 'dist', 'bundle'), { recursive: true, preserveTimestamps: true });
  cpSync(join(ROOT, 'dist', 'cli', 'main.js'), join(dir, 'dist', 'cli', 'main.js'), { preserveTimestamps: true });
  cpSync(join(ROOT, 'materials'), join(dir, 'materials'), { recursive: true });
  cpSync(join(ROOT, 'package.json'), join(dir, 'package.json'));
  symlinkSync(join(ROOT, 'node_modules'), join(dir, 'node_modules'), 'dir');
  return dir;
}

function run(dir: string): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, ['bin/bandbend.js', ...ARGS], { cwd: dir, encoding: 'utf8', timeout: 120_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const coreCacheOf = (dir: string): string => {
  const core = readdirSync(join(dir, 'dist', 'bundle')).find((f) => /^core-.*\.cjs$/.test(f));
  if (core === undefined) throw new Error('no core chunk in dist/bundle (run npm run build)');
  return join(dir, 'dist', 'bundle', `${core}.v8cache`);
};

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});

describe('the launcher and its code cache', () => {
  const reference = runBandbend(ARGS);

  it('the build leaves a code cache for the core chunk', () => {
    expect(existsSync(coreCacheOf(ROOT))).toBe(true);
  });

  it('a corrupt cache is rejected, the output is unchanged, and the cache is rewritten', () => {
    const dir = privateInstall();
    made.push(dir);
    const cache = coreCacheOf(dir);
    const garbage = Buffer.alloc(4096, 0x5a);
    writeFileSync(cache, garbage);
    const r = run(dir);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toBe(reference.stdout);
    expect(readFileSync(cache).equals(garbage)).toBe(false);
    expect(readdirSync(join(dir, 'dist', 'bundle')).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('a missing cache is written by the next run, which gives the same output', () => {
    const dir = privateInstall();
    made.push(dir);
    const cache = coreCacheOf(dir);
    rmSync(cache);
    const r = run(dir);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(reference.stdout);
    expect(existsSync(cache)).toBe(true);
    expect(run(dir).stdout).toBe(reference.stdout);
  });
});

describe('standard streams', () => {
  it('a reader that has gone before the output is written ends the command quietly, with its own exit code', () => {
    // `true` exits at once, so the CLI's single write meets a closed pipe (EPIPE)
    const script = `set -o pipefail; "${process.execPath}" bin/bandbend.js ${ARGS.map((a) => `'${a}'`).join(' ')} 2>"$ERR_FILE" | true`;
    const errFile = join(mkdtempSync(join(tmpdir(), 'bandbend-pipe-')), 'stderr.txt');
    made.push(join(errFile, '..'));
    const r = spawnSync('bash', ['-c', script], { cwd: ROOT, env: { ...process.env, ERR_FILE: errFile }, encoding: 'utf8', timeout: 120_000 });
    expect(r.status).toBe(0);
    expect(readFileSync(errFile, 'utf8')).toBe('');
  });

  it('help text meeting a reader that has gone ends quietly too (`bandbend contact --help | head -1`)', () => {
    // the help text is written by the argument parser, not by the command: same rule (common practice, no source)
    const errFile = join(mkdtempSync(join(tmpdir(), 'bandbend-pipe-')), 'stderr.txt');
    made.push(join(errFile, '..'));
    for (const args of [['contact', '--help'], ['--help'], ['--version']]) {
      const script = `set -o pipefail; "${process.execPath}" bin/bandbend.js ${args.join(' ')} 2>"$ERR_FILE" | true`;
      const r = spawnSync('bash', ['-c', script], { cwd: ROOT, env: { ...process.env, ERR_FILE: errFile }, encoding: 'utf8', timeout: 120_000 });
      expect(r.status).toBe(0);
      expect(readFileSync(errFile, 'utf8')).toBe('');
    }
  });

  it('bad input still gives one line on stderr and exit 2', () => {
    const r = runBandbend(['contact', '--metal', 'Pt', '--support', 'ZnO', '--temperature', '-5 K']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr.startsWith('bandbend: error: ')).toBe(true);
  });
});
