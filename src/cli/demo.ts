// `bandbend demo`: the built-in scenario (what `npm start` runs).
import type { Command } from 'commander';

const EXAMPLES = `
Examples:
  bandbend demo                      # writes reports/demo (fails if it exists and is not empty)
  bandbend demo --out out/demo --force`;

export function registerDemo(program: Command): void {
  program
    .command('demo')
    .description('the built-in scenario: writes a report with figures and CSV (what `npm start` runs)')
    .option('--out <DIR>', 'output folder', 'reports/demo')
    .option('--force', 'overwrite an existing demo folder')
    .addHelpText('after', EXAMPLES)
    .action(async (opts: Record<string, unknown>) => {
      const { runDemo } = await import('../demo.js');
      const out = await runDemo({ outDir: String(opts['out']), force: opts['force'] === true });
      process.stdout.write(out.summary);
    });
}
