/// <reference lib="dom" />
// Browser check of the explorer page (issue 15), in the Chromium shipped inside the devDependency
// @sparticuz/chromium (test/support/browser.ts; never a system browser, never skipped).
//
// The page is served by the `explore` command's own server, in-process on a free port. The reference for every
// number the page shows is the CLI: the page's "copy as command" line is run as `bandbend contact ... --json`
// (compiled CLI, dist/) and the numbers shown must equal that JSON formatted to the printed precision (3
// significant digits, src/output/format.ts). The sweep must equal `bandbend study` run on the page's own study
// file. Also checked: the URL restores every input, no console errors, no request leaves the page's origin,
// `explore --out` writes a folder that serves the page, path traversal is refused, a port in use exits 2.
// Screenshot: test-output/explorer/explorer.png (BANDBEND_DOCS_SCREENSHOT=1 also writes docs/explorer.png).
import { spawn, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser } from './support/browser.js';
import { serveExplorer, type RunningExplorer } from '../src/cli/exploreServer.js';
import { formatNumber } from '../src/output/format.js';
import { commandLine, fromQuery, toQuery, type SweepSettings } from '../explorer/share.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const OUTPUT_DIR = join(ROOT, 'test-output', 'explorer');

let browser: Browser;
let server: RunningExplorer;
let work: string;

beforeAll(async () => {
  if (!existsSync(join(ROOT, 'dist', 'explorer', 'index.html')) || !existsSync(join(ROOT, 'dist', 'cli', 'main.js'))) {
    throw new Error('the explorer page or the CLI is not built: run `npm run build` first (npm test does)');
  }
  work = mkdtempSync(join(tmpdir(), 'bandbend-explorer-'));
  server = await serveExplorer({ port: 0, signals: false });
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
  rmSync(work, { recursive: true, force: true });
});

interface Watched {
  page: Page;
  problems: string[];
  requests: string[];
}

/** A page that records console errors, uncaught exceptions, failed requests and every request URL. */
async function watchedPage(): Promise<Watched> {
  const page = await browser.newPage({ viewport: { width: 1360, height: 1000 }, acceptDownloads: true });
  const problems: string[] = [];
  const requests: string[] = [];
  page.on('console', (msg) => {
    if (msg.type() === 'error') problems.push(`console: ${msg.text()}`);
  });
  page.on('pageerror', (err) => problems.push(`page error: ${err.message}`));
  page.on('requestfailed', (req) => problems.push(`request failed: ${req.url()}`));
  page.on('request', (req) => requests.push(req.url()));
  page.on('worker', (worker) => worker.on('console', (msg) => msg.type() === 'error' && problems.push(`worker console: ${msg.text()}`)));
  return { page, problems, requests };
}

async function rendered(page: Page): Promise<number> {
  return page.evaluate(() => Number(document.body.dataset['rendered'] ?? 0));
}

/** Wait until a solve newer than `after` is on the page. */
async function waitForRender(page: Page, after: number): Promise<void> {
  await page.waitForFunction((n) => Number(document.body.dataset['rendered'] ?? 0) > n, after, { timeout: 30_000 });
}

/** Headline numbers as shown: result path -> text. */
async function shownNumbers(page: Page): Promise<Record<string, string>> {
  return page.evaluate(() =>
    Object.fromEntries(Array.from(document.querySelectorAll<HTMLElement>('#headline dd[data-path]')).map((dd) => [dd.dataset['path']!, dd.querySelector('.value')!.textContent!])),
  );
}

async function fieldValues(page: Page): Promise<Record<string, string>> {
  return page.evaluate(() =>
    Object.fromEntries(Array.from(document.querySelectorAll<HTMLElement>('.control')).map((c) => [c.dataset['option']!, (c.querySelector('input[type=text], select') as HTMLInputElement).value])),
  );
}

function read(result: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((node, key) => (node !== null && typeof node === 'object' ? (node as Record<string, unknown>)[key] : undefined), result);
}

/** Run the page's command line with the compiled CLI (through the shell, so its quoting is checked too). */
function runCommand(command: string, extra: string): { status: number | null; stdout: string; stderr: string } {
  expect(command.startsWith('bandbend contact ')).toBe(true);
  const line = `${JSON.stringify(process.execPath)} bin/bandbend.js ${command.slice('bandbend '.length)} ${extra}`;
  const r = spawnSync('bash', ['-c', line], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

function sameOrigin(url: string, origin: string): boolean {
  const u = new URL(url);
  return u.protocol === 'data:' || u.origin === origin;
}

describe('explorer page in Chromium', () => {
  it('shows the numbers of `bandbend contact --json` for the same inputs, after a slider move and typed input', async () => {
    const { page, problems, requests } = await watchedPage();
    await page.goto(server.url, { waitUntil: 'load' });
    await waitForRender(page, 0);
    // move the temperature slider and type a particle size, as a user would
    let before = await rendered(page);
    await page.locator('[data-option=temperature] input[type=range]').fill('300');
    await waitForRender(page, before);
    before = await rendered(page);
    // the donor slider is logarithmic: 10^(10 + 13 t) cm^-3 over 1e10..1e23 (the row's limit), t = 0.6 -> 6.31e17
    await page.locator('[data-option=donors] input[type=range]').fill('600');
    await waitForRender(page, before);
    before = await rendered(page);
    await page.locator('#in-particleDiameter').fill('5');
    await waitForRender(page, before);
    before = await rendered(page);
    await page.locator('#in-geometry').selectOption('hemisphere');
    await waitForRender(page, before);
    const fields = await fieldValues(page);
    expect(Number(fields['temperature'])).toBeGreaterThan(50);
    expect(fields['particleDiameter']).toBe('5');
    expect(fields['donors']).toBe('6.31e17');

    const command = (await page.locator('#command').textContent())!;
    expect(command).toContain('--temperature');
    expect(command).toContain("--particle-diameter '5 nm'");
    expect(command).toContain("--donors '6.31e17 cm^-3'");
    const cli = runCommand(command, '--json');
    expect(cli.status, cli.stderr).toBe(0);
    const json = JSON.parse(cli.stdout) as Record<string, unknown>;
    expect(json['geometry']).toBe('hemisphere');
    expect(json['temperature_K']).toBe(Number(fields['temperature']));

    const shown = await shownNumbers(page);
    expect(Object.keys(shown).length).toBeGreaterThanOrEqual(10);
    for (const [path, text] of Object.entries(shown)) {
      const value = read(json, path);
      const expected = typeof value === 'number' ? formatNumber(value, 3) : String(value);
      expect(`${path} = ${text}`).toBe(`${path} = ${expected}`);
    }
    // the band diagram is drawn: E_C, E_V, E_F and the vacuum level are labelled
    const labels = await page.locator('#band .level-label').allTextContents();
    expect(labels).toEqual(expect.arrayContaining(['E_vac', 'E_C', 'E_V', 'E_F']));

    // "download result (JSON)" is the CLI's JSON document
    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('#download-json').click()]);
    const downloaded = JSON.parse(readFileSync((await download.path())!, 'utf8')) as Record<string, unknown>;
    expect(Object.keys(downloaded)).toEqual(Object.keys(json));
    for (const path of ['barrierHeight_eV', 'bandBending_eV', 'electronsPerParticle', 'width_nm', 'spaceCharge_C_per_m2']) {
      expect(read(downloaded, path) as number).toBeCloseTo(read(json, path) as number, 12);
    }

    // the URL holds every input: a fresh page from it shows the same inputs and the same numbers
    const url = page.url();
    const again = await watchedPage();
    await again.page.goto(url, { waitUntil: 'load' });
    await waitForRender(again.page, 0);
    expect(await fieldValues(again.page)).toEqual(fields);
    expect(await shownNumbers(again.page)).toEqual(shown);

    mkdirSync(OUTPUT_DIR, { recursive: true });
    await page.evaluate(() => {
      window.scrollTo(0, 0);
      document.getElementById('controls')!.scrollTo(0, 0);
    });
    await page.mouse.move(700, 990);
    const shot = join(OUTPUT_DIR, 'explorer.png');
    await page.screenshot({ path: shot, fullPage: false });
    if (process.env['BANDBEND_DOCS_SCREENSHOT'] === '1') copyFileSync(shot, join(ROOT, 'docs', 'explorer.png'));

    const origin = new URL(server.url).origin;
    for (const w of [{ problems, requests }, again]) {
      expect(w.problems).toEqual([]);
      expect(w.requests.length).toBeGreaterThan(0);
      expect(w.requests.filter((r) => !sameOrigin(r, origin))).toEqual([]);
    }
    await again.page.close();
    await page.close();
  });

  it('computes the sweep of the study file it offers, equal to `bandbend study` on that file', async () => {
    const { page, problems } = await watchedPage();
    await page.goto(server.url, { waitUntil: 'load' });
    await waitForRender(page, 0);
    await page.locator('#sweep-x').selectOption('temperature');
    await page.locator('#sweep-form input[name=from]').fill('300');
    await page.locator('#sweep-form input[name=to]').fill('600');
    await page.locator('#sweep-form input[name=points]').fill('4');
    await page.locator('#sweep-log').setChecked(false);
    await page.locator('#sweep-y').selectOption('bandBending_eV');
    await page.waitForFunction(() => {
      const s = (window as unknown as { bandbendExplorer: { lastSweep?: { xs: number[] } } }).bandbendExplorer.lastSweep;
      return s !== undefined && s.xs.length === 4 && s.xs[0] === 300 && s.xs[3] === 600;
    }, undefined, { timeout: 30_000 });
    const sweep = await page.evaluate(() => (window as unknown as { bandbendExplorer: { lastSweep: { xs: number[]; ys: (number | null)[]; output: string } } }).bandbendExplorer.lastSweep);
    expect(sweep.output).toBe('bandBending_eV');

    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('#download-study').click()]);
    const file = join(work, 'sweep-study.json');
    writeFileSync(file, readFileSync((await download.path())!));
    const out = join(work, 'study-out');
    const r = spawnSync(process.execPath, ['bin/bandbend.js', 'study', file, '--out', out], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
    expect(r.status, r.stderr).toBe(0);
    const rows = readFileSync(join(out, 'results.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    const study = rows.filter((row) => 'bandBending_eV' in row || 'outputs' in row);
    expect(study.length).toBe(4);
    study.forEach((row, i) => {
      const value = (row['bandBending_eV'] ?? (row['outputs'] as Record<string, unknown> | undefined)?.['bandBending_eV']) as number;
      expect(sweep.ys[i]!).toBeCloseTo(value, 9);
    });
    expect(problems).toEqual([]);
    await page.close();
  });
});

describe('shareable state (no browser)', () => {
  const sweep: SweepSettings = { option: 'temperature', from: 300, to: 700, points: 9, log: false, output: 'electronsPerParticle' };
  const inputs = {
    metal: 'Pt',
    support: 'ZnO',
    workFunctionShift: '0.1',
    workFunctionShiftSource: `Kelvin probe, batch 'K7' "dried" $HOME; \\ & | * ?`,
    temperature: '200 degC',
    donors: '3e17',
  };

  it('the command line survives the shell: bash hands the CLI exactly the typed text (checked in its provenance)', () => {
    const cli = runCommand(commandLine(inputs), '--json');
    expect(cli.status, cli.stderr).toBe(0);
    const json = JSON.parse(cli.stdout) as { inputs: { field: string; value: number; note?: string }[]; temperature_K: number; donorDensity_cm3: number };
    expect(json.inputs.find((i) => i.field === 'work-function shift')?.note).toBe(`source: ${inputs.workFunctionShiftSource}`);
    expect(json.temperature_K).toBeCloseTo(473.15, 9); // 200 degC, the Celsius scale's definition
    expect(json.donorDensity_cm3).toBeCloseTo(3e17, -10); // a bare number took the row's display unit, cm^-3
  });

  it('the URL query round-trips every input and the sweep', () => {
    const state = fromQuery(toQuery({ inputs, sweep }), { ...sweep, option: 'donors' });
    expect(state).toEqual({ inputs, sweep });
  });
});

function get(port: number, path: string): Promise<{ status: number; type: string; body: string }> {
  return new Promise((done, fail) => {
    const req = request({ host: '127.0.0.1', port, path, method: 'GET' }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => (body += chunk));
      res.on('end', () => done({ status: res.statusCode ?? 0, type: String(res.headers['content-type'] ?? ''), body }));
    });
    req.on('error', fail);
    req.end();
  });
}

function runCli(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, ['bin/bandbend.js', ...args], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('explore command', () => {
  it('--out writes a folder that serves the page; a non-empty folder needs --force', async () => {
    const out = join(work, 'site', 'explorer');
    const first = runCli(['explore', '--out', out]);
    expect(first.status, first.stderr).toBe(0);
    expect(existsSync(join(out, 'index.html'))).toBe(true);
    const second = runCli(['explore', '--out', out]);
    expect(second.status).toBe(2);
    expect(second.stderr.trim().split('\n')).toHaveLength(1);
    expect(second.stderr).toContain('--out');
    expect(runCli(['explore', '--out', out, '--force']).status).toBe(0);
    // flags of the other mode are refused, not ignored
    for (const args of [['--out', out, '--force', '--port', '8000'], ['--force', '--no-open']]) {
      const r = runCli(['explore', ...args]);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }

    // the copy is servable as it is: the page loads from it and solves
    const copy = await serveExplorer({ port: 0, root: out, signals: false });
    try {
      const index = await get(copy.port, '/');
      expect(index.status).toBe(200);
      expect(index.type).toContain('text/html');
      const script = /src="\.\/(assets\/[^"]+\.js)"/.exec(index.body)?.[1];
      expect(script).toBeDefined();
      const js = await get(copy.port, `/${script!}`);
      expect(js.status).toBe(200);
      expect(js.type).toContain('text/javascript');
      const { page, problems } = await watchedPage();
      await page.goto(copy.url, { waitUntil: 'load' });
      await waitForRender(page, 0);
      expect(await page.locator('#headline dd[data-path=barrierHeight_eV]').count()).toBe(1);
      expect(problems).toEqual([]);
      await page.close();
    } finally {
      await copy.close();
    }
  });

  it('refuses path traversal and serves only files of the built folder', async () => {
    const secret = readFileSync(join(ROOT, 'package.json'), 'utf8');
    for (const path of ['/../package.json', '/../../package.json', '/%2e%2e/package.json', '/assets/..%2f..%2fpackage.json', '/..%5c..%5cpackage.json', '//etc/passwd', '/%00index.html', '/assets/']) {
      const r = await get(server.port, path);
      expect(r.status, path).toBe(404);
      expect(r.body).not.toContain('"name": "bandbend"');
      expect(secret).toContain('"name": "bandbend"');
    }
    expect((await get(server.port, '/index.html')).status).toBe(200);
  });

  it('a port in use, or a bad port, exits 2 with one line naming --port', async () => {
    const inUse = runCli(['explore', '--port', String(server.port), '--no-open']);
    expect(inUse.status).toBe(2);
    expect(inUse.stderr.trim().split('\n')).toHaveLength(1);
    expect(inUse.stderr).toContain('--port');
    const bad = runCli(['explore', '--port', 'http', '--no-open']);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('--port');
  });

  it('prints the address it serves on', async () => {
    const child = spawn(process.execPath, ['bin/bandbend.js', 'explore', '--port', '0', '--no-open'], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    try {
      const url = await new Promise<string>((done, fail) => {
        let text = '';
        child.stdout.setEncoding('utf8');
        child.stdout.on('data', (chunk: string) => {
          text += chunk;
          const m = /http:\/\/127\.0\.0\.1:(\d+)\//.exec(text);
          if (m) done(m[0]);
        });
        child.on('exit', (code) => fail(new Error(`explore exited (${String(code)}) before printing an address: ${text}`)));
      });
      const r = await get(Number(new URL(url).port), '/');
      expect(r.status).toBe(200);
      expect(r.body).toContain('bandbend explorer');
    } finally {
      child.kill('SIGINT');
    }
  });
});
