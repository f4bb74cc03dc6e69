// The study report for scripts: the same report as `bandbend study` writes (src/output/studyReport.ts).
import { existsSync } from 'node:fs';
import type { Study } from '../study/studyFile.js';
import { writeStudyReportFromResults } from './studyReport.js';

/**
 * Write <outDir>/report (index.html and a figure per numeric output, as the CLI does) from the JSONL results of a
 * finished study, replacing an earlier report. Returns the path of index.html, or null when jsonlPath does not exist.
 */
export async function writeStudyPlots(study: Study, outDir: string, jsonlPath: string): Promise<string | null> {
  if (!existsSync(jsonlPath)) return null;
  const paths = await writeStudyReportFromResults({ outDir, study, force: true, resultsPath: jsonlPath });
  return paths.htmlPath;
}
