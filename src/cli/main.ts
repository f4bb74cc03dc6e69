// The `bandbend` command line. Exit codes: 0 ok, 2 bad input (one line naming the field), 1 internal error.
// Each command registers itself and loads what it needs on use, so `contact --json` loads only the physics.
import type { Command as CommandType } from 'commander';
import { Command, CommanderError } from './commander.js';
import { InputError, ConvergenceError } from '../errors.js';
import { stripTerminalControl } from '../output/escape.js';
import { writeToFd, STDERR_FD, STDOUT_FD } from './io.js';
import { registerContact } from './contact.js';
import { registerScreen } from './screen.js';
import { registerStudyCommand } from './study.js';
import { registerMottSchottky } from './mottSchottky.js';
import { registerDemo } from './demo.js';
import { registerMaterials } from './materials.js';
import { registerValidate } from './validate.js';
import { registerExplore } from './explore.js';

export { readInputFile } from './io.js';

/** The commands in help order. Only the one being run is registered (building the flags of all of them is a
 * measurable part of `contact --json`'s start-up); all of them for top-level help, `help`, or an unknown name. */
const COMMANDS: readonly (readonly [string, (program: CommandType) => void])[] = [
  ['contact', registerContact],
  ['screen', registerScreen],
  ['study', registerStudyCommand],
  ['mott-schottky', registerMottSchottky],
  ['demo', registerDemo],
  ['materials', registerMaterials],
  ['validate', registerValidate],
  ['explore', registerExplore],
];

function buildProgram(argv: readonly string[]): CommandType {
  const program = new Command();
  program
    .name('bandbend')
    .description(
      'Equilibrium band bending, barrier height, space-charge width and charge per particle at metal/oxide-support contacts.',
    )
    .version('0.1.0');
  const only = COMMANDS.find(([name]) => name === argv[0]);
  for (const [, register] of only !== undefined ? [only] : COMMANDS) register(program);
  return program;
}

/** One stderr line: user text in messages (names, paths, option values) cannot move the cursor or ring a bell. */
export function errorLine(message: string, suffix = ''): string {
  return `bandbend: error: ${stripTerminalControl(message).trim()}${suffix}\n`;
}

/** Run the CLI; returns the exit code. */
export async function main(argv: string[]): Promise<number> {
  const program = buildProgram(argv);
  const output = {
    // help and version text through the same writer as every other output: a reader that has gone (`--help | head`)
    // ends the output silently instead of an unhandled EPIPE on process.stdout
    writeOut: (text: string) => writeToFd(STDOUT_FD, text),
    writeErr: (text: string) => writeToFd(STDERR_FD, stripTerminalControl(text, true)),
    // commander's usage errors ("error: unknown option '--x'") in the same one-line form as every other error
    outputError: (text: string) => writeToFd(STDERR_FD, errorLine(text.replace(/^error:\s*/, ''), ' (run with --help for usage)')),
  };
  const all = [program, ...program.commands, ...program.commands.flatMap((c) => c.commands)];
  for (const command of all) command.exitOverride().configureOutput(output);
  try {
    await program.parseAsync(argv, { from: 'user' });
    // a command may set a non-zero code without failing (an interrupted study exits 130, like a shell)
    return typeof process.exitCode === 'number' ? process.exitCode : 0;
  } catch (error) {
    if (error instanceof CommanderError) {
      // help and version print and exit 0; usage errors were already printed by commander
      if (error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.code === 'commander.help') return 0;
      return 2;
    }
    if (error instanceof InputError) {
      writeToFd(STDERR_FD, errorLine(error.message));
      return 2;
    }
    if (error instanceof ConvergenceError) {
      writeToFd(STDERR_FD, `bandbend: ${stripTerminalControl(error.message)}\n`);
      return 1;
    }
    const message = error instanceof Error ? error.message : String(error);
    writeToFd(STDERR_FD, `bandbend: internal error: ${stripTerminalControl(message)}\n`);
    if (process.env['BANDBEND_DEBUG'] && error instanceof Error) writeToFd(STDERR_FD, `${error.stack ?? ''}\n`);
    return 1;
  }
}
