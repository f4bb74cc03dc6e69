// `bandbend validate`: run the validation gallery (validation/*.csv, published measurements) through the solver
// and print how far the predictions are from the measurements, per barrier model. Loads the solver on use.
import type { Command } from 'commander';
import { InputError, requireInRange } from '../errors.js';
import { parseQuantity } from '../inputs/units.js';
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
  bandbend validate --ignore-support-state
  bandbend validate --model default --scatter 200 --seed 3`;

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
  if (runs.some((r) => r.result.statistics.scatter)) {
    const sc = (f: (x: NonNullable<ValidationStatistics['scatter']>) => string) => (s: ValidationStatistics) => (s.scatter ? f(s.scatter) : 'n/a');
    lines.push(
      ['scatter: samples per row (seed)', sc((x) => `${x.samples} (${x.seed})`)],
      ['scatter: barrier measured inside 5-95% band', sc((x) => pct(x.barrierInsideBand, x.barrierRows))],
      ['scatter: mean barrier band width', sc((x) => eV(x.barrierMeanBandWidth_eV))],
      ['scatter: charge sign reached by >= 5% of samples', sc((x) => pct(x.chargeSignReached, x.chargeSignRows))],
      ['scatter: charge magnitude range meets the band', sc((x) => pct(x.magnitudeReached, x.magnitudeRows))],
      ['scatter: band bending measured inside band', sc((x) => pct(x.bandBendingInsideBand, x.bandBendingRows))],
      ['scatter: rows without a band (all samples failed)', sc((x) => String(x.failedRows))],
    );
  }
  const head = ['statistic', ...runs.map(label)];
  const body = lines.map(([name, f]) => [name, ...runs.map((r) => f(r.result.statistics))]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((row) => row[i]!.length)));
  const fmt = (cells: string[]) => cells.map((c, i) => c.padEnd(widths[i]!)).join('  ').trimEnd();
  return [fmt(head), fmt(widths.map((w) => '-'.repeat(w))), ...body.map(fmt)].join('\n');
}

/** A whole number given to `flag`, within [min, max] (parsed by the units grammar, never evaluated). */
function wholeNumber(flag: string, raw: unknown, min: number, max: number): number {
  const v = parseQuantity(flag, raw as string, 'dimensionless');
  if (!Number.isInteger(v)) throw new InputError(flag, `expected a whole number, got ${v}`, `${min} to ${max}`);
  return requireInRange(flag, v, min, max, '');
}

/** The scatter request of --scatter/--seed, or undefined when --scatter is absent or 0. */
function scatterRequest(opts: Record<string, unknown>, maxSamples: number): { samples: number; seed: number } | undefined {
  const samples = opts['scatter'] === undefined ? 0 : wholeNumber('--scatter', opts['scatter'], 0, maxSamples);
  if (opts['seed'] !== undefined && samples === 0) throw new InputError('--seed', 'given without --scatter', 'use it with --scatter N > 0');
  if (samples === 0) return undefined;
  const seed = opts['seed'] === undefined ? 1 : wholeNumber('--seed', opts['seed'], 0, 2 ** 32 - 1);
  return { samples, seed };
}

async function runValidate(opts: Record<string, unknown>): Promise<void> {
  const models = checkModels(opts['model']);
  const { MAX_SCATTER_SAMPLES } = await import('../validation/scatter.js');
  const scatter = scatterRequest(opts, MAX_SCATTER_SAMPLES);
  const report = typeof opts['report'] === 'string' ? opts['report'] : undefined;
  const { runValidation, loadGallery } = await import('../validation/gallery.js');
  // refuse an existing non-empty report folder before any work is done
  if (report !== undefined) {
    const { prepareReportDir } = await import('../output/report.js');
    createFolder(report, '--report');
    await prepareReportDir(report, opts['force'] === true);
  }
  const includeUnverified = opts['verifiedOnly'] !== true;
  const supportState = opts['ignoreSupportState'] !== true;
  // the scatter bands take a while (samples x rows x models solves): a bar on a terminal, nothing in pipes
  let progress: { tick(): void; done(): void } | undefined;
  if (scatter) {
    const { createProgress } = await import('../study/progress.js');
    const g = loadGallery();
    const rowsPerModel = [...g.barriers, ...g.charges, ...g.bandBending].filter((r) => includeUnverified || r.verified).length;
    progress = createProgress(rowsPerModel * models.length, 'validate --scatter');
  }
  const common = { includeUnverified, supportState, ...(scatter ? { scatter, onRow: () => progress!.tick() } : {}) };
  const runs: ModelRun[] = models.map((model) => {
    if (model !== DEFAULT_MODEL) {
      return { model, barrierModel: model, result: runValidation({ model: model as BarrierModel, ...common }) };
    }
    // 'default' leaves barrierModel unset in every contact (src/validation/gallery.ts), so the library default applies
    return { model, barrierModel: null, result: runValidation({ model: DEFAULT_MODEL, ...common }) };
  });
  progress?.done();

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
    if (scatter && scatter.samples < 100) notice(`--scatter ${scatter.samples}: fewer than 100 samples per row, so the 5% and 95% ends of each band are rough`);
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
    .option('--scatter <N>', 'also sample each row N times within its inputs\' published ranges and count the measurements inside the 5-95% band (default: off)')
    .option('--seed <S>', 'seed for --scatter (default 1)')
    .option('--json', 'print statistics and rows as one JSON object')
    .option('--report <DIR>', 'write per-model tables, JSON and predicted-vs-measured figures to DIR/<model>/')
    .option('--force', 'write into an existing non-empty report folder')
    .addHelpText('after', EXAMPLES)
    .action(runValidate);
}
