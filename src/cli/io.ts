// Small helpers shared by the commands: JSON on stdout, bounded reads of input files.
import { writeSync } from 'node:fs';
import { InputError } from '../errors.js';
import { MAX_INPUT_FILE_BYTES, readTextFile } from '../inputs/files.js';
import { stripTerminalControl } from '../output/escape.js';

/** The JSON text the CLI prints (also the explorer page's downloads); non-finite numbers become null. */
export function jsonText(value: unknown): string {
  // JSON.stringify itself writes NaN and +-Infinity as null (ECMA-262 SerializeJSONProperty): no replacer call per value
  return `${JSON.stringify(value, null, 2)}\n`;
}

/** Standard streams by file descriptor. */
export const STDOUT_FD = 1;
export const STDERR_FD = 2;

let sleeper: Int32Array | undefined;
const closedFds = new Set<number>();

/**
 * Write text in full to a standard stream's file descriptor, synchronously. process.stdout and process.stderr are
 * made on first use and load Node's stream library with them (a tenth of a `contact --json` run on the bench
 * machine), which a one-shot command does not need. Same behaviour as those streams on Linux, where they are
 * synchronous for files, pipes and terminals (Node documentation, "A note on process I/O"): same order, nothing held
 * back. A full non-blocking pipe (EAGAIN) is waited on in 1 ms steps; a reader that has gone (EPIPE) or a closed
 * descriptor (EBADF) ends that stream's output silently, as a shell pipeline expects (`bandbend ... | head`).
 */
export function writeToFd(fd: number, text: string): void {
  if (closedFds.has(fd)) return;
  const bytes = Buffer.from(text, 'utf8');
  let offset = 0;
  while (offset < bytes.length) {
    try {
      offset += writeSync(fd, bytes, offset, bytes.length - offset);
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'EAGAIN') {
        sleeper ??= new Int32Array(new SharedArrayBuffer(4));
        Atomics.wait(sleeper, 0, 0, 1);
        continue;
      }
      if (code === 'EPIPE' || code === 'EBADF') {
        closedFds.add(fd);
        return;
      }
      throw error;
    }
  }
}

/** One JSON document on stdout; non-finite numbers become null. */
export function writeJson(value: unknown): void {
  writeToFd(STDOUT_FD, jsonText(value));
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
  writeToFd(STDERR_FD, `${stripTerminalControl(text)}\n`);
}
