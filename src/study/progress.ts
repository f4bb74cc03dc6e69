// A one-line progress bar on stderr, only for terminals (silent in pipes, files and CI logs).

export interface Progress {
  /** n more items done (default 1) */
  tick(n?: number): void;
  /** draw the final state and end the line */
  done(): void;
}

/** The part of a stream the bar needs (process.stderr by default). */
export interface ProgressStream {
  isTTY?: boolean;
  columns?: number;
  write(text: string): unknown;
}

export interface ProgressOptions {
  stream?: ProgressStream;
  /** minimum time between redraws, ms (default 100: ~10 updates per second) */
  intervalMs?: number;
  /** clock in ms (for tests) */
  now?: () => number;
}

const NO_PROGRESS: Progress = { tick: () => undefined, done: () => undefined };

function formatSeconds(s: number): string {
  if (!Number.isFinite(s) || s < 0) return '--';
  if (s < 60) return `${Math.round(s)}s`;
  if (s < 3600) return `${Math.floor(s / 60)}m${String(Math.round(s % 60)).padStart(2, '0')}s`;
  return `${Math.floor(s / 3600)}h${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}m`;
}

/** The text of the bar for `done` of `total` items after `elapsed_s` seconds (no control characters). */
export function formatProgress(label: string, done: number, total: number, elapsed_s: number, width = 24): string {
  const fraction = total > 0 ? Math.min(1, done / total) : 1;
  const filled = Math.round(fraction * width);
  const eta = done > 0 && done < total ? ` eta ${formatSeconds((elapsed_s / done) * (total - done))}` : '';
  const percent = `${Math.floor(fraction * 100)}%`.padStart(4);
  return `${label} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${percent} ${done}/${total} ${formatSeconds(elapsed_s)}${eta}`;
}

/** A progress bar for `total` items, drawn on stderr when it is a terminal, at most ~10 times a second. */
export function createProgress(total: number, label: string, options: ProgressOptions = {}): Progress {
  const stream = options.stream ?? process.stderr;
  if (stream.isTTY !== true) return NO_PROGRESS;
  const now = options.now ?? (() => performance.now());
  const interval = options.intervalMs ?? 100;
  const start = now();
  let count = 0;
  let lastDraw = -Infinity;
  let finished = false;
  const draw = (): void => {
    const text = formatProgress(label, count, total, (now() - start) / 1000);
    const columns = stream.columns ?? 80;
    // \r back to the start, \x1b[K clears the rest of the line
    stream.write(`\r${text.length >= columns ? text.slice(0, Math.max(0, columns - 1)) : text}\x1b[K`);
  };
  return {
    tick(n = 1) {
      if (finished) return;
      count += n;
      const t = now();
      if (t - lastDraw >= interval) {
        lastDraw = t;
        draw();
      }
    },
    done() {
      if (finished) return;
      finished = true;
      draw();
      stream.write('\n');
    },
  };
}
