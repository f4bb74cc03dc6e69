// Small helpers shared by the commands: JSON on stdout, bounded reads of input files.
import { InputError } from '../errors.js';
import { MAX_INPUT_FILE_BYTES, readTextFile } from '../inputs/files.js';
import { stripTerminalControl } from '../output/escape.js';

/** The JSON text the CLI prints (also the explorer page's downloads); non-finite numbers become null. */
export function jsonText(value: unknown): string {
  // JSON.stringify itself writes NaN and +-Infinity as null (ECMA-262 SerializeJSONProperty): no replacer call per value
  return `${JSON.stringify(value, null, 2)}\n`;
}

/** One JSON document on stdout; non-finite numbers become null. */
export function writeJson(value: unknown): void {
  process.stdout.write(jsonText(value));
}

/** Extra materials files given with --materials, if any. */
export function materialsFiles(value: unknown): string[] | undefined {
  if (!Array.isArray(value)) return undefined;
  const files = value as string[];
  // checked here so that the message names the flag (the loader names a file by its path, which is empty here)
  if (files.some((f) => f.trim() === '')) throw new InputError('--materials', 'missing path', 'a materials file (JSON or YAML)');
  return files;
}

export function readInputFile(path: string, field: string, maxBytes = MAX_INPUT_FILE_BYTES): string {
  return readTextFile(path, field, maxBytes); // regular files only, size counted while reading (src/inputs/files.ts)
}

/** One notice line on stderr (e.g. "report written: PATH"); user text in it cannot control the terminal. */
export function notice(text: string): void {
  process.stderr.write(`${stripTerminalControl(text)}\n`);
}
