// `bandbend study FILE`: parameter sweeps from a study file, rows written as they complete, plus line plots.
import type { Command } from 'commander';
import { readFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { loadStudyFile, sweptColumn, isNumericField, axisLength, type Study } from '../study/studyFile.js';
import { runStudy, RESULT_FILES, type StudyFormat } from '../study/runner.js';
import { createProgress, type Progress } from '../study/progress.js';
import { linePlotSpec, type Row } from '../output/figures.js';
import { writeStudyReport } from '../output/report.js';

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
    .action(async (file: string, opts: Record<string, unknown>) => {
      const study = loadStudyFile(file);
      const jobs = Number(opts['jobs']);
      const formats = String(opts['format'])
        .split(',')
        .map((f) => f.trim())
        .filter((f) => f !== '');
      for (const f of formats) if (f !== 'csv' && f !== 'json') throw new InputError('--format', `unknown format "${f}"`, 'csv, json');
      const outDir = String(opts['out']);
      const controller = new AbortController();
      const onSignal = (): void => controller.abort();
      process.once('SIGINT', onSignal);
      process.once('SIGTERM', onSignal);
      const bar: { progress: Progress | null } = { progress: null };
      try {
        const summary = await runStudy({
          study,
          outDir,
          jobs,
          force: opts['force'] === true,
          formats: formats as StudyFormat[],
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
    });
}

/** Line plots of every numeric output against the first numeric swept input, coloured by the second axis. */
async function writeStudyPlots(study: Study, outDir: string, jsonlPath: string): Promise<string | null> {
  if (!existsSync(jsonlPath)) return null;
  const rows: Row[] = readFileSync(jsonlPath, 'utf8')
    .split('\n')
    .filter((l) => l.trim() !== '')
    .map((l) => JSON.parse(l) as Row)
    .sort((a, b) => Number(a['index']) - Number(b['index']));
  // x: the numeric axis with the most points; colour: the next axis
  const numericAxes = study.sweep.axes.filter((a) => isNumericField(a.field)).sort((a, b) => axisLength(b) - axisLength(a));
  if (numericAxes.length === 0 || rows.length === 0) return null;
  const x = sweptColumn(numericAxes[0]!);
  const otherAxes = study.sweep.axes.filter((a) => a !== numericAxes[0]);
  const color = otherAxes.length > 0 ? sweptColumn(otherAxes[0]!) : undefined;
  const xLog = 'log' in numericAxes[0]! && (numericAxes[0] as { log?: unknown }).log !== undefined;
  const plots = study.outputs
    .filter((o) => rows.some((r) => typeof r[o] === 'number'))
    .map((output) => ({
      name: `plot-${output.replace(/[^A-Za-z0-9_-]/g, '_')}`,
      title: output,
      spec: linePlotSpec(rows, { x, y: output, xLog, ...(color ? { color } : {}), title: `${output} against ${x}` }),
    }));
  const paths = await writeStudyReport(join(outDir, 'report'), rows, plots, {
    title: `Study ${study.name}`,
    force: true,
    description: `${rows.length} points; data in ../${RESULT_FILES.csv}`,
  });
  return paths.htmlPath;
}
