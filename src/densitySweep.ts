// Electrons per particle against areal particle density (catalyst loading) for one contact: the particle-array
// geometry at a ladder of densities, written as CSV + figure and returned as a report section.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { solveContact, type ContactOptions } from './contact.js';
import { linePlotSpec, type Row } from './output/figures.js';
import { renderSvg, writeFigure, svgForInline } from './output/render.js';
import { escapeHtml } from './output/escape.js';
import { isModelFailure } from './errors.js';
import { formatPrecision } from './output/format.js';

export const DEFAULT_DENSITIES_CM2 = [1e10, 2e10, 5e10, 1e11, 2e11, 5e11, 1e12, 2e12, 5e12, 1e13];

export interface DensitySweepRow {
  particleDensity_cm2: number;
  electronsPerParticle: number | null;
  meanSpacing_nm: number | null;
  chargeDepth90_nm: number | null;
  zonesOverlap: boolean | null;
  error: string;
}

/** Solve the contact in the particle-array geometry at each density; a density that fails is a row with its error. */
export function sweepParticleDensity(options: ContactOptions, densities_cm2: readonly number[] = DEFAULT_DENSITIES_CM2): DensitySweepRow[] {
  const { uncertainty: _samples, seed: _seed, ...base } = options;
  return densities_cm2.map((density) => {
    try {
      // particles resting on their footprint stay so in the sweep; every other geometry sweeps the hemisphere array
      const r = solveContact({ ...base, geometry: base.geometry === 'disc' || base.geometry === 'disc-array' ? 'disc-array' : 'array', particleDensity: density });
      return {
        particleDensity_cm2: density,
        electronsPerParticle: r.electronsPerParticle,
        meanSpacing_nm: r.particle.meanSpacing_nm,
        chargeDepth90_nm: r.chargeDepth90_nm,
        zonesOverlap: r.particle.zonesOverlap,
        error: '',
      };
    } catch (error) {
      if (!isModelFailure(error)) throw error;
      return { particleDensity_cm2: density, electronsPerParticle: null, meanSpacing_nm: null, chargeDepth90_nm: null, zonesOverlap: null, error: error.message };
    }
  });
}

/** Write density-sweep.csv and the figure into dir; return the report section (trusted HTML, user text escaped). */
export async function densitySweepSection(dir: string, rows: DensitySweepRow[], label: string): Promise<{ title: string; html: string }> {
  writeFileSync(join(dir, 'density-sweep.csv'), stringify(rows as unknown as Record<string, unknown>[], { header: true }));
  const solved = rows.filter((r) => r.electronsPerParticle !== null);
  const spec = linePlotSpec(solved as unknown as Row[], {
    x: 'particleDensity_cm2',
    y: 'electronsPerParticle',
    xLog: true,
    title: `${label}: electrons gained per particle against particle density`,
    xTitle: 'particle density (cm^-2)',
    yTitle: 'electrons per particle',
  });
  const svg = await renderSvg(spec);
  await writeFigure(dir, 'density-sweep', spec);
  const cell = (v: number | null, digits: number, exp = false): string => (v === null ? '' : exp ? v.toExponential(0) : formatPrecision(v, digits));
  const table = rows
    .map(
      (r) =>
        `<tr><td>${cell(r.particleDensity_cm2, 1, true)}</td><td>${cell(r.electronsPerParticle, 3)}</td><td>${cell(r.meanSpacing_nm, 3)}</td><td>${cell(r.chargeDepth90_nm, 3)}</td><td>${r.zonesOverlap === null ? '' : r.zonesOverlap ? 'yes' : 'no'}</td><td>${escapeHtml(r.error)}</td></tr>`,
    )
    .join('');
  return {
    title: 'Particle density (loading) sweep',
    html: `<p>Same inputs in the particle-array geometry, particle density varied (no uncertainty sampling). Data: <a href="density-sweep.csv">density-sweep.csv</a>.</p>
<figure>${svgForInline(svg, 'electrons per particle against particle density')}<figcaption>Electrons gained per particle against the areal particle density (log axis); neighbouring space-charge zones overlap once the 90% charge depth exceeds half the mean spacing, and the charge per particle then falls.</figcaption></figure>
<table><thead><tr><th>particles per cm^2</th><th>electrons per particle</th><th>mean spacing (nm)</th><th>90% charge depth (nm)</th><th>zones overlap</th><th>error</th></tr></thead><tbody>${table}</tbody></table>`,
  };
}
