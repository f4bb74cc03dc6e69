// Tests for figures, SVG rendering, reports and the terminal summary.
// The ContactResult fixture is SYNTHETIC: its profile is computed here from the textbook depletion
// approximation (uniform ionized donors up to a sharp depletion edge), not by the bandbend solver.
import { mkdtemp, readFile, readdir, rm, mkdir, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TopLevelSpec } from 'vega-lite';
import { InputError } from '../src/errors.js';
import { NO_DEFECTS } from '../src/inputs/defectInputs.js';
import { contactCautions, HYDROGEN_CAUTIONS, SCREENING_CAUTION } from '../src/output/cautions.js';
import type { ContactResult } from '../src/types.js';
import { escapeHtml, escapeMarkdownCell, stripControl } from '../src/output/escape.js';
import {
  bandDiagramSpec,
  chargeFieldSpec,
  decadeTicks,
  heatmapSpec,
  linePlotSpec,
  localisedLevelOf,
  mottSchottkyFitSpec,
  prefersLogDepth,
  type Row,
} from '../src/output/figures.js';
import { compileSpec, renderSvg, svgSize, writeFigure } from '../src/output/render.js';
import { contactResultRows, writeContactReport, writeScreenReport, writeStudyReport, sortRows } from '../src/output/report.js';
import { formatContactSummary, formatNumber, shouldUseColor } from '../src/output/summary.js';

// ---------------------------------------------------------------- synthetic fixture

const Q = 1.602176634e-19;
const EPS0 = 8.8541878128e-12;
const KB_EV = 8.617333262e-5;

interface FixtureParams {
  metal: string;
  support: string;
  workFunction_eV: number;
  affinity_eV: number;
  ecBulk_eV: number;
  gap_eV: number;
  donors_cm3: number;
  epsR: number;
  temperature_K: number;
  diameter_nm: number;
}

const DEFAULTS: FixtureParams = {
  metal: 'Pt',
  support: 'TiO2-test',
  workFunction_eV: 5.3,
  affinity_eV: 4.2,
  ecBulk_eV: 0.15,
  gap_eV: 3.2,
  donors_cm3: 1e18,
  epsR: 30,
  temperature_K: 573,
  diameter_nm: 3,
};

/** A plausible n-type Schottky contact from the depletion approximation (synthetic, see file header). */
function depletionFixture(over: Partial<FixtureParams> = {}): ContactResult {
  const p = { ...DEFAULTS, ...over };
  const supportW = p.affinity_eV + p.ecBulk_eV;
  const vbi = p.workFunction_eV - supportW; // band bending, eV (>0: depletion)
  const nd = p.donors_cm3 * 1e6; // m^-3
  const eps = p.epsR * EPS0;
  const w_m = Math.sqrt((2 * eps * Math.abs(vbi)) / (Q * nd));
  const w_nm = w_m * 1e9;
  const kT = KB_EV * p.temperature_K;
  const nc = 2.5e19 * (p.temperature_K / 300) ** 1.5; // cm^-3, order of magnitude only

  // mesh: x = 0 plus 199 log-spaced points from 0.01 nm to 4 W
  const x_nm = [0];
  for (let i = 0; i < 199; i++) x_nm.push(0.01 * (4 * w_nm / 0.01) ** (i / 198));
  const ec = x_nm.map((x) => p.ecBulk_eV + (x < w_nm ? vbi * (1 - x / w_nm) ** 2 : 0));
  const rho = x_nm.map((x) => (x < w_nm ? Q * nd : 0));
  const field = x_nm.map((x) => (x < w_nm ? (-Q * nd * (w_m - x * 1e-9)) / eps : 0));
  const n = ec.map((e) => nc * Math.exp(-e / kT));
  const spaceCharge = Q * nd * w_m;
  const area_m2 = Math.PI * (p.diameter_nm * 0.5e-9) ** 2;

  return {
    metal: p.metal,
    support: p.support,
    temperature_K: p.temperature_K,
    geometry: 'planar',
    statistics: 'boltzmann',
    barrierModel: 'ideal',
    barrierCarrier: 'electron',
    barrierHeight_eV: p.workFunction_eV - p.affinity_eV,
    electronBarrier_eV: p.workFunction_eV - p.affinity_eV,
    metalWorkFunction_eV: p.workFunction_eV,
    bandBending_eV: vbi,
    fermiLevelBelowConduction_eV: p.ecBulk_eV,
    supportWorkFunction_eV: supportW,
    direction: vbi > 0 ? 'support-to-metal' : vbi < 0 ? 'metal-to-support' : 'none',
    spaceCharge_C_per_m2: spaceCharge,
    chargeEquivalentWidth_nm: w_nm,
    depletionWidthApprox_nm: w_nm,
    depletionWidthApproxIsPlanar: false,
    sphericalDepletionWidth_nm: null,
    width_nm: w_nm,
    widthDefinition: 'charge-equivalent',
    debyeLength_nm: Math.sqrt((eps * kT) / (Q * nd)) * 1e9,
    interfaceField_V_per_m: field[0]!,
    interfacePermittivity: 10,
    permittivityNonlinearity_V_m5_per_C3: 0,
    imageForceLowering_eV: 0.031,
    capacitanceBarrier: null,
    imageForceMaximum_nm: 2.5,
    imageForceContinuumValid: true,
    electronsPerParticle: (spaceCharge * area_m2) / Q,
    donorDensity_cm3: p.donors_cm3,
    pinningFactor: null,
    particleWorkFunction_eV: 5.1,
    interfaceStates: null,
    photoemission: { observedBandBending_eV: 0.5, inelasticMeanFreePath_nm: 2.5, photonEnergy_eV: 1486.6, coreLevel: 'O 1s', emissionAngle_deg: 0 },
    chargeDepth90_nm: 0.9 * w_nm, // uniform depletion charge: 90% lies within 0.9 W
    supportFullyDepleted: false,
    acceptorDensity_cm3: 0,
    bulk: {
      electronDensity_cm3: n[n.length - 1]!,
      holeDensity_cm3: 1e-20,
      ionizedDonors_cm3: p.donors_cm3,
      ionizedAcceptors_cm3: 0,
      conductionDensityOfStates_cm3: nc,
      valenceDensityOfStates_cm3: nc,
      intrinsicDensityLog10_cm3: -5.2,
      localisedElectrons_cm3: 0,
    },
    particle: {
      diameter_nm: p.diameter_nm,
      atoms: 950,
      surfaceAtoms: 380,
      dispersion: 0.4,
      electronsPerSurfaceAtom: (spaceCharge * area_m2) / Q / 380,
      chargingEnergy_eV: 0.08,
      chargingEnergyOverKT: 0.08 / kT,
      particleDensity_cm2: null,
      meanSpacing_nm: null,
      zonesOverlap: null,
    },
    exchange: {
      richardsonConstant_A_per_cm2_K2: 120,
      exchangeCurrentDensity_A_per_cm2: 2.5e-3,
      exchangeCurrentLog10_A_per_cm2: Math.log10(2.5e-3),
      equilibrationTime_s: 4.2e-6,
      equilibrationTimeLog10_s: Math.log10(4.2e-6),
      slow: false,
      profileExchangeCurrentLog10_A_per_cm2: null,
      tunnellingEnhancement: null,
      relaxationTime99_s: null,
      relaxationTime99Log10_s: null,
      historyTemperature_K: null,
      historyRelaxationTime99_s: null,
      historyRelaxationTime99Log10_s: null,
    },
    pretreatment: {
      mode: 'given',
      reductionTemperature_K: null,
      oxygenPressure_Pa: null,
      hydrogenToWater: null,
      vacancyDensity_cm3: null,
      equilibrationTemperature_K: null,
    },
    defects: NO_DEFECTS, // src/inputs/defectInputs.ts: the block of a contact without defect inputs
    profile: {
      x_nm,
      conductionBand_eV: ec,
      valenceBand_eV: ec.map((e) => e - p.gap_eV),
      electronDensity_cm3: n,
      holeDensity_cm3: n.map(() => 1e-20),
      chargeDensity_C_per_m3: rho,
      field_V_per_m: field,
    },
    solver: { converged: true, iterations: 12, meshPoints: x_nm.length, domainLength_nm: x_nm[x_nm.length - 1]!, chargeErrorEstimate: 1e-9, chargeErrorBound: 1e-9, meetsTolerance: true },
    warnings: [{ code: 'synthetic', message: 'synthetic fixture from the depletion approximation' }],
    cautions: ['Test caution: oxygen vacancy density assumed.'],
    inputs: [
      { field: 'metal.workFunction', value: p.workFunction_eV, unit: 'eV', min: 5.1, max: 5.9, origin: 'library', source: 'ref-a', citation: 'Example Handbook of Surfaces, 2nd ed. (test entry)', note: 'polycrystalline' },
      { field: 'support.electronAffinity', value: p.affinity_eV, unit: 'eV', origin: 'library', source: 'ref-b', citation: 'Review of oxide affinities (test entry)', fromMemory: true },
      { field: 'support.donorDensity', value: p.donors_cm3, unit: 'cm^-3', origin: 'user', note: 'given on the command line' },
    ],
  };
}

/** The depletion-approximation barrier is E_C(0) - E_F = W_m - chi. */
const fixture = depletionFixture();

async function expectCompiles(spec: TopLevelSpec): Promise<void> {
  const { vega, warnings } = await compileSpec(spec);
  expect(warnings).toEqual([]);
  expect(vega.marks?.length ?? 0).toBeGreaterThan(0);
}

async function expectRenders(spec: TopLevelSpec): Promise<string> {
  const svg = await renderSvg(spec);
  expect(svg.startsWith('<svg')).toBe(true);
  const { width, height } = svgSize(svg);
  expect(width).toBeGreaterThan(0);
  expect(height).toBeGreaterThan(0);
  expect(svg.length).toBeGreaterThan(1000);
  return svg;
}

let work: string;
beforeAll(async () => {
  work = await mkdtemp(join(tmpdir(), 'bandbend-output-'));
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

// ---------------------------------------------------------------- fixture sanity

describe('synthetic fixture', () => {
  it('is a plausible depletion contact', () => {
    expect(fixture.profile.x_nm.length).toBe(200);
    expect(fixture.bandBending_eV).toBeCloseTo(0.95, 10);
    expect(fixture.profile.conductionBand_eV[0]).toBeCloseTo(fixture.electronBarrier_eV, 10);
    expect(fixture.depletionWidthApprox_nm!).toBeGreaterThan(30);
    expect(fixture.depletionWidthApprox_nm!).toBeLessThan(100);
    expect(prefersLogDepth(fixture)).toBe(true);
  });
});

// ---------------------------------------------------------------- figures

describe('band diagram', () => {
  it('compiles and renders with levels, legend and annotations (linear depth)', async () => {
    const spec = bandDiagramSpec(fixture);
    await expectCompiles(spec);
    const svg = await expectRenders(spec);
    for (const label of ['vacuum level E_vac', 'conduction band E_C', 'valence band E_V', 'Fermi level E_F']) {
      expect(svg).toContain(label); // legend entries
    }
    expect(svg).toContain('mark-line');
    expect(svg).toContain('mark-rule');
    expect(svg).toContain('mark-rect');
    expect(svg).toContain('barrier');
    expect(svg).toContain(`${formatNumber(fixture.barrierHeight_eV)} eV`);
    expect(svg).toContain('band bending');
    expect(svg).toContain('+0.95 eV');
    expect(svg).toContain('metal (Pt)');
    expect(svg).toContain('support (TiO2-test)');
  });

  it('draws the vacuum level from the work functions and electron affinity', () => {
    const spec = bandDiagramSpec(fixture) as { layer: { data?: { values?: Record<string, unknown>[] } }[] };
    const levels = spec.layer.flatMap((l) => l.data?.values ?? []).filter((v) => v.series === 'vacuum level E_vac');
    const metalSide = levels.filter((v) => (v.x_nm as number) < 0);
    expect(metalSide.every((v) => v.energy_eV === fixture.metalWorkFunction_eV)).toBe(true);
    const last = levels[levels.length - 1]!;
    expect(last.energy_eV as number).toBeCloseTo(fixture.supportWorkFunction_eV, 10);
    // all ~200 profile points are kept (no downsampling)
    expect(levels.length).toBe(fixture.profile.x_nm.length + 2);
  });

  it('supports a log depth axis and stays deterministic', async () => {
    const spec = bandDiagramSpec(fixture, { logDepth: true });
    await expectCompiles(spec);
    const svg = await expectRenders(spec);
    expect(svg).toContain('symmetric-log');
    expect(JSON.stringify(bandDiagramSpec(fixture, { logDepth: true }))).toBe(JSON.stringify(spec));
  });

  it('annotates a hole barrier for a p-type contact', async () => {
    const p = { ...depletionFixture({ workFunction_eV: 4.0 }), barrierCarrier: 'hole' as const, barrierHeight_eV: 2.9 };
    const svg = await renderSvg(bandDiagramSpec(p));
    expect(svg).toContain('hole barrier');
    expect(svg).toContain('2.9 eV');
  });
});

describe('band diagram: interface states and localised level', () => {
  // Interface-state and localised-level view of the fixture: the localised level sits exactly at E_F at the
  // interface, where Fermi–Dirac occupancy of a site with spin degeneracy g = 2 is g/(g+1) = 2/3
  // (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., eq. 1.35 form for a singly occupiable level).
  const ec0 = fixture.profile.conductionBand_eV[0]!;
  const withStates: ContactResult = {
    ...fixture,
    barrierModel: 'interface-states',
    interfaceStates: {
      stateDensity_per_eV_cm2: 3e13,
      neutralLevelAboveValence_eV: 2.2,
      layerThickness_nm: 0.5,
      layerPermittivity: 1,
      interfaceStateCharge_C_per_m2: 0.016,
      metalCharge_C_per_m2: -0.02,
      layerDrop_eV: 0.2,
      electronsFromInterfaceStates: 0.5,
      electronsFromSpaceCharge: 1.5,
      evaluations: 9,
      surfaceDonors_per_cm2: 0,
      surfaceDonorLevel_eV: null,
      surfaceDonorCharge_C_per_m2: 0,
      surfaceDonorsIonisedFraction: null,
      electronsFromSurfaceDonors: 0,
    },
    bulk: { ...fixture.bulk, localisedElectrons_cm3: 1e18 },
    inputs: [
      ...fixture.inputs,
      { field: 'localised-electron sites', value: 1e22, unit: 'cm^-3', origin: 'library', source: 'ref-c' },
      { field: 'localised level (depth below E_C)', value: ec0, unit: 'eV', origin: 'library', source: 'ref-d' },
      { field: 'charge-neutrality level (above E_V)', value: 2.2, unit: 'eV', origin: 'library', source: 'ref-e', citation: 'CNL compilation (test entry)', fromMemory: true },
    ],
  };

  it('reads the localised level and its occupancy (2/3 where the level meets E_F)', () => {
    const view = localisedLevelOf(withStates)!;
    expect(view.depth_eV).toBe(ec0);
    expect(view.interfaceOccupancy).toBeCloseTo(2 / 3, 12);
    expect(view.bulkOccupancy).toBeCloseTo(1e18 / 1e22, 15);
    expect(localisedLevelOf(fixture)).toBeNull();
  });

  it('draws the CNL at E_V(0) + phi_0 and the localised level E_C(x) - depth, and states both in the subtitle', async () => {
    const spec = bandDiagramSpec(withStates) as unknown as { layer: { data?: { values?: Record<string, unknown>[] } }[]; title: { subtitle: string[] } };
    const values = spec.layer.flatMap((l) => l.data?.values ?? []);
    const cnl = values.find((v) => v.label === 'CNL')!;
    expect(cnl.y as number).toBeCloseTo(fixture.profile.valenceBand_eV[0]! + 2.2, 12);
    const localised = values.filter((v) => v.series === 'localised level E_L');
    expect(localised.length).toBe(fixture.profile.x_nm.length);
    expect(localised[0]!.energy_eV as number).toBeCloseTo(0, 12);
    expect(spec.title.subtitle.join(' ')).toContain('+0.5 electrons to the particle');
    expect(spec.title.subtitle.join(' ')).toContain('67% at the interface');
    const svg = await expectRenders(bandDiagramSpec(withStates) as TopLevelSpec);
    expect(svg).toContain('localised level E_L');
    // without interface states or localised sites nothing extra is drawn
    const plain = bandDiagramSpec(fixture) as unknown as { layer: { data?: { values?: Record<string, unknown>[] } }[] };
    expect(plain.layer.flatMap((l) => l.data?.values ?? []).some((v) => v.label === 'CNL' || v.series === 'localised level E_L')).toBe(false);
  });

  it('lists the interface-state block, the photoemission band bending, the particle work function and the model data', () => {
    const rows = contactResultRows(withStates);
    const value = (label: string) => rows.find((r) => r.label === label)?.value ?? '';
    expect(rows.filter((r) => r.group === 'interface states').length).toBe(7);
    expect(value('electrons to the particle from interface states / space charge')).toBe('+0.5 / +1.5');
    expect(value('band bending seen by photoemission')).toContain('+0.5 eV');
    expect(value('particle work function (size-corrected)')).toBe('5.1 eV');
    expect(value('barrier model data')).toContain('CNL compilation (test entry), from memory');
    expect(value('localised (small-polaron) electrons')).toContain('67% at the interface');
    expect(contactResultRows(fixture).some((r) => r.group === 'interface states')).toBe(false);
  });
});

describe('charge and field', () => {
  it('compiles two stacked panels, linear and log depth', async () => {
    for (const logDepth of [false, true]) {
      const spec = chargeFieldSpec(fixture, { logDepth });
      expect('vconcat' in spec && spec.vconcat.length).toBe(2);
      await expectCompiles(spec);
      const svg = await expectRenders(spec);
      expect(svg).toContain('charge density (C/m^3)');
      expect(svg).toContain('field (V/m, + into support)');
    }
  });

  it('skips x = 0 on a log axis', () => {
    const spec = chargeFieldSpec(fixture, { logDepth: true }) as { data: { values: { x_nm: number }[] } };
    expect(spec.data.values.every((v) => v.x_nm > 0)).toBe(true);
    expect(spec.data.values.length).toBe(fixture.profile.x_nm.length - 1);
  });
});

describe('heat map', () => {
  const metals = ['Pt', 'Au', 'Ni'];
  const supports = ['TiO2', 'ZnO', 'CeO2'];
  const rows: Row[] = metals.flatMap((m, i) =>
    supports.map((s, j) => ({ metal: m, support: s, barrierHeight_eV: 0.5 + 0.2 * i + 0.1 * j, electronsPerParticle: (i - 1) * 0.7 + j * 0.1 })),
  );

  it('renders a sequential map with value labels', async () => {
    const spec = heatmapSpec(rows, { metricField: 'barrierHeight_eV', title: 'Barrier height (eV)', metals, supports });
    await expectCompiles(spec);
    const svg = await expectRenders(spec);
    expect(svg).toContain('mark-rect');
    expect(svg).toContain('>0.5<');
    expect(svg).toContain('>1.1<');
    expect(svg).toContain('Barrier height (eV)');
    expect(JSON.stringify(spec)).toContain('viridis');
  });

  it('uses a diverging scale centred on zero for signed values and greys missing ones', async () => {
    const withGap = [...rows.slice(0, -1), { metal: 'Ni', support: 'CeO2', electronsPerParticle: null }];
    const spec = heatmapSpec(withGap, { metricField: 'electronsPerParticle', title: 'Electrons per particle', metals, supports });
    const json = JSON.stringify(spec);
    expect(json).toContain('blueorange');
    await expectCompiles(spec);
    const svg = await expectRenders(spec);
    expect(svg).toContain('n/a');
    const scale = (spec as { layer: { encoding?: { color?: { scale?: { domain?: number[] } } } }[] }).layer[0]!.encoding!.color!.scale!.domain!;
    expect(scale[0]).toBe(-scale[1]!);
  });
});

describe('line plot and Mott-Schottky', () => {
  const rows: Row[] = [300, 400, 500, 600, 700].flatMap((t) =>
    ['1e17', '1e18'].map((nd) => ({ temperature_K: t, donors: nd, debyeLength_nm: (nd === '1e17' ? 10 : 3) * Math.sqrt(t / 300) })),
  );

  it('plots a study against the swept input, with groups and log axes', async () => {
    const spec = linePlotSpec(rows, { x: 'temperature_K', y: 'debyeLength_nm', color: 'donors', yLog: true, title: 'Debye length' });
    await expectCompiles(spec);
    const svg = await expectRenders(spec);
    expect(svg).toContain('mark-line');
    expect(svg).toContain('mark-symbol');
    expect(svg).toContain('1e18');
  });

  it('drops non-positive values on log axes and handles a categorical sweep', async () => {
    const bad: Row[] = [...rows, { temperature_K: 0, donors: '1e17', debyeLength_nm: 5 }];
    const spec = linePlotSpec(bad, { x: 'temperature_K', y: 'debyeLength_nm', xLog: true, title: 't' }) as { data: { values: unknown[] } };
    expect(spec.data.values.length).toBe(rows.length);
    const cat = linePlotSpec([{ m: 'Pt', y: 1 }, { m: 'Au', y: 2 }], { x: 'm', y: 'y', title: 'by metal' });
    await expectCompiles(cat);
    await expectRenders(cat);
  });

  it('shows Mott-Schottky points, fit and flat band', async () => {
    const fit = { slope: 2e13, intercept: 1e13, flatBand_V: -0.55 };
    const points = [0, 0.2, 0.4, 0.6, 0.8].map((v) => ({ potential_V: v, inverseCapSquared: fit.slope * v + fit.intercept + (v - 0.4) * 1e11 }));
    const spec = mottSchottkyFitSpec(points, fit, { yTitle: '1/C^2 (cm^4/F^2)' });
    await expectCompiles(spec);
    const svg = await expectRenders(spec);
    expect(svg).toContain('flat band -0.55 V');
    expect(svg).toContain('mark-symbol');
    expect(svg).toContain('1/C^2 (cm^4/F^2)');
  });

  it('decade ticks', () => {
    expect(decadeTicks(0.01, 250)).toEqual([0.01, 0.1, 1, 10, 100]);
    expect(decadeTicks(0, 10)).toEqual([]);
  });
});

describe('writeFigure', () => {
  it('writes the svg and the Vega-Lite source', async () => {
    const dir = join(work, 'fig');
    const spec = bandDiagramSpec(fixture);
    const { svgPath, specPath } = await writeFigure(dir, 'band', spec);
    expect(svgPath.endsWith('band.svg')).toBe(true);
    expect(specPath.endsWith('band.vl.json')).toBe(true);
    expect(JSON.parse(await readFile(specPath, 'utf8'))).toEqual(JSON.parse(JSON.stringify(spec)));
    const svg = await readFile(svgPath, 'utf8');
    expect(svg).toMatch(/^<svg[^>]* width="\d+(\.\d+)?" height="\d+(\.\d+)?"/);
    await expect(writeFigure(dir, '../escape', spec)).rejects.toThrow(/plain file name/);
  });

  it('refuses external data', async () => {
    const spec: TopLevelSpec = { data: { url: 'https://example.invalid/data.json' }, mark: 'point', width: 100, height: 100 };
    await expect(renderSvg(spec)).rejects.toThrow(/external resource/);
  });
});

// ---------------------------------------------------------------- reports

describe('contact report', () => {
  const evil = '<script>alert("x")</script>';
  const result = depletionFixture({ metal: `Pt ${evil}` });
  result.warnings.push({ code: 'note', message: `sample <img src=x onerror=alert(1)> & co` });

  it('writes a self-contained, escaped index.html, summary.md and figures', async () => {
    const dir = join(work, 'report');
    const out = await writeContactReport(dir, result, { title: `Report ${evil}`, extraSections: [{ title: `More ${evil}`, html: '<p>extra</p>' }] });
    const files = (await readdir(dir)).sort();
    expect(files).toEqual(
      ['band-diagram-log.svg', 'band-diagram-log.vl.json', 'band-diagram.svg', 'band-diagram.vl.json', 'charge-field.svg', 'charge-field.vl.json', 'index.html', 'summary.md'].sort(),
    );
    expect(out.figures.length).toBe(6);
    const html = await readFile(out.htmlPath, 'utf8');
    // no script of any kind, no external resources
    expect(html.toLowerCase()).not.toContain('<script');
    expect(html).not.toContain('<img');
    expect(html).not.toMatch(/https?:\/\//);
    expect(html).not.toMatch(/<link\b|<[^>]+\s(src|href)=|url\(/i);
    expect(html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt; &amp; co');
    // figures inline
    expect((html.match(/<svg\b/g) ?? []).length).toBe(3);
    expect(html).toContain('<p>extra</p>');
    // tables and sections
    expect(html).toContain('Example Handbook of Surfaces, 2nd ed. (test entry)');
    expect(html).toContain('from memory — verify');
    expect(html).toContain('5.1 to 5.9');
    expect(html).toContain('image-force lowering');
    expect(html).toContain('equilibration time (thermionic exchange)');
    expect(html).toContain('One-dimensional equilibrium Poisson');
    expect(html).toContain('Boltzmann');
    expect(html).toContain('no interface states');
    expect(html).toContain('Test caution: oxygen vacancy density assumed.');
    // the hydrogen hazard caution only when hydrogen was used; the screening caution exactly once
    expect(html).not.toMatch(/flammable/);
    expect(html.split('screening estimates').length - 1).toBe(1);
    expect(html).toContain(formatNumber(result.barrierHeight_eV));
  });

  it('summary.md contains the key numbers', async () => {
    const md = await readFile(join(work, 'report', 'summary.md'), 'utf8');
    expect(md).toContain(`${formatNumber(result.barrierHeight_eV)} eV`);
    expect(md).toContain('+0.95 eV');
    expect(md).toContain(formatNumber(result.depletionWidthApprox_nm));
    expect(md).toContain(`+${formatNumber(result.electronsPerParticle)}`);
    expect(md).toContain('](band-diagram.svg)');
    expect(md).not.toContain('<script>');
    expect(md).toContain('from memory — verify');
  });

  it('refuses an existing non-empty folder unless force', async () => {
    const dir = join(work, 'report');
    const attempt = writeContactReport(dir, result, { title: 'again' });
    await expect(attempt).rejects.toBeInstanceOf(InputError);
    await expect(writeContactReport(dir, result, { title: 'again' })).rejects.toThrow('--report: folder exists; use --force to overwrite');
    const out = await writeContactReport(dir, result, { title: 'again', force: true });
    expect(await readFile(out.htmlPath, 'utf8')).toContain('<title>again</title>');
    // an existing empty folder is fine
    const empty = join(work, 'empty');
    await mkdir(empty);
    await expect(writeContactReport(empty, fixture, { title: 'ok' })).resolves.toBeTruthy();
    // a file in the way is refused even with force
    const file = join(work, 'file.txt');
    await writeFile(file, 'x');
    await expect(writeContactReport(file, fixture, { title: 'x', force: true })).rejects.toBeInstanceOf(InputError);
  });

  it('lists the hydrogen cautions once when hydrogen was used', async () => {
    const r = depletionFixture();
    r.pretreatment = { ...r.pretreatment, mode: 'equilibrium', hydrogenToWater: 100 };
    r.cautions = contactCautions(true);
    const out = await writeContactReport(join(work, 'hydrogen'), r, { title: 'h' });
    const html = await readFile(out.htmlPath, 'utf8');
    expect(html.split(escapeHtml(HYDROGEN_CAUTIONS[0]!)).length - 1).toBe(1);
    expect(html.split(escapeHtml(SCREENING_CAUTION)).length - 1).toBe(1);
  });

  it('shows uncertainty and a slow exchange given as a log', async () => {
    const r = depletionFixture();
    r.exchange = { ...r.exchange!, exchangeCurrentDensity_A_per_cm2: 0, exchangeCurrentLog10_A_per_cm2: -412.3, equilibrationTime_s: null, equilibrationTimeLog10_s: 402.5, slow: true };
    r.uncertainty = {
      samples: 200,
      sampledInputs: ['workFunction_eV'],
      seed: 7,
      failed: 1,
      directionProbability: { 'support-to-metal': 0.9, 'metal-to-support': 0.08, none: 0.02 },
      barrierHeight_eV: { p05: 0.8, p50: 1.1, p95: 1.4 },
      bandBending_eV: { p05: 0.6, p50: 0.95, p95: 1.2 },
      electronsPerParticle: { p05: 0.2, p50: 0.4, p95: 0.6 },
    };
    const out = await writeContactReport(join(work, 'unc'), r, { title: 'u' });
    const html = await readFile(out.htmlPath, 'utf8');
    expect(html).toContain('0.8 / 1.1 / 1.4 eV');
    expect(html).toContain('10^-412 A/cm^2');
    expect(html).toContain('10^403 s — slow: more than an hour');
    expect(formatContactSummary(r, { color: false })).toContain('10^403 s (slow: more than an hour)');
  });
});

describe('screen and study reports', () => {
  it('writes a sorted screen table with heat maps, escaping cells', async () => {
    const rows: Row[] = [
      { metal: 'Pt', support: 'ZnO', barrierHeight_eV: 1.2 },
      { metal: 'Au', support: 'ZnO', barrierHeight_eV: 0.9 },
      { metal: '<b>x</b>', support: 'ZnO', barrierHeight_eV: null },
      { metal: 'Ni', support: 'ZnO', barrierHeight_eV: 0.4 },
    ];
    const spec = heatmapSpec(rows, { metricField: 'barrierHeight_eV', title: 'Barrier', metals: ['Pt', 'Au', 'Ni'], supports: ['ZnO'] });
    const out = await writeScreenReport(join(work, 'screen'), rows, [{ name: 'heatmap-barrier', title: 'Barrier map', spec }], { title: 'Screen' });
    expect(out.figures.map((f) => f.split(/[\\/]/).pop())).toEqual(['heatmap-barrier.svg', 'heatmap-barrier.vl.json']);
    const html = await readFile(out.htmlPath, 'utf8');
    expect(html).toContain('&lt;b&gt;x&lt;/b&gt;');
    const table = html.slice(html.indexOf('id="table"'));
    const order = ['>Ni<', '>Au<', '>Pt<'].map((s) => table.indexOf(s));
    expect(order[0]).toBeGreaterThan(0);
    expect(order[0]).toBeLessThan(order[1]!);
    expect(order[1]).toBeLessThan(order[2]!);
    expect(html).toContain('sorted by barrierHeight_eV, ascending');
    const md = await readFile(out.mdPath, 'utf8');
    expect(md).toContain('| Ni | ZnO | 0.4 |');
    await expect(writeScreenReport(join(work, 'screen'), rows, [], { title: 'Screen' })).rejects.toBeInstanceOf(InputError);
  });

  it('writes a study report in input order', async () => {
    const rows: Row[] = [1e16, 1e17, 1e18].map((nd, i) => ({ donors_cm3: nd, depletionWidth_nm: 500 / (i + 1) }));
    const plot = linePlotSpec(rows, { x: 'donors_cm3', y: 'depletionWidth_nm', xLog: true, title: 'Width vs donors' });
    const out = await writeStudyReport(join(work, 'study'), rows, [{ name: 'width', spec: plot }], { title: 'Study', description: 'donor sweep' });
    const md = await readFile(out.mdPath, 'utf8');
    expect(md).toContain('| 1e16 | 500 |');
    expect(md).toContain('3 rows in input order.');
    await expect(
      writeStudyReport(join(work, 'study2'), rows, [{ name: 'a/b', spec: plot }], { title: 'bad' }),
    ).rejects.toBeInstanceOf(InputError);
  });

  it('sortRows is stable and puts missing values last', () => {
    const rows: Row[] = [{ v: 2, k: 'a' }, { v: null, k: 'b' }, { v: 1, k: 'c' }, { v: 2, k: 'd' }];
    expect(sortRows(rows, 'v').map((r) => r.k)).toEqual(['c', 'a', 'd', 'b']);
    expect(sortRows(rows, 'v', true).map((r) => r.k)).toEqual(['a', 'd', 'c', 'b']);
  });
});

// ---------------------------------------------------------------- terminal summary and escaping

describe('terminal summary', () => {
  it('is an aligned table with direction in words and warnings', () => {
    const text = formatContactSummary(fixture, { color: false });
    expect(text).toContain('Pt | TiO2-test at 573 K');
    expect(text).toMatch(/barrier height \(electrons, E_C\(0\) - E_F\)\s+1\.1 eV/);
    expect(text).toContain('electrons move from the support into the metal');
    expect(text).toContain('[synthetic]');
    expect(text).not.toContain('\u001b[');
    const lines = text.split('\n').filter((l) => l.startsWith('  band bending  ') || l.startsWith('  Debye length'));
    expect(lines.length).toBe(2);
    // the nanoscale rows (issue 11): interface states and what photoemission sees
    expect(text).toMatch(/band bending seen by photoemission\s+[+-]?\d/);
    expect(lines[0]!.search(/\S+\s*$/) > 0).toBe(true);
    const valueColumn = (l: string) => l.slice(2).search(/ {2}\S/);
    expect(valueColumn(lines[0]!)).toBe(valueColumn(lines[1]!));
  });

  it('uses colour only when asked / on a TTY without NO_COLOR, and strips control characters', () => {
    expect(formatContactSummary(fixture, { color: true })).toContain('\u001b[1m');
    expect(shouldUseColor({ isTTY: true }, {})).toBe(true);
    expect(shouldUseColor({ isTTY: true }, { NO_COLOR: '1' })).toBe(false);
    expect(shouldUseColor({ isTTY: false }, {})).toBe(false);
    const nasty = depletionFixture({ metal: 'Pt\u001b[31mRED' });
    expect(formatContactSummary(nasty, { color: false })).not.toContain('\u001b');
  });
});

describe('escaping and number formatting', () => {
  it('escapes HTML, Markdown cells and control characters', () => {
    expect(escapeHtml('<a href="x">&\'</a>')).toBe('&lt;a href=&quot;x&quot;&gt;&amp;&#39;&lt;/a&gt;');
    expect(escapeMarkdownCell('a|b\n<c>')).toBe('a\\|b &lt;c&gt;');
    expect(stripControl('a\u0007b\tc')).toBe('ab c');
  });

  it('formats numbers compactly', () => {
    expect(formatNumber(0.95123)).toBe('0.951');
    expect(formatNumber(1e18)).toBe('1e18');
    expect(formatNumber(-2.5e-6)).toBe('-2.5e-6');
    expect(formatNumber(12345)).toBe('12300');
    expect(formatNumber(null)).toBe('n/a');
    expect(formatNumber(0)).toBe('0');
  });
});
