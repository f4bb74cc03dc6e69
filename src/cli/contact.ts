// `bandbend contact`: one metal/support contact. Loads only the physics unless a report is asked for.
import type { Command } from 'commander';
import { Option } from './commander.js';
import { InputError } from '../errors.js';
import { createFolder } from '../inputs/files.js';
import { isArrayGeometry, type ContactOptions } from '../inputs/parameters.js';
import { addContactFlags, contactOptionsFrom } from './options.js';
import { FIT_USES, noteFitInputs, optionsFromFit, readFitFile, type FitUse } from './fitInput.js';
import { writeJson, notice, writeToFd, STDOUT_FD } from './io.js';

const EXAMPLES = `
Examples:
  bandbend contact --metal Pt --support ZnO --donors 1e18
  bandbend contact --metal Au --support TiO2-anatase --geometry hemisphere --particle-diameter 3nm --json
  bandbend contact --work-function 5.3 --electron-affinity 4.2 --band-gap 3.2 --permittivity 10 --donors "5e17 cm^-3"
  bandbend contact --metal Pd --support CeO2 --geometry disc --particle-diameter 2nm --reduction-temperature 900K --oxygen-pressure 1e-13
  bandbend contact --metal Au --support SrTiO3 --donors 1e20 --permittivity-nonlinearity 0   # linear dielectric, for comparison
  bandbend contact --metal Pd --support CeO2 --geometry array --particle-density 1e12 --uncertainty 200 --seed 7
  bandbend contact --metal Pt --support CeO2 --reduction-temperature 673K --hydrogen-to-water 100 --temperature 473K --report out/pt-ceo2
  bandbend contact --metal Pt --support TiO2-anatase --fit-from examples/mott-schottky-sample.fit.json`;

/** The options a Mott–Schottky fit gives (--fit-from; conflicts with typed options refused in optionsFromFit). */
function fitOptions(options: ContactOptions, opts: Record<string, unknown>): ContactOptions {
  const file = opts['fitFrom'];
  if (file === undefined) {
    if (opts['fitUse'] !== undefined) throw new InputError('--fit-use', 'only with --fit-from');
    return {};
  }
  return optionsFromFit(readFitFile(String(file)), (opts['fitUse'] ?? 'density') as FitUse, options);
}

async function runContact(opts: Record<string, unknown>): Promise<void> {
  const typed = contactOptionsFrom(opts);
  const fromFit = fitOptions(typed, opts);
  const options = { ...typed, ...fromFit };
  const { solveContact } = await import('../contact.js');
  const result = solveContact(options);
  if (typeof opts['fitFrom'] === 'string') noteFitInputs(result.inputs, fromFit, opts['fitFrom']);
  if (typeof opts['report'] === 'string') {
    const dir = opts['report'];
    const [{ writeContactReport, prepareReportDir }, { sweepParticleDensity, densitySweepSection }] = await Promise.all([
      import('../output/report.js'),
      import('../densitySweep.js'),
    ]);
    createFolder(dir, '--report'); // bad paths exit 2 (src/inputs/files.ts); then the empty-or-force rule
    await prepareReportDir(dir, opts['force'] === true);
    const title = `${result.metal} on ${result.support}`;
    // particle arrays: how the charge per particle depends on loading belongs in the write-up
    const extraSections = isArrayGeometry(result.geometry) ? [await densitySweepSection(dir, sweepParticleDensity(options), title)] : [];
    const paths = await writeContactReport(dir, result, { title, force: true, extraSections });
    if (opts['json'] !== true) notice(`report written: ${paths.htmlPath}`);
  }
  if (opts['json'] === true) writeJson(result);
  else {
    const { formatContactSummary } = await import('../output/summary.js');
    writeToFd(STDOUT_FD, `${formatContactSummary(result)}\n`);
  }
}

export function registerContact(program: Command): void {
  const contact = program
    .command('contact')
    .description('one metal/support contact: readable summary, --json, or --report DIR')
    .option('--json', 'print the result as one JSON object')
    .option('--report <DIR>', 'write an HTML + Markdown report with figures to DIR')
    .option('--force', 'overwrite an existing report folder')
    .option('--fit-from <FILE>', 'inputs from a Mott-Schottky fit (the JSON of `bandbend mott-schottky --json`): its dopant density and permittivity')
    .addOption(new Option('--fit-use <WHAT>', "what to take from the fit: the dopant density, or the work function from the flat-band potential (default: density)").choices(FIT_USES));
  addContactFlags(contact);
  contact.addHelpText('after', EXAMPLES);
  contact.action(runContact);
}
