// src/inputs/files.ts: only regular files are read, with one streaming size limit; folders are created level by
// level and never under /proc, /sys or /dev; errors are one-line InputErrors naming the path, never file bytes.
// The expected outcomes are those of POSIX file types (open(2), fstat(2), mkfifo(3), mkdir(2)) on Linux.
import { spawnSync } from 'node:child_process';
import { chmodSync, copyFileSync, existsSync, ftruncateSync, mkdirSync, mkdtempSync, openSync, closeSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../src/errors.js';
import {
  MAX_INPUT_FILE_BYTES,
  MAX_NEW_FOLDER_LEVELS,
  createFolder,
  parseCsvRecords,
  readFileBytes,
  readTextFile,
} from '../src/inputs/files.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
let work: string;

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-files-'));
});

afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

function errorOf(fn: () => unknown): InputError {
  try {
    fn();
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err;
  }
  throw new Error('no error thrown');
}

function expectOneLine(err: InputError): void {
  // eslint-disable-next-line no-control-regex
  expect(err.message).not.toMatch(/[\u0000-\u001f\u007f-\u009f]/);
  expect(err.message.length).toBeLessThan(600);
}

describe('readTextFile: regular files only', () => {
  it('reads a UTF-8 file and removes a byte-order mark', () => {
    const path = join(work, 'ok.csv');
    writeFileSync(path, '\ufeffpotential_V,capacitance_F\n0,1e-6\n');
    expect(readTextFile(path, '--data')).toBe('potential_V,capacitance_F\n0,1e-6\n');
  });

  it('a missing file, a folder, a FIFO and a path through a file are refused by type, naming the path', () => {
    const missing = join(work, 'nope.json');
    expect(errorOf(() => readTextFile(missing, '--materials')).message).toBe(`--materials: ${missing}: file not found`);
    const folder = join(work, 'a-folder');
    mkdirSync(folder);
    expect(errorOf(() => readTextFile(folder, '--materials')).message).toMatch(/a-folder: is a folder, not a file$/);
    const fifo = join(work, 'pipe');
    const made = spawnSync('mkfifo', [fifo]);
    expect(made.status, 'mkfifo').toBe(0);
    // opened non-blocking: no writer is needed for the refusal (a blocking open would hang here)
    expect(errorOf(() => readTextFile(fifo, '--materials')).message).toMatch(/pipe: is a pipe \(FIFO\), not a regular file$/);
    const file = join(work, 'plain.txt');
    writeFileSync(file, 'x');
    expect(errorOf(() => readTextFile(join(file, 'inside.json'), '--materials')).message).toMatch(/a part of the path is not a folder$/);
  });

  it('/dev, /proc and /sys are refused before opening, also through a symbolic link', () => {
    for (const path of ['/dev/zero', '/dev/urandom', '/proc/self/environ', '/proc/self/cmdline', '/sys/kernel/mm/transparent_hugepage/enabled']) {
      const err = errorOf(() => readTextFile(path, '--materials'));
      expect(err.message).toMatch(/is inside \/(dev|proc|sys): only regular files are read$/);
    }
    const link = join(work, 'zeros.json');
    symlinkSync('/dev/zero', link);
    expect(errorOf(() => readTextFile(link, '--materials')).message).toBe(`--materials: ${link}: is inside /dev: only regular files are read`);
  });

  it('one size limit with one wording; a sparse 1 GiB file is refused without reading it', () => {
    const big = join(work, 'sparse.json');
    const fd = openSync(big, 'w');
    ftruncateSync(fd, 1024 ** 3);
    closeSync(fd);
    const err = errorOf(() => readTextFile(big, '--materials'));
    expect(err.message).toBe(`--materials: ${big}: file is larger than the 5 MB limit (allowed: files of at most 5 MB (5,000,000 bytes))`);
    const edge = join(work, 'edge.txt');
    writeFileSync(edge, 'a'.repeat(MAX_INPUT_FILE_BYTES));
    expect(readTextFile(edge, 'f').length).toBe(MAX_INPUT_FILE_BYTES);
    writeFileSync(edge, 'a'.repeat(MAX_INPUT_FILE_BYTES + 1));
    expect(errorOf(() => readTextFile(edge, 'f')).message).toMatch(/file is larger than the 5 MB limit/);
    // a smaller limit for one caller keeps the same sentence shape
    writeFileSync(edge, 'abcdef');
    expect(errorOf(() => readFileBytes(edge, 'f', 5)).message).toMatch(/file is larger than the 5-byte limit/);
  });

  it('binary data is refused without echoing any of its bytes', () => {
    const secret = 'TOP-SECRET-\u001b[2J';
    const nul = join(work, 'nul.json');
    writeFileSync(nul, Buffer.concat([Buffer.from(secret), Buffer.from([0, 0, 0])]));
    const a = errorOf(() => readTextFile(nul, '--materials'));
    expect(a.message).toMatch(/contains NUL bytes: not a text file/);
    expect(a.message).not.toContain('SECRET');
    const latin = join(work, 'latin1.csv');
    writeFileSync(latin, Buffer.from([0x53, 0x45, 0x43, 0x52, 0x45, 0x54, 0xe9, 0xff, 0xfe]));
    const b = errorOf(() => readTextFile(latin, '--data'));
    expect(b.message).toMatch(/is not UTF-8 text/);
    expect(b.message).not.toContain('SECRET');
  });

  it('paths with control characters are shown without them; empty and NUL paths are refused', () => {
    const odd = join(work, 'odd\u001b[31mname\u0007.json');
    const err = errorOf(() => readTextFile(odd, '--materials'));
    expectOneLine(err);
    expect(err.message).toContain('odd?[31mname?.json: file not found');
    expect(errorOf(() => readTextFile('', '--materials')).message).toMatch(/missing path/);
    expect(errorOf(() => readTextFile('a\u0000b', '--materials')).message).toMatch(/NUL character/);
    expect(errorOf(() => readTextFile('x'.repeat(100_000), '--materials')).message).toMatch(/path is too long/);
  });

  it('the path is named once when the field already holds it', () => {
    const missing = join(work, 'again.yaml');
    expect(errorOf(() => readTextFile(missing, missing)).message).toBe(`${missing}: file not found`);
  });
});

describe('createFolder: bounded, never under /proc, /sys, /dev', () => {
  it('creates missing levels and accepts an existing writable folder', () => {
    const target = join(work, 'out', 'a', 'b');
    expect(createFolder(target, '--out')).toBe(target);
    expect(statSync(target).isDirectory()).toBe(true);
    expect(createFolder(target, '--out')).toBe(target);
  });

  it('refuses system folders (recursive mkdir under /proc never returns), files and too many levels', () => {
    expect(errorOf(() => createFolder('/proc/bandbend-test/x', '--out')).message).toMatch(/is inside \/proc: output folders cannot be created there$/);
    expect(errorOf(() => createFolder('/sys/bandbend-test', '--out')).message).toMatch(/is inside \/sys/);
    expect(errorOf(() => createFolder('/dev/null', '--out')).message).toMatch(/is inside \/dev/);
    const file = join(work, 'not-a-folder');
    writeFileSync(file, 'x');
    expect(errorOf(() => createFolder(file, '--out')).message).toBe(`--out: ${file}: exists and is not a folder`);
    expect(errorOf(() => createFolder(join(file, 'sub'), '--out')).message).toMatch(/a part of the path is a file, not a folder$/);
    const deep = join(work, ...Array.from({ length: MAX_NEW_FOLDER_LEVELS + 1 }, (_, k) => `d${k}`));
    expect(errorOf(() => createFolder(deep, '--out')).message).toMatch(new RegExp(`more than ${MAX_NEW_FOLDER_LEVELS} new folder levels`));
    expect(existsSync(join(work, 'd0'))).toBe(false);
  });

  it('a read-only folder is reported as read-only, not as a missing file', () => {
    const locked = join(work, 'locked');
    mkdirSync(locked);
    chmodSync(locked, 0o555);
    const target = join(locked, 'new');
    let message: string;
    if (process.getuid?.() === 0) {
      // root may write anywhere: run the same call as the unprivileged user 65534 (setpriv, util-linux)
      // (a copy of the compiled module in the temp folder, so that the clone's own permissions do not matter)
      chmodSync(work, 0o755);
      const mod = join(work, 'mod');
      mkdirSync(join(mod, 'inputs'), { recursive: true });
      writeFileSync(join(mod, 'package.json'), '{"type":"module"}');
      copyFileSync(join(ROOT, 'dist', 'inputs', 'files.js'), join(mod, 'inputs', 'files.js'));
      copyFileSync(join(ROOT, 'dist', 'errors.js'), join(mod, 'errors.js'));
      const script = `import('${join(mod, 'inputs', 'files.js')}').then((m) => { try { m.createFolder(${JSON.stringify(target)}, '--out'); console.log('created'); } catch (e) { console.log(e.message); } });`;
      const r = spawnSync('setpriv', ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, '-e', script], { encoding: 'utf8', cwd: '/' });
      expect(r.status, r.stderr).toBe(0);
      message = r.stdout.trim();
    } else {
      message = errorOf(() => createFolder(target, '--out')).message;
    }
    expect(message).toBe(`--out: ${target}: folder ${locked} is read-only for this user (permission denied)`);
    expect(existsSync(target)).toBe(false);
    chmodSync(locked, 0o755);
  });
});

describe('parseCsvRecords: large inputs', () => {
  it('splits 200k rows in one pass, with quoted cells and comments, keeping file line numbers', () => {
    const rows = 200_000;
    const lines = ['# comment', 'a,b'];
    for (let k = 0; k < rows; k++) lines.push(k % 1000 === 0 ? `"${k}","x ""q"""` : `${k},${k * 2}`);
    const records = parseCsvRecords(lines.join('\r\n') + '\r\n', 'big.csv');
    expect(records).toHaveLength(rows + 1);
    expect(records[0]).toEqual({ line: 2, cells: ['a', 'b'] });
    expect(records[1]).toEqual({ line: 3, cells: ['0', 'x "q"'] });
    expect(records[rows]).toEqual({ line: rows + 2, cells: [String(rows - 1), String((rows - 1) * 2)] });
  });
});
