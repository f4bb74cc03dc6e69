// `bandbend contact`: one metal/support contact. Loads only the physics unless a report is asked for.
import type { Command } from 'commander';
import { addContactFlags, contactOptionsFrom } from './options.js';
import { writeJson, notice } from './io.js';

const EXAMPLES = `
Examples:
  bandbend contact --metal Pt --support ZnO --donors 1e18
  bandbend contact --metal Au --support TiO2-anatase --geometry hemisphere --particle-diameter 3nm --json
  bandbend contact --work-function 5.3 --electron-affinity 4.2 --band-gap 3.2 --permittivity 10 --donors "5e17 cm^-3"
  bandbend contact --metal Pd --support CeO2 --geometry array --particle-density 1e12 --uncertainty 200 --seed 7
  bandbend contact --metal Pt --support CeO2 --reduction-temperature 673K --hydrogen-to-water 100 --temperature 473K --report out/pt-ceo2`;

async function runContact(opts: Record<string, unknown>): Promise<void> {
  const options = contactOptionsFrom(opts);
  const { solveContact } = await import('../contact.js');
  const result = solveContact(options);
  if (typeof opts['report'] === 'string') {
    const dir = opts['report'];
    const [{ writeContactReport, prepareReportDir }, { sweepParticleDensity, densitySweepSection }] = await Promise.all([
      import('../output/report.js'),
      import('../densitySweep.js'),
    ]);
    await prepareReportDir(dir, opts['force'] === true);
    const title = `${result.metal} on ${result.support}`;
    // particle arrays: how the charge per particle depends on loading belongs in the write-up
    const extraSections = result.geometry === 'array' ? [await densitySweepSection(dir, sweepParticleDensity(options), title)] : [];
    const paths = await writeContactReport(dir, result, { title, force: true, extraSections });
    if (opts['json'] !== true) notice(`report written: ${paths.htmlPath}`);
  }
  if (opts['json'] === true) writeJson(result);
  else {
    const { formatContactSummary } = await import('../output/summary.js');
    process.stdout.write(`${formatContactSummary(result)}\n`);
  }
}

export function registerContact(program: Command): void {
  const contact = program
    .command('contact')
    .description('one metal/support contact: readable summary, --json, or --report DIR')
    .option('--json', 'print the result as one JSON object')
    .option('--report <DIR>', 'write an HTML + Markdown report with figures to DIR')
    .option('--force', 'overwrite an existing report folder');
  addContactFlags(contact);
  contact.addHelpText('after', EXAMPLES);
  contact.action(runContact);
}
