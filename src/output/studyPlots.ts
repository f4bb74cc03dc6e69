// Line plots and the HTML report of a finished study, from its JSONL results (CLI and library).
import { readFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { sweptColumn, isNumericField, axisLength, type Study } from '../study/studyFile.js';
import { RESULT_FILES } from '../study/outFiles.js';
import { linePlotSpec, type Row } from './figures.js';
import { writeStudyReport } from './report.js';

/** Line plots of every numeric output against the first numeric swept input, coloured by the second axis. */
export async function writeStudyPlots(study: Study, outDir: string, jsonlPath: string): Promise<string | null> {
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
