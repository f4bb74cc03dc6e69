// Terminal summary of one contact, plus the wording helpers shared by figures and reports (numbers: format.ts).
import { isatty } from 'node:tty';
import type { ContactResult, FlowDirection } from '../types.js';
import { thermalEnergy_eV } from '../constants.js';
import { stripControl } from './escape.js';
import { formatNumber, formatSigned, formatQuantity, formatLogQuantity } from './format.js';

export { formatNumber, formatSigned, formatQuantity, formatLogQuantity } from './format.js';

/** The flow direction in words (electrons move in the stated direction until the Fermi levels align). */
export function directionInWords(direction: FlowDirection): string {
  switch (direction) {
    case 'support-to-metal':
      return 'electrons move from the support into the metal (the metal particle becomes negative)';
    case 'metal-to-support':
      return 'electrons move from the metal into the support (the metal particle becomes positive)';
    case 'none':
      return 'no net charge transfer (flat bands)';
  }
}

/** Band bending in words, from the sign convention of ContactResult (positive = up toward the interface). */
export function bendingInWords(bandBending_eV: number, kT_eV: number): string {
  if (Math.abs(bandBending_eV) < 0.1 * kT_eV) return 'flat (below 0.1 kT)';
  return bandBending_eV > 0 ? 'upward toward the interface' : 'downward toward the interface';
}

/** Human label of the barrier, naming the carrier. */
export function barrierLabel(result: Pick<ContactResult, 'barrierCarrier'>): string {
  return result.barrierCarrier === 'hole' ? 'barrier height (holes, E_F - E_V(0))' : 'barrier height (electrons, E_C(0) - E_F)';
}

export interface SummaryOptions {
  /** ANSI colour for headings and warnings; default: only when stdout is a TTY and NO_COLOR is unset */
  color?: boolean;
}

/** Whether colour output is appropriate: the stream is a TTY and NO_COLOR is not set (https://no-color.org). */
export function shouldUseColor(
  // isatty(1) rather than process.stdout.isTTY: the stream object is not made just to ask (src/cli/io.ts writeToFd)
  stream: { isTTY?: boolean } = { isTTY: isatty(1) },
  env: Record<string, string | undefined> = process.env,
): boolean {
  if (env.NO_COLOR !== undefined && env.NO_COLOR !== '') return false;
  return stream.isTTY === true;
}

interface Styler {
  bold: (s: string) => string;
  warn: (s: string) => string;
}

function styler(color: boolean): Styler {
  if (!color) return { bold: (s) => s, warn: (s) => s };
  return { bold: (s) => `\u001b[1m${s}\u001b[22m`, warn: (s) => `\u001b[33m${s}\u001b[39m` };
}

/** Rows of [label, value] rendered as two aligned columns. */
export function alignRows(rows: readonly (readonly [string, string])[], indent = '  '): string[] {
  const width = rows.reduce((w, [label]) => Math.max(w, label.length), 0);
  return rows.map(([label, value]) => `${indent}${label.padEnd(width)}  ${value}`);
}

/**
 * Rows of the nanoscale contact (issue 11): interface states and their share of the particle's electrons, the
 * size-corrected particle work function, localised electrons of the support, and the band bending photoemission sees.
 */
function nanoscaleRows(result: ContactResult): [string, string][] {
  const rows: [string, string][] = [];
  const is = result.interfaceStates;
  if (is !== null) {
    rows.push([
      'interface states',
      `${formatQuantity(is.stateDensity_per_eV_cm2, 'eV^-1 cm^-2')}, neutral level ${formatQuantity(is.neutralLevelAboveValence_eV, 'eV')} above E_V; ` +
        `electrons per particle from interface states ${formatSigned(is.electronsFromInterfaceStates)}, from the space charge ${formatSigned(is.electronsFromSpaceCharge)}`,
    ]);
    if (is.surfaceDonors_per_cm2 > 0) {
      rows.push([
        'surface donors',
        `${formatQuantity(is.surfaceDonors_per_cm2, 'cm^-2')} at ${formatQuantity(is.surfaceDonorLevel_eV!, 'eV')} below E_C, ` +
          `${formatNumber(100 * (is.surfaceDonorsIonisedFraction ?? 0))}% ionised (${formatSigned(is.electronsFromSurfaceDonors)} electrons per particle, counted in the interface states)`,
      ]);
    }
  }
  if (result.geometry !== 'planar') rows.push(['particle work function (size-corrected)', formatQuantity(result.particleWorkFunction_eV, 'eV')]);
  if (result.bulk.localisedElectrons_cm3 > 0) rows.push(['localised electrons (bulk, polarons)', formatQuantity(result.bulk.localisedElectrons_cm3, 'cm^-3')]);
  const pe = result.photoemission;
  rows.push([
    'band bending seen by photoemission',
    `${formatSigned(pe.observedBandBending_eV)} eV (${pe.coreLevel}, ${formatNumber(pe.photonEnergy_eV, 5)} eV photons, mean free path ${formatQuantity(pe.inelasticMeanFreePath_nm, 'nm')})`,
  ]);
  return rows;
}

/** The key results of one contact as [label, value] rows (plain text). */
export function keyResultRows(result: ContactResult): [string, string][] {
  const kT = thermalEnergy_eV(result.temperature_K);
  const rows: [string, string][] = [
    [barrierLabel(result), formatQuantity(result.barrierHeight_eV, 'eV')],
    ['band bending', `${formatSigned(result.bandBending_eV)} eV (${bendingInWords(result.bandBending_eV, kT)})`],
    ['direction', directionInWords(result.direction)],
    ['metal work function', formatQuantity(result.metalWorkFunction_eV, 'eV')],
    ['support work function', formatQuantity(result.supportWorkFunction_eV, 'eV')],
    ['bulk E_C - E_F', formatQuantity(result.fermiLevelBelowConduction_eV, 'eV')],
    ['space charge', `${formatSigned(result.spaceCharge_C_per_m2)} C/m^2`],
    ['charge-equivalent width', formatQuantity(result.chargeEquivalentWidth_nm, 'nm')],
    ['depletion width (approx.)', formatQuantity(result.depletionWidthApprox_nm, 'nm')],
    ['Debye length', formatQuantity(result.debyeLength_nm, 'nm')],
    ['interface field', formatQuantity(result.interfaceField_V_per_m, 'V/m')],
    ...(result.permittivityNonlinearity_V_m5_per_C3 > 0
      ? ([['permittivity at the interface', `${formatNumber(result.interfacePermittivity)} (field-dependent; Landau-Devonshire beta ${result.permittivityNonlinearity_V_m5_per_C3.toExponential(2)} V m^5 C^-3)`]] as [string, string][])
      : []),
    ['image-force lowering', formatQuantity(result.imageForceLowering_eV, 'eV')],
    ...(result.capacitanceBarrier
      ? ([['barrier a C-V measurement reports', `${formatQuantity(result.capacitanceBarrier.barrier_eV, 'eV')} (Mott-Schottky intercept of the model's C(V), 0-1 V reverse)`]] as [string, string][])
      : []),
    ['electrons per particle', `${formatSigned(result.electronsPerParticle)} (d = ${formatNumber(result.particle.diameter_nm)} nm)`],
    ...nanoscaleRows(result),
  ];
  if (result.exchange) {
    const e = result.exchange;
    rows.push([
      'exchange time',
      formatLogQuantity(e.equilibrationTime_s, e.equilibrationTimeLog10_s, 's') + (e.slow ? ' (slow: more than an hour)' : ''),
    ]);
  }
  const d = result.defects as ContactResult['defects'] | undefined; // absent in results written before issue 12
  if (d !== undefined && d.history !== 'none') {
    const time = d.reequilibrationTime_s === null ? 'no diffusion coefficient' : `re-equilibration d^2/D = ${formatQuantity(d.reequilibrationTime_s, 's')}`;
    rows.push([
      'oxygen vacancies',
      `${formatQuantity(d.vacancies_cm3, 'cm^-3')} (${d.history}; ${d.reactionGas} ${formatNumber(d.reactionGasValue)}, pO2 = 10^${formatNumber(d.log10OxygenPartialPressure_bar, 4)} bar; ${time})`,
    ]);
    for (const note of d.notes) rows.push(['vacancy note', note]);
  }
  if (result.uncertainty) {
    const u = result.uncertainty;
    rows.push([
      'barrier 5-50-95 %',
      `${formatNumber(u.barrierHeight_eV.p05)} / ${formatNumber(u.barrierHeight_eV.p50)} / ${formatNumber(u.barrierHeight_eV.p95)} eV`,
    ]);
    rows.push([
      'P(direction)',
      (Object.keys(u.directionProbability) as FlowDirection[])
        .map((d) => `${d} ${formatNumber(u.directionProbability[d], 2)}`)
        .join(', '),
    ]);
  }
  return rows;
}

/** A readable, aligned plain-text summary of one contact for the terminal. */
export function formatContactSummary(result: ContactResult, opts: SummaryOptions = {}): string {
  const st = styler(opts.color ?? shouldUseColor());
  const metal = stripControl(result.metal);
  const support = stripControl(result.support);
  const lines: string[] = [];
  lines.push(st.bold(`${metal} | ${support} at ${formatNumber(result.temperature_K, 4)} K`));
  lines.push(`  ${result.geometry} geometry, ${result.statistics} statistics, ${result.barrierModel} barrier model`);
  lines.push('');
  lines.push(...alignRows(keyResultRows(result)));
  const warnings = result.warnings;
  if (warnings.length > 0) {
    lines.push('');
    lines.push(st.warn(st.bold('Warnings')));
    for (const w of warnings) lines.push(st.warn(`  - [${stripControl(w.code)}] ${stripControl(w.message)}`));
  }
  if (result.cautions.length > 0) {
    lines.push('');
    lines.push(st.bold('Cautions'));
    for (const c of result.cautions) lines.push(`  - ${stripControl(c)}`);
  }
  return `${lines.join('\n')}\n`;
}
