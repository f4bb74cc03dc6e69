// The parameter table (src/inputs/parameters.ts) against what it generates: the ContactOptions doc comments,
// the CLI flags and help, the study fields; and its unit factors against the SI definitions.
import { readFileSync } from 'node:fs';
import { Command } from 'commander';
import { describe, expect, it } from 'vitest';
import { DISPLAY_UNITS, OPTION_NAMES, PARAMETERS, flagName, fromDisplay, helpText, row, toDisplay } from '../src/inputs/parameters.js';
import { addContactFlags } from '../src/cli/options.js';
import { CONTACT_FIELDS } from '../src/study/studyFile.js';
import { parseQuantity, unitSpecOf } from '../src/inputs/units.js';

/** field -> @default text, read from the ContactOptions interface in the source. */
function documentedDefaults(): Map<string, string | undefined> {
  const source = readFileSync(new URL('../src/inputs/parameters.ts', import.meta.url), 'utf8');
  const body = source.slice(source.indexOf('export interface ContactOptions {'), source.indexOf('export type OptionName'));
  const out = new Map<string, string | undefined>();
  for (const m of body.matchAll(/\/\*\*(.*?)\*\/\s*\n\s*(\w+)\?:/gs)) {
    const tag = /@default (.*)$/.exec(m[1]!.trim());
    out.set(m[2]!, tag?.[1]!.trim());
  }
  return out;
}

describe('parameter table', () => {
  it('has one row per ContactOptions field, and each field documents the default of its row', () => {
    const docs = documentedDefaults();
    expect([...docs.keys()].sort()).toEqual([...OPTION_NAMES].sort());
    for (const p of PARAMETERS) {
      const documented = docs.get(p.option);
      expect(documented, p.option).toBeDefined();
      if (p.defaultText !== undefined) expect(documented, p.option).toBe(p.defaultText);
    }
  });
  it('generates one CLI flag per row with the documented default in its help', () => {
    const command = addContactFlags(new Command('contact'));
    const flags = command.options.map((o) => o.long);
    expect(flags).toEqual(PARAMETERS.map(flagName));
    const temperature = command.options.find((o) => o.long === '--temperature')!;
    expect(temperature.description).toBe(helpText(row('temperature')));
    expect(temperature.description).toContain('(default: 300 K)');
    const geometry = command.options.find((o) => o.long === '--geometry')!;
    expect(geometry.argChoices).toEqual(['planar', 'hemisphere', 'array', 'disc', 'disc-array']);
  });
  it('generates the study fields: every option, categorical where the row is', () => {
    expect(Object.keys(CONTACT_FIELDS).sort()).toEqual([...OPTION_NAMES].sort());
    expect(CONTACT_FIELDS.donors).toEqual({ kind: 'quantity', quantity: 'volumeDensity' });
    expect(CONTACT_FIELDS.geometry).toEqual({ kind: 'choice', choices: ['planar', 'hemisphere', 'array', 'disc', 'disc-array'] });
    expect(CONTACT_FIELDS.metal).toEqual({ kind: 'text', categorical: true });
  });
  it('limits are ordered and quantities name their kind; sampled rows have a rule', () => {
    for (const p of PARAMETERS) {
      if (p.limits) expect(p.limits[0], p.option).toBeLessThan(p.limits[1]);
      if (p.kind === 'quantity') expect(p.quantity, p.option).toBeDefined();
      if (p.sampledAs) expect(['uniform', 'log-uniform'], p.option).toContain(p.sampling);
      if (p.choices) expect(p.kind, p.option).toBe('choice');
    }
  });
  // BIPM, The International System of Units (SI), 9th ed. (2019), Table 7 (prefixes): 1 cm = 1e-2 m, 1 nm = 1e-9 m;
  // 1 bar = 1e5 Pa (same brochure, Table 8).
  it('display-unit factors match the SI definitions and the unit parser', () => {
    expect(DISPLAY_UNITS.volumeDensity.toSi).toBeCloseTo(1 / (1e-2) ** 3, 6);
    expect(DISPLAY_UNITS.arealDensity.toSi).toBeCloseTo(1 / (1e-2) ** 2, 8);
    expect(DISPLAY_UNITS.length.toSi).toBe(1e-9);
    expect(DISPLAY_UNITS.pressure.toSi).toBe(1e5);
    for (const [kind, d] of Object.entries(DISPLAY_UNITS)) {
      const spec = unitSpecOf(kind as keyof typeof DISPLAY_UNITS);
      expect(spec.defaultUnit, kind).toBe(d.unit);
      expect(parseQuantity(kind, 1, kind as keyof typeof DISPLAY_UNITS), kind).toBe(d.toSi);
      expect(d.toSi * d.fromSi, kind).toBeCloseTo(1, 14);
    }
  });
  it('converts library values (display units) and SI back the same way', () => {
    const donors = row('donors');
    expect(fromDisplay(donors, 1e17)).toBe(1e23);
    expect(toDisplay(donors, 1e23)).toBe(1e17);
    expect(toDisplay(row('particleDiameter'), 3e-9)).toBe(3);
  });
});
