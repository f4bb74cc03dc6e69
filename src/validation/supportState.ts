// The support's state in a gallery measurement (reduced in vacuum, oxidised, a stated donor density) as structured
// data, and its mapping to the contact inputs of the parameter table (reductionTemperature, oxygenPressure,
// hydrogenToWater, donors). One convention, applied to every row alike, fills what a paper leaves out; it was
// fixed before any row was compared and is never chosen per row.
import { z } from 'zod';

const num = z.number().finite();

/** What the paper says about the support before / during the measurement (read from the source, never inferred). */
export const SupportStateSchema = z
  .object({
    /** reduced (vacuum anneal, sputtering, H2), oxidised (O2 anneal or dose, stoichiometric film), or not stated */
    state: z.enum(['reduced', 'oxidised', 'unknown']),
    /** temperature of the last vacuum / gas anneal as stated, K (null: not stated) */
    annealTemperature_K: num.positive().nullable(),
    /** O2 pressure of that step as stated, bar (null: not stated) */
    oxygenPressure_bar: num.positive().nullable(),
    /** pH2/pH2O of a stated H2 reduction (null: none) */
    hydrogenToWater: num.positive().nullable(),
    /** where the statement was read (abstract, experimental section) and its words */
    basis: z.string().min(1),
  })
  .strict();

export type SupportState = z.infer<typeof SupportStateSchema>;

/**
 * The one convention for what a paper does not state (common practice, NO SOURCE; fixed for every row):
 * - reduced without a temperature: a UHV anneal at 900 K, the usual last step of sputter-anneal cycles of
 *   TiO2(110) and oxide films (typical 800-1000 K);
 * - reduced or annealed in vacuum without a pressure: residual O2 1e-13 bar (a UHV base pressure of 1e-10 mbar
 *   taken wholly as O2, an upper bound on pO2, so the least reducing reading);
 * - oxidised without a pressure: O2 1e-9 bar (a dose at about 1e-6 mbar); without a temperature: dosed at room
 *   temperature, 300 K (vacancies frozen in from there; few either way).
 */
export const SUPPORT_STATE_CONVENTION = {
  reducedAnnealTemperature_K: 900,
  vacuumOxygenPressure_bar: 1e-13,
  oxidisingOxygenPressure_bar: 1e-9,
  oxidisedTemperature_K: 300,
  note: 'common practice, no source: reduced = UHV anneal 900 K in residual O2 1e-13 bar; oxidised = O2 1e-9 bar at 300 K',
} as const;

/** How a row's support state reached the model. */
export type SupportStateMapping = 'paper' | 'paper+convention' | 'convention' | 'library-defaults';

export interface SupportStateInputs {
  /** contact options added to the row's contact (empty: library defaults) */
  options: Record<string, unknown>;
  mapping: SupportStateMapping;
  /** what was taken from the paper, what from the convention, or why nothing was mapped */
  note: string;
}

const DEFAULTS = (note: string): SupportStateInputs => ({ options: {}, mapping: 'library-defaults', note });

/**
 * Contact inputs for a row's support state. A donor density stated by the paper wins (it is the measured bulk
 * state); otherwise reduced / oxidised go through the reduction pretreatment inputs, with SUPPORT_STATE_CONVENTION
 * for what the paper leaves out. 'unknown' or no state: library defaults.
 */
export function supportStateInputs(state: SupportState | null | undefined, donors_cm3: number | null | undefined): SupportStateInputs {
  if (donors_cm3 !== null && donors_cm3 !== undefined) {
    return { options: { donors: donors_cm3 }, mapping: 'paper', note: `donor density ${donors_cm3} cm^-3 stated by the paper` };
  }
  if (!state || state.state === 'unknown') return DEFAULTS('support state not stated: library defaults');
  const fromPaper: string[] = [];
  const fromConvention: string[] = [];
  const options: Record<string, unknown> = {};
  const take = (key: string, paper: number | null, convention: number, label: string) => {
    if (paper !== null) {
      options[key] = paper;
      fromPaper.push(`${label} ${paper}`);
    } else {
      options[key] = convention;
      fromConvention.push(`${label} ${convention}`);
    }
  };
  const reduced = state.state === 'reduced';
  const conventionT = reduced ? SUPPORT_STATE_CONVENTION.reducedAnnealTemperature_K : SUPPORT_STATE_CONVENTION.oxidisedTemperature_K;
  take('reductionTemperature', state.annealTemperature_K, conventionT, 'anneal K');
  if (state.hydrogenToWater !== null) {
    options['hydrogenToWater'] = state.hydrogenToWater;
    fromPaper.push(`H2/H2O ${state.hydrogenToWater}`);
  } else {
    const convention = reduced ? SUPPORT_STATE_CONVENTION.vacuumOxygenPressure_bar : SUPPORT_STATE_CONVENTION.oxidisingOxygenPressure_bar;
    take('oxygenPressure', state.oxygenPressure_bar, convention, 'pO2 bar');
  }
  const mapping: SupportStateMapping = fromConvention.length === 0 ? 'paper' : fromPaper.length === 0 ? 'convention' : 'paper+convention';
  const parts = [`${state.state}`];
  if (fromPaper.length) parts.push(`from the paper: ${fromPaper.join(', ')}`);
  if (fromConvention.length) parts.push(`by convention (common practice, no source): ${fromConvention.join(', ')}`);
  return { options, mapping, note: parts.join('; ') };
}

/** True when the state's inputs go through the support's reduction thermodynamics (not a stated donor density). */
export function usesReductionData(state: SupportStateInputs): boolean {
  return ['reductionTemperature', 'oxygenPressure', 'hydrogenToWater'].some((key) => key in state.options);
}

/** The fallback when the library cannot take the state: library defaults, and say why. */
export function unmappedState(support: string, why: string): SupportStateInputs {
  return DEFAULTS(`support state not mapped (${why} for ${support}): library defaults`);
}
