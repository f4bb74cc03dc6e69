// Bounded aggregation of study rows for plots, in one streaming pass (memory independent of the
// number of rows).
//
// Plan (from the study alone, before any row is read):
//   x       the numeric axis with the most values (else the first axis, as categories); more than
//           MAX_X values are binned by position along the axis (contiguous runs of values)
//   colour  the next axis in study order: one line per value; a numeric axis with more than
//           MAX_COLOR_BINS values is grouped into that many contiguous value ranges, a categorical
//           axis shows its first MAX_CATEGORIES values
//   facet   the axis after that (third axis): one small panel per value or value range (MAX_FACETS)
//   rest    every further axis is aggregated over
// Each cell (facet group, colour group, x bin) keeps, per numeric output, count, min, max and a
// reservoir sample (deterministic xorshift, capacity chosen so the whole plan stores at most
// MAX_STORED values) from which the median and the 5th/95th percentiles are read. When every cell
// holds one value the plot is a plain line; otherwise the line is the median and the band 5-95 %.
import { defaultUnitOf } from '../inputs/units.js';
import { axisValues, type SweptValue } from './sweep.js';
import { fieldSpec, isNumericField, sweptColumn, type Study, type SweepAxis } from './studyFile.js';

export const MAX_X = 120;
export const MAX_COLOR_BINS = 8;
export const MAX_CATEGORIES = 20;
export const MAX_FACETS = 6;
/** Most sampled values stored over all cells and outputs. */
export const MAX_STORED = 4_000_000;

// ---------------------------------------------------------------------------------------------
// names and units for titles

const INPUT_NAMES: Record<string, string> = {
  metal: 'metal',
  support: 'support',
  supportFormula: 'support formula',
  workFunction: 'metal work function',
  workFunctionShift: 'work-function shift',
  electronAffinity: 'electron affinity',
  bandGap: 'band gap',
  permittivity: 'relative permittivity',
  opticalPermittivity: 'optical permittivity',
  electronMass: 'electron effective mass (m_e)',
  holeMass: 'hole effective mass (m_e)',
  donors: 'donor density',
  donorLevel: 'donor level below E_C',
  donorLevel2: 'second donor level below E_C',
  donorType: 'donor type',
  acceptors: 'acceptor density',
  acceptorLevel: 'acceptor level above E_V',
  temperature: 'temperature',
  barrierModel: 'barrier model',
  pinningFactor: 'pinning factor S',
  neutralLevel: 'charge-neutrality level',
  barrier: 'given barrier height',
  geometry: 'geometry',
  particleDiameter: 'particle diameter',
  particleDensity: 'particle density',
  supportThickness: 'support thickness',
  statistics: 'carrier statistics',
  reductionTemperature: 'reduction temperature',
  oxygenPressure: 'O2 pressure in reduction',
  hydrogenToWater: 'H2/H2O ratio in reduction',
  reductionEnthalpy: 'vacancy formation enthalpy',
  reductionEntropy: 'vacancy formation entropy (k_B)',
  oxygenSites: 'oxygen-site density',
  refinement: 'mesh refinement',
  uncertainty: 'Monte Carlo samples',
  seed: 'random seed',
};

const OUTPUT_NAMES: Record<string, string> = {
  temperature_K: 'temperature',
  barrierHeight_eV: 'barrier height',
  electronBarrier_eV: 'electron barrier',
  metalWorkFunction_eV: 'metal work function',
  bandBending_eV: 'band bending',
  fermiLevelBelowConduction_eV: 'Fermi level below E_C (bulk)',
  supportWorkFunction_eV: 'support work function',
  direction: 'direction of electron transfer',
  spaceCharge_C_per_m2: 'space charge per area',
  chargeEquivalentWidth_nm: 'charge-equivalent width',
  depletionWidthApprox_nm: 'depletion width (approx.)',
  debyeLength_nm: 'Debye length',
  interfaceField_V_per_m: 'interface field',
  imageForceLowering_eV: 'image-force lowering',
  electronsPerParticle: 'electrons gained per particle',
  donorDensity_cm3: 'donor density',
  acceptorDensity_cm3: 'acceptor density',
  pinningFactor: 'pinning factor S',
  chargeDepth90_nm: 'depth holding 90 % of the charge',
  'bulk.electronDensity_cm3': 'bulk electron density',
  'bulk.holeDensity_cm3': 'bulk hole density',
  'bulk.ionizedDonors_cm3': 'ionised donors (bulk)',
  'particle.atoms': 'atoms per particle',
  'particle.surfaceAtoms': 'surface atoms per particle',
  'particle.dispersion': 'dispersion',
  'particle.electronsPerSurfaceAtom': 'electrons per surface atom',
  'particle.chargingEnergy_eV': 'charging energy',
  'exchange.exchangeCurrentDensity_A_per_cm2': 'exchange current density',
  'exchange.exchangeCurrentLog10_A_per_cm2': 'log10 exchange current density',
  'exchange.equilibrationTime_s': 'equilibration time',
  'exchange.equilibrationTimeLog10_s': 'log10 equilibration time',
  'pretreatment.vacancyDensity_cm3': 'oxygen-vacancy density',
  'pretreatment.reductionTemperature_K': 'reduction temperature',
  'pretreatment.oxygenPressure_Pa': 'O2 pressure in reduction',
  'solver.iterations': 'Newton iterations',
  'solver.meshPoints': 'mesh points',
  'solver.chargeErrorEstimate': 'charge error estimate (relative)',
};

const UNIT_SUFFIXES: [RegExp, string][] = [
  [/Log10_A_per_cm2$/, 'log10 A/cm^2'],
  [/Log10_s$/, 'log10 s'],
  [/Log10_cm3$/, 'log10 cm^-3'],
  [/_A_per_cm2_K2$/, 'A cm^-2 K^-2'],
  [/_A_per_cm2$/, 'A/cm^2'],
  [/_C_per_m2$/, 'C/m^2'],
  [/_V_per_m$/, 'V/m'],
  [/_eV$/, 'eV'],
  [/_cm3$/, 'cm^-3'],
  [/_cm2$/, 'cm^-2'],
  [/_nm$/, 'nm'],
  [/_K$/, 'K'],
  [/_Pa$/, 'Pa'],
  [/_s$/, 's'],
];

function words(name: string): string {
  return name
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[._-]+/g, ' ')
    .toLowerCase()
    .trim();
}

/** Name and unit of an output path: "band bending (eV)". */
export function outputTitle(path: string): string {
  const unit = UNIT_SUFFIXES.find(([re]) => re.test(path))?.[1];
  const leaf = path.split('.').at(-1)!;
  const name = OUTPUT_NAMES[path] ?? words(UNIT_SUFFIXES.reduce((s, [re]) => s.replace(re, ''), leaf).replace(/Log10$/, ''));
  return unit ? `${name} (${unit})` : name;
}

/** Name and unit of a swept field: "donor density (cm^-3)". */
export function inputTitle(axis: Pick<SweepAxis, 'field' | 'unit'>): string {
  const spec = fieldSpec(axis.field);
  const name = INPUT_NAMES[axis.field] ?? words(axis.field);
  if (spec?.kind !== 'quantity' || spec.quantity === 'dimensionless') return name;
  return `${name} (${axis.unit ?? defaultUnitOf(spec.quantity)})`;
}

/** Name of a base field for the report's conditions table. */
export function fieldName(field: string): string {
  return INPUT_NAMES[field] ?? words(field);
}

// ---------------------------------------------------------------------------------------------
// the plan

export interface AxisGroups {
  axis: SweepAxis;
  column: string;
  title: string;
  /** group of each axis position (-1: not plotted) */
  groupOf: number[];
  /** label of each group */
  labels: string[];
  /** representative numeric value of each group (x only; NaN for categories) */
  centres: number[];
  numeric: boolean;
  log: boolean;
  /** values were grouped into ranges */
  binned: boolean;
  /** positions not plotted (categorical axes beyond MAX_CATEGORIES) */
  dropped: number;
}

export interface AggregationPlan {
  x: AxisGroups;
  color: AxisGroups | null;
  facet: AxisGroups | null;
  /** swept fields aggregated over */
  rest: SweepAxis[];
  outputs: string[];
  /** reservoir capacity per cell and output */
  capacity: number;
}

function fmt(v: SweptValue): string {
  if (typeof v === 'string') return v;
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e5 || a < 1e-3) ? v.toExponential(2).replace(/\.?0+e/, 'e') : String(Number(v.toPrecision(4)));
}

/** A numeric axis spanning at least two decades of positive values reads better on a log scale. */
export function spansDecades(values: readonly number[], decades = 2): boolean {
  const pos = values.filter((v) => Number.isFinite(v));
  if (pos.length < 2 || pos.some((v) => v <= 0)) return false;
  return Math.log10(Math.max(...pos) / Math.min(...pos)) >= decades;
}

function groupAxis(axis: SweepAxis, maxNumeric: number, maxCategories: number): AxisGroups {
  const values = axisValues(axis);
  const numeric = isNumericField(axis.field) && values.every((v) => typeof v === 'number');
  const nums = numeric ? (values as number[]) : [];
  const log = numeric && ('log' in axis || spansDecades(nums));
  const base = { axis, column: sweptColumn(axis), title: inputTitle(axis), numeric, log, dropped: 0 };
  if (!numeric) {
    const shown = Math.min(values.length, maxCategories);
    return {
      ...base,
      groupOf: values.map((_, i) => (i < shown ? i : -1)),
      labels: values.slice(0, shown).map(String),
      centres: values.slice(0, shown).map(() => NaN),
      binned: false,
      dropped: values.length - shown,
    };
  }
  const n = values.length;
  if (n <= maxNumeric) {
    return { ...base, groupOf: values.map((_, i) => i), labels: nums.map(fmt), centres: [...nums], binned: false };
  }
  // contiguous runs of positions
  const groups = maxNumeric;
  const groupOf = values.map((_, i) => Math.min(groups - 1, Math.floor((i * groups) / n)));
  const labels: string[] = [];
  const centres: number[] = [];
  for (let g = 0; g < groups; g++) {
    const first = groupOf.indexOf(g);
    const last = groupOf.lastIndexOf(g);
    labels.push(`${fmt(nums[first]!)} to ${fmt(nums[last]!)}`);
    // geometric centre on a log axis, arithmetic otherwise
    centres.push(log ? Math.sqrt(nums[first]! * nums[last]!) : (nums[first]! + nums[last]!) / 2);
  }
  return { ...base, groupOf, labels, centres, binned: true };
}

/** The aggregation plan of a study (see the file comment). */
export function planAggregation(study: Study, outputs: readonly string[] = study.outputs): AggregationPlan {
  const axes = study.sweep.axes;
  const numericAxes = axes.filter((a) => isNumericField(a.field)).sort((a, b) => axisValues(b).length - axisValues(a).length);
  const xAxis = numericAxes[0] ?? axes[0]!;
  // in zip mode every axis moves together: only x is meaningful
  const others = study.sweep.mode === 'zip' ? [] : axes.filter((a) => a !== xAxis);
  const x = groupAxis(xAxis, MAX_X, 50);
  const color = others[0] ? groupAxis(others[0], MAX_COLOR_BINS, MAX_CATEGORIES) : null;
  const facet = others[1] ? groupAxis(others[1], MAX_FACETS, MAX_FACETS * 2) : null;
  const cells = x.labels.length * (color?.labels.length ?? 1) * (facet?.labels.length ?? 1);
  const capacity = Math.max(8, Math.min(256, Math.floor(MAX_STORED / Math.max(1, cells * Math.max(1, outputs.length)))));
  return { x, color, facet, rest: others.slice(2), outputs: [...outputs], capacity };
}

// ---------------------------------------------------------------------------------------------
// streaming statistics

/** Count, min, max and a bounded reservoir sample of a stream of numbers. */
export class Reservoir {
  n = 0;
  min = Infinity;
  max = -Infinity;
  private readonly sample: number[] = [];
  private state: number;
  constructor(
    private readonly capacity: number,
    seed = 0x9e3779b9,
  ) {
    this.state = seed >>> 0 || 1;
  }
  private random(): number {
    // xorshift32 (Marsaglia, J. Stat. Softw. 8(14), 2003)
    let s = this.state;
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    this.state = s >>> 0;
    return this.state / 4294967296;
  }
  add(v: number): void {
    this.n++;
    if (v < this.min) this.min = v;
    if (v > this.max) this.max = v;
    // Vitter's algorithm R (ACM TOMS 11(1), 1985): each value kept with probability capacity / n
    if (this.sample.length < this.capacity) this.sample.push(v);
    else {
      const j = Math.floor(this.random() * this.n);
      if (j < this.capacity) this.sample[j] = v;
    }
  }
  /** Quantile q in [0, 1] of the sample (linear interpolation between order statistics); exact while n <= capacity. */
  quantile(q: number): number {
    const s = [...this.sample].sort((a, b) => a - b);
    if (s.length === 0) return NaN;
    if (q <= 0) return this.min;
    if (q >= 1) return this.max;
    const h = (s.length - 1) * q;
    const lo = Math.floor(h);
    return s[lo]! + (h - lo) * ((s[Math.min(lo + 1, s.length - 1)] ?? s[lo]!) - s[lo]!);
  }
}

export interface AggregatedPoint {
  facet: string;
  group: string;
  x: number | string;
  n: number;
  median: number;
  lo: number;
  hi: number;
  min: number;
  max: number;
}

export interface OutputOverview {
  output: string;
  title: string;
  numeric: number;
  min: number;
  median: number;
  max: number;
}

/** A row as read from results.jsonl (typed) or results.csv (strings). */
export type ResultRecord = Record<string, unknown>;

export class StudyAggregator {
  readonly plan: AggregationPlan;
  private readonly positions: Map<string, number>[] = [];
  private readonly cells = new Map<number, Reservoir[]>();
  private readonly overall: Reservoir[];
  rows = 0;
  failed = 0;
  /** error message -> count (at most 50 distinct messages kept) */
  readonly errors = new Map<string, number>();
  constructor(study: Study, outputs: readonly string[] = study.outputs) {
    this.plan = planAggregation(study, outputs);
    for (const g of [this.plan.x, this.plan.color, this.plan.facet]) {
      this.positions.push(new Map((g ? axisValues(g.axis) : []).map((v, i) => [String(v), i])));
    }
    this.overall = this.plan.outputs.map((_, i) => new Reservoir(4096, 12345 + i));
  }

  private group(k: number, g: AxisGroups | null, row: ResultRecord): number {
    if (g === null) return 0;
    const pos = this.positions[k]!.get(String(row[g.column] ?? ''));
    return pos === undefined ? -1 : g.groupOf[pos]!;
  }

  add(row: ResultRecord): void {
    this.rows++;
    const error = row['error'];
    if (error !== null && error !== undefined && error !== '') {
      this.failed++;
      const msg = String(error).slice(0, 200);
      if (this.errors.has(msg) || this.errors.size < 50) this.errors.set(msg, (this.errors.get(msg) ?? 0) + 1);
      return;
    }
    const { x, color, facet } = this.plan;
    const gx = this.group(0, x, row);
    const gc = this.group(1, color, row);
    const gf = this.group(2, facet, row);
    const plotted = gx >= 0 && gc >= 0 && gf >= 0;
    const key = plotted ? (gf * (color?.labels.length ?? 1) + gc) * x.labels.length + gx : -1;
    let cell = plotted ? this.cells.get(key) : undefined;
    this.plan.outputs.forEach((o, i) => {
      const raw = row[o];
      const v = typeof raw === 'number' ? raw : typeof raw === 'string' && raw !== '' ? Number(raw) : NaN;
      if (!Number.isFinite(v)) return;
      this.overall[i]!.add(v);
      if (!plotted) return;
      if (cell === undefined) {
        cell = this.plan.outputs.map((_, j) => new Reservoir(this.plan.capacity, key * 7919 + j + 1));
        this.cells.set(key, cell);
      }
      cell[i]!.add(v);
    });
  }

  /** Plot points of one output, in facet, group, x order. */
  points(output: string): AggregatedPoint[] {
    const i = this.plan.outputs.indexOf(output);
    const { x, color, facet } = this.plan;
    const nx = x.labels.length;
    const nc = color?.labels.length ?? 1;
    const out: AggregatedPoint[] = [];
    for (const key of [...this.cells.keys()].sort((a, b) => a - b)) {
      const r = this.cells.get(key)![i]!;
      if (r.n === 0) continue;
      const gx = key % nx;
      const gc = Math.floor(key / nx) % nc;
      const gf = Math.floor(key / (nx * nc));
      out.push({
        facet: facet?.labels[gf] ?? '',
        group: color?.labels[gc] ?? '',
        x: x.numeric ? x.centres[gx]! : x.labels[gx]!,
        n: r.n,
        median: r.quantile(0.5),
        lo: r.quantile(0.05),
        hi: r.quantile(0.95),
        min: r.min,
        max: r.max,
      });
    }
    return out;
  }

  overview(): OutputOverview[] {
    return this.plan.outputs.map((o, i) => {
      const r = this.overall[i]!;
      return { output: o, title: outputTitle(o), numeric: r.n, min: r.min, median: r.quantile(0.5), max: r.max };
    });
  }
}

/** Split one CSV line as csv-stringify writes it (RFC 4180 quotes, no embedded newlines). */
export function splitCsvLine(line: string): string[] {
  const cells: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      cells.push(cell);
      cell = '';
    } else cell += ch;
  }
  cells.push(cell);
  return cells;
}
