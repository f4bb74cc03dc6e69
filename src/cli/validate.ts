// `bandbend validate`: run the validation gallery (validation/*.csv, published measurements) through the solver
// and print how far the predictions are from the measurements, per barrier model. Loads the solver on use.
import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { createFolder } from '../inputs/files.js';
import { parameterOf } from '../inputs/parameters.js';
import type { BarrierModel } from '../types.js';
import type { ValidationResult, ValidationStatistics } from '../validation/gallery.js';
import { writeJson, notice } from './io.js';

/** Model name meaning "leave barrierModel unset": whatever the library default of the day is. */
export const DEFAULT_MODEL = 'default';

const EXAMPLES = `
Examples:
  bandbend validate
  bandbend validate --model pinned --json
  bandbend validate --model ideal default --report out/validation --force
  bandbend validate --verified-only
  bandbend validate --ignore-support-state`;

/** The values the parameter table allows for barrierModel, plus 'default'. */
export function allowedModels(): string[] {
  return [...(parameterOf('barrierModel')?.choices ?? []), DEFAULT_MODEL];
}

/** What an unset barrierModel resolves to, when the table says so plainly (a fixed string fallback); else null. */
function defaultModelValue(): string | null {
  const value = parameterOf('barrierModel')?.fallback?.value;
  return typeof value === 'string' ? value : null;
}

interface ModelRun {
  /** the name given on the command line */
  model: string;
  /** the barrierModel passed to every contact; null = left unset (library default) */
  barrierModel: string | null;
  result: ValidationResult;
}

function label(run: ModelRun): string {
  if (run.barrierModel !== null) return run.model;
  const resolved = defaultModelValue();
  return resolved === null ? DEFAULT_MODEL : `${DEFAULT_MODEL} (${resolved})`;
}

function checkModels(value: unknown): string[] {
  const given = Array.isArray(value) ? (value as string[]) : typeof value === 'string' ? [value] : ['ideal', DEFAULT_MODEL];
  const allowed = allowedModels();
  for (const m of given) {
    if (!allowed.includes(m)) throw new InputError('--model', `unknown barrier model "${m}"`, allowed.join(', '));
  }
  return [...new Set(given)];
}

function pct(x: number | null, of: number): string {
  return x === null ? 'n/a' : `${Math.round(x * 100)}% of ${of}`;
}

function supportStateCounts(s: ValidationStatistics): string {
  const c = s.supportStates ?? {};
  return `${c.paper ?? 0} / ${c['paper+convention'] ?? 0} / ${c.convention ?? 0} / ${c['library-defaults'] ?? 0}`;
}

/** The statistics of several models side by side, one statistic a line. */
function statisticsTable(runs: readonly ModelRun[], num: (x: number | null) => string): string {
  const eV = (x: number | null) => (x === null ? 'n/a' : `${num(x)} eV`);
  const lines: [string, (s: ValidationStatistics) => string][] = [
    ['barrier MAE, per metal/oxide pair', (s) => eV(s.barrier.meanAbsoluteError_eV)],
    ['barrier MAE, per row', (s) => eV(s.barrier.rowMeanAbsoluteError_eV)],
    ['barrier MAE, verified rows (pairs)', (s) => eV(s.barrier.verifiedMeanAbsoluteError_eV)],
    ['barrier pairs / rows / oxides', (s) => `${s.barrier.pairs} / ${s.barrier.rows} / ${s.barrier.oxides}`],
    ['charge: sign agreement', (s) => pct(s.charge.signAgreement, s.charge.signRows)],
    ['charge: within factor 3 of magnitude', (s) => pct(s.charge.withinFactor3, s.charge.magnitudeRows)],
    ['band bending (photoemission) MAE', (s) => `${eV(s.bandBending.meanAbsoluteError_eV)} (${s.bandBending.rows} rows)`],
    ['support state: paper / +convention / convention / defaults', (s) => supportStateCounts(s)],
    ['failed rows: barrier / charge / band bending', (s) => `${s.barrier.failed} / ${s.charge.failed} / ${s.bandBending.failed}`],
  ];
  const head = ['statistic', ...runs.map(label)];
  const body = lines.map(([name, f]) => [name, ...runs.map((r) => f(r.result.statistics))]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((row) => row[i]!.length)));
  const fmt = (cells: string[]) => cells.map((c, i) => c.padEnd(widths[i]!)).join('  ').trimEnd();
  return [fmt(head), fmt(widths.map((w) => '-'.repeat(w))), ...body.map(fmt)].join('\n');
}

async function runValidate(opts: Record<string, unknown>): Promise<void> {
  const models = checkModels(opts['model']);
  const report = typeof opts['report'] === 'string' ? opts['report'] : undefined;
  const { runValidation } = await import('../validation/gallery.js');
  // refuse an existing non-empty report folder before any work is done
  if (report !== undefined) {
    const { prepareReportDir } = await import('../output/report.js');
    createFolder(report, '--report');
    await prepareReportDir(report, opts['force'] === true);
  }
  const includeUnverified = opts['verifiedOnly'] !== true;
  const supportState = opts['ignoreSupportState'] !== true;
  const runs: ModelRun[] = models.map((model) => {
    if (model !== DEFAULT_MODEL) {
      return { model, barrierModel: model, result: runValidation({ model: model as BarrierModel, includeUnverified, supportState }) };
    }
    // 'default' leaves barrierModel unset in every contact (src/validation/gallery.ts), so the library default applies
    return { model, barrierModel: null, result: runValidation({ model: DEFAULT_MODEL, includeUnverified, supportState }) };
  });

  let written: string[] = [];
  if (report !== undefined) {
    const [{ writeValidationReport }, { join }, { writeFile }] = await Promise.all([
      import('../validation/report.js'),
      import('node:path'),
      import('node:fs/promises'),
    ]);
    for (const run of runs) {
      const paths = await writeValidationReport(join(report, run.model), run.result);
      written.push(paths.table);
    }
    const { formatNumber } = await import('../output/summary.js');
    const summary = join(report, 'statistics.txt');
    await writeFile(summary, `${statisticsTable(runs, formatNumber)}\n`, 'utf8');
    written = [summary, ...written];
  }

  if (opts['json'] === true) {
    writeJson({
      models: runs.map((r) => ({ model: r.model, barrierModel: r.barrierModel, statistics: r.result.statistics, rows: r.result.rows })),
      ...(report !== undefined ? { report: written } : {}),
    });
  } else {
    const { formatNumber } = await import('../output/summary.js');
    process.stdout.write(`${statisticsTable(runs, formatNumber)}\n`);
    process.stdout.write('MAE: mean absolute error of predicted vs measured; see validation/README.md for the gallery and its sources.\n');
    if (report !== undefined) notice(`report written: ${written[0]}`);
  }
}

export function registerValidate(program: Command): void {
  program
    .command('validate')
    .description('compare predictions with the published measurements of the validation gallery')
    .option('--model <NAME...>', `barrier model(s) to compare: ${allowedModels().join(', ')} ('default' leaves it unset)`, ['ideal', DEFAULT_MODEL])
    .option('--verified-only', 'use only gallery rows checked against a found copy of the source')
    .option('--ignore-support-state', "give every row library defaults instead of the measurement's support state (reduced, oxidised, stated donors)")
    .option('--json', 'print statistics and rows as one JSON object')
    .option('--report <DIR>', 'write per-model tables, JSON and predicted-vs-measured figures to DIR/<model>/')
    .option('--force', 'write into an existing non-empty report folder')
    .addHelpText('after', EXAMPLES)
    .action(runValidate);
}
