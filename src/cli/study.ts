// `bandbend study FILE`: parameter sweeps from a study file, rows written as they complete, plus plots (src/study/command.ts).
import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { checkFolderPath } from '../inputs/files.js';

/** Options whose value is read as a number: an empty string would read as 0 and be reported as "got 0". */
const NUMBER_OPTIONS = [
  ['jobs', '--jobs', '1 to 256 worker threads'],
  ['pointTimeout', '--point-timeout', 'seconds, e.g. 300'],
] as const;

/** Empty strings are errors that name their field (issue 13): the study file, merge folders, numeric options. */
function checkNotEmpty(file: string, dirs: readonly string[], opts: Record<string, unknown>): void {
  if (file.trim() === '') throw new InputError('study FILE', 'missing path', 'a study file (YAML or JSON), or `merge`');
  if (file === 'merge' && dirs.some((d) => d.trim() === '')) throw new InputError('study merge', 'missing path in the shard folders', 'the --out folders of every shard');
  for (const [key, flag, allowed] of NUMBER_OPTIONS) {
    const value = opts[key];
    if (typeof value === 'string' && value.trim() === '') throw new InputError(flag, 'missing value', allowed);
  }
}

const EXAMPLE = `
Study file (YAML or JSON):
  name: anatase-reduction
  base: { metal: Pt, support: CeO2, temperature: 473 K, geometry: hemisphere }
  sweep:
    mode: product            # or zip
    axes:
      - { field: donors, log: { from: 1e16, to: 1e19, points: 13 }, unit: cm^-3 }
      - { field: particleDiameter, values: [1, 2, 5], unit: nm }
  outputs: [bandBending_eV, electronsPerParticle, chargeEquivalentWidth_nm]

Examples:
  bandbend study examples/study-support-reduction.yaml --out out/reduction
  bandbend study examples/study-support-reduction.yaml --out out/reduction --resume       # continue after a crash or Ctrl-C
  bandbend study examples/study-support-reduction.yaml --out out/csv-only --jobs 2 --format csv --no-plots
  bandbend study examples/study-support-reduction.yaml --out out/shard-1 --shard 1/2 --no-plots   # points i with i % 2 == 0
  bandbend study examples/study-support-reduction.yaml --out out/shard-2 --shard 2/2 --no-plots   # points i with i % 2 == 1
  bandbend study merge out/shard-1 out/shard-2 --out out/all                               # join the shards

--resume keeps the complete rows on disk (a partial last line is cut off) and computes the rest;
a lock file (<out>/.bandbend-study.lock) makes a second run on the same folder refuse.
A full disk or file-size limit stops the study with exit 1; every line on disk stays complete.`;

export function registerStudyCommand(program: Command): void {
  program
    .command('study <FILE> [DIRS...]')
    .description('parameter study from a study file: rows written as they complete (CSV/JSONL) and plots; `study merge DIR... --out DIR` joins shards')
    .requiredOption('--out <DIR>', 'output folder')
    .option('--jobs <N>', 'worker threads (default: the available cores)')
    .option('--format <LIST>', 'result formats: csv, json or csv,json (default csv,json; on --resume: as before)')
    .option('--no-plots', 'skip the plots and HTML report')
    .option('--force', 'replace the results of an earlier run in the folder')
    .option('--resume', 'continue the run in --out from the complete rows on disk')
    .option('--shard <K/N>', 'compute only points i with i % N == K-1 (merge with `study merge`)')
    .option('--point-timeout <S>', 'watchdog: seconds without a sign of life before a worker is replaced', '300')
    .addHelpText('after', EXAMPLE)
    .action(async (file: string, dirs: string[], opts: Record<string, unknown>) => {
      // loaded on use: `contact --json` must not pay for the study runner and its report
      // a bad --out path exits 2 before any work; the runner creates the folder (createFolder) once the file is read
      if (typeof opts['out'] === 'string') checkFolderPath(opts['out'], '--out');
      checkNotEmpty(file, dirs, opts);
      const { studyCommand } = await import('../study/command.js');
      await studyCommand(file, dirs, opts);
    });
}
