// What the page shows beside each control: whether the input applies with the other inputs (the row's `when`),
// the value the solve used and where it came from, and the library value of the chosen metal/support with its
// citation. The row context is rebuilt here from the user's inputs and the result's provenance: it only decides
// what the page greys out; the solver's own checks stay the authority (a refused input is reported as an error).
import { findMetal, findSupport, formatCitation } from '../src/materials/load.js';
import type { InputProvenance, MaterialsLibrary, PropertyValue } from '../src/materials/types.js';
import { PARAMETERS, displayUnitOf, flagName, fromDisplay, type LibraryRecords, type OptionName, type ParameterRow, type RowContext } from '../src/inputs/parameters.js';
import { parseQuantity } from '../src/inputs/units.js';
import type { ContactResult } from '../src/types.js';
import type { InputValues, RowInfo } from './protocol.js';

function attempt<T>(f: () => T): T | undefined {
  try {
    return f();
  } catch {
    return undefined;
  }
}

function records(inputs: InputValues, lib: MaterialsLibrary): LibraryRecords {
  return {
    metal: inputs['metal'] ? attempt(() => findMetal(lib, inputs['metal']!)) : undefined,
    support: inputs['support'] ? attempt(() => findSupport(lib, inputs['support']!)) : undefined,
  };
}

/** The provenance entry of a row in a result (its own label, its library label, or a derived variant of it). */
function provenanceOf(p: ParameterRow, result: ContactResult | undefined, recs: LibraryRecords): InputProvenance | undefined {
  if (result === undefined || p.label === undefined) return undefined;
  const libraryLabel = p.libraryLabel ? attempt(() => p.libraryLabel!(recs)) : undefined;
  return result.inputs.find((i) => i.field === p.label || i.field === libraryLabel || i.field.startsWith(`${p.label} (`));
}

const CHOSEN: Partial<Record<OptionName, (r: ContactResult) => string>> = {
  barrierModel: (r) => r.barrierModel,
  geometry: (r) => r.geometry,
  statistics: (r) => r.statistics,
};

class PageContext implements RowContext {
  private readonly memo = new Map<OptionName, number | string | undefined>();
  private depth = 0;
  constructor(
    readonly records: LibraryRecords,
    private readonly inputs: InputValues,
    private readonly result: ContactResult | undefined,
  ) {}
  given(option: OptionName): boolean {
    return this.inputs[option] !== undefined;
  }
  value(option: OptionName): number | string | undefined {
    if (!this.memo.has(option)) {
      this.depth++;
      this.memo.set(option, this.depth > 20 ? undefined : this.lookup(option));
      this.depth--;
    }
    return this.memo.get(option);
  }
  private lookup(option: OptionName): number | string | undefined {
    const p = PARAMETERS.find((q) => q.option === option);
    if (p === undefined) return undefined;
    const text = this.inputs[option];
    if (text !== undefined) return p.kind === 'quantity' || p.kind === 'integer' ? attempt(() => parseQuantity(flagName(p), text, p.quantity ?? 'dimensionless')) : text;
    if (this.result !== undefined && CHOSEN[option]) return CHOSEN[option]!(this.result);
    const used = provenanceOf(p, this.result, this.records);
    if (used !== undefined) return fromDisplay(p, used.value);
    const pv = attempt(() => p.library?.(this.records, this));
    if (pv !== undefined) return fromDisplay(p, pv.value);
    const fallback = p.fallback?.value;
    return typeof fallback === 'function' ? attempt(() => fallback(this)) : fallback;
  }
}

function libraryInfo(p: ParameterRow, pv: PropertyValue | undefined, lib: MaterialsLibrary): RowInfo['library'] {
  if (pv === undefined) return undefined;
  const reference = lib.references.get(pv.source);
  return {
    value: pv.value,
    unit: displayUnitOf(p).unit,
    ...(pv.min !== undefined ? { min: pv.min } : {}),
    ...(pv.max !== undefined ? { max: pv.max } : {}),
    citation: reference ? formatCitation(reference) : pv.source,
    fromMemory: pv.fromMemory === true,
  };
}

/** Inputs the solve derives without a provenance entry of their own, read from the result. */
const DERIVED_USED: Partial<Record<OptionName, (r: ContactResult) => number | undefined>> = {
  interfaceStateDensity: (r) => r.interfaceStates?.stateDensity_per_eV_cm2,
};

function usedOf(p: ParameterRow, result: ContactResult | undefined, recs: LibraryRecords): RowInfo['used'] {
  const used = provenanceOf(p, result, recs);
  if (used !== undefined) {
    return {
      value: used.value,
      unit: used.unit,
      origin: used.origin,
      ...(used.citation !== undefined ? { citation: used.citation } : {}),
      ...(used.fromMemory !== undefined ? { fromMemory: used.fromMemory } : {}),
    };
  }
  const derived = result !== undefined ? DERIVED_USED[p.option]?.(result) : undefined;
  return derived !== undefined ? { value: derived, unit: displayUnitOf(p).unit, origin: 'derived' } : undefined;
}

/** One RowInfo per table row, for the inputs given and (when the solve worked) its result. */
export function rowInfos(inputs: InputValues, result: ContactResult | undefined, lib: MaterialsLibrary): RowInfo[] {
  const recs = records(inputs, lib);
  const c = new PageContext(recs, inputs, result);
  return PARAMETERS.map((p) => {
    const applicable = p.when === undefined || attempt(() => p.when!.test(c)) !== false;
    const used = usedOf(p, result, recs);
    const library = libraryInfo(p, attempt(() => p.library?.(recs, c)), lib);
    const info: RowInfo = { option: p.option, applicable };
    if (used !== undefined) info.used = used;
    if (library !== undefined) info.library = library;
    return info;
  });
}
