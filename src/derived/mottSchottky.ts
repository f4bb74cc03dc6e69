// Mott–Schottky analysis of measured capacitance–voltage data of a support electrode: dopant density,
// flat-band potential and the support's Fermi level on the vacuum scale, with least-squares uncertainties.
import { Matrix, inverse, solve } from 'ml-matrix';
import { EPS0_F_PER_M, K_BOLTZMANN_EV_PER_K, Q_ELEMENTARY_C } from '../constants.js';
import { InputError, requireInRange } from '../errors.js';
import { parseCsvRecords, readTextFile, type CsvRecord } from '../inputs/files.js';

/**
 * Absolute potential of the standard hydrogen electrode, 4.44 V (± 0.02 V) at 298.15 K: IUPAC recommendation,
 * S. Trasatti, Pure Appl. Chem. 58 (1986) 955, doi:10.1351/pac198658070955 (checked via the IUPAC Gold Book
 * entry "standard hydrogen electrode").
 */
export const ABSOLUTE_SHE_POTENTIAL_V = 4.44;

export type ReferenceElectrode = 'SHE' | 'NHE' | 'SCE' | 'Ag/AgCl' | 'RHE';

/**
 * Potentials of the fixed reference electrodes versus SHE at 25 °C, V. From memory of A. J. Bard and
 * L. R. Faulkner, Electrochemical Methods, 2nd ed. (Wiley, 2001), table of reference electrode potentials,
 * verify. Cross-checked in public tables: SCE 0.2412 V and Ag/AgCl in saturated KCl 0.197 V (without
 * liquid-junction correction). 'Ag/AgCl' means saturated KCl filling; other fillings differ by tens of mV.
 * RHE is pH-dependent and handled in referenceOffset_V.
 */
export const REFERENCE_POTENTIAL_V_SHE: Readonly<Record<Exclude<ReferenceElectrode, 'RHE'>, number>> = {
  SHE: 0,
  NHE: 0,
  SCE: 0.241,
  'Ag/AgCl': 0.197,
};

const REFERENCE_ALIASES: Record<string, ReferenceElectrode> = {
  she: 'SHE',
  nhe: 'NHE',
  sce: 'SCE',
  'ag/agcl': 'Ag/AgCl',
  agcl: 'Ag/AgCl',
  rhe: 'RHE',
};

const REFERENCE_CHOICES = 'SHE, NHE, SCE, Ag/AgCl (saturated KCl), RHE (needs pH)';

/** Read a reference electrode name (case-insensitive), throwing InputError with the allowed names. */
export function parseReferenceElectrode(text: string, field = 'reference'): ReferenceElectrode {
  const found = REFERENCE_ALIASES[String(text).trim().toLowerCase()];
  if (!found) throw new InputError(field, `unknown reference electrode "${text}"`, REFERENCE_CHOICES);
  return found;
}

/**
 * Offset to add to a potential measured against `reference` to get it against SHE, V.
 * RHE: E(SHE) = E(RHE) - (ln 10) (kT/q) pH (Nernst equation for H+/H2), 0.0591 V per pH unit at 298.15 K;
 * the Nernst slope is taken at the measurement temperature, the fixed electrodes at their 25 °C values.
 */
export function referenceOffset_V(reference: ReferenceElectrode, options: { pH?: number; temperature_K?: number } = {}): number {
  if (reference === 'RHE') {
    if (options.pH === undefined) throw new InputError('pH', 'the RHE scale needs the electrolyte pH', '-1 to 15');
    const pH = requireInRange('pH', options.pH, -1, 15, '');
    const temperature_K = requireInRange('temperature_K', options.temperature_K ?? 298.15, 200, 500, 'K');
    return -Math.LN10 * K_BOLTZMANN_EV_PER_K * temperature_K * pH;
  }
  const offset = REFERENCE_POTENTIAL_V_SHE[reference];
  if (offset === undefined) throw new InputError('reference', `unknown reference electrode "${String(reference)}"`, REFERENCE_CHOICES);
  return offset;
}

/** One measured point: give capacitance_F (with electrodeArea_m2 in the fit) or capacitance_F_per_m2. */
export interface CapacitanceRow {
  /** electrode potential versus the reference electrode, V */
  potential_V: number;
  /** measured capacitance of the whole electrode, F */
  capacitance_F?: number;
  /** measured capacitance per electrode area, F/m^2 */
  capacitance_F_per_m2?: number;
}

export interface MottSchottkyInput {
  rows: CapacitanceRow[];
  /** geometric electrode area, m^2; needed when rows carry capacitance_F */
  electrodeArea_m2?: number;
  /** relative permittivity of the support (static) */
  permittivityRelative: number;
  /** measurement temperature, K */
  temperature_K: number;
  reference: ReferenceElectrode;
  /** electrolyte pH, needed for RHE */
  pH?: number;
}

export interface MottSchottkyFit {
  points: number;
  /** positive slope: n-type (donors); negative slope: p-type (acceptors) */
  carrierType: 'n' | 'p';
  /** d(1/c^2)/dV with c per area, m^4 F^-2 V^-1 */
  slope: number;
  slopeStdErr: number;
  /** 1/c^2 at V = 0, m^4 F^-2 */
  intercept: number;
  interceptStdErr: number;
  slopeInterceptCovariance: number;
  rSquared: number;
  /** false when |slope| is within two standard errors of zero: carrier type and density are then not established */
  slopeSignificant: boolean;
  /** donor density for n-type, acceptor density for p-type, m^-3 */
  dopantDensity_m3: number;
  dopantDensityStdErr_m3: number;
  dopantDensity_cm3: number;
  dopantDensityStdErr_cm3: number;
  /** flat-band potential versus the reference electrode used, V */
  flatBandPotential_V: number;
  flatBandStdErr_V: number;
  reference: ReferenceElectrode;
  /** added to a potential versus the reference to give it versus SHE, V */
  referenceOffset_V: number;
  flatBandPotential_V_SHE: number;
  /** support Fermi level on the vacuum scale, E_F = -(4.44 eV + q V_fb(SHE)); negative, eV */
  fermiLevelVsVacuum_eV: number;
  /** -fermiLevelVsVacuum_eV: the support work function at flat band, eV (uncertainty flatBandStdErr_V plus 0.02 eV in the SHE scale) */
  supportWorkFunction_eV: number;
  /** kT/q at the measurement temperature, V */
  thermalVoltage_V: number;
  /** the static relative permittivity the density was computed with (contact --fit-from uses it too) */
  permittivityRelative: number;
  /** measurement temperature, K */
  temperature_K: number;
}

export interface LinearFit {
  intercept: number;
  slope: number;
  interceptVariance: number;
  slopeVariance: number;
  covariance: number;
  rSquared: number;
}

/**
 * Ordinary least squares y = a + b x through the design matrix X = [1, x]: beta by QR (ml-matrix solve),
 * covariance s^2 (X^T X)^-1 with s^2 = RSS / (n - 2), the unbiased residual variance.
 */
export function fitStraightLine(x: number[], y: number[]): LinearFit {
  const n = x.length;
  const design = new Matrix(n, 2);
  for (let i = 0; i < n; i++) {
    design.set(i, 0, 1);
    design.set(i, 1, x[i]!);
  }
  const response = Matrix.columnVector(y);
  const beta = solve(design, response);
  const intercept = beta.get(0, 0);
  const slope = beta.get(1, 0);
  const normalInverse = inverse(design.transpose().mmul(design));
  let rss = 0;
  let tss = 0;
  const meanY = y.reduce((sum, v) => sum + v, 0) / n;
  for (let i = 0; i < n; i++) {
    rss += (y[i]! - intercept - slope * x[i]!) ** 2;
    tss += (y[i]! - meanY) ** 2;
  }
  const residualVariance = rss / (n - 2);
  return {
    intercept,
    slope,
    interceptVariance: residualVariance * normalInverse.get(0, 0),
    slopeVariance: residualVariance * normalInverse.get(1, 1),
    covariance: residualVariance * normalInverse.get(0, 1),
    rSquared: tss > 0 ? 1 - rss / tss : 0,
  };
}

/**
 * Fit 1/c^2 against V with the Mott–Schottky relation (c = capacitance per area):
 *   n-type: 1/c^2 =  (2 / (q eps eps0 N_D)) (V - V_fb - kT/q)
 *   p-type: 1/c^2 = -(2 / (q eps eps0 N_A)) (V - V_fb + kT/q)
 * so N = 2 / (q eps eps0 |b|) and V_fb = -a/b - sign(b) kT/q. The fit assumes the data lie in depletion,
 * a frequency where the space-charge capacitance dominates, and no surface-state contribution.
 */
export function fitMottSchottky(input: MottSchottkyInput): MottSchottkyFit {
  const permittivity = requireInRange('permittivityRelative', input.permittivityRelative, 1, 1e5, '(relative permittivity)');
  const temperature_K = requireInRange('temperature_K', input.temperature_K, 200, 500, 'K');
  const offset_V = referenceOffset_V(input.reference, { pH: input.pH, temperature_K });
  const { potentials, inverseSquare } = inverseSquareCapacitance(input);
  const { minV, maxV } = potentialWindow(potentials);

  const fit = fitStraightLine(potentials, inverseSquare);
  let largestInverseSquare = 0;
  for (const y of inverseSquare) if (y > largestInverseSquare) largestInverseSquare = y;
  // Numerically flat: the fitted change of 1/c^2 across the window is at roundoff level of 1/c^2 itself.
  if (!Number.isFinite(fit.slope) || Math.abs(fit.slope) * (maxV - minV) <= 1e-9 * largestInverseSquare) {
    throw new InputError('rows', '1/C^2 does not change with potential: no Mott–Schottky slope', 'data with a nonzero 1/C^2 slope');
  }
  const slopeStdErr = Math.sqrt(Math.max(0, fit.slopeVariance));
  // Two standard errors: below that the sign, hence the carrier type, is not established by the data.
  const slopeSignificant = Math.abs(fit.slope) > 2 * slopeStdErr;
  const interceptStdErr = Math.sqrt(Math.max(0, fit.interceptVariance));
  const carrierSign = Math.sign(fit.slope);
  const thermalVoltage_V = K_BOLTZMANN_EV_PER_K * temperature_K;

  // Dopant density from the Mott–Schottky slope, N = 2/(q eps eps0 |b|); relative error equals that of b.
  const dopantDensity_m3 = 2 / (Q_ELEMENTARY_C * permittivity * EPS0_F_PER_M * Math.abs(fit.slope));
  const dopantDensityStdErr_m3 = (dopantDensity_m3 * slopeStdErr) / Math.abs(fit.slope);

  // V_fb = -a/b - sign(b) kT/q; first-order propagation with the a-b covariance, which is large
  // because the intercept is an extrapolation from the measured window.
  const flatBand_V = -fit.intercept / fit.slope - carrierSign * thermalVoltage_V;
  const dVda = -1 / fit.slope;
  const dVdb = fit.intercept / fit.slope ** 2;
  const flatBandVariance = dVda ** 2 * fit.interceptVariance + dVdb ** 2 * fit.slopeVariance + 2 * dVda * dVdb * fit.covariance;
  const flatBandStdErr_V = Math.sqrt(Math.max(0, flatBandVariance));

  const flatBandSHE_V = flatBand_V + offset_V;
  // Vacuum scale E_F = -(4.44 eV + q V_fb(SHE)): at flat band the electrode Fermi level equals the support's.
  const fermiLevelVsVacuum_eV = -(ABSOLUTE_SHE_POTENTIAL_V + flatBandSHE_V);

  return {
    points: potentials.length,
    carrierType: carrierSign > 0 ? 'n' : 'p',
    slope: fit.slope,
    slopeStdErr,
    intercept: fit.intercept,
    interceptStdErr,
    slopeInterceptCovariance: fit.covariance,
    rSquared: fit.rSquared,
    slopeSignificant,
    dopantDensity_m3,
    dopantDensityStdErr_m3,
    dopantDensity_cm3: dopantDensity_m3 * 1e-6,
    dopantDensityStdErr_cm3: dopantDensityStdErr_m3 * 1e-6,
    flatBandPotential_V: flatBand_V,
    flatBandStdErr_V,
    reference: input.reference,
    referenceOffset_V: offset_V,
    flatBandPotential_V_SHE: flatBandSHE_V,
    fermiLevelVsVacuum_eV,
    supportWorkFunction_eV: -fermiLevelVsVacuum_eV,
    thermalVoltage_V,
    permittivityRelative: permittivity,
    temperature_K,
  };
}

/** The points as (V, 1/c^2) with c per electrode area; each row checked (3 points at least). */
function inverseSquareCapacitance(input: MottSchottkyInput): { potentials: number[]; inverseSquare: number[] } {
  if (!Array.isArray(input.rows) || input.rows.length < 3) {
    throw new InputError('rows', `${Array.isArray(input.rows) ? input.rows.length : 0} points given`, 'at least 3 capacitance-voltage points');
  }
  const potentials: number[] = [];
  const inverseSquare: number[] = [];
  input.rows.forEach((row, index) => {
    const field = `rows[${index}]`;
    requireInRange(`${field}.potential_V`, row.potential_V, -100, 100, 'V');
    const perArea = capacitancePerArea(row, field, input.electrodeArea_m2);
    potentials.push(row.potential_V);
    inverseSquare.push(1 / perArea ** 2);
  });
  return { potentials, inverseSquare };
}

function capacitancePerArea(row: CapacitanceRow, field: string, electrodeArea_m2: number | undefined): number {
  if (row.capacitance_F_per_m2 !== undefined && row.capacitance_F !== undefined) {
    throw new InputError(field, 'give either capacitance_F or capacitance_F_per_m2, not both');
  }
  if (row.capacitance_F_per_m2 !== undefined) return requirePositive(`${field}.capacitance_F_per_m2`, row.capacitance_F_per_m2, 'F/m^2');
  if (row.capacitance_F === undefined) {
    throw new InputError(field, 'missing capacitance', 'capacitance_F (with electrodeArea_m2) or capacitance_F_per_m2');
  }
  if (electrodeArea_m2 === undefined) {
    throw new InputError('electrodeArea_m2', 'needed to turn capacitance_F into capacitance per area', '1e-10 to 1 m^2');
  }
  const area = requireInRange('electrodeArea_m2', electrodeArea_m2, 1e-10, 1, 'm^2');
  return requirePositive(`${field}.capacitance_F`, row.capacitance_F, 'F') / area;
}

/** Lowest and highest potential; refuses a window of zero width (no slope). */
function potentialWindow(potentials: readonly number[]): { minV: number; maxV: number } {
  // loops, not Math.min(...array): spreading 130k+ values into a call overflows the stack
  let minV = Infinity;
  let maxV = -Infinity;
  for (const v of potentials) {
    if (v < minV) minV = v;
    if (v > maxV) maxV = v;
  }
  if (!(maxV - minV > 1e-9 * Math.max(1, Math.abs(maxV)))) {
    throw new InputError('rows', 'all points are at the same potential, so no slope can be fitted', 'at least two distinct potentials');
  }
  return { minV, maxV };
}

function requirePositive(field: string, value: number, unit: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new InputError(field, `value ${String(value)} ${unit} is not a positive finite number`, `greater than 0 ${unit}`);
  }
  return value;
}

// ---------------------------------------------------------------------------------------------------------
// CSV input

export type CapacitanceColumn = 'capacitance_F' | 'capacitance_F_per_cm2';

export interface ParsedCapacitanceCsv {
  rows: CapacitanceRow[];
  /** which capacitance column the file had */
  capacitanceColumn: CapacitanceColumn;
}

const M2_PER_CM2 = 1e-4;
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Read capacitance–voltage data from CSV text. The first non-comment line is a header naming the columns
 * (case-insensitive, extra columns ignored):
 *   potential_V            electrode potential versus the reference electrode, V
 *   capacitance_F          capacitance of the whole electrode, F (the fit then needs the electrode area), or
 *   capacitance_F_per_cm2  capacitance per electrode area, F/cm^2 (returned as capacitance_F_per_m2)
 * Exactly one capacitance column. Errors name the file, the row (its 1-based line in the file) and column.
 */
export function parseCapacitanceCsv(text: string, fileLabel: string): ParsedCapacitanceCsv {
  if (typeof text !== 'string') throw new InputError(fileLabel, 'no CSV text given');
  const records = parseCsvRecords(text, fileLabel);
  const header = records.shift();
  if (!header) {
    throw new InputError(fileLabel, 'the file has no header line', 'a header with potential_V and capacitance_F or capacitance_F_per_cm2');
  }
  const names = header.cells.map((name) => name.trim().toLowerCase());
  const seen = new Set<string>();
  for (const name of names) {
    if (name !== '' && seen.has(name)) throw new InputError(`${fileLabel}: row ${header.line}`, `column "${name}" appears twice in the header`);
    seen.add(name);
  }
  const potentialIndex = names.indexOf('potential_v');
  const absoluteIndex = names.indexOf('capacitance_f');
  const perAreaIndex = names.indexOf('capacitance_f_per_cm2');
  const expected = 'header columns potential_V and one of capacitance_F, capacitance_F_per_cm2';
  if (potentialIndex < 0) throw new InputError(`${fileLabel}: row ${header.line}`, 'no potential_V column in the header', expected);
  if (absoluteIndex < 0 && perAreaIndex < 0) {
    throw new InputError(`${fileLabel}: row ${header.line}`, 'no capacitance column in the header', expected);
  }
  if (absoluteIndex >= 0 && perAreaIndex >= 0) {
    throw new InputError(`${fileLabel}: row ${header.line}`, 'both capacitance_F and capacitance_F_per_cm2 are present; keep one', expected);
  }
  const capacitanceColumn: CapacitanceColumn = absoluteIndex >= 0 ? 'capacitance_F' : 'capacitance_F_per_cm2';
  const capacitanceIndex = absoluteIndex >= 0 ? absoluteIndex : perAreaIndex;

  const rows: CapacitanceRow[] = records.map((record) => {
    if (record.cells.length !== header.cells.length) {
      throw new InputError(
        `${fileLabel}: row ${record.line}`,
        `${record.cells.length} cells where the header has ${header.cells.length} columns`,
        `${header.cells.length} comma-separated cells per row`,
      );
    }
    const potential_V = readNumber(fileLabel, record, potentialIndex, 'potential_V');
    const capacitance = readNumber(fileLabel, record, capacitanceIndex, capacitanceColumn);
    if (!(capacitance > 0)) {
      throw new InputError(
        `${fileLabel}: row ${record.line}, column ${capacitanceColumn}`,
        `capacitance ${capacitance} is not positive`,
        'greater than 0',
      );
    }
    return capacitanceColumn === 'capacitance_F'
      ? { potential_V, capacitance_F: capacitance }
      : { potential_V, capacitance_F_per_m2: capacitance / M2_PER_CM2 };
  });
  if (rows.length < 3) {
    throw new InputError(fileLabel, `${rows.length} data rows`, 'at least 3 capacitance-voltage points');
  }
  return { rows, capacitanceColumn };
}

/**
 * Read a capacitance–voltage CSV file (regular files of at most 5 MB only, see src/inputs/files.ts) and parse it
 * with parseCapacitanceCsv; errors name `field` and the path.
 */
export function readCapacitanceCsvFile(path: string, field: string = path): ParsedCapacitanceCsv {
  return parseCapacitanceCsv(readTextFile(path, field), path);
}

function readNumber(fileLabel: string, record: CsvRecord, index: number, column: string): number {
  const raw = record.cells[index]!.trim();
  const value = Number(raw);
  if (!NUMBER_PATTERN.test(raw) || !Number.isFinite(value)) {
    throw new InputError(`${fileLabel}: row ${record.line}, column ${column}`, `"${raw}" is not a number`, 'a finite decimal number such as 1.5e-6');
  }
  return value;
}
