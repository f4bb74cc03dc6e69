// Report folders: one self-contained offline index.html (inline CSS and SVG, no scripts, no external
// resources), a summary.md, and every figure as <name>.svg + <name>.vl.json next to them.
import { mkdir, readFile, readdir, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { TopLevelSpec } from 'vega-lite';
import { Q_ELEMENTARY_C, thermalEnergy_eV } from '../constants.js';
import { InputError } from '../errors.js';
import type { InputProvenance } from '../materials/types.js';
import type { ContactResult, FlowDirection } from '../types.js';
import { reportCautions } from './cautions.js';
import { escapeHtml, escapeMarkdownCell, escapeMarkdownText, isSafeBaseName } from './escape.js';
import { bandDiagramSpec, chargeFieldSpec, localisedLevelOf, prefersLogDepth, type Cell, type Row } from './figures.js';
import { svgForInline, writeFigure } from './render.js';
import {
  barrierLabel,
  bendingInWords,
  directionInWords,
  formatNumber,
  formatLogQuantity,
  formatQuantity,
  formatSigned,
} from './summary.js';

// ---------------------------------------------------------------- public types

/** Extra HTML section supplied by calling code. `html` is inserted as-is (trusted markup from code,
 * never raw user text: escape with escapeHtml first); `title` is escaped. */
export interface ReportSection {
  title: string;
  html: string;
}

export interface ContactReportOptions {
  title: string;
  /** allow writing into an existing non-empty folder (files of the same name are overwritten, others kept) */
  force?: boolean;
  extraSections?: ReportSection[];
}

/** A named figure for screen and study reports; `name` becomes the file base name (letters, digits, . _ -). */
export interface FigureSpec {
  name: string;
  /** caption; defaults to the name */
  title?: string;
  spec: TopLevelSpec;
}

export interface TableReportOptions {
  title: string;
  force?: boolean;
  /** sort the table by this column (screen default: barrierHeight_eV when present; study default: input order) */
  sortBy?: string;
  descending?: boolean;
  /** columns to show, in order; default: every key in order of first appearance */
  columns?: string[];
  /** short description placed under the title (escaped) */
  description?: string;
  /** warnings to list (escaped) */
  warnings?: string[];
  /** cautions in addition to the standard one (escaped) */
  cautions?: string[];
  extraSections?: ReportSection[];
}

export interface ReportPaths {
  htmlPath: string;
  mdPath: string;
  /** every figure file written (for each figure: the .svg, then the .vl.json) */
  figures: string[];
}

// ---------------------------------------------------------------- fixed text

/** Modelling assumptions of one contact calculation, in words. */
export function contactAssumptions(result: ContactResult): string[] {
  const stats =
    result.statistics === 'fermi-dirac'
      ? 'Fermi–Dirac statistics for electrons and holes (degenerate doping handled).'
      : 'Boltzmann (non-degenerate) statistics for electrons and holes; inaccurate once E_F nears a band edge.';
  const barrier =
    result.barrierModel === 'pinned'
      ? 'Interface states are included only through the pinned-barrier model (charge-neutrality level and pinning factor).'
      : result.barrierModel === 'given'
        ? 'The barrier height was given as an input; interface states are not modelled.'
        : result.barrierModel === 'interface-states'
          ? 'Interface states (Bardeen; Cowley & Sze): a uniform density per eV around a charge-neutrality level, behind a thin ' +
            'interfacial layer, solved together with the space charge; the particle counts the interface-state charge under its contact.' +
            (result.interfaceStates !== null && result.interfaceStates.surfaceDonors_per_cm2 > 0
              ? ' Donor-like surface states (--surface-donors) at one level add to the interface charge as they ionise.'
              : '')
          : 'Ideal contact: no interface states, the barrier follows the work-function difference (Schottky–Mott limit).';
  const geometry: Record<string, string> = {
    planar: 'a planar contact (per unit area)',
    hemisphere: 'a hemispherical particle sunk into the support (radial depth; contact 2 pi r^2)',
    array: "one particle's cell of a particle array (spherical zones joined to the cell's footprint)",
    disc: "a particle resting on its flat footprint (depth on the axis; the disc's oblate-spheroidal equipotentials)",
  };
  const dielectric =
    result.permittivityNonlinearity_V_m5_per_C3 > 0
      ? `Continuum electrostatics with a field-dependent (Landau–Devonshire) permittivity of the support, ${formatNumber(result.interfacePermittivity)} at the interface field; `
      : 'Continuum electrostatics with the static permittivity of the support; ';
  return [
    'Thermodynamic equilibrium: one Fermi level through metal and support, no current, no illumination.',
    `One-dimensional equilibrium Poisson equation along the depth into the support (geometry: ${result.geometry}, ${geometry[result.geometry] ?? result.geometry}), ` +
      `solved on ${result.solver.meshPoints} mesh points over ${formatNumber(result.solver.domainLength_nm)} nm.`,
    stats,
    barrier,
    dielectric + 'no atomistic or quantum-size effects beyond the reported charging energy; image-force lowering is a separate estimate.',
    'Bulk band parameters and defect levels as listed under Inputs; adsorbates, surface reconstruction and gas-phase reactions are not modelled.',
  ];
}

export const TABLE_ASSUMPTIONS: string[] = [
  'Each row is an independent equilibrium contact calculation (1D Poisson, continuum electrostatics).',
  'Interface states are included only where the pinned-barrier model was selected.',
  'Inputs are library or user values as recorded with each calculation; see the per-contact reports for provenance.',
];

// ---------------------------------------------------------------- folder handling

/**
 * Create dir, or accept it when it is empty; refuse an existing non-empty folder unless force.
 * Never deletes anything.
 */
export async function prepareReportDir(dir: string, force = false): Promise<void> {
  let info;
  try {
    info = await stat(dir);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') {
      await mkdir(dir, { recursive: true });
      return;
    }
    throw err;
  }
  if (!info.isDirectory()) throw new InputError('--report', 'path exists and is not a folder');
  const entries = await readdir(dir);
  if (entries.length > 0 && !force) throw new InputError('--report', 'folder exists; use --force to overwrite');
}

// ---------------------------------------------------------------- table helpers

export interface ResultRow {
  group: string;
  label: string;
  value: string;
}

function htmlTable(headers: readonly string[], rows: readonly (readonly string[])[], cls = ''): string {
  const head = `<tr>${headers.map((h) => `<th scope="col">${escapeHtml(h)}</th>`).join('')}</tr>`;
  const body = rows.map((r) => `<tr>${r.map((c) => `<td>${escapeHtml(c)}</td>`).join('')}</tr>`).join('\n');
  return `<table${cls ? ` class="${cls}"` : ''}>\n<thead>${head}</thead>\n<tbody>\n${body}\n</tbody>\n</table>`;
}

function markdownTable(headers: readonly string[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]) => `| ${cells.map(escapeMarkdownCell).join(' | ')} |`;
  return [line(headers), `|${headers.map(() => ' --- ').join('|')}|`, ...rows.map(line)].join('\n');
}

function htmlList(items: readonly string[], empty: string): string {
  if (items.length === 0) return `<p class="muted">${escapeHtml(empty)}</p>`;
  return `<ul>\n${items.map((i) => `<li>${escapeHtml(i)}</li>`).join('\n')}\n</ul>`;
}

function markdownList(items: readonly string[], empty: string): string {
  if (items.length === 0) return `_${escapeMarkdownText(empty)}_`;
  return items.map((i) => `- ${escapeMarkdownText(i)}`).join('\n');
}

function formatCell(v: Cell): string {
  if (typeof v === 'number') return formatNumber(v, 4);
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (v === null || v === undefined) return 'n/a';
  return v;
}

function yesNo(v: boolean | null): string {
  return v === null ? 'n/a' : v ? 'yes' : 'no';
}

// ---------------------------------------------------------------- contact content

const DIRECTIONS: FlowDirection[] = ['support-to-metal', 'metal-to-support', 'none'];

/** Builds the rows of one group. */
function groupRows(group: string): { rows: ResultRow[]; add: (label: string, value: string) => void } {
  const rows: ResultRow[] = [];
  return { rows, add: (label, value) => rows.push({ group, label, value }) };
}

/** Where the barrier model's data came from: the sources of the interface-state / pinning inputs the result used. */
export function barrierModelSource(result: ContactResult): string {
  const fields = ['charge-neutrality level (above E_V)', 'charge-neutrality level', 'pinning factor', 'interface-state density', 'barrier (given)'];
  const used = result.inputs.filter((i) => fields.includes(i.field));
  if (result.barrierModel === 'ideal') return 'Schottky–Mott rule: metal work function and support electron affinity only';
  if (used.length === 0) return 'no library data recorded';
  return used
    .map((i) => `${i.field} ${formatNumber(i.value, 3)}${i.unit ? ` ${i.unit}` : ''} (${i.citation ?? i.source ?? i.origin}${i.fromMemory ? ', from memory' : ''})`)
    .join('; ');
}

function contactRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('contact');
  add('metal | support', `${result.metal} | ${result.support}`);
  add('temperature', formatQuantity(result.temperature_K, 'K', 4));
  add('model', `${result.geometry} geometry, ${result.statistics} statistics, ${result.barrierModel} barrier`);
  add('barrier model data', barrierModelSource(result));
  return rows;
}

function barrierRows(result: ContactResult, kT: number): ResultRow[] {
  const { rows, add } = groupRows('barrier');
  add(barrierLabel(result), formatQuantity(result.barrierHeight_eV, 'eV'));
  add('electron barrier E_C(0) - E_F', formatQuantity(result.electronBarrier_eV, 'eV'));
  add('band bending (+ = up toward interface)', `${formatSigned(result.bandBending_eV)} eV, ${bendingInWords(result.bandBending_eV, kT)}`);
  const pe = result.photoemission;
  add(
    'band bending seen by photoemission',
    `${formatSigned(pe.observedBandBending_eV)} eV (${pe.coreLevel} at ${formatNumber(pe.photonEnergy_eV, 5)} eV photons, ` +
      `inelastic mean free path ${formatQuantity(pe.inelasticMeanFreePath_nm, 'nm')})`,
  );
  add('direction of electron transfer', `${result.direction}: ${directionInWords(result.direction)}`);
  add('metal work function', formatQuantity(result.metalWorkFunction_eV, 'eV'));
  add('support work function', formatQuantity(result.supportWorkFunction_eV, 'eV'));
  add('bulk E_C - E_F', formatQuantity(result.fermiLevelBelowConduction_eV, 'eV'));
  add('image-force lowering', formatQuantity(result.imageForceLowering_eV, 'eV'));
  if (result.capacitanceBarrier) {
    const cv = result.capacitanceBarrier;
    add('barrier a C-V measurement reports (Mott-Schottky intercept of the model C(V), 0-1 V reverse)', `${formatQuantity(cv.barrier_eV, 'eV')} (R^2 ${formatNumber(cv.rSquared, 4)})`);
  }
  if (result.pinningFactor !== null) add('pinning factor S', formatNumber(result.pinningFactor));
  return rows;
}

/** Interface-state model (Bardeen; Cowley & Sze 1965): only when it was used. */
/** A charge per area in C/m^2 and in elementary charges per cm^2. */
function perCm2(charge_C_per_m2: number): string {
  return `${formatSigned(charge_C_per_m2)} C/m^2 (${formatSigned(charge_C_per_m2 / Q_ELEMENTARY_C / 1e4)} e/cm^2)`;
}

function interfaceStateRows(result: ContactResult): ResultRow[] {
  const it = result.interfaceStates;
  if (it === null) return [];
  const { rows, add } = groupRows('interface states');
  add('density of interface states', formatQuantity(it.stateDensity_per_eV_cm2, 'eV^-1 cm^-2'));
  add('charge-neutrality level above E_V', formatQuantity(it.neutralLevelAboveValence_eV, 'eV'));
  add('interfacial layer (thickness, permittivity)', `${formatQuantity(it.layerThickness_nm, 'nm')}, ${formatNumber(it.layerPermittivity)}`);
  add('interface-state charge (+ = states gave electrons to the metal)', perCm2(it.interfaceStateCharge_C_per_m2));
  add('metal charge -(space charge + interface states)', perCm2(it.metalCharge_C_per_m2));
  add('potential step across the layer', formatQuantity(it.layerDrop_eV, 'eV'));
  add('electrons to the particle from interface states / space charge', `${formatSigned(it.electronsFromInterfaceStates)} / ${formatSigned(it.electronsFromSpaceCharge)}`);
  if (it.surfaceDonors_per_cm2 > 0) {
    add('surface donors (density, depth below E_C)', `${formatQuantity(it.surfaceDonors_per_cm2, 'cm^-2')}, ${formatQuantity(it.surfaceDonorLevel_eV!, 'eV')}`);
    add('surface donors ionised (part of the interface-state charge)', `${formatNumber(100 * (it.surfaceDonorsIonisedFraction ?? 0))}%, ${perCm2(it.surfaceDonorCharge_C_per_m2)}`);
  }
  return rows;
}

function spaceChargeRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('space charge');
  add('space charge (support side)', perCm2(result.spaceCharge_C_per_m2));
  add('charge-equivalent width', formatQuantity(result.chargeEquivalentWidth_nm, 'nm'));
  add('depletion width (depletion approximation)', formatQuantity(result.depletionWidthApprox_nm, 'nm'));
  add('Debye length', formatQuantity(result.debyeLength_nm, 'nm'));
  add('interface field', formatQuantity(result.interfaceField_V_per_m, 'V/m'));
  if (result.permittivityNonlinearity_V_m5_per_C3 > 0) {
    add('permittivity at the interface (field-dependent)', formatNumber(result.interfacePermittivity));
  }
  add('donor density', formatQuantity(result.donorDensity_cm3, 'cm^-3'));
  add('acceptor density', formatQuantity(result.acceptorDensity_cm3, 'cm^-3'));
  return rows;
}

function bulkRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('bulk');
  const b = result.bulk;
  add('electron density', formatQuantity(b.electronDensity_cm3, 'cm^-3'));
  add('hole density', formatQuantity(b.holeDensity_cm3, 'cm^-3'));
  add('ionized donors', formatQuantity(b.ionizedDonors_cm3, 'cm^-3'));
  add('ionized acceptors', formatQuantity(b.ionizedAcceptors_cm3, 'cm^-3'));
  const localised = localisedLevelOf(result);
  if (localised !== null) {
    add(
      'localised (small-polaron) electrons',
      `${formatQuantity(b.localisedElectrons_cm3, 'cm^-3')} (${formatNumber(100 * localised.bulkOccupancy, 2)}% of ${formatNumber(localised.sites_cm3)} sites; ` +
        `${formatNumber(100 * localised.interfaceOccupancy, 2)}% at the interface)`,
    );
  }
  add('N_C / N_V', `${formatNumber(b.conductionDensityOfStates_cm3)} / ${formatNumber(b.valenceDensityOfStates_cm3)} cm^-3`);
  add('intrinsic density', `10^${formatNumber(b.intrinsicDensityLog10_cm3)} cm^-3`);
  return rows;
}

function particleRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('particle');
  const p = result.particle;
  add('electrons per particle (+ = gained by metal)', formatSigned(result.electronsPerParticle));
  add('diameter', formatQuantity(p.diameter_nm, 'nm'));
  add('particle work function (size-corrected)', formatQuantity(result.particleWorkFunction_eV, 'eV'));
  add('atoms / surface atoms', `${formatNumber(p.atoms)} / ${formatNumber(p.surfaceAtoms)}`);
  add('dispersion', formatNumber(p.dispersion));
  add('electrons per surface atom', formatSigned(p.electronsPerSurfaceAtom));
  add('charging energy', `${formatQuantity(p.chargingEnergy_eV, 'eV')} (${formatNumber(p.chargingEnergyOverKT)} kT)`);
  if (p.particleDensity_cm2 !== null || p.meanSpacing_nm !== null || p.zonesOverlap !== null) {
    add('particle density', formatQuantity(p.particleDensity_cm2, 'cm^-2'));
    add('mean spacing', formatQuantity(p.meanSpacing_nm, 'nm'));
    add('space-charge zones overlap', yesNo(p.zonesOverlap));
  }
  return rows;
}

function exchangeRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('exchange');
  const e = result.exchange;
  if (!e) {
    add('equilibration time', 'not computed');
    return rows;
  }
  add('Richardson constant', formatQuantity(e.richardsonConstant_A_per_cm2_K2, 'A/(cm^2 K^2)'));
  add('exchange current density', formatLogQuantity(e.exchangeCurrentDensity_A_per_cm2, e.exchangeCurrentLog10_A_per_cm2, 'A/cm^2'));
  add(
    'equilibration time (thermionic exchange)',
    formatLogQuantity(e.equilibrationTime_s, e.equilibrationTimeLog10_s, 's') + (e.slow ? ' — slow: more than an hour' : ''),
  );
  return rows;
}

function atmosphereRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('reaction atmosphere');
  const d = result.defects as ContactResult['defects'] | undefined; // absent in results written before issue 12
  if (d === undefined || d.history === 'none') return rows;
  add('vacancy history', d.history);
  add(`reaction gas ${d.reactionGas ?? ''}`, formatNumber(d.reactionGasValue));
  add('equilibrium pO2', `10^${formatNumber(d.log10OxygenPartialPressure_bar, 4)} bar`);
  add('vacancies (donors used)', formatQuantity(d.vacancies_cm3, 'cm^-3'));
  add('vacancies in equilibrium with the gas', formatQuantity(d.equilibriumVacancies_cm3, 'cm^-3'));
  add('re-equilibration time d^2/D', d.reequilibrationTime_s === null ? 'no diffusion coefficient' : formatQuantity(d.reequilibrationTime_s, 's'));
  return rows;
}

function pretreatmentRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('pretreatment');
  const t = result.pretreatment;
  add('mode', t.mode);
  add('reduction temperature', formatQuantity(t.reductionTemperature_K, 'K', 4));
  add('oxygen pressure', formatQuantity(t.oxygenPressure_Pa, 'Pa'));
  add('H2/H2O ratio', formatNumber(t.hydrogenToWater));
  add('vacancy density', formatQuantity(t.vacancyDensity_cm3, 'cm^-3'));
  add('vacancy equilibration temperature', formatQuantity(t.equilibrationTemperature_K, 'K', 4));
  return rows;
}

function uncertaintyRows(result: ContactResult): ResultRow[] {
  const u = result.uncertainty;
  if (!u) return [];
  const { rows, add } = groupRows('uncertainty');
  const pct = (q: { p05: number; p50: number; p95: number }, unit: string) =>
    `${formatNumber(q.p05)} / ${formatNumber(q.p50)} / ${formatNumber(q.p95)}${unit ? ` ${unit}` : ''}`;
  add('samples (failed) / seed', `${u.samples} (${u.failed}) / ${u.seed}`);
  add('direction probability', DIRECTIONS.map((d) => `${d} ${formatNumber(u.directionProbability[d] ?? 0, 2)}`).join(', '));
  add('barrier 5 / 50 / 95 %', pct(u.barrierHeight_eV, 'eV'));
  add('band bending 5 / 50 / 95 %', pct(u.bandBending_eV, 'eV'));
  add('electrons per particle 5 / 50 / 95 %', pct(u.electronsPerParticle, ''));
  return rows;
}

function solverRows(result: ContactResult): ResultRow[] {
  const { rows, add } = groupRows('solver');
  const s = result.solver;
  add('Newton iterations', String(s.iterations));
  add('mesh points / domain', `${s.meshPoints} / ${formatQuantity(s.domainLength_nm, 'nm')}`);
  add('charge error estimate (Richardson, relative)', formatNumber(s.chargeErrorEstimate));
  return rows;
}

/** The results of one contact as grouped label/value rows (plain text, escaped on output). */
export function contactResultRows(result: ContactResult): ResultRow[] {
  const kT = thermalEnergy_eV(result.temperature_K);
  return [
    ...contactRows(result),
    ...barrierRows(result, kT),
    ...interfaceStateRows(result),
    ...spaceChargeRows(result),
    ...bulkRows(result),
    ...particleRows(result),
    ...exchangeRows(result),
    ...pretreatmentRows(result),
    ...atmosphereRows(result),
    ...uncertaintyRows(result),
    ...solverRows(result),
  ];
}

/** Input provenance as table rows: field, value, unit, range, origin, citation, note, check. */
export function inputRows(inputs: readonly InputProvenance[]): string[][] {
  return inputs.map((i) => [
    i.field,
    formatNumber(i.value, 4),
    i.unit,
    i.min !== undefined || i.max !== undefined ? `${formatNumber(i.min, 4)} to ${formatNumber(i.max, 4)}` : '',
    i.origin,
    i.citation ?? i.source ?? '',
    i.note ?? '',
    i.fromMemory ? 'from memory — verify' : '',
  ]);
}

const INPUT_HEADERS = ['field', 'value', 'unit', 'range', 'origin', 'citation', 'note', 'check'];

function contactWarnings(result: ContactResult): string[] {
  return result.warnings.map((w) => `[${w.code}] ${w.message}`);
}

function allCautions(extra: readonly string[]): string[] {
  return reportCautions(extra);
}

// ---------------------------------------------------------------- page assembly

const CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { font-family: system-ui, sans-serif; color: #1d1d1d; background: #ffffff; margin: 0 auto; padding: 1.5rem; max-width: 72rem; line-height: 1.45; }
h1 { font-size: 1.6rem; margin: 0 0 .25rem; }
h2 { font-size: 1.2rem; margin: 2rem 0 .6rem; padding-bottom: .2rem; border-bottom: 1px solid #d0d0d0; }
p.lead { color: #444; margin-top: 0; }
.muted { color: #666; }
table { border-collapse: collapse; margin: .5rem 0 1rem; font-size: .9rem; }
th, td { border: 1px solid #d0d0d0; padding: .3rem .55rem; text-align: left; vertical-align: top; }
thead th { background: #f2f2f2; }
tbody tr:nth-child(even) td { background: #fafafa; }
td.group { font-weight: 600; background: #f7f7f7; }
.verify { color: #8a4b00; font-weight: 600; }
.scroll { overflow-x: auto; }
figure { margin: 1rem 0 1.5rem; }
figcaption { font-size: .85rem; color: #555; margin-top: .3rem; }
.box { border-left: 4px solid #4c78a8; background: #f5f8fb; padding: .6rem 1rem; margin: .5rem 0; }
.box.warn { border-color: #f58518; background: #fff8f0; }
.box.caution { border-color: #e45756; background: #fdf4f4; }
@media print { body { max-width: none; padding: 0; } .scroll { overflow: visible; } }
`;

function page(title: string, body: string): string {
  return [
    '<!DOCTYPE html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8">',
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    `<title>${escapeHtml(title)}</title>`,
    `<style>${CSS}</style>`,
    '</head>',
    '<body>',
    body,
    '<footer><p class="muted">Generated by bandbend. This file is self-contained and works offline.</p></footer>',
    '</body>',
    '</html>',
    '',
  ].join('\n');
}

function section(title: string, inner: string, id?: string): string {
  return `<section${id ? ` id="${escapeHtml(id)}"` : ''}>\n<h2>${escapeHtml(title)}</h2>\n${inner}\n</section>`;
}

export interface RenderedFigure {
  name: string;
  title: string;
  svg: string;
}

function figureHtml(f: RenderedFigure): string {
  const files = `${f.name}.svg, ${f.name}.vl.json`;
  return (
    `<figure id="fig-${escapeHtml(f.name)}">\n${svgForInline(f.svg, f.title)}\n` +
    `<figcaption>${escapeHtml(f.title)} <span class="muted">(files: ${escapeHtml(files)})</span></figcaption>\n</figure>`
  );
}

function groupedResultsHtml(rows: readonly ResultRow[]): string {
  const body: string[] = [];
  let group = '';
  for (const r of rows) {
    if (r.group !== group) {
      group = r.group;
      body.push(`<tr><td class="group" colspan="2">${escapeHtml(group)}</td></tr>`);
    }
    body.push(`<tr><td>${escapeHtml(r.label)}</td><td>${escapeHtml(r.value)}</td></tr>`);
  }
  return `<table class="results">\n<thead><tr><th scope="col">quantity</th><th scope="col">value</th></tr></thead>\n<tbody>\n${body.join('\n')}\n</tbody>\n</table>`;
}

function extraHtml(sections: readonly ReportSection[] | undefined): string[] {
  return (sections ?? []).map((s) => section(s.title, s.html));
}

/** The complete index.html of a contact report (pure). */
export function contactReportHtml(result: ContactResult, opts: ContactReportOptions, figures: readonly RenderedFigure[]): string {
  const warnings = contactWarnings(result);
  const inputs = result.inputs.length
    ? `<div class="scroll">${htmlTable(INPUT_HEADERS, inputRows(result.inputs), 'inputs')}</div>` +
      (result.inputs.some((i) => i.fromMemory)
        ? '<p class="verify">Values marked "from memory — verify" were not checked against a copy of the cited source.</p>'
        : '')
    : '<p class="muted">No input provenance was recorded.</p>';
  const parts = [
    `<header>\n<h1>${escapeHtml(opts.title)}</h1>\n<p class="lead">${escapeHtml(
      `${result.metal} | ${result.support} at ${formatNumber(result.temperature_K, 4)} K — ` +
        `${barrierLabel(result)} ${formatNumber(result.barrierHeight_eV)} eV, band bending ${formatSigned(result.bandBending_eV)} eV; ` +
        directionInWords(result.direction),
    )}</p>\n</header>`,
    warnings.length ? `<div class="box warn"><strong>Warnings:</strong>${htmlList(warnings, '')}</div>` : '',
    section('Results', groupedResultsHtml(contactResultRows(result)), 'results'),
    section('Figures', figures.map(figureHtml).join('\n'), 'figures'),
    section('Inputs and sources', inputs, 'inputs'),
    section('Assumptions', htmlList(contactAssumptions(result), ''), 'assumptions'),
    section('Warnings', htmlList(warnings, 'No warnings.'), 'warnings'),
    section('Cautions', `<div class="box caution">${htmlList(allCautions(result.cautions), '')}</div>`, 'cautions'),
    ...extraHtml(opts.extraSections),
  ];
  return page(opts.title, parts.filter((p) => p !== '').join('\n'));
}

/** The summary.md of a contact report (pure). */
export function contactReportMarkdown(result: ContactResult, opts: ContactReportOptions, figures: readonly RenderedFigure[]): string {
  const rows = contactResultRows(result).map((r) => [r.group, r.label, r.value]);
  const out = [
    `# ${escapeMarkdownText(opts.title)}`,
    '',
    escapeMarkdownText(`${result.metal} | ${result.support} at ${formatNumber(result.temperature_K, 4)} K: ${directionInWords(result.direction)}.`),
    '',
    '## Key results',
    '',
    markdownTable(['group', 'quantity', 'value'], rows),
    '',
    '## Figures',
    '',
    ...figures.map((f) => `- [${escapeMarkdownText(f.title)}](${f.name}.svg) (Vega-Lite source: ${f.name}.vl.json)`),
    '',
    '## Inputs and sources',
    '',
    result.inputs.length ? markdownTable(INPUT_HEADERS, inputRows(result.inputs)) : '_No input provenance was recorded._',
    '',
    '## Assumptions',
    '',
    markdownList(contactAssumptions(result), ''),
    '',
    '## Warnings',
    '',
    markdownList(contactWarnings(result), 'No warnings.'),
    '',
    '## Cautions',
    '',
    markdownList(allCautions(result.cautions), ''),
    '',
  ];
  return out.join('\n');
}

async function writeFigures(dir: string, figs: readonly FigureSpec[]): Promise<{ files: string[]; rendered: RenderedFigure[] }> {
  const files: string[] = [];
  const rendered: RenderedFigure[] = [];
  const seen = new Set<string>();
  for (const f of figs) {
    if (!isSafeBaseName(f.name)) throw new InputError('figure', `name "${f.name}" is not a plain file name`, 'letters, digits, . _ -');
    if (seen.has(f.name)) throw new InputError('figure', `duplicate figure name "${f.name}"`);
    seen.add(f.name);
    const { svgPath, specPath } = await writeFigure(dir, f.name, f.spec);
    files.push(svgPath, specPath);
    rendered.push({ name: f.name, title: f.title ?? f.name, svg: await readFile(svgPath, 'utf8') });
  }
  return { files, rendered };
}

/** The standard figures of one contact. */
export function contactFigures(result: ContactResult): FigureSpec[] {
  const log = prefersLogDepth(result);
  return [
    { name: 'band-diagram', title: 'Band diagram across the metal | support interface', spec: bandDiagramSpec(result) },
    {
      name: 'band-diagram-log',
      title: 'Band diagram, symmetric-log position axis (resolves thin layers near the interface)',
      spec: bandDiagramSpec(result, { logDepth: true }),
    },
    {
      name: 'charge-field',
      title: `Space-charge density and electric field against depth${log ? ' (log depth)' : ''}`,
      spec: chargeFieldSpec(result, { logDepth: log }),
    },
  ];
}

/**
 * Write a contact report into dir: index.html (self-contained), summary.md, and the figures
 * band-diagram, band-diagram-log and charge-field as .svg + .vl.json.
 * Throws InputError('--report', ...) when dir exists, is not empty, and force is not set.
 */
export async function writeContactReport(dir: string, result: ContactResult, opts: ContactReportOptions): Promise<ReportPaths> {
  await prepareReportDir(dir, opts.force === true);
  const { files, rendered } = await writeFigures(dir, contactFigures(result));
  const htmlPath = join(dir, 'index.html');
  const mdPath = join(dir, 'summary.md');
  await writeFile(htmlPath, contactReportHtml(result, opts, rendered), 'utf8');
  await writeFile(mdPath, contactReportMarkdown(result, opts, rendered), 'utf8');
  return { htmlPath, mdPath, figures: files };
}

// ---------------------------------------------------------------- screens and studies

function columnsOf(rows: readonly Row[], wanted?: readonly string[]): string[] {
  if (wanted && wanted.length) return [...wanted];
  const cols: string[] = [];
  const seen = new Set<string>();
  for (const r of rows) for (const k of Object.keys(r)) if (!seen.has(k)) (seen.add(k), cols.push(k));
  return cols;
}

/** Stable sort by a column: finite numbers first (ascending unless descending), then text, then missing. */
export function sortRows(rows: readonly Row[], by: string | undefined, descending = false): Row[] {
  const indexed = rows.map((row, i) => ({ row, i }));
  if (by === undefined) return indexed.map((e) => e.row);
  const rank = (v: Cell): number => (typeof v === 'number' && Number.isFinite(v) ? 0 : typeof v === 'string' ? 1 : 2);
  indexed.sort((a, b) => {
    const va = a.row[by];
    const vb = b.row[by];
    const ra = rank(va);
    const rb = rank(vb);
    if (ra !== rb) return ra - rb;
    let cmp = 0;
    if (ra === 0) cmp = (va as number) - (vb as number);
    else if (ra === 1) cmp = (va as string) < (vb as string) ? -1 : (va as string) > (vb as string) ? 1 : 0;
    if (descending) cmp = -cmp;
    return cmp || a.i - b.i;
  });
  return indexed.map((e) => e.row);
}

interface TableReportContent {
  title: string;
  description: string;
  columns: string[];
  rows: string[][];
  sortNote: string;
  warnings: string[];
  cautions: string[];
}

function tableContent(kind: 'screen' | 'study', rows: readonly Row[], opts: TableReportOptions): TableReportContent {
  const defaultSort = kind === 'screen' && rows.some((r) => 'barrierHeight_eV' in r) ? 'barrierHeight_eV' : undefined;
  const sortBy = opts.sortBy ?? defaultSort;
  const sorted = sortRows(rows, sortBy, opts.descending === true);
  const columns = columnsOf(rows, opts.columns);
  return {
    title: opts.title,
    description: opts.description ?? '',
    columns,
    rows: sorted.map((r) => columns.map((c) => formatCell(r[c]))),
    sortNote:
      sortBy === undefined
        ? `${rows.length} rows in input order.`
        : `${rows.length} rows sorted by ${sortBy}, ${opts.descending ? 'descending' : 'ascending'}.`,
    warnings: opts.warnings ?? [],
    cautions: allCautions(opts.cautions ?? []),
  };
}

function tableReportHtml(c: TableReportContent, figures: readonly RenderedFigure[], extra: readonly ReportSection[] | undefined): string {
  const parts = [
    `<header>\n<h1>${escapeHtml(c.title)}</h1>${c.description ? `\n<p class="lead">${escapeHtml(c.description)}</p>` : ''}\n</header>`,
    c.warnings.length ? `<div class="box warn"><strong>Warnings:</strong>${htmlList(c.warnings, '')}</div>` : '',
    section('Figures', figures.length ? figures.map(figureHtml).join('\n') : '<p class="muted">No figures.</p>', 'figures'),
    section('Results table', `<p class="muted">${escapeHtml(c.sortNote)}</p>\n<div class="scroll">${htmlTable(c.columns, c.rows, 'rows')}</div>`, 'table'),
    section('Assumptions', htmlList(TABLE_ASSUMPTIONS, ''), 'assumptions'),
    section('Warnings', htmlList(c.warnings, 'No warnings.'), 'warnings'),
    section('Cautions', `<div class="box caution">${htmlList(c.cautions, '')}</div>`, 'cautions'),
    ...extraHtml(extra),
  ];
  return page(c.title, parts.filter((p) => p !== '').join('\n'));
}

function tableReportMarkdown(c: TableReportContent, figures: readonly RenderedFigure[]): string {
  return [
    `# ${escapeMarkdownText(c.title)}`,
    '',
    ...(c.description ? [escapeMarkdownText(c.description), ''] : []),
    '## Results table',
    '',
    escapeMarkdownText(c.sortNote),
    '',
    markdownTable(c.columns, c.rows),
    '',
    '## Figures',
    '',
    ...(figures.length ? figures.map((f) => `- [${escapeMarkdownText(f.title)}](${f.name}.svg) (Vega-Lite source: ${f.name}.vl.json)`) : ['_No figures._']),
    '',
    '## Assumptions',
    '',
    markdownList(TABLE_ASSUMPTIONS, ''),
    '',
    '## Warnings',
    '',
    markdownList(c.warnings, 'No warnings.'),
    '',
    '## Cautions',
    '',
    markdownList(c.cautions, ''),
    '',
  ].join('\n');
}

async function writeTableReport(
  kind: 'screen' | 'study',
  dir: string,
  rows: readonly Row[],
  figs: readonly FigureSpec[],
  opts: TableReportOptions,
): Promise<ReportPaths> {
  await prepareReportDir(dir, opts.force === true);
  const { files, rendered } = await writeFigures(dir, figs);
  const content = tableContent(kind, rows, opts);
  const htmlPath = join(dir, 'index.html');
  const mdPath = join(dir, 'summary.md');
  await writeFile(htmlPath, tableReportHtml(content, rendered, opts.extraSections), 'utf8');
  await writeFile(mdPath, tableReportMarkdown(content, rendered), 'utf8');
  return { htmlPath, mdPath, figures: files };
}

/**
 * Metals x supports screen: sorted results table (default sort: barrierHeight_eV ascending when present)
 * and the given heat maps (see heatmapSpec), written like a contact report.
 */
export function writeScreenReport(
  dir: string,
  rows: readonly Row[],
  heatmapSpecs: readonly FigureSpec[],
  opts: TableReportOptions,
): Promise<ReportPaths> {
  return writeTableReport('screen', dir, rows, heatmapSpecs, opts);
}

/** Study (parameter sweep): results table in input order (unless sortBy) and the given plots (see linePlotSpec). */
export function writeStudyReport(
  dir: string,
  rows: readonly Row[],
  plots: readonly FigureSpec[],
  opts: TableReportOptions,
): Promise<ReportPaths> {
  return writeTableReport('study', dir, rows, plots, opts);
}
