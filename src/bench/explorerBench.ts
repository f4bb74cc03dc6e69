// Bench of the explorer page (issue 15): the time from an input to the updated band diagram, in Chromium.
//
// The built page (dist/explorer/) is served by the `explore` command's server on a free port of 127.0.0.1 and
// opened in the headless Chromium shipped inside the devDependency @sparticuz/chromium (browserLaunch.ts). The
// temperature slider is moved programmatically (value set, `input` event dispatched, as a drag does) to
// alternating positions; the page itself records, with performance.now(), the time from the input event to the
// moment the new band diagram is in the DOM (window.bandbendExplorer.latencies_ms; it includes the wait for the
// next animation frame, the message to the worker, the solve and the drawing). Each move waits for its diagram
// before the next, so every sample is one full round. 5 warm-up moves, then MOVES timed ones; median and p90.
// The worker's own solve time for each move is reported beside it. Target (issue 15): median under 50 ms.
import { performance } from 'node:perf_hooks';
import type { Page } from 'playwright-core';
import { launchBrowser } from './browserLaunch.js';
import { serveExplorer } from '../cli/exploreServer.js';

const WARMUP = 5;
const MOVES = 40;

export interface ExplorerBench {
  /** median / p90 time from the slider's input event to the new band diagram in the DOM, ms */
  inputToDiagram_ms_median: number;
  inputToDiagram_ms_p90: number;
  /** median solve time inside the worker for the same moves, ms */
  workerSolve_ms_median: number;
  moves: number;
  /** the target of issue 15 */
  target_lt_50ms: boolean;
  /** set (and the numbers 0) when the browser could not be started */
  error?: string;
}

function quantile(values: readonly number[], q: number): number {
  const s = [...values].sort((a, b) => a - b);
  const i = (s.length - 1) * q;
  const lo = Math.floor(i);
  return s[lo]! + (s[Math.ceil(i)]! - s[lo]!) * (i - lo);
}

// page code as strings: src is compiled without the DOM types
const RENDERED = 'Number(document.body.dataset.rendered ?? 0)';
const MOVE = (position: number) =>
  `(() => { const s = document.querySelector('[data-option=temperature] input[type=range]'); s.value = '${position}'; s.dispatchEvent(new Event('input', { bubbles: true })); })()`;
const LAST = '(() => { const p = window.bandbendExplorer; return [p.latencies_ms[p.latencies_ms.length - 1], p.lastSolve_ms]; })()';

/** Move the temperature slider to `position` and wait for the diagram; returns [latency, worker solve] in ms. */
async function move(page: Page, position: number): Promise<[number, number]> {
  const before = (await page.evaluate(RENDERED)) as number;
  await page.evaluate(MOVE(position));
  await page.waitForFunction(`${RENDERED} > ${before}`, undefined, { timeout: 30_000 });
  return (await page.evaluate(LAST)) as [number, number];
}

export async function benchExplorer(): Promise<ExplorerBench> {
  const started = performance.now();
  let server: Awaited<ReturnType<typeof serveExplorer>> | undefined;
  let browser: Awaited<ReturnType<typeof launchBrowser>> | undefined;
  try {
    server = await serveExplorer({ port: 0, signals: false });
    browser = await launchBrowser();
    // bypassCSP: the page's CSP forbids string evaluation, which the page code strings above need
    const page = await browser.newPage({ viewport: { width: 1360, height: 1000 }, bypassCSP: true });
    await page.goto(server.url, { waitUntil: 'load' });
    await page.waitForFunction(`${RENDERED} > 0`, undefined, { timeout: 60_000 });
    const latencies: number[] = [];
    const solves: number[] = [];
    for (let i = 0; i < WARMUP + MOVES; i++) {
      const [latency, solve] = await move(page, i % 2 === 0 ? 400 : 450); // about 630 K and 700 K
      if (i >= WARMUP) {
        latencies.push(latency);
        solves.push(solve);
      }
    }
    const median = quantile(latencies, 0.5);
    const result: ExplorerBench = {
      inputToDiagram_ms_median: Number(median.toFixed(2)),
      inputToDiagram_ms_p90: Number(quantile(latencies, 0.9).toFixed(2)),
      workerSolve_ms_median: Number(quantile(solves, 0.5).toFixed(3)),
      moves: MOVES,
      target_lt_50ms: median < 50,
    };
    console.log(
      `\n## explorer page (Chromium): input -> band diagram median ${result.inputToDiagram_ms_median} ms, p90 ${result.inputToDiagram_ms_p90} ms ` +
        `(worker solve median ${result.workerSolve_ms_median} ms, ${MOVES} moves, ${((performance.now() - started) / 1000).toFixed(1)} s)`,
    );
    return result;
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    console.log(`\n## explorer page: not measured (${message})`);
    return { inputToDiagram_ms_median: 0, inputToDiagram_ms_p90: 0, workerSolve_ms_median: 0, moves: 0, target_lt_50ms: false, error: message };
  } finally {
    await browser?.close();
    await server?.close();
  }
}
