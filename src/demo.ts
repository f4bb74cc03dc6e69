// Built-in demo scenario (invented): the "Kestrel" hydrogenation team screens metal nanoparticles on reduced
// oxide supports and writes up its lead sample HX-14 (Pt on H2-reduced ceria). Team and sample names are fictional.
import { existsSync, readdirSync, writeFileSync } from 'node:fs';
import { createFolder } from './inputs/files.js';
import { join } from 'node:path';
import { solveContact, type ContactOptions } from './contact.js';
import { sweepParticleDensity, densitySweepSection } from './densitySweep.js';
import { runScreen, sortScreenRows, writeScreenFolder, screenCsv } from './screen.js';
import { writeContactReport } from './output/report.js';
import { escapeHtml } from './output/escape.js';
import { loadLibrary } from './materials/load.js';
import { InputError } from './errors.js';
import { formatContactSummary } from './output/summary.js';

export interface DemoOptions {
  outDir: string;
  force: boolean;
}

/** The lead sample: conditions as the (fictional) team would enter them. */
export const DEMO_SAMPLE: ContactOptions = {
  metal: 'Pt',
  support: 'CeO2',
  temperature: '473 K',
  geometry: 'disc-array', // particles resting on their footprint, as on a real catalyst (not sunk into the support)
  particleDiameter: '2.5 nm',
  particleDensity: '5e11 cm^-2',
  reductionTemperature: '673 K',
  hydrogenToWater: 1000,
  uncertainty: 100,
  seed: 42,
};

export const DEMO_SCREEN = {
  metals: ['Pt', 'Pd', 'Ni', 'Cu', 'Ru', 'Au'],
  supports: ['TiO2-anatase', 'CeO2', 'ZnO', 'SnO2', 'In2O3'],
  conditions: { temperature: '473 K', geometry: 'disc', particleDiameter: '2.5 nm', donors: '1e18 cm^-3' } as ContactOptions,
};


export async function runDemo(options: DemoOptions): Promise<{ summary: string; htmlPath: string }> {
  const { outDir, force } = options;
  // bounded creation; /dev/null, /proc/..., read-only folders and files in the way exit 2 (src/inputs/files.ts)
  const existed = existsSync(outDir);
  createFolder(outDir, '--out');
  if (existed && readdirSync(outDir).length > 0 && !force) {
    throw new InputError('--out', `${outDir} exists and is not empty; use --force to overwrite`);
  }
  const library = loadLibrary();

  // 1. the lead sample, with literature scatter propagated
  const lead = solveContact({ ...DEMO_SAMPLE, materials: library });

  // 2. how the charge per particle changes with loading (particle density)
  const sweepRows = sweepParticleDensity({ ...DEMO_SAMPLE, materials: library });
  const sweepSection = await densitySweepSection(outDir, sweepRows, 'HX-14');

  // 3. the screen of candidate pairs
  const screenRows = sortScreenRows(
    runScreen({ metals: DEMO_SCREEN.metals, supports: DEMO_SCREEN.supports, conditions: DEMO_SCREEN.conditions, materials: library }),
    'electronsPerParticle',
  );
  writeFileSync(join(outDir, 'screen.csv'), screenCsv(screenRows));
  await writeScreenFolder(join(outDir, 'screen'), screenRows, {
    title: 'Kestrel team screen: metals x reduced supports, 2.5 nm particles resting on the support (disc contact) at 473 K, 1e18 cm^-3 donors',
    metals: DEMO_SCREEN.metals,
    supports: DEMO_SCREEN.supports,
    sortBy: 'electronsPerParticle',
    force: true,
    preamble: '<p>Part of the demo report for sample HX-14: <a href="../index.html">back to the main report</a>. Data: <a href="../screen.csv">screen.csv</a>.</p>',
  });

  // the main report, with the sweep and a link to the screen as extra sections
  const paths = await writeContactReport(outDir, lead, {
    title: 'Sample HX-14 (fictional): Pt on H2-reduced ceria, Kestrel hydrogenation screen',
    force: true,
    extraSections: [
      sweepSection,
      {
        title: 'Screen of candidate pairs',
        html: `<p>${escapeHtml(`${DEMO_SCREEN.metals.length} metals x ${DEMO_SCREEN.supports.length} supports`)}: <a href="screen/index.html">screen report with heat maps</a>, data in <a href="screen.csv">screen.csv</a>.</p>`,
      },
    ],
  });
  const summary = `${formatContactSummary(lead)}\n\ndemo report written: ${paths.htmlPath}\n`;
  return { summary, htmlPath: paths.htmlPath };
}
