import { describe, expect, it } from 'vitest';
import {
  ABSOLUTE_SHE_POTENTIAL_V,
  REFERENCE_POTENTIAL_V_SHE,
  fitMottSchottky,
  parseCapacitanceCsv,
  parseReferenceElectrode,
  referenceOffset_V,
  type CapacitanceRow,
} from '../src/derived/mottSchottky.js';
import { InputError } from '../src/errors.js';
import { EPS0_F_PER_M, K_BOLTZMANN_EV_PER_K, Q_ELEMENTARY_C } from '../src/constants.js';

const EPS_R = 30;
const T = 298.15;
const KT_Q = K_BOLTZMANN_EV_PER_K * T;
const AREA_M2 = 0.5e-4; // 0.5 cm^2

/** Exact Mott–Schottky capacitance per area (common practice, no source: the relation itself). */
function perAreaCapacitance(V: number, N_m3: number, Vfb: number, type: 'n' | 'p'): number {
  const slope = (type === 'n' ? 2 : -2) / (Q_ELEMENTARY_C * EPS_R * EPS0_F_PER_M * N_m3);
  const shift = type === 'n' ? -KT_Q : KT_Q;
  return 1 / Math.sqrt(slope * (V - Vfb + shift));
}

function potentials(from: number, to: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => from + ((to - from) * i) / (count - 1));
}

/** Deterministic noise in [-1, 1) from a fixed linear congruential generator (common practice, no source). */
function noiseSequence(count: number, seed = 12345): number[] {
  let state = seed;
  return Array.from({ length: count }, () => {
    state = (1103515245 * state + 12345) % 2147483648;
    return (2 * state) / 2147483648 - 1;
  });
}

const ND_TRUE_M3 = 1e24; // 1e18 cm^-3
const VFB_TRUE = -0.3; // V vs Ag/AgCl

describe('Mott–Schottky fit on exact synthetic data', () => {
  const volts = potentials(0, 1, 21);

  it('recovers N_D = 1e18 cm^-3 and V_fb = -0.3 V to 1e-9 (capacitance per area)', () => {
    const rows: CapacitanceRow[] = volts.map((V) => ({ potential_V: V, capacitance_F_per_m2: perAreaCapacitance(V, ND_TRUE_M3, VFB_TRUE, 'n') }));
    const fit = fitMottSchottky({ rows, permittivityRelative: EPS_R, temperature_K: T, reference: 'Ag/AgCl' });
    expect(fit.carrierType).toBe('n');
    expect(Math.abs(fit.dopantDensity_cm3 / 1e18 - 1)).toBeLessThan(1e-9);
    expect(Math.abs(fit.flatBandPotential_V / VFB_TRUE - 1)).toBeLessThan(1e-9);
    expect(fit.rSquared).toBeCloseTo(1, 12);
    expect(fit.points).toBe(21);
  });

  it('gives the same answer from whole-electrode capacitance and an electrode area', () => {
    const rows: CapacitanceRow[] = volts.map((V) => ({ potential_V: V, capacitance_F: perAreaCapacitance(V, ND_TRUE_M3, VFB_TRUE, 'n') * AREA_M2 }));
    const fit = fitMottSchottky({ rows, electrodeArea_m2: AREA_M2, permittivityRelative: EPS_R, temperature_K: T, reference: 'Ag/AgCl' });
    expect(Math.abs(fit.dopantDensity_cm3 / 1e18 - 1)).toBeLessThan(1e-9);
    expect(Math.abs(fit.flatBandPotential_V / VFB_TRUE - 1)).toBeLessThan(1e-9);
  });

  it('puts the Fermi level on the vacuum scale through the SHE at 4.44 V', () => {
    // E_F = -(4.44 eV + q V_fb(SHE)): IUPAC recommendation, S. Trasatti, Pure Appl. Chem. 58 (1986) 955,
    // doi:10.1351/pac198658070955. Ag/AgCl (sat. KCl) = +0.197 V vs SHE (from memory of Bard & Faulkner,
    // Electrochemical Methods, 2nd ed., verify).
    const rows: CapacitanceRow[] = volts.map((V) => ({ potential_V: V, capacitance_F_per_m2: perAreaCapacitance(V, ND_TRUE_M3, VFB_TRUE, 'n') }));
    const fit = fitMottSchottky({ rows, permittivityRelative: EPS_R, temperature_K: T, reference: 'Ag/AgCl' });
    expect(fit.referenceOffset_V).toBe(0.197);
    expect(fit.flatBandPotential_V_SHE).toBeCloseTo(-0.103, 9);
    expect(fit.fermiLevelVsVacuum_eV).toBeCloseTo(-(4.44 - 0.103), 9);
    expect(fit.supportWorkFunction_eV).toBeCloseTo(4.337, 9);
  });

  it('recognises a negative slope as p-type and returns the acceptor density', () => {
    // p-type form 1/C^2 = -(2/(q eps eps0 N_A))(V - V_fb + kT/q): common practice, no source.
    const NA = 5e23;
    const VfbRhe = 1.2;
    const rows = potentials(0.2, 1.0, 17).map((V) => ({ potential_V: V, capacitance_F_per_m2: perAreaCapacitance(V, NA, VfbRhe, 'p') }));
    const fit = fitMottSchottky({ rows, permittivityRelative: EPS_R, temperature_K: T, reference: 'RHE', pH: 7 });
    expect(fit.carrierType).toBe('p');
    expect(fit.slope).toBeLessThan(0);
    expect(Math.abs(fit.dopantDensity_m3 / NA - 1)).toBeLessThan(1e-9);
    expect(Math.abs(fit.flatBandPotential_V / VfbRhe - 1)).toBeLessThan(1e-9);
    // RHE = SHE + 0.0591 pH V at 25 °C (from memory of Bard & Faulkner, 2nd ed., verify).
    expect(fit.flatBandPotential_V_SHE).toBeCloseTo(1.2 - 0.0591 * 7, 3);
  });
});

describe('Mott–Schottky fit with noise', () => {
  const volts = potentials(-0.1, 1.2, 27);
  const noise = noiseSequence(volts.length);
  const rows: CapacitanceRow[] = volts.map((V, i) => ({
    potential_V: V,
    capacitance_F_per_m2: perAreaCapacitance(V, ND_TRUE_M3, VFB_TRUE, 'n') * (1 + 0.01 * noise[i]!),
  }));
  const fit = fitMottSchottky({ rows, permittivityRelative: EPS_R, temperature_K: T, reference: 'SCE' });

  it('reports nonzero standard errors that cover the truth', () => {
    expect(fit.dopantDensityStdErr_cm3).toBeGreaterThan(0);
    expect(fit.flatBandStdErr_V).toBeGreaterThan(0);
    expect(fit.rSquared).toBeLessThan(1);
    expect(fit.rSquared).toBeGreaterThan(0.99);
    expect(fit.slopeSignificant).toBe(true);
    expect(Math.abs(fit.dopantDensity_cm3 - 1e18)).toBeLessThan(3 * fit.dopantDensityStdErr_cm3);
    expect(Math.abs(fit.flatBandPotential_V - VFB_TRUE)).toBeLessThan(3 * fit.flatBandStdErr_V);
  });

  it('agrees with closed-form simple linear regression (normal equations)', () => {
    // Simple linear regression b = Sxy/Sxx, a = ybar - b xbar, var(b) = s^2/Sxx, var(a) = s^2 (1/n + xbar^2/Sxx),
    // cov(a, b) = -xbar s^2/Sxx: common practice, no source.
    const x = volts;
    const y = rows.map((r) => 1 / r.capacitance_F_per_m2! ** 2);
    const n = x.length;
    const xbar = x.reduce((s, v) => s + v, 0) / n;
    const ybar = y.reduce((s, v) => s + v, 0) / n;
    let sxx = 0;
    let sxy = 0;
    for (let i = 0; i < n; i++) {
      sxx += (x[i]! - xbar) ** 2;
      sxy += (x[i]! - xbar) * (y[i]! - ybar);
    }
    const b = sxy / sxx;
    const a = ybar - b * xbar;
    let rss = 0;
    for (let i = 0; i < n; i++) rss += (y[i]! - a - b * x[i]!) ** 2;
    const s2 = rss / (n - 2);
    const seB = Math.sqrt(s2 / sxx);
    const seA = Math.sqrt(s2 * (1 / n + xbar ** 2 / sxx));
    const cov = (-xbar * s2) / sxx;
    expect(fit.slope / b).toBeCloseTo(1, 10);
    expect(fit.intercept / a).toBeCloseTo(1, 10);
    expect(fit.slopeStdErr / seB).toBeCloseTo(1, 8);
    expect(fit.interceptStdErr / seA).toBeCloseTo(1, 8);
    expect(fit.slopeInterceptCovariance / cov).toBeCloseTo(1, 8);

    // First-order propagation to V_fb = -a/b - kT/q including the covariance (common practice, no source).
    const varV = seA ** 2 / b ** 2 + (a ** 2 * seB ** 2) / b ** 4 - (2 * a * cov) / b ** 3;
    expect(fit.flatBandStdErr_V / Math.sqrt(varV)).toBeCloseTo(1, 8);
    // N = 2/(q eps eps0 b), relative error equal to that of b.
    expect(fit.dopantDensityStdErr_m3 / fit.dopantDensity_m3).toBeCloseTo(seB / b, 10);
    expect(fit.flatBandPotential_V).toBeCloseTo(-a / b - KT_Q, 10);
  });
});

describe('reference electrodes', () => {
  it('uses the tabulated offsets vs SHE', () => {
    // SCE +0.241 V, Ag/AgCl (sat. KCl) +0.197 V vs SHE at 25 °C (from memory of A. J. Bard and L. R. Faulkner,
    // Electrochemical Methods, 2nd ed., Wiley 2001, verify); SHE = NHE = 0.
    expect(REFERENCE_POTENTIAL_V_SHE.SCE).toBe(0.241);
    expect(referenceOffset_V('Ag/AgCl')).toBe(0.197);
    expect(referenceOffset_V('SHE')).toBe(0);
    expect(referenceOffset_V('NHE')).toBe(0);
    expect(ABSOLUTE_SHE_POTENTIAL_V).toBe(4.44);
  });

  it('needs a pH for RHE and gives 0.0591 V per pH at 25 °C', () => {
    // Nernst slope (ln 10) RT/F = 0.05916 V at 298.15 K: common practice, no source.
    expect(referenceOffset_V('RHE', { pH: 1 })).toBeCloseTo(-0.0591, 3);
    expect(() => referenceOffset_V('RHE')).toThrow(/pH/);
    expect(() => referenceOffset_V('RHE', { pH: 20 })).toThrow(/pH/);
  });

  it('parses names case-insensitively and rejects unknown ones', () => {
    expect(parseReferenceElectrode('sce')).toBe('SCE');
    expect(parseReferenceElectrode(' Ag/AgCl ')).toBe('Ag/AgCl');
    expect(() => parseReferenceElectrode('MSE')).toThrow(/reference.*allowed: SHE/);
  });
});

describe('fit input validation', () => {
  const good = [0, 0.5, 1].map((V) => ({ potential_V: V, capacitance_F_per_m2: perAreaCapacitance(V, ND_TRUE_M3, VFB_TRUE, 'n') }));
  const base = { permittivityRelative: EPS_R, temperature_K: T, reference: 'SHE' as const };

  it('needs three points, distinct potentials, positive capacitance and an area for absolute values', () => {
    expect(() => fitMottSchottky({ ...base, rows: good.slice(0, 2) })).toThrow(/at least 3/);
    expect(() => fitMottSchottky({ ...base, rows: good.map((r) => ({ ...r, potential_V: 0.2 })) })).toThrow(/same potential/);
    expect(() => fitMottSchottky({ ...base, rows: [...good, { potential_V: 1.1, capacitance_F_per_m2: -1 }] })).toThrow(/rows\[3\]\.capacitance_F_per_m2/);
    expect(() => fitMottSchottky({ ...base, rows: good.map((r) => ({ potential_V: r.potential_V, capacitance_F: 1e-6 })) })).toThrow(/electrodeArea_m2/);
    expect(() => fitMottSchottky({ ...base, rows: good.map((r) => ({ potential_V: r.potential_V, capacitance_F_per_m2: 1e-2 })) })).toThrow(/slope/);
    expect(() => fitMottSchottky({ ...base, rows: good, permittivityRelative: 0 })).toThrow(/permittivityRelative/);
  });
});

describe('capacitance CSV', () => {
  it('reads capacitance per cm^2 (converted to per m^2), CRLF, quotes, comments and extra columns', () => {
    const text = '\ufeff# measured at 1 kHz\r\nPotential_V,"capacitance_F_per_cm2",note\r\n0.0,1e-6,a\r\n0.5,"8e-7","b, quoted"\r\n\r\n1.0,6e-7,c\r\n';
    const parsed = parseCapacitanceCsv(text, 'ms.csv');
    expect(parsed.capacitanceColumn).toBe('capacitance_F_per_cm2');
    expect(parsed.rows).toHaveLength(3);
    expect(parsed.rows[1]!.potential_V).toBe(0.5);
    expect(parsed.rows[1]!.capacitance_F_per_m2).toBeCloseTo(8e-3, 15);
  });

  it('round-trips synthetic data through CSV into the fit', () => {
    const lines = ['potential_V,capacitance_F'];
    for (const V of potentials(0, 1, 11)) lines.push(`${V},${perAreaCapacitance(V, ND_TRUE_M3, VFB_TRUE, 'n') * AREA_M2}`);
    const { rows } = parseCapacitanceCsv(lines.join('\n'), 'synthetic.csv');
    const fit = fitMottSchottky({ rows, electrodeArea_m2: AREA_M2, permittivityRelative: EPS_R, temperature_K: T, reference: 'SCE' });
    expect(Math.abs(fit.dopantDensity_cm3 / 1e18 - 1)).toBeLessThan(1e-9);
  });

  const header = 'potential_V,capacitance_F\n';
  const cases: Array<[string, string, RegExp]> = [
    ['non-numeric cell', header + '0,1e-6\n0.5,abc\n1,1e-6\n', /bad\.csv: row 3, column capacitance_F.*"abc" is not a number/],
    ['empty cell', header + '0,1e-6\n,1e-6\n1,1e-6\n', /bad\.csv: row 3, column potential_V/],
    ['hex is not a number', header + '0,1e-6\n0x1,1e-6\n1,1e-6\n', /row 3, column potential_V/],
    ['ragged row', header + '0,1e-6\n0.5\n1,1e-6\n', /bad\.csv: row 3: 1 cells where the header has 2/],
    ['zero capacitance', header + '0,1e-6\n0.5,0\n1,1e-6\n', /bad\.csv: row 3, column capacitance_F.*not positive/],
    ['negative capacitance', header + '0,1e-6\n0.5,1e-6\n1,-1e-6\n', /row 4, column capacitance_F.*not positive/],
    ['too few points', header + '0,1e-6\n0.5,1e-6\n', /bad\.csv: 2 data rows.*at least 3/],
    ['no potential column', 'voltage,capacitance_F\n0,1\n1,1\n2,1\n', /bad\.csv: row 1: no potential_V column/],
    ['no capacitance column', 'potential_V,c\n0,1\n1,1\n2,1\n', /no capacitance column/],
    ['both capacitance columns', 'potential_V,capacitance_F,capacitance_F_per_cm2\n0,1,1\n1,1,1\n2,1,1\n', /keep one/],
    ['unterminated quote', header + '0,1e-6\n0.5,"1e-6\n1,1e-6\n', /bad\.csv: row 3: a quoted cell is never closed/],
    ['stray quote', header + '0,1e-6\n0.5,1e"-6\n1,1e-6\n', /row 3: stray double quote/],
    ['duplicate column', 'potential_V,potential_V,capacitance_F\n0,0,1\n', /appears twice/],
    ['empty file', '', /bad\.csv: the file has no header line/],
  ];
  for (const [name, text, message] of cases) {
    it(`rejects ${name} with InputError naming file, row and column`, () => {
      expect(() => parseCapacitanceCsv(text, 'bad.csv')).toThrow(InputError);
      expect(() => parseCapacitanceCsv(text, 'bad.csv')).toThrow(message);
    });
  }
});
