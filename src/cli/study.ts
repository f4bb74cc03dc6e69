// `bandbend study FILE`: parameter sweeps from a study file, rows written as they complete, plus line plots.
import type { Command } from 'commander';
import { InputError } from '../errors.js';

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
  bandbend study sweep.json --out out/sweep --jobs 2 --format csv`;

function formatsOf(text: string): ('csv' | 'json')[] {
  const formats = text
    .split(',')
    .map((f) => f.trim())
    .filter((f) => f !== '');
  for (const f of formats) if (f !== 'csv' && f !== 'json') throw new InputError('--format', `unknown format "${f}"`, 'csv, json');
  return formats as ('csv' | 'json')[];
}

async function runStudyCommand(file: string, opts: Record<string, unknown>): Promise<void> {
  const [{ loadStudyFile }, { runStudy }, { createProgress }, { writeStudyPlots }] = await Promise.all([
    import('../study/studyFile.js'),
    import('../study/runner.js'),
    import('../study/progress.js'),
    import('../output/studyPlots.js'),
  ]);
  const study = loadStudyFile(file);
  const formats = formatsOf(String(opts['format']));
  const outDir = String(opts['out']);
  const controller = new AbortController();
  const onSignal = (): void => controller.abort();
  process.once('SIGINT', onSignal);
  process.once('SIGTERM', onSignal);
  const bar: { progress: ReturnType<typeof createProgress> | null } = { progress: null };
  try {
    const summary = await runStudy({
      study,
      outDir,
      jobs: Number(opts['jobs']),
      force: opts['force'] === true,
      formats,
      signal: controller.signal,
      onProgress: (_done, all, added) => {
        bar.progress ??= createProgress(all, study.name);
        bar.progress.tick(added);
      },
    });
    bar.progress?.done();
    process.stderr.write(
      `${summary.points} of ${summary.total} points written (${summary.failed} failed) in ${summary.elapsed_s.toFixed(2)} s` +
        `${summary.interrupted ? ' - interrupted, rows on disk are complete' : ''}\n`,
    );
    if (opts['plots'] !== false && !summary.interrupted && summary.jsonlPath !== null) {
      const report = await writeStudyPlots(study, outDir, summary.jsonlPath);
      if (report) process.stderr.write(`report written: ${report}\n`);
    }
    if (summary.interrupted) process.exitCode = 130;
  } finally {
    process.removeListener('SIGINT', onSignal);
    process.removeListener('SIGTERM', onSignal);
  }
}

export function registerStudyCommand(program: Command): void {
  program
    .command('study <FILE>')
    .description('parameter study from a study file: rows written as they complete (CSV/JSONL) and line plots')
    .requiredOption('--out <DIR>', 'output folder')
    .option('--jobs <N>', 'worker threads', '1')
    .option('--format <LIST>', 'result formats: csv, json or csv,json', 'csv,json')
    .option('--no-plots', 'skip the line plots and HTML report')
    .option('--force', 'replace the results of an earlier run in the folder')
    .addHelpText('after', EXAMPLE)
    .action(runStudyCommand);
}
