// `bandbend screen`: metals x supports at the same conditions.
import type { Command } from 'commander';
import { existsSync } from 'node:fs';
import { createFolder, writeTextFile } from '../inputs/files.js';
import { InputError } from '../errors.js';
import { addContactFlags, contactOptionsFrom } from './options.js';
import { materialsFiles, writeJson, notice } from './io.js';

const EXAMPLES = `
Examples:
  bandbend screen --metals Pt,Pd,Au --supports ZnO,TiO2-anatase,CeO2 --donors 1e18
  bandbend screen --metals all --supports all --geometry hemisphere --csv screen.csv --report out/screen`;

function listOf(text: string | undefined, all: string[], field: string): string[] {
  if (text === undefined || text.trim() === '') throw new InputError(field, 'missing list', 'comma-separated names, or "all"');
  if (text.trim().toLowerCase() === 'all') return all;
  const names = text.split(',').map((s) => s.trim());
  // "Pt,,Au" or "Pt," is a typo, not a request for fewer rows
  if (names.includes('')) throw new InputError(field, `empty name in the list "${text}"`, 'comma-separated names, or "all"');
  return names;
}

function writeCsv(target: string, csv: string, force: boolean): void {
  if (target === '-') {
    process.stdout.write(csv);
    return;
  }
  if (existsSync(target) && !force) throw new InputError('--csv', `${target} exists; use --force to overwrite`);
  writeTextFile(target, csv, '--csv');
}

async function runScreenCommand(opts: Record<string, unknown>): Promise<void> {
  const [{ resolveLibrary, findMetal, findSupport }, screen, { createProgress }] = await Promise.all([
    import('../materials/load.js'),
    import('../screen.js'),
    import('../study/progress.js'),
  ]);
  const library = resolveLibrary(materialsFiles(opts['materials']));
  const metals = listOf(opts['metals'] as string, [...library.metals.keys()], '--metals').map((m) => findMetal(library, m).name);
  const supports = listOf(opts['supports'] as string, [...library.supports.keys()], '--supports').map((s) => findSupport(library, s).name);
  const sortBy = String(opts['sortBy']);
  if (!(screen.SCREEN_COLUMNS as string[]).includes(sortBy)) throw new InputError('--sort-by', `unknown column "${sortBy}"`, screen.SCREEN_COLUMNS.join(', '));
  const conditions = contactOptionsFrom(opts, ['metal', 'support', 'materials']);
  const progress = createProgress(metals.length * supports.length, 'screen');
  const options = { metals, supports, conditions, materials: library, overrideMaterials: opts['overrideMaterials'] === true };
  const rows = screen.sortScreenRows(screen.runScreen({ ...options, onProgress: () => progress.tick(1) }), sortBy);
  progress.done();
  const csvTarget = opts['csv'];
  if (typeof csvTarget === 'string') writeCsv(csvTarget, screen.screenCsv(rows), opts['force'] === true);
  if (typeof opts['report'] === 'string') {
    createFolder(opts['report'], '--report');
    const title = `Screen: ${metals.length} metals x ${supports.length} supports`;
    const paths = await screen.writeScreenFolder(opts['report'], rows, { title, metals, supports, sortBy, force: opts['force'] === true });
    notice(`report written: ${paths.htmlPath}`);
  }
  if (opts['json'] === true) writeJson(rows);
  else if (csvTarget !== '-') {
    const { formatScreenTable } = await import('../output/screenText.js');
    process.stdout.write(formatScreenTable(rows));
  }
}

export function registerScreen(program: Command): void {
  const screen = program
    .command('screen')
    .description('metals x supports at the same conditions: sorted table, CSV/JSON, heat maps, HTML report')
    .requiredOption('--metals <LIST>', 'comma-separated metals, or "all"')
    .requiredOption('--supports <LIST>', 'comma-separated supports, or "all"')
    .option('--sort-by <FIELD>', 'column to sort by, largest first', 'electronsPerParticle')
    .option('--csv <FILE>', 'write the table as CSV (use - for stdout)')
    .option('--json', 'print the rows as JSON')
    .option('--report <DIR>', 'write an HTML report with heat maps to DIR')
    .option('--override-materials', 'apply material properties (--work-function, --band-gap, ...) to every row of the screen')
    .option('--force', 'overwrite existing output');
  addContactFlags(screen, ['metal', 'support']);
  screen.addHelpText('after', EXAMPLES);
  screen.action(runScreenCommand);
}
