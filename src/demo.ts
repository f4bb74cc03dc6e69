// Built-in demo scenario (invented): the "Kestrel" hydrogenation team screens metal nanoparticles on reduced
// oxide supports and writes up its lead sample HX-14 (Pt on H2-reduced ceria). Team and sample names are fictional.
import { existsSync, mkdirSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { solveContact, type ContactOptions } from './contact.js';
import { runScreen, sortScreenRows, writeScreenFolder, SCREEN_COLUMNS } from './screen.js';
import { writeContactReport } from './output/report.js';
import { linePlotSpec } from './output/figures.js';
import { renderSvg, writeFigure, svgForInline } from './output/render.js';
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
  geometry: 'array',
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
  conditions: { temperature: '473 K', geometry: 'hemisphere', particleDiameter: '2.5 nm', donors: '1e18 cm^-3' } as ContactOptions,
};

export const DEMO_DENSITIES_CM2 = [1e10, 2e10, 5e10, 1e11, 2e11, 5e11, 1e12, 2e12, 5e12, 1e13];

export async function runDemo(options: DemoOptions): Promise<{ summary: string; htmlPath: string }> {
  const { outDir, force } = options;
  if (existsSync(outDir) && readdirSync(outDir).length > 0 && !force) {
    throw new InputError('--out', `${outDir} exists and is not empty; use --force to overwrite`);
  }
  mkdirSync(outDir, { recursive: true });
  const library = loadLibrary();

  // 1. the lead sample, with literature scatter propagated
  const lead = solveContact({ ...DEMO_SAMPLE, materials: library });

  // 2. how the charge per particle changes with loading (particle density)
  const sweepRows = DEMO_DENSITIES_CM2.map((density) => {
    const { uncertainty: _u, seed: _s, ...base } = DEMO_SAMPLE;
    const r = solveContact({ ...base, particleDensity: density, materials: library });
    return {
      particleDensity_cm2: density,
      electronsPerParticle: r.electronsPerParticle,
      meanSpacing_nm: r.particle.meanSpacing_nm,
      chargeDepth90_nm: r.chargeDepth90_nm,
      zonesOverlap: r.particle.zonesOverlap,
    };
  });
  writeFileSync(join(outDir, 'density-sweep.csv'), stringify(sweepRows, { header: true }));
  const sweepSpec = linePlotSpec(sweepRows, {
    x: 'particleDensity_cm2',
    y: 'electronsPerParticle',
    xLog: true,
    title: 'HX-14: electrons gained per Pt particle against particle density',
    xTitle: 'particle density (cm^-2)',
    yTitle: 'electrons per particle',
  });
  const sweepFigureName = 'density-sweep';

  // 3. the screen of candidate pairs
  const screenRows = sortScreenRows(
    runScreen({ metals: DEMO_SCREEN.metals, supports: DEMO_SCREEN.supports, conditions: DEMO_SCREEN.conditions, materials: library }),
    'electronsPerParticle',
  );
  writeFileSync(join(outDir, 'screen.csv'), stringify(screenRows as unknown as Record<string, unknown>[], { header: true, columns: SCREEN_COLUMNS as string[] }));
  await writeScreenFolder(join(outDir, 'screen'), screenRows, {
    title: 'Kestrel team screen: metals x reduced supports, 2.5 nm hemispheres at 473 K, 1e18 cm^-3 donors',
    metals: DEMO_SCREEN.metals,
    supports: DEMO_SCREEN.supports,
    sortBy: 'electronsPerParticle',
    force: true,
    preamble: '<p>Part of the demo report for sample HX-14: <a href="../index.html">back to the main report</a>. Data: <a href="../screen.csv">screen.csv</a>.</p>',
  });

  // the main report, with the sweep and a link to the screen as extra sections
  const sweepSvg = await renderSvg(sweepSpec);
  await writeFigure(outDir, sweepFigureName, sweepSpec);
  const sweepTable = sweepRows
    .map(
      (r) =>
        `<tr><td>${r.particleDensity_cm2.toExponential(0)}</td><td>${r.electronsPerParticle.toPrecision(3)}</td><td>${(r.meanSpacing_nm ?? 0).toFixed(1)}</td><td>${r.chargeDepth90_nm.toFixed(1)}</td><td>${r.zonesOverlap ? 'yes' : 'no'}</td></tr>`,
    )
    .join('');
  const paths = await writeContactReport(outDir, lead, {
    title: 'Sample HX-14 (fictional): Pt on H2-reduced ceria, Kestrel hydrogenation screen',
    force: true,
    extraSections: [
      {
        title: 'Particle density (loading) sweep',
        html: `<p>Same sample, particle density varied; other inputs unchanged (no uncertainty sampling). Data: <a href="density-sweep.csv">density-sweep.csv</a>.</p>
<figure>${svgForInline(sweepSvg, 'electrons per particle against particle density')}<figcaption>Electrons gained per Pt particle against the areal particle density (log axis); zones overlap once the 90% charge depth exceeds half the mean spacing.</figcaption></figure>
<table><thead><tr><th>particles per cm^2</th><th>electrons per particle</th><th>mean spacing (nm)</th><th>90% charge depth (nm)</th><th>zones overlap</th></tr></thead><tbody>${sweepTable}</tbody></table>`,
      },
      {
        title: 'Screen of candidate pairs',
        html: `<p>${escapeHtml(`${DEMO_SCREEN.metals.length} metals x ${DEMO_SCREEN.supports.length} supports`)}: <a href="screen/index.html">screen report with heat maps</a>, data in <a href="screen.csv">screen.csv</a>.</p>`,
      },
    ],
  });
  const summary = `${formatContactSummary(lead)}\n\ndemo report written: ${paths.htmlPath}\n`;
  return { summary, htmlPath: paths.htmlPath };
}
