// Cautions: the fixed texts, written once, and the rule that each appears once per report.
import { HYDROGEN_CAUTIONS } from '../inputs/pretreatment.js';

/** The standing caution of every result and report. */
export const SCREENING_CAUTION =
  'All numbers are screening estimates from 1D equilibrium electrostatics with literature-typical inputs, not ' +
  'measurements: interface chemistry, adsorbates, strain and particle shape can move barriers by tenths of an eV. ' +
  'Confirm important conclusions against measurements.';

/** Hazard cautions added whenever hydrogen was used (H2/H2O pretreatment). */
export { HYDROGEN_CAUTIONS };

/** The cautions of one contact result: hydrogen only when hydrogen was used, then the standing caution. */
export function contactCautions(usedHydrogen: boolean): string[] {
  return [...(usedHydrogen ? HYDROGEN_CAUTIONS : []), SCREENING_CAUTION];
}

/** The cautions of a report: each once, in first-seen order, the standing caution always last if not present. */
export function reportCautions(...lists: readonly (readonly string[])[]): string[] {
  const seen = new Set<string>();
  for (const list of lists) for (const c of list) seen.add(c);
  seen.add(SCREENING_CAUTION);
  return [...seen];
}
