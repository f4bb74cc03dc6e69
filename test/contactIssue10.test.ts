// Issue 10 wired into the contact pipeline: widths from the fully ionised density, Debye length null instead of
// Infinity, the mesh bound, the relaxation exchange time and the plausibility warnings, end to end.
import { describe, expect, it } from 'vitest';
import { solveContact } from '../src/contact.js';
import { loadLibrary } from '../src/materials/load.js';
import { CODATA2018, tungstenOnSilicon } from './helpers.js';

/** Every number anywhere in a result is finite (issue 10 item 5: no Infinity, no NaN). */
function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(allFinite);
  if (value !== null && typeof value === 'object') return Object.values(value).every(allFinite);
  return true;
}

// Planar contact with 1e18 cm^-3 donors 0.5 eV deep at 300 K (issue 10 item 1's case; the oxide parameters are
// illustrative: chi 4.2 eV, gap 3.2 eV, eps 8.5, m_e 0.3).
const DEEP_DONORS = tungstenOnSilicon({
  workFunction: 5.3,
  electronAffinity: 4.2,
  bandGap: 3.2,
  permittivity: 8.5,
  electronMass: 0.3,
  holeMass: 1,
  donors: '1e18 cm^-3',
  donorLevel: 0.5,
  statistics: 'fermi-dirac',
});

describe('widths from the charge that is there (issue 10 item 1)', () => {
  const r = solveContact(DEEP_DONORS);
  const nd_m3 = 1e24;
  it('W_Q = |Q| / (q N_D) with the donors fully ionised (tens of nm, not the 2.2e5 nm of the bulk ionised density)', () => {
    const expected_nm = (Math.abs(r.spaceCharge_C_per_m2) / (CODATA2018.q * nd_m3)) * 1e9;
    expect(r.chargeEquivalentWidth_nm!).toBeCloseTo(expected_nm, 6);
    expect(r.chargeEquivalentWidth_nm!).toBeGreaterThan(10);
    expect(r.chargeEquivalentWidth_nm!).toBeLessThan(60);
    expect(r.width_nm).toBe(r.chargeEquivalentWidth_nm);
    expect(r.widthDefinition).toBe('charge-equivalent');
  });
  it('the depletion approximation uses the same density (Sze & Ng, 3rd ed., ch. 3) and agrees with W_Q within 25%', () => {
    const eps = 8.5 * CODATA2018.eps0;
    const kT = (CODATA2018.k * 300) / CODATA2018.q;
    const w_nm = Math.sqrt((2 * eps * (r.bandBending_eV - kT)) / (CODATA2018.q * nd_m3)) * 1e9;
    expect(r.depletionWidthApprox_nm!).toBeCloseTo(w_nm, 6);
    expect(r.depletionWidthApproxIsPlanar).toBe(false);
    // deep donors near the layer's edge are only partly ionised, so W_Q is a little below the abrupt-layer width
    expect(r.chargeEquivalentWidth_nm! / w_nm).toBeGreaterThan(0.75);
    expect(r.chargeEquivalentWidth_nm! / w_nm).toBeLessThanOrEqual(1.0);
  });
  it('no false fully-depleted warning for a 200 nm grain whose layer is ~25 nm', () => {
    const grain = solveContact({ ...DEEP_DONORS, supportThickness: '200 nm' });
    expect(grain.chargeDepth90_nm).toBeLessThan(50);
    expect(grain.supportFullyDepleted).toBe(false);
    expect(grain.warnings.map((w) => w.code)).not.toContain('fully-depleted');
  });
  it('a 20 nm grain thinner than the layer is fully depleted', () => {
    const grain = solveContact({ ...DEEP_DONORS, supportThickness: '20 nm' });
    expect(grain.supportFullyDepleted).toBe(true);
  });
  it('hemisphere: the headline width is the 90%-charge depth and the planar depletion width is labelled planar', () => {
    const h = solveContact({ ...DEEP_DONORS, geometry: 'hemisphere', particleDiameter: '4 nm' });
    expect(h.widthDefinition).toBe('charge-depth-90');
    expect(h.width_nm).toBe(h.chargeDepth90_nm);
    expect(h.depletionWidthApproxIsPlanar).toBe(true);
    // the spherical shell holds more volume per depth than the plane: its depletion layer is thinner
    expect(h.sphericalDepletionWidth_nm!).toBeLessThan(h.depletionWidthApprox_nm!);
  });
});

describe('no Infinity in a result (issue 10 item 5)', () => {
  it('undoped 5 eV-gap insulator at 50 K (Debye length ~1e117 m before): debyeLength_nm null with a warning, everything else finite', () => {
    const r = solveContact(tungstenOnSilicon({ bandGap: 5, electronAffinity: 1, workFunction: 4, permittivity: 10, donors: '0 cm^-3', temperature: 50, statistics: 'fermi-dirac' }));
    expect(r.debyeLength_nm).toBeNull();
    expect(r.warnings.map((w) => w.code)).toContain('debye-undefined');
    expect(allFinite(r)).toBe(true);
  });
  it('the textbook W/Si contact has a finite Debye length and meets the mesh tolerance without a warning', () => {
    const r = solveContact(tungstenOnSilicon());
    // L_D = sqrt(eps kT / (q^2 N_D)) for N_D = 1e16 cm^-3 in silicon: 41 nm (Sze & Ng, 3rd ed., ch. 2)
    expect(r.debyeLength_nm!).toBeGreaterThan(38);
    expect(r.debyeLength_nm!).toBeLessThan(44);
    expect(r.solver.meetsTolerance).toBe(true);
    expect(r.warnings.map((w) => w.code)).not.toContain('mesh-accuracy');
    expect(allFinite(r)).toBe(true);
  });
});

describe('exchange by relaxation (issue 10 item 3)', () => {
  it('the 99% relaxation time is shorter than |Q|/J0: the relaxation goes as C kT / (q J0) (issue 10 item 3)', () => {
    const r = solveContact(DEEP_DONORS);
    const e = r.exchange!;
    expect(e.relaxationTime99_s).not.toBeNull();
    expect(e.relaxationTime99_s!).toBeLessThan(e.equilibrationTime_s!);
    expect(e.tunnellingEnhancement!).toBeGreaterThanOrEqual(1);
    expect(e.historyTemperature_K).toBeNull();
  });
});

describe('library contacts (issue 10 items 3 and 6)', () => {
  const library = loadLibrary();
  it('Pt/CeO2 reduced at 773 K: relaxation also computed at the pretreatment temperature, faster there (Arrhenius)', () => {
    const r = solveContact({ metal: 'Pt', support: 'CeO2', reductionTemperature: '773 K', hydrogenToWater: 100, temperature: '473 K', materials: library });
    const e = r.exchange!;
    expect(e.historyTemperature_K).toBe(773);
    expect(e.historyRelaxationTime99_s!).toBeLessThan(e.relaxationTime99_s!);
    // slow only when neither temperature reaches 99% of the charge within an hour
    expect(e.slow).toBe(e.relaxationTime99_s! > 3600 && e.historyRelaxationTime99_s! > 3600);
  });
  it('Pt (1.6 nm, ~70 atoms) hemisphere on SrTiO3 with 1e20 donors at 473 K: implausible charge and high-field permittivity flagged', () => {
    // issue 10 item 6: 179 electrons on a 139-atom Pt particle on SrTiO3 at 473 K passed silently before;
    // > 1 e per surface atom is unphysical (see PLAUSIBLE/MAX_ELECTRONS_PER_SURFACE_ATOM: Lykhach et al., Nat. Mater.
    // 15, 284 (2016) count ~0.1 e per Pt atom); SrTiO3's permittivity falls at 1e9 V/m (Devonshire 1949)
    // the ideal (Schottky–Mott) model reproduces the implausible case; the warnings must flag it
    // with a linear dielectric (permittivity nonlinearity 0, as before issue 11's field-dependent permittivity)
    const r = solveContact({ metal: 'Pt', support: 'SrTiO3', temperature: '473 K', particleDiameter: '1.6 nm', geometry: 'hemisphere', donors: '1e20', barrierModel: 'ideal', permittivityNonlinearity: 0, materials: library });
    const codes = r.warnings.map((w) => w.code);
    // the library's Landau–Devonshire coefficient for SrTiO3: the permittivity at the interface falls well below the
    // static 316 (van der Berg et al., Appl. Phys. Lett. 67, 697 (1995): about tenfold by 10 MV/cm), the layer holds
    // less charge, and the warning that asked for the field-dependent permittivity is gone
    const nonlinear = solveContact({ metal: 'Pt', support: 'SrTiO3', temperature: '473 K', particleDiameter: '1.6 nm', geometry: 'hemisphere', donors: '1e20', barrierModel: 'ideal', materials: library });
    expect(nonlinear.permittivityNonlinearity_V_m5_per_C3).toBeGreaterThan(0);
    expect(nonlinear.interfacePermittivity).toBeLessThan(0.5 * r.interfacePermittivity);
    expect(Math.abs(nonlinear.electronsPerParticle)).toBeLessThan(Math.abs(r.electronsPerParticle));
    expect(nonlinear.warnings.map((w) => w.code)).not.toContain('field-dependent-permittivity');
    // a linear dielectric: the static value at 473 K, the room-temperature 316.3 (Krupka et al., arXiv:1508.07550)
    // carried by the Curie-Weiss law with T0 = 30 K (Neville, Hoeneisen & Mead, J. Appl. Phys. 43, 2124 (1972))
    expect(r.interfacePermittivity).toBeCloseTo((316.3 * (300 - 30)) / (473 - 30), 10);
    // with the library default (interface states, issue 11) the same particle carries a plausible charge
    const defaults = solveContact({ metal: 'Pt', support: 'SrTiO3', temperature: '473 K', particleDiameter: '1.6 nm', geometry: 'hemisphere', donors: '1e20', materials: library });
    expect(defaults.barrierModel).toBe('interface-states');
    expect(Math.abs(defaults.particle.electronsPerSurfaceAtom!)).toBeLessThan(0.3);
    expect(r.particle.electronsPerSurfaceAtom!).toBeGreaterThan(1);
    expect(codes).toContain('unphysical-charge');
    expect(codes).toContain('field-dependent-permittivity');
    expect(codes).toContain('image-force-continuum');
    expect(r.imageForceContinuumValid).toBe(false);
    expect(r.imageForceMaximum_nm).toBeLessThan(1);
  });
});
