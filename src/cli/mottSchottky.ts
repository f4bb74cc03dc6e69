// `bandbend mott-schottky FILE`: fit capacitance-voltage data (least squares loaded only here).
import type { Command } from 'commander';
import { Option } from './commander.js';
import { existsSync } from 'node:fs';
import { writeTextFile } from '../inputs/files.js';
import { InputError, requireInRange } from '../errors.js';
import { parseQuantity } from '../inputs/units.js';
import { readInputFile, writeJson } from './io.js';

const EXAMPLES = `
CSV columns: potential_V and capacitance_F (with --area) or capacitance_F_per_cm2.
Examples:
  bandbend mott-schottky examples/mott-schottky-sample.csv --permittivity 31 --reference Ag/AgCl
  bandbend mott-schottky examples/mott-schottky-sample.csv --permittivity 31 --reference Ag/AgCl --json --plot ms.svg
Saved to a file, the --json output is an input of \`bandbend contact --fit-from FILE\` (donor density and
permittivity, or with --fit-use work-function the support work function from the flat-band potential).`;

function areaFromText(text: string): number {
  const bare = Number(text);
  if (text.trim() !== '' && Number.isFinite(bare)) return bare * 1e-4;
  const m = /^\s*([0-9.eE+-]+)\s*(cm\^2|cm2|mm\^2|mm2|m\^2|m2)\s*$/.exec(text);
  if (!m || !Number.isFinite(Number(m[1]))) throw new InputError('--area', `cannot read "${text}"`, 'an area, e.g. "0.5 cm^2"');
  const factor: Record<string, number> = { 'cm^2': 1e-4, cm2: 1e-4, 'mm^2': 1e-6, mm2: 1e-6, 'm^2': 1, m2: 1 };
  return Number(m[1]) * factor[m[2]!]!;
}

type Fit = ReturnType<typeof import('../derived/mottSchottky.js').fitMottSchottky>;
type Rows = ReturnType<typeof import('../derived/mottSchottky.js').parseCapacitanceCsv>['rows'];

async function writePlot(path: string, rows: Rows, fit: Fit, electrodeArea_m2: number | undefined, force: boolean): Promise<void> {
  for (const target of [path, `${path}.vl.json`]) {
    if (existsSync(target) && !force) throw new InputError('--plot', `${target} exists; use --force to overwrite`);
  }
  const [{ mottSchottkyFitSpec }, { renderSvg }] = await Promise.all([import('../output/figures.js'), import('../output/render.js')]);
  const points = rows.map((row) => {
    const perArea = row.capacitance_F_per_m2 ?? (row.capacitance_F ?? NaN) / (electrodeArea_m2 ?? NaN);
    return { potential_V: row.potential_V, inverseCapSquared: 1 / (perArea * perArea) };
  });
  const spec = mottSchottkyFitSpec(points, { slope: fit.slope, intercept: fit.intercept, flatBand_V: fit.flatBandPotential_V }, { yTitle: '1/C^2 (m^4/F^2)' });
  writeTextFile(path, await renderSvg(spec), '--plot');
  writeTextFile(`${path}.vl.json`, JSON.stringify(spec, null, 2), '--plot');
}

async function runMottSchottky(file: string, opts: Record<string, unknown>): Promise<void> {
  const { parseCapacitanceCsv, fitMottSchottky, parseReferenceElectrode } = await import('../derived/mottSchottky.js');
  const parsed = parseCapacitanceCsv(readInputFile(file, 'mott-schottky FILE'), file);
  const areaText = opts['area'];
  const electrodeArea_m2 = typeof areaText === 'string' ? areaFromText(areaText) : undefined;
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
  if (typeof opts['plot'] === 'string') await writePlot(opts['plot'], parsed.rows, fit, electrodeArea_m2, opts['force'] === true);
  if (opts['json'] === true) writeJson(fit);
  else {
    const { formatFit } = await import('../output/mottSchottkyText.js');
    process.stdout.write(formatFit(fit));
  }
}

export function registerMottSchottky(program: Command): void {
  program
    .command('mott-schottky <FILE>')
    .description('fit capacitance-voltage data: donor density and flat-band potential, on the vacuum scale')
    .requiredOption('--permittivity <ER>', 'static relative permittivity of the support')
    .option('--area <A>', 'electrode area (cm^2 if bare) when the CSV gives capacitance_F')
    .option('--temperature <T>', 'measurement temperature (K if bare)', '298.15')
    .addOption(new Option('--reference <ELECTRODE>', 'reference electrode of the potentials').choices(['SHE', 'NHE', 'SCE', 'Ag/AgCl', 'RHE']).default('SHE'))
    .option('--ph <PH>', 'electrolyte pH (needed for RHE)')
    .option('--json', 'print the fit as JSON')
    .option('--plot <FILE>', 'write the fit plot as SVG (and FILE.vl.json)')
    .option('--force', 'overwrite an existing plot')
    .addHelpText('after', EXAMPLES)
    .action(runMottSchottky);
}
