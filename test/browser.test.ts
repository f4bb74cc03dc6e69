/// <reference lib="dom" />
// Browser check of the demo report: `bandbend demo --out <tmp>` (compiled CLI), then both report pages are opened in
// headless Chromium through playwright-core. Every SVG figure must be laid out with a non-zero size, the console must
// show no errors and no request may fail (the report is meant to be self-contained and offline).
// A full-page screenshot is saved as test-output/demo-report.png (git-ignored) for a human to look at.
//
// The browser is the Chromium shipped inside the devDependency @sparticuz/chromium (see test/support/browser.ts): no
// system browser is used and none is downloaded. When it cannot be started this test FAILS saying why: never skipped.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser } from './support/browser.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const OUTPUT_DIR = join(ROOT, 'test-output');

let work: string;
let demoDir: string;
let browser: Browser | undefined;

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-browser-'));
  demoDir = join(work, 'demo');
  const r = spawnSync(process.execPath, ['bin/bandbend.js', 'demo', '--out', demoDir], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`bandbend demo failed (exit ${String(r.status)}): ${r.stderr}`);
});

afterAll(async () => {
  await browser?.close();
  rmSync(work, { recursive: true, force: true });
});

async function launch(): Promise<Browser> {
  browser ??= await launchBrowser();
  return browser;
}

interface PageProblems {
  consoleErrors: string[];
  pageErrors: string[];
  failedRequests: string[];
}

/** Open a report page and collect console errors, uncaught exceptions and failed requests while it loads. */
async function openReport(relativePath: string): Promise<{ page: Page; problems: PageProblems }> {
  const b = await launch();
  const page = await b.newPage({ viewport: { width: 1280, height: 900 } });
  const problems: PageProblems = { consoleErrors: [], pageErrors: [], failedRequests: [] };
  page.on('console', (msg) => {
    if (msg.type() === 'error') problems.consoleErrors.push(msg.text());
  });
  page.on('pageerror', (err) => problems.pageErrors.push(err.message));
  page.on('requestfailed', (req) => problems.failedRequests.push(`${req.url()}: ${req.failure()?.errorText ?? 'failed'}`));
  page.on('response', (res) => {
    if (res.status() >= 400) problems.failedRequests.push(`${res.url()}: HTTP ${res.status()}`);
  });
  const file = join(demoDir, relativePath);
  expect(existsSync(file), `${file} was not written by the demo`).toBe(true);
  await page.goto(pathToFileURL(file).href, { waitUntil: 'load' });
  return { page, problems };
}

interface FigureBox {
  index: number;
  label: string;
  width: number;
  height: number;
  left: number;
  right: number;
}

/** Bounding boxes of the outermost <svg> elements (figures), as laid out by the browser. */
async function figureBoxes(page: Page): Promise<FigureBox[]> {
  return page.evaluate(() =>
    Array.from(document.querySelectorAll('svg'))
      .filter((svg) => !svg.parentElement?.closest('svg'))
      .map((svg, index) => {
        const box = svg.getBoundingClientRect();
        const label = svg.getAttribute('aria-label') ?? svg.closest('figure')?.querySelector('figcaption')?.textContent ?? '';
        return { index, label: label.slice(0, 80), width: box.width, height: box.height, left: box.left, right: box.right };
      }),
  );
}

describe('demo report in headless Chromium', () => {
  it('index.html: every SVG figure has a size, no console errors, no failed requests; screenshot saved', async () => {
    const { page, problems } = await openReport('index.html');
    const boxes = await figureBoxes(page);
    // the demo report has the band diagram (linear and log depth), the charge/field figure and the density sweep
    expect(boxes.length, 'number of SVG figures on index.html').toBeGreaterThanOrEqual(3);
    for (const box of boxes) {
      expect(box.width, `figure ${box.index} "${box.label}" width`).toBeGreaterThan(0);
      expect(box.height, `figure ${box.index} "${box.label}" height`).toBeGreaterThan(0);
    }
    // figures stay inside the page: no figure starts left of the viewport (a sign of clipping)
    for (const box of boxes) expect(box.left, `figure ${box.index} "${box.label}" left edge`).toBeGreaterThanOrEqual(0);
    mkdirSync(OUTPUT_DIR, { recursive: true });
    await page.screenshot({ path: join(OUTPUT_DIR, 'demo-report.png'), fullPage: true });
    expect(problems.pageErrors, 'uncaught exceptions').toEqual([]);
    expect(problems.consoleErrors, 'console errors').toEqual([]);
    expect(problems.failedRequests, 'failed requests').toEqual([]);
    // the link to the screen report resolves to a file the demo wrote
    const screenLink = await page.locator('a[href="screen/index.html"]').count();
    expect(screenLink).toBeGreaterThan(0);
    await page.close();
  }, 120_000);

  it('screen/index.html: heat maps have a size, no console errors, no failed requests', async () => {
    const { page, problems } = await openReport(join('screen', 'index.html'));
    const boxes = await figureBoxes(page);
    expect(boxes.length, 'number of heat maps on screen/index.html').toBeGreaterThanOrEqual(3);
    for (const box of boxes) {
      expect(box.width, `figure ${box.index} "${box.label}" width`).toBeGreaterThan(0);
      expect(box.height, `figure ${box.index} "${box.label}" height`).toBeGreaterThan(0);
      expect(box.left, `figure ${box.index} "${box.label}" left edge`).toBeGreaterThanOrEqual(0);
    }
    mkdirSync(OUTPUT_DIR, { recursive: true });
    await page.screenshot({ path: join(OUTPUT_DIR, 'demo-screen-report.png'), fullPage: true });
    expect(problems.pageErrors, 'uncaught exceptions').toEqual([]);
    expect(problems.consoleErrors, 'console errors').toEqual([]);
    expect(problems.failedRequests, 'failed requests').toEqual([]);
    await page.close();
  }, 120_000);
});
