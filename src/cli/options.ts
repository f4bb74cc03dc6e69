// CLI flags of the contact inputs, generated from the parameter table (src/inputs/parameters.ts).
import type { Command } from 'commander';
import { Option } from './commander.js';
import { materialsFiles } from './io.js';
import { PARAMETERS, flagName, helpText, type ContactOptions, type OptionName } from '../inputs/parameters.js';

/** Add one flag per table row (help text with the documented default, choices checked by commander). */
export function addContactFlags(command: Command, skip: readonly OptionName[] = []): Command {
  for (const p of PARAMETERS) {
    if (skip.includes(p.option)) continue;
    const option = new Option(p.flag, helpText(p));
    if (p.choices) option.choices(p.choices);
    command.addOption(option);
  }
  return command;
}

/** commander's parsed options -> ContactOptions (only the keys that were given, values as typed). */
export function contactOptionsFrom(parsed: Record<string, unknown>, skip: readonly OptionName[] = []): ContactOptions {
  const out: Record<string, unknown> = {};
  for (const p of PARAMETERS) {
    if (skip.includes(p.option)) continue;
    const value = parsed[p.option];
    if (value !== undefined) out[p.option] = value;
  }
  materialsFiles(out['materials']); // an empty --materials path is refused naming the flag
  return out as ContactOptions;
}

/** '--donors' for 'donors', for messages that name a flag. */
export function flagOf(option: OptionName): string {
  return flagName(PARAMETERS.find((p) => p.option === option)!);
}
