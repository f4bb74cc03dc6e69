// Small helpers shared by the commands: JSON on stdout, bounded reads of input files.
import { existsSync, readFileSync, statSync } from 'node:fs';
import { InputError } from '../errors.js';

/** One JSON document on stdout; non-finite numbers become null. */
export function writeJson(value: unknown): void {
  process.stdout.write(`${JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
}

/** Extra materials files given with --materials, if any. */
export function materialsFiles(value: unknown): string[] | undefined {
  return Array.isArray(value) ? (value as string[]) : undefined;
}

export function readInputFile(path: string, field: string, maxBytes = 5_000_000): string {
  if (!existsSync(path)) throw new InputError(field, `file not found: ${path}`);
  const stats = statSync(path);
  if (!stats.isFile()) throw new InputError(field, `not a file: ${path}`);
  if (stats.size > maxBytes) throw new InputError(field, `${path} is ${(stats.size / 1e6).toFixed(1)} MB`, `at most ${maxBytes / 1e6} MB`);
  return readFileSync(path, 'utf8');
}
