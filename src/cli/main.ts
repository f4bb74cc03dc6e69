// The `bandbend` command line. Exit codes: 0 ok, 2 bad input (one line naming the field), 1 internal error.
import { Command, CommanderError, Option } from 'commander';
import { readFileSync, existsSync, statSync, writeFileSync } from 'node:fs';
import { InputError, ConvergenceError, requireInRange } from '../errors.js';
import { solveContact } from '../contact.js';
import { addContactFlags, contactOptionsFrom } from './options.js';
import { formatContactSummary } from '../output/summary.js';
import { writeContactReport, prepareReportDir } from '../output/report.js';
import { sweepParticleDensity, densitySweepSection } from '../densitySweep.js';
import { mottSchottkyFitSpec } from '../output/figures.js';
import { renderSvg } from '../output/render.js';
import { resolveLibrary, findMetal, findSupport, formatCitation } from '../materials/load.js';
import type { MaterialsLibrary, PropertyValue } from '../materials/types.js';
import { runScreen, sortScreenRows, writeScreenFolder, screenCsv, SCREEN_COLUMNS, type ScreenRow } from '../screen.js';
import { parseCapacitanceCsv, fitMottSchottky, parseReferenceElectrode } from '../derived/mottSchottky.js';
import { parseQuantity } from '../inputs/units.js';
import { createProgress } from '../study/progress.js';
import { runDemo } from '../demo.js';
import { registerStudyCommand } from './study.js';

const EXAMPLES = {
  contact: `
Examples:
  bandbend contact --metal Pt --support ZnO --donors 1e18
  bandbend contact --metal Au --support TiO2-anatase --geometry hemisphere --particle-diameter 3nm --json
  bandbend contact --work-function 5.3 --electron-affinity 4.2 --band-gap 3.2 --permittivity 10 --donors "5e17 cm^-3"
  bandbend contact --metal Pd --support CeO2 --geometry array --particle-density 1e12 --uncertainty 200 --seed 7
  bandbend contact --metal Pt --support TiO2-anatase --reduction-temperature 673K --hydrogen-to-water 100 --temperature 473K --report out/pt-tio2`,
  screen: `
Examples:
  bandbend screen --metals Pt,Pd,Au --supports ZnO,TiO2-anatase,CeO2 --donors 1e18
  bandbend screen --metals all --supports all --geometry hemisphere --csv screen.csv --report out/screen`,
  mottSchottky: `
CSV columns: potential_V and capacitance_F (with --area) or capacitance_F_per_cm2.
Examples:
  bandbend mott-schottky data.csv --permittivity 31 --area 0.5cm^2 --reference Ag/AgCl
  bandbend mott-schottky data.csv --permittivity 8.5 --reference RHE --ph 7 --json`,
  demo: `
Examples:
  bandbend demo                      # writes reports/demo (fails if it exists and is not empty)
  bandbend demo --out /tmp/demo --force`,
  materials: `
Examples:
  bandbend materials list --kind support
  bandbend materials show CeO2
  bandbend materials show Pt --json`,
};

function writeJson(value: unknown): void {
  process.stdout.write(`${JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
}

function libraryFrom(files: unknown): MaterialsLibrary {
  return resolveLibrary(Array.isArray(files) ? (files as string[]) : undefined);
}

function listOf(text: string | undefined, all: string[], field: string): string[] {
  if (text === undefined || text.trim() === '') throw new InputError(field, 'missing list', 'comma-separated names, or "all"');
  if (text.trim().toLowerCase() === 'all') return all;
  return text.split(',').map((s) => s.trim()).filter((s) => s !== '');
}

function buildProgram(): Command {
  const program = new Command();
  program
    .name('bandbend')
    .description(
      'Equilibrium band bending, barrier height, space-charge width and charge per particle at metal/oxide-support contacts.',
    )
    .version('0.1.0')
    .showHelpAfterError('(run with --help for usage)');

  // contact
  const contact = program
    .command('contact')
    .description('one metal/support contact: readable summary, --json, or --report DIR')
    .option('--metal <NAME>', 'metal from the materials library (or give --work-function)')
    .option('--support <NAME>', 'support oxide from the materials library (or give its properties)')
    .option('--json', 'print the result as one JSON object')
    .option('--report <DIR>', 'write an HTML + Markdown report with figures to DIR')
    .option('--force', 'overwrite an existing report folder');
  addContactFlags(contact);
  contact.addHelpText('after', EXAMPLES.contact);
  contact.action(async (opts: Record<string, unknown>) => {
    const options = contactOptionsFrom(opts);
    const result = solveContact(options);
    if (typeof opts['report'] === 'string') {
      const dir = opts['report'];
      await prepareReportDir(dir, opts['force'] === true);
      // particle arrays: how the charge per particle depends on loading belongs in the write-up
      const extraSections =
        result.geometry === 'array' ? [await densitySweepSection(dir, sweepParticleDensity(options), `${result.metal} on ${result.support}`)] : [];
      const paths = await writeContactReport(dir, result, {
        title: `${result.metal} on ${result.support}`,
        force: true,
        extraSections,
      });
      if (opts['json'] !== true) process.stderr.write(`report written: ${paths.htmlPath}\n`);
    }
    if (opts['json'] === true) writeJson(result);
    else process.stdout.write(`${formatContactSummary(result)}\n`);
  });

  // screen
  const screen = program
    .command('screen')
    .description('metals x supports at the same conditions: sorted table, CSV/JSON, heat maps, HTML report')
    .requiredOption('--metals <LIST>', 'comma-separated metals, or "all"')
    .requiredOption('--supports <LIST>', 'comma-separated supports, or "all"')
    .option('--sort-by <FIELD>', 'column to sort by, largest first', 'electronsPerParticle')
    .option('--csv <FILE>', 'write the table as CSV (use - for stdout)')
    .option('--json', 'print the rows as JSON')
    .option('--report <DIR>', 'write an HTML report with heat maps to DIR')
    .option('--force', 'overwrite existing output');
  addContactFlags(screen);
  screen.addHelpText('after', EXAMPLES.screen);
  screen.action(async (opts: Record<string, unknown>) => {
    const library = libraryFrom(opts['materials']);
    const metals = listOf(opts['metals'] as string, [...library.metals.keys()], '--metals').map((m) => findMetal(library, m).name);
    const supports = listOf(opts['supports'] as string, [...library.supports.keys()], '--supports').map((s) => findSupport(library, s).name);
    const sortBy = String(opts['sort-by'] ?? opts['sortBy']);
    if (!(SCREEN_COLUMNS as string[]).includes(sortBy)) throw new InputError('--sort-by', `unknown column "${sortBy}"`, SCREEN_COLUMNS.join(', '));
    const conditions = contactOptionsFrom(opts);
    delete conditions.materials;
    const progress = createProgress(metals.length * supports.length, 'screen');
    const rows = sortScreenRows(
      runScreen({ metals, supports, conditions, materials: library, onProgress: () => progress.tick(1) }),
      sortBy,
    );
    progress.done();
    const csvTarget = opts['csv'];
    if (typeof csvTarget === 'string') {
      const csv = screenCsv(rows);
      if (csvTarget === '-') process.stdout.write(csv);
      else {
        if (existsSync(csvTarget) && opts['force'] !== true) throw new InputError('--csv', `${csvTarget} exists; use --force to overwrite`);
        writeFileSync(csvTarget, csv);
      }
    }
    if (typeof opts['report'] === 'string') {
      const paths = await writeScreenFolder(opts['report'], rows, {
        title: `Screen: ${metals.length} metals x ${supports.length} supports`,
        metals,
        supports,
        sortBy,
        force: opts['force'] === true,
      });
      process.stderr.write(`report written: ${paths.htmlPath}\n`);
    }
    if (opts['json'] === true) writeJson(rows);
    else if (csvTarget !== '-') process.stdout.write(formatScreenTable(rows));
  });

  // study
  registerStudyCommand(program);

  // mott-schottky
  const ms = program
    .command('mott-schottky <FILE>')
    .description('fit capacitance-voltage data: donor density and flat-band potential, on the vacuum scale')
    .requiredOption('--permittivity <ER>', 'static relative permittivity of the support')
    .option('--area <A>', 'electrode area (cm^2 if bare) when the CSV gives capacitance_F')
    .option('--temperature <T>', 'measurement temperature (K if bare)', '298.15')
    .addOption(new Option('--reference <ELECTRODE>', 'reference electrode of the potentials').choices(['SHE', 'NHE', 'SCE', 'Ag/AgCl', 'RHE']).default('SHE'))
    .option('--ph <PH>', 'electrolyte pH (needed for RHE)')
    .option('--json', 'print the fit as JSON')
    .option('--plot <FILE>', 'write the fit plot as SVG (and FILE.vl.json)')
    .option('--force', 'overwrite an existing plot');
  ms.addHelpText('after', EXAMPLES.mottSchottky);
  ms.action(async (file: string, opts: Record<string, unknown>) => {
    const text = readInputFile(file, 'mott-schottky FILE');
    const parsed = parseCapacitanceCsv(text, file);
    const areaText = opts['area'];
    const electrodeArea_m2 =
      typeof areaText === 'string' ? areaFromText(areaText) : undefined;
    const reference = parseReferenceElectrode(String(opts['reference']), '--reference');
    if (reference === 'RHE' && opts['ph'] === undefined) throw new InputError('--ph', 'the RHE scale needs the electrolyte pH', '0 to 14');
    if (parsed.capacitanceColumn === 'capacitance_F' && areaText === undefined) {
      throw new InputError('--area', `${file} gives capacitance_F: the electrode area is needed`, 'an area, e.g. "0.5 cm^2"');
    }
    const permittivityRelative = requireInRange('--permittivity', parseQuantity('--permittivity', opts['permittivity'] as string, 'dimensionless'), 1, 1e5, '');
    const temperature_K = requireInRange('--temperature', parseQuantity('--temperature', opts['temperature'] as string, 'temperature'), 200, 500, 'K (electrochemical measurement)');
    if (electrodeArea_m2 !== undefined) requireInRange('--area', electrodeArea_m2 * 1e4, 1e-6, 1e4, 'cm^2');
    const fit = fitMottSchottky({
      rows: parsed.rows,
      ...(electrodeArea_m2 !== undefined ? { electrodeArea_m2 } : {}),
      permittivityRelative,
      temperature_K,
      reference,
      ...(opts['ph'] !== undefined ? { pH: requireInRange('--ph', parseQuantity('--ph', opts['ph'] as string, 'dimensionless'), -2, 16, '') } : {}),
    });
    if (typeof opts['plot'] === 'string') {
      const plotPath = opts['plot'];
      for (const target of [plotPath, `${plotPath}.vl.json`]) {
        if (existsSync(target) && opts['force'] !== true) throw new InputError('--plot', `${target} exists; use --force to overwrite`);
      }
      const points = parsed.rows.map((row) => {
        const perArea = row.capacitance_F_per_m2 ?? (row.capacitance_F ?? NaN) / (electrodeArea_m2 ?? NaN);
        return { potential_V: row.potential_V, inverseCapSquared: 1 / (perArea * perArea) };
      });
      const spec = mottSchottkyFitSpec(points, { slope: fit.slope, intercept: fit.intercept, flatBand_V: fit.flatBandPotential_V }, { yTitle: '1/C^2 (m^4/F^2)' });
      writeFileSync(plotPath, await renderSvg(spec));
      writeFileSync(`${plotPath}.vl.json`, JSON.stringify(spec, null, 2));
    }
    if (opts['json'] === true) writeJson(fit);
    else process.stdout.write(formatFit(fit));
  });

  // demo
  program
    .command('demo')
    .description('the built-in scenario: writes a report with figures and CSV (what `npm start` runs)')
    .option('--out <DIR>', 'output folder', 'reports/demo')
    .option('--force', 'overwrite an existing demo folder')
    .addHelpText('after', EXAMPLES.demo)
    .action(async (opts: Record<string, unknown>) => {
      const out = await runDemo({ outDir: String(opts['out']), force: opts['force'] === true });
      process.stdout.write(out.summary);
    });

  // materials
  const materials = program.command('materials').description('the materials library: values, ranges and citations');
  materials.addHelpText('after', EXAMPLES.materials);
  materials
    .command('list')
    .description('list metals and supports')
    .addOption(new Option('--kind <KIND>', 'only metals or only supports').choices(['metal', 'support']))
    .option('--json', 'print as JSON')
    .option('--materials <FILE...>', 'extra materials file(s)')
    .addHelpText('after', EXAMPLES.materials)
    .action((opts: Record<string, unknown>) => {
      const lib = libraryFrom(opts['materials']);
      const kind = opts['kind'] as string | undefined;
      const metals = kind === 'support' ? [] : [...lib.metals.values()];
      const supports = kind === 'metal' ? [] : [...lib.supports.values()];
      if (opts['json'] === true) {
        writeJson({
          metals: metals.map((m) => ({ name: m.name, fullName: m.fullName, workFunction_eV: m.workFunction_eV.value })),
          supports: supports.map((s) => ({ name: s.name, fullName: s.fullName, bandGap_eV: s.bandGap_eV.value, electronAffinity_eV: s.electronAffinity_eV.value, conductionType: s.conductionType })),
        });
        return;
      }
      const lines: string[] = [];
      if (metals.length > 0) {
        lines.push(`metals (${metals.length})`);
        for (const m of metals) lines.push(`  ${m.name.padEnd(6)} ${m.fullName.padEnd(12)} work function ${m.workFunction_eV.value.toFixed(2)} eV`);
      }
      if (supports.length > 0) {
        lines.push(`supports (${supports.length})`);
        for (const s of supports) {
          lines.push(`  ${s.name.padEnd(16)} ${s.conductionType.padEnd(9)} gap ${s.bandGap_eV.value.toFixed(2)} eV  affinity ${s.electronAffinity_eV.value.toFixed(2)} eV`);
        }
      }
      process.stdout.write(`${lines.join('\n')}\n`);
    });
  materials
    .command('show <NAME>')
    .description('all values of one metal or support with ranges and citations')
    .option('--json', 'print as JSON')
    .option('--materials <FILE...>', 'extra materials file(s)')
    .addHelpText('after', EXAMPLES.materials)
    .action((name: string, opts: Record<string, unknown>) => {
      const lib = libraryFrom(opts['materials']);
      let record: Record<string, unknown>;
      try {
        record = findMetal(lib, name) as unknown as Record<string, unknown>;
      } catch {
        try {
          record = findSupport(lib, name) as unknown as Record<string, unknown>;
        } catch {
          throw new InputError('NAME', `no metal or support called "${name}"`, 'see `bandbend materials list`');
        }
      }
      if (opts['json'] === true) {
        writeJson({ ...record, references: referencedBy(lib, record) });
        return;
      }
      process.stdout.write(formatRecord(lib, record));
    });

  return program;
}

function referencedBy(lib: MaterialsLibrary, record: Record<string, unknown>): Record<string, string> {
  const keys = new Set<string>();
  const walk = (v: unknown): void => {
    if (v && typeof v === 'object') {
      const o = v as Record<string, unknown>;
      if (typeof o['source'] === 'string') keys.add(o['source']);
      for (const child of Object.values(o)) walk(child);
    }
  };
  walk(record);
  const out: Record<string, string> = {};
  for (const k of keys) {
    const ref = lib.references.get(k);
    out[k] = ref ? formatCitation(ref) : '(missing reference)';
  }
  return out;
}

function formatRecord(lib: MaterialsLibrary, record: Record<string, unknown>): string {
  const lines: string[] = [`${String(record['name'])} (${String(record['fullName'])}), ${String(record['kind'])}`];
  const refs = new Map<string, number>();
  const cite = (key: string): string => {
    if (!refs.has(key)) refs.set(key, refs.size + 1);
    return `[${refs.get(key)}]`;
  };
  const show = (label: string, pv: PropertyValue): void => {
    const range = pv.min !== undefined && pv.max !== undefined ? ` (range ${pv.min} to ${pv.max})` : '';
    const memory = pv.fromMemory ? ' [from memory, verify]' : '';
    const note = pv.note ? ` ${pv.note}` : '';
    lines.push(`  ${label.padEnd(28)} ${pv.value}${range} ${cite(pv.source)}${memory}${note}`);
  };
  const walk = (prefix: string, value: unknown): void => {
    if (value === null || typeof value !== 'object') {
      if (!['name', 'fullName', 'kind'].includes(prefix)) lines.push(`  ${prefix.padEnd(28)} ${String(value)}`);
      return;
    }
    const o = value as Record<string, unknown>;
    if (typeof o['value'] === 'number' && typeof o['source'] === 'string') {
      show(prefix, o as unknown as PropertyValue);
      return;
    }
    for (const [k, v] of Object.entries(o)) walk(prefix ? `${prefix}.${k}` : k, v);
  };
  walk('', record);
  lines.push('references');
  for (const [key, n] of refs) {
    const ref = lib.references.get(key);
    lines.push(`  [${n}] ${ref ? formatCitation(ref) : key}`);
  }
  return `${lines.join('\n')}\n`;
}

function formatScreenTable(rows: ScreenRow[]): string {
  const header = ['metal', 'support', 'direction', 'barrier eV', 'bending eV', 'e-/particle', 'W_Q nm', 'P(s->m)', 'note'];
  const body = rows.map((r) => [
    r.metal,
    r.support,
    r.direction ?? 'failed',
    num(r.barrierHeight_eV, 3),
    num(r.bandBending_eV, 3),
    num(r.electronsPerParticle, 3),
    num(r.chargeEquivalentWidth_nm, 3),
    r.probabilitySupportToMetal === null ? '' : r.probabilitySupportToMetal.toFixed(2),
    r.error !== '' ? r.error.slice(0, 60) : r.warnings,
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]): string => cells.map((c, i) => c.padEnd(widths[i]!)).join('  ').trimEnd();
  return `${[line(header), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)].join('\n')}\n`;
}

function num(v: number | null, digits: number): string {
  if (v === null) return '';
  return Math.abs(v) >= 1e4 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(digits - 1) : v.toPrecision(digits);
}

function formatFit(fit: ReturnType<typeof fitMottSchottky>): string {
  const lines = [
    `Mott-Schottky fit (${fit.points} points, R^2 = ${fit.rSquared.toFixed(5)})`,
    `  carrier type              ${fit.carrierType}-type${fit.slopeSignificant ? '' : ' (slope not significant: type uncertain)'}`,
    `  ${(fit.carrierType === 'n' ? 'donor density' : 'acceptor density').padEnd(26)}${fit.dopantDensity_cm3.toExponential(3)} +/- ${fit.dopantDensityStdErr_cm3.toExponential(2)} cm^-3`,
    `  flat-band potential       ${fit.flatBandPotential_V.toFixed(4)} +/- ${fit.flatBandStdErr_V.toFixed(4)} V vs ${fit.reference}`,
    `  flat-band potential (SHE) ${fit.flatBandPotential_V_SHE.toFixed(4)} V`,
    `  Fermi level vs vacuum     ${fit.fermiLevelVsVacuum_eV.toFixed(3)} eV (absolute SHE 4.44 V, Trasatti 1986)`,
    `  support work function     ${fit.supportWorkFunction_eV.toFixed(3)} eV  (use with --donors and --electron-affinity)`,
  ];
  return `${lines.join('\n')}\n`;
}

function areaFromText(text: string): number {
  const bare = Number(text);
  if (text.trim() !== '' && Number.isFinite(bare)) return bare * 1e-4;
  const m = /^\s*([0-9.eE+-]+)\s*(cm\^2|cm2|mm\^2|mm2|m\^2|m2)\s*$/.exec(text);
  if (!m || !Number.isFinite(Number(m[1]))) throw new InputError('--area', `cannot read "${text}"`, 'an area, e.g. "0.5 cm^2"');
  const factor: Record<string, number> = { 'cm^2': 1e-4, cm2: 1e-4, 'mm^2': 1e-6, mm2: 1e-6, 'm^2': 1, m2: 1 };
  return Number(m[1]) * factor[m[2]!]!;
}

export function readInputFile(path: string, field: string, maxBytes = 5_000_000): string {
  if (!existsSync(path)) throw new InputError(field, `file not found: ${path}`);
  const stats = statSync(path);
  if (!stats.isFile()) throw new InputError(field, `not a file: ${path}`);
  if (stats.size > maxBytes) throw new InputError(field, `${path} is ${(stats.size / 1e6).toFixed(1)} MB`, `at most ${maxBytes / 1e6} MB`);
  return readFileSync(path, 'utf8');
}

/** Run the CLI; returns the exit code. */
export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  program.exitOverride();
  program.configureOutput({
    writeErr: (text) => process.stderr.write(text),
  });
  for (const command of program.commands) command.exitOverride();
  for (const command of program.commands) for (const sub of command.commands) sub.exitOverride();
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
      process.stderr.write(`bandbend: error: ${error.message}\n`);
      return 2;
    }
    if (error instanceof ConvergenceError) {
      process.stderr.write(`bandbend: ${error.message}\n`);
      return 1;
    }
    const message = error instanceof Error ? error.message : String(error);
    process.stderr.write(`bandbend: internal error: ${message}\n`);
    if (process.env['BANDBEND_DEBUG'] && error instanceof Error) process.stderr.write(`${error.stack ?? ''}\n`);
    return 1;
  }
}
