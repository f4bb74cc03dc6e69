// Screening: every metal x support pair at the same conditions, one row per pair.
import { solveContact, type ContactOptions } from './contact.js';
import { resolveLibrary } from './materials/load.js';
import { stringify } from 'csv-stringify/sync';
import type { MaterialsLibrary } from './materials/types.js';
import type { ContactResult, Warning } from './types.js';
import { InputError, isModelFailure } from './errors.js';
import { flagName, parameterOf } from './inputs/parameters.js';
import { heatmapSpec } from './output/figures.js';
import { writeScreenReport, type ReportPaths } from './output/report.js';

export interface ScreenRow {
  metal: string;
  support: string;
  direction: string | null;
  barrierHeight_eV: number | null;
  bandBending_eV: number | null;
  electronsPerParticle: number | null;
  chargeEquivalentWidth_nm: number | null;
  supportWorkFunction_eV: number | null;
  metalWorkFunction_eV: number | null;
  donorDensity_cm3: number | null;
  /**
   * where this row's donor density came from: 'library' (the support's own typical density), 'user' (the screen's
   * conditions), 'pretreatment', 'derived' (from a support work function), 'default' (none: 0); null for failed rows
   */
  donorSource: string | null;
  /** probability that electrons flow from support to metal (only with uncertainty sampling) */
  probabilitySupportToMetal: number | null;
  /** the contact's warnings, the same {code, message} objects as in `contact --json` (the CSV column lists the codes) */
  warnings: Warning[];
  error: string;
  [key: string]: string | number | null | Warning[];
}

export interface ScreenOptions {
  metals: string[];
  supports: string[];
  /** conditions shared by every pair (metal/support are set per pair) */
  conditions: Omit<ContactOptions, 'metal' | 'support' | 'materials'>;
  materials?: MaterialsLibrary | string[];
  /** apply material properties in `conditions` (work function, band gap, ...) to every pair; refused otherwise */
  overrideMaterials?: boolean;
  onProgress?: (done: number, total: number) => void;
}

export const SCREEN_COLUMNS: (keyof ScreenRow)[] = [
  'metal',
  'support',
  'direction',
  'barrierHeight_eV',
  'bandBending_eV',
  'electronsPerParticle',
  'chargeEquivalentWidth_nm',
  'supportWorkFunction_eV',
  'metalWorkFunction_eV',
  'donorDensity_cm3',
  'donorSource',
  'probabilitySupportToMetal',
  'warnings',
  'error',
];

function rowOf(metal: string, support: string, r: ContactResult | null, error: string): ScreenRow {
  return {
    metal,
    support,
    direction: r?.direction ?? null,
    barrierHeight_eV: r?.barrierHeight_eV ?? null,
    bandBending_eV: r?.bandBending_eV ?? null,
    electronsPerParticle: r?.electronsPerParticle ?? null,
    chargeEquivalentWidth_nm: r?.chargeEquivalentWidth_nm ?? null,
    supportWorkFunction_eV: r?.supportWorkFunction_eV ?? null,
    metalWorkFunction_eV: r?.metalWorkFunction_eV ?? null,
    donorDensity_cm3: r?.donorDensity_cm3 ?? null,
    donorSource: r ? donorSourceOf(r) : null,
    probabilitySupportToMetal: r?.uncertainty?.directionProbability['support-to-metal'] ?? null,
    warnings: r ? r.warnings.map((w) => ({ code: w.code, message: w.message })) : [],
    error,
  };
}

/**
 * Where the donor density of a solved contact came from, read off its input provenance: each support gets its own
 * library density unless the screen's conditions give one (issue 10 item 7).
 */
export function donorSourceOf(r: ContactResult): string {
  const input = r.inputs.find((i) => i.field.startsWith('donor density'));
  if (input === undefined) return 'default';
  if (input.field === 'donor density (oxygen vacancies)') return 'pretreatment';
  return input.origin;
}

/** Conditions that are a property of one named material would relabel every row: refuse them unless asked. */
function checkConditions(options: ScreenOptions): void {
  if (options.overrideMaterials === true) return;
  for (const option of Object.keys(options.conditions)) {
    const p = parameterOf(option);
    if (p?.identifies !== undefined) {
      throw new InputError(
        flagName(p),
        `would apply one value to every ${p.identifies} of the screen while the rows keep the library names`,
        'leave it out, or pass --override-materials (overrideMaterials: true)',
      );
    }
  }
}

/** Solve every pair; a pair that fails with a model or input error is a row with its error, the screen goes on. */
export function runScreen(options: ScreenOptions): ScreenRow[] {
  if (options.metals.length === 0) throw new InputError('--metals', 'no metals given', 'a comma-separated list, or "all"');
  if (options.supports.length === 0) throw new InputError('--supports', 'no supports given', 'a comma-separated list, or "all"');
  checkConditions(options);
  const library = resolveLibrary(options.materials);
  const rows: ScreenRow[] = [];
  const errors: InputError[] = [];
  const total = options.metals.length * options.supports.length;
  for (const metal of options.metals) {
    for (const support of options.supports) {
      let result: ContactResult | null = null;
      let error = '';
      try {
        result = solveContact({ ...options.conditions, metal, support, materials: library });
      } catch (e) {
        if (!isModelFailure(e)) throw e;
        if (e instanceof InputError) errors.push(e);
        error = e.message;
      }
      rows.push(rowOf(result?.metal ?? metal, result?.support ?? support, result, error));
      options.onProgress?.(rows.length, total);
    }
  }
  // every pair refused the same input: the conditions are at fault, not the pairs
  if (errors.length === total && errors.every((e) => e.message === errors[0]!.message)) throw errors[0]!;
  return rows;
}

/** The warning codes of a row, space-separated (CSV cell, terminal table). */
export function warningCodes(row: Pick<ScreenRow, 'warnings'>): string {
  return row.warnings.map((w) => w.code).join(' ');
}

/** The screen table as CSV, in the SCREEN_COLUMNS order; the warnings column holds the codes. */
export function screenCsv(rows: readonly ScreenRow[]): string {
  return stringify(rows.map(flatRow), { header: true, columns: SCREEN_COLUMNS as string[] });
}

/** A row with its warnings as the codes, for tables, CSV and heat maps. */
function flatRow(row: ScreenRow): Record<string, string | number | null> {
  return { ...row, warnings: warningCodes(row) } as Record<string, string | number | null>;
}

/** Sort rows: by a numeric column, largest magnitude first; failed rows last. */
export function sortScreenRows(rows: ScreenRow[], column: string): ScreenRow[] {
  return [...rows].sort((a, b) => {
    const x = a[column];
    const y = b[column];
    const xn = typeof x === 'number' ? x : null;
    const yn = typeof y === 'number' ? y : null;
    if (xn === null && yn === null) return 0;
    if (xn === null) return 1;
    if (yn === null) return -1;
    return yn - xn;
  });
}

const HEATMAP_TITLES: Record<'bandBending_eV' | 'barrierHeight_eV' | 'electronsPerParticle', string> = {
  bandBending_eV: 'Band bending (eV, positive = bands bend up toward the particle)',
  barrierHeight_eV: 'Barrier height for the majority carrier (eV)',
  electronsPerParticle: 'Electrons gained per particle (negative = lost)',
};

export interface ScreenReportOptions {
  title: string;
  metals: string[];
  supports: string[];
  sortBy: string;
  force: boolean;
  /** trusted HTML placed at the top of the report (e.g. a link back to a parent report) */
  preamble?: string;
}

/** Screen report: heat maps, sorted table (columns that are empty in every row left out), warning summary. */
export function writeScreenFolder(dir: string, rows: ScreenRow[], options: ScreenReportOptions): Promise<ReportPaths> {
  const flat = rows.map(flatRow);
  const figures = (Object.keys(HEATMAP_TITLES) as (keyof typeof HEATMAP_TITLES)[]).map((metric) => ({
    name: `heatmap-${metric}`,
    title: HEATMAP_TITLES[metric],
    spec: heatmapSpec(flat, { metricField: metric, title: HEATMAP_TITLES[metric], legendTitle: metric, metals: options.metals, supports: options.supports }),
  }));
  const columns = (SCREEN_COLUMNS as string[]).filter((c) => flat.some((r) => r[c] !== null && r[c] !== ''));
  const counts = new Map<string, number>();
  for (const row of rows) for (const { code } of row.warnings) counts.set(code, (counts.get(code) ?? 0) + 1);
  const failed = rows.filter((r) => r.error !== '');
  const warnings = [
    ...[...counts].map(([code, n]) => `${code}: ${n} of ${rows.length} pairs`),
    ...failed.map((r) => `${r.metal} on ${r.support} failed: ${r.error}`),
  ];
  return writeScreenReport(dir, flat, figures, {
    title: options.title,
    force: options.force,
    sortBy: options.sortBy,
    descending: true,
    columns,
    warnings,
    ...(options.preamble !== undefined ? { extraSections: [{ title: 'Context', html: options.preamble }] } : {}),
    description: `${options.metals.length} metals x ${options.supports.length} supports, sorted by ${options.sortBy} (largest first). Warning codes per pair are explained in the contact reports; see --help.`,
  });
}

