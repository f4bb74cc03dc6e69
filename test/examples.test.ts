// Every example a user can copy runs (bandbend issue 13, item 8): the "Examples:" lines of every command's
// --help, and every `bandbend` / `npx bandbend` line in the ```sh blocks of README.md. Each must exit 0. They run
// in order (a later example may use what an earlier one wrote, e.g. study shards before the merge), in a fresh
// temporary folder per command or README section that links to the package's examples/ folder, so files
// they write stay out of the package.
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const BIN = join(ROOT, 'bin', 'bandbend.js');
const folders: string[] = [];

afterAll(() => {
  for (const f of folders) rmSync(f, { recursive: true, force: true });
});

/** A fresh working folder with examples/ linked in (examples refer to examples/...). */
function workFolder(): string {
  const dir = mkdtempSync(join(tmpdir(), 'bandbend-examples-'));
  symlinkSync(join(ROOT, 'examples'), join(dir, 'examples'));
  folders.push(dir);
  return dir;
}

function run(args: string[], cwd: string): { code: number | null; stdout: string; stderr: string } {
  const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1' };
  delete env['BANDBEND_DEBUG'];
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', env, timeout: 300_000, maxBuffer: 64 * 1024 * 1024 });
  if (r.error) throw r.error;
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/**
 * `bandbend explore` without --out serves until stopped: start it, wait for the address it prints, fetch the page
 * (HTTP 200 with the page's HTML), then stop it with SIGINT. PATH is emptied so that no system browser is opened.
 */
async function runServing(args: string[], cwd: string): Promise<{ status: number; body: string; code: number | null; stderr: string }> {
  const child = spawn(process.execPath, [BIN, ...args], { cwd, env: { ...process.env, NO_COLOR: '1', PATH: '' }, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`no address printed: ${stderr}`)), 60_000);
    child.stdout.on('data', (d: Buffer) => {
      stdout += d.toString();
      const m = /http:\/\/127\.0\.0\.1:\d+\//.exec(stdout);
      if (m) {
        clearTimeout(timer);
        resolve(m[0]);
      }
    });
    child.on('exit', () => reject(new Error(`exited before serving: ${stderr}`)));
  });
  const response = await fetch(url);
  const body = await response.text();
  child.kill('SIGINT');
  const code = await exited;
  return { status: response.status, body, code, stderr };
}

/** Whether an example line serves until stopped (explore without --out). */
function serves(args: string[]): boolean {
  return args[0] === 'explore' && !args.includes('--out') && !args.includes('--help');
}

/** Run one example: exit 0, or for a serving example the page answered. */
async function runExample(args: string[], cwd: string, line: string): Promise<void> {
  if (serves(args)) {
    const r = await runServing(args, cwd);
    expect(r.status, `${line}\n${r.stderr}`).toBe(200);
    expect(r.body, line).toContain('<html');
    return;
  }
  const r = run(args, cwd);
  expect(r.code, `${line}\n${r.stderr}`).toBe(0);
}

/** Shell words of one command line: double and single quotes group, a trailing "# comment" is dropped. */
export function shellWords(line: string): string[] {
  const words: string[] = [];
  const re = /"([^"]*)"|'([^']*)'|(#.*$)|([^\s"'#][^\s"']*(?:"[^"]*"[^\s"']*)*)/g;
  for (let m = re.exec(line); m !== null; m = re.exec(line)) {
    if (m[3] !== undefined) break;
    words.push(m[1] ?? m[2] ?? m[4]!);
  }
  return words;
}

/** The bandbend command lines of --help text: the lines after "Examples:" that start with "bandbend ". */
function helpExamples(help: string): string[] {
  const after = help.split(/^Examples:$/m)[1] ?? '';
  return after
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l.startsWith('bandbend '));
}

/** Commands a README block may show that are not bandbend itself, and why they are not run here. */
const NOT_RUN: Record<string, string> = {
  'npm install && npm start': 'the quick start itself: npm test, which runs this file, is its check',
  'npm test': 'this test suite',
};

/** The ```sh blocks of the README: each block's command lines (continuations joined, comment lines dropped). */
function readmeCommands(markdown: string): string[][] {
  const blocks = [...markdown.matchAll(/^```sh\n([\s\S]*?)^```$/gm)].map((m) => m[1]!);
  return blocks.map((block) => {
    const joined = block.replace(/\\\n\s*/g, ' ');
    return joined
      .split('\n')
      .map((l) => l.trim())
      .filter((l) => l !== '' && !l.startsWith('#'));
  });
}

const COMMANDS: string[][] = [
  [],
  ['contact'],
  ['screen'],
  ['study'],
  ['mott-schottky'],
  ['demo'],
  ['materials'],
  ['materials', 'list'],
  ['materials', 'show'],
  ['validate'],
  ['explore'],
];

describe('every --help example runs', () => {
  const home = workFolder();
  const seen = new Set<string>();
  for (const command of COMMANDS) {
    const help = run([...command, '--help'], home);
    const examples = helpExamples(help.stdout).filter((l) => !seen.has(l));
    examples.forEach((l) => seen.add(l));
    if (examples.length === 0) continue;
    describe(`bandbend ${command.join(' ') || '(top level)'}`, () => {
      const cwd = workFolder();
      for (const line of examples) {
        it(line, () => runExample(shellWords(line).slice(1), cwd, line));
      }
    });
  }

  it('every command with options shows at least one example', () => {
    for (const command of COMMANDS.slice(1)) {
      const help = run([...command, '--help'], home);
      expect(helpExamples(help.stdout).length, command.join(' ')).toBeGreaterThan(0);
    }
  });
});

describe('every README command line runs', () => {
  const blocks = readmeCommands(readFileSync(join(ROOT, 'README.md'), 'utf8'));
  it('the README has its sh blocks and each line is a bandbend command or a listed npm step', () => {
    expect(blocks.length).toBeGreaterThan(5);
    for (const line of blocks.flat()) {
      const words = shellWords(line);
      const isBandbend = words[0] === 'bandbend' || (words[0] === 'npx' && words[1] === 'bandbend');
      expect(isBandbend || NOT_RUN[line] !== undefined, line).toBe(true);
    }
  });
  blocks.forEach((lines, b) => {
    const commands = lines.filter((l) => NOT_RUN[l] === undefined);
    if (commands.length === 0) return;
    describe(`sh block ${b + 1}`, () => {
      const cwd = workFolder();
      for (const line of commands) {
        it(line, () => {
          const words = shellWords(line);
          return runExample(words.slice(words[0] === 'npx' ? 2 : 1), cwd, line);
        });
      }
    });
  });
});

describe('shellWords', () => {
  it('groups quotes and drops comments', () => {
    expect(shellWords('bandbend contact --donors "5e17 cm^-3" --x \'a b\'   # note')).toEqual(['bandbend', 'contact', '--donors', '5e17 cm^-3', '--x', 'a b']);
    expect(shellWords('bandbend validate                         # models')).toEqual(['bandbend', 'validate']);
  });
});
