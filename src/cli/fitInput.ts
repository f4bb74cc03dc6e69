// `contact --fit-from FILE`: the JSON printed by `mott-schottky --json` as contact inputs. The fit becomes
// ordinary option values (donors or acceptors, or the support work function, and the permittivity the density was
// computed with), which then go through the parameter table rows like typed flags: same limits, same
// refusals, same provenance. An option the fit would set that is also given explicitly is refused (exit 2).
import { InputError } from '../errors.js';
import { PARAMETERS, type ContactOptions, type OptionName } from '../inputs/parameters.js';
import type { InputProvenance } from '../materials/types.js';
import { readTextFile, shownPath } from '../inputs/files.js';
import { flagOf } from './options.js';

/** What contact takes from a fit: the dopant density (default) or the flat-band Fermi level. */
export type FitUse = 'density' | 'work-function';
export const FIT_USES: readonly FitUse[] = ['density', 'work-function'];

/** The fields of a Mott–Schottky fit that contact reads. */
export interface FitForContact {
  carrierType: 'n' | 'p';
  dopantDensity_cm3: number;
  supportWorkFunction_eV: number;
  /** absent in fits written before the field existed */
  permittivityRelative: number | undefined;
}

const FIELD = '--fit-from';
const FIT_FILE_BYTES = 100_000; // a fit is under 1 kB

function finiteField(data: Record<string, unknown>, key: string, required: boolean): number | undefined {
  const v = data[key];
  if (v === undefined && !required) return undefined;
  if (typeof v !== 'number' || !Number.isFinite(v)) {
    throw new InputError(FIELD, `"${key}" is ${v === undefined ? 'missing' : 'not a finite number'}`, 'the JSON printed by `bandbend mott-schottky --json`');
  }
  return v;
}

/** Read and check a fit file (bounded read; only the fields contact uses are required). */
export function readFitFile(path: string): FitForContact {
  const text = readTextFile(path, FIELD, FIT_FILE_BYTES);
  let data: unknown;
  try {
    data = JSON.parse(text) as unknown;
  } catch {
    throw new InputError(FIELD, 'not valid JSON', 'the JSON printed by `bandbend mott-schottky --json`');
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data)) {
    throw new InputError(FIELD, 'expected a JSON object', 'the JSON printed by `bandbend mott-schottky --json`');
  }
  const d = data as Record<string, unknown>;
  if (d['carrierType'] !== 'n' && d['carrierType'] !== 'p') throw new InputError(FIELD, '"carrierType" is missing', "'n' or 'p'");
  if (d['slopeSignificant'] === false) {
    throw new InputError(FIELD, 'the fit slope is not significant: carrier type and density are not established by the data', 'a fit with slopeSignificant true');
  }
  return {
    carrierType: d['carrierType'],
    dopantDensity_cm3: finiteField(d, 'dopantDensity_cm3', true)!,
    supportWorkFunction_eV: finiteField(d, 'supportWorkFunction_eV', true)!,
    permittivityRelative: finiteField(d, 'permittivityRelative', false),
  };
}

/**
 * Contact options from a fit. `density`: donors (n-type) or acceptors (p-type) from the slope; `work-function`:
 * the support work function from the flat-band potential (it fixes the bulk Fermi level, so no donors). Either way
 * the permittivity the density was computed with. An option given explicitly that the fit also sets is refused.
 */
export function optionsFromFit(fit: FitForContact, use: FitUse, given: ContactOptions): ContactOptions {
  const out: ContactOptions = {};
  if (use === 'density') {
    out[fit.carrierType === 'n' ? 'donors' : 'acceptors'] = `${fit.dopantDensity_cm3} cm^-3`;
  } else {
    out.supportWorkFunction = `${fit.supportWorkFunction_eV} eV`;
  }
  if (fit.permittivityRelative !== undefined) out.permittivity = fit.permittivityRelative;
  const what = use === 'density' ? `its ${fit.carrierType === 'n' ? 'donor' : 'acceptor'} density` : 'its support work function';
  for (const option of Object.keys(out) as OptionName[]) {
    if (given[option] !== undefined) throw new InputError(flagOf(option), `conflicts with ${FIELD} (the fit sets it)`, `one of the two`);
  }
  // both set the bulk Fermi level: the density of the fit and a work function (or donors and the fit's work function)
  const fermiSetters: OptionName[] = use === 'density' ? ['supportWorkFunction'] : ['donors'];
  for (const option of fermiSetters) {
    if (given[option] !== undefined) {
      throw new InputError(flagOf(option), `conflicts with ${FIELD}: ${what} already sets the bulk Fermi level`, use === 'density' ? '--fit-use work-function to take the fit\'s work function instead' : 'leave the donors out');
    }
  }
  return out;
}

/** Say in the provenance of each input the fit set where it came from (the rows record them as user values). */
export function noteFitInputs(inputs: InputProvenance[], fitOptions: ContactOptions, file: string): void {
  const labels = new Set(PARAMETERS.filter((p) => fitOptions[p.option] !== undefined).map((p) => p.label));
  for (const input of inputs) {
    if (input.origin === 'user' && labels.has(input.field)) input.note = `from the Mott-Schottky fit ${shownPath(file)} (--fit-from)`;
  }
}
