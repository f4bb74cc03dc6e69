// `bandbend materials list|show`: the materials library with ranges and citations.
import type { Command } from 'commander';
import { Option } from './commander.js';
import { InputError } from '../errors.js';
import { materialsFiles, writeJson } from './io.js';

const EXAMPLES = `
Examples:
  bandbend materials list --kind support
  bandbend materials show CeO2
  bandbend materials show Pt --json`;

async function listMaterials(opts: Record<string, unknown>): Promise<void> {
  const { resolveLibrary } = await import('../materials/load.js');
  const lib = resolveLibrary(materialsFiles(opts['materials']));
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
  const { formatMaterialsList } = await import('../output/materialsText.js');
  process.stdout.write(formatMaterialsList(metals, supports));
}

async function showMaterial(name: string, opts: Record<string, unknown>): Promise<void> {
  const [{ resolveLibrary, findMetal, findSupport }, text] = await Promise.all([import('../materials/load.js'), import('../output/materialsText.js')]);
  const lib = resolveLibrary(materialsFiles(opts['materials']));
  let record: Record<string, unknown>;
  try {
    record = findMetal(lib, name) as unknown as Record<string, unknown>;
  } catch (metalError) {
    if (!(metalError instanceof InputError)) throw metalError;
    try {
      record = findSupport(lib, name) as unknown as Record<string, unknown>;
    } catch (supportError) {
      if (!(supportError instanceof InputError)) throw supportError;
      throw new InputError('NAME', `no metal or support called "${name}"`, 'see `bandbend materials list`');
    }
  }
  if (opts['json'] === true) writeJson({ ...record, references: text.referencedBy(lib, record) });
  else process.stdout.write(text.formatRecord(lib, record));
}

export function registerMaterials(program: Command): void {
  const materials = program.command('materials').description('the materials library: values, ranges and citations');
  materials.addHelpText('after', EXAMPLES);
  materials
    .command('list')
    .description('list metals and supports')
    .addOption(new Option('--kind <KIND>', 'only metals or only supports').choices(['metal', 'support']))
    .option('--json', 'print as JSON')
    .option('--materials <FILE...>', 'extra materials file(s)')
    .addHelpText('after', EXAMPLES)
    .action(listMaterials);
  materials
    .command('show <NAME>')
    .description('all values of one metal or support with ranges and citations')
    .option('--json', 'print as JSON')
    .option('--materials <FILE...>', 'extra materials file(s)')
    .addHelpText('after', EXAMPLES)
    .action(showMaterial);
}
