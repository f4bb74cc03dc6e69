// `bandbend materials` as text: the list and one record with its ranges and citations (terminal-safe).
import { formatCitation } from '../materials/load.js';
import type { MaterialsLibrary, MetalRecord, PropertyValue, SupportRecord } from '../materials/types.js';
import { terminalLines } from './escape.js';

/** Metals and supports, one line each. */
export function formatMaterialsList(metals: readonly MetalRecord[], supports: readonly SupportRecord[]): string {
  const lines: string[] = [];
  if (metals.length > 0) {
    lines.push(`metals (${metals.length})`);
    for (const m of metals) lines.push(`  ${m.name.padEnd(6)} ${m.fullName.padEnd(12)} work function ${m.workFunction_eV.value.toFixed(2)} eV`);
  }
  if (supports.length > 0) {
    lines.push(`supports (${supports.length})`);
    for (const s of supports) {
      lines.push(`  ${s.name.padEnd(16)} ${s.conductionType.padEnd(9)} gap ${s.bandGap_eV.value.toFixed(2)} eV  affinity ${s.electronAffinity_eV.value.toFixed(2)} eV`);
    }
  }
  return terminalLines(lines);
}

/** The citations of every source a record names: key -> formatted citation. */
export function referencedBy(lib: MaterialsLibrary, record: Record<string, unknown>): Record<string, string> {
  const keys = new Set<string>();
  const walk = (v: unknown): void => {
    if (v && typeof v === 'object') {
      const o = v as Record<string, unknown>;
      if (typeof o['source'] === 'string') keys.add(o['source']);
      for (const child of Object.values(o)) walk(child);
    }
  };
  walk(record);
  const out: Record<string, string> = {};
  for (const k of keys) {
    const ref = lib.references.get(k);
    out[k] = ref ? formatCitation(ref) : '(missing reference)';
  }
  return out;
}

/** One record, every value with its range, citation number and notes, then the references. */
export function formatRecord(lib: MaterialsLibrary, record: Record<string, unknown>): string {
  const lines: string[] = [`${String(record['name'])} (${String(record['fullName'])}), ${String(record['kind'])}`];
  const refs = new Map<string, number>();
  const cite = (key: string): string => {
    if (!refs.has(key)) refs.set(key, refs.size + 1);
    return `[${refs.get(key)}]`;
  };
  const show = (label: string, pv: PropertyValue): void => {
    const range = pv.min !== undefined && pv.max !== undefined ? ` (range ${pv.min} to ${pv.max})` : '';
    const memory = pv.fromMemory ? ' [from memory, verify]' : '';
    const note = pv.note ? ` ${pv.note}` : '';
    lines.push(`  ${label.padEnd(28)} ${pv.value}${range} ${cite(pv.source)}${memory}${note}`);
  };
  const walk = (prefix: string, value: unknown): void => {
    if (value === null || typeof value !== 'object') {
      if (!['name', 'fullName', 'kind'].includes(prefix)) lines.push(`  ${prefix.padEnd(28)} ${String(value)}`);
      return;
    }
    const o = value as Record<string, unknown>;
    if (typeof o['value'] === 'number' && typeof o['source'] === 'string') {
      show(prefix, o as unknown as PropertyValue);
      return;
    }
    for (const [k, v] of Object.entries(o)) walk(prefix ? `${prefix}.${k}` : k, v);
  };
  walk('', record);
  lines.push('references');
  for (const [key, n] of refs) {
    const ref = lib.references.get(key);
    lines.push(`  [${n}] ${ref ? formatCitation(ref) : key}`);
  }
  return terminalLines(lines);
}

