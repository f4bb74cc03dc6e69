// Small-polaron levels: vertical (photoemission) versus thermal (Fermi–Dirac) depth, and the library values.
import { describe, expect, it } from 'vitest';
import { configurationCoordinateEnergies, thermalPolaronDepth_eV, verticalPolaronDepth_eV } from '../src/bulk/polaron.js';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../src/bulk/equilibrium.js';
import { loadBuiltinLibrary } from '../src/materials/index.js';
import { CODATA2018 } from './helpers.js';

/**
 * Brute-force minimisation of the two parabolas of the configuration-coordinate model, written here independently
 * of src/bulk/polaron.ts (Holstein, Ann. Phys. 8, 343 (1959); Austin & Mott, Adv. Phys. 18, 41 (1969); model
 * from memory of those papers, the energies below are derived from it by direct search, not by the formulas).
 */
function parabolaSearch(A: number, k0: number, k1: number): { thermal: number; vertical: number } {
  const empty = (q: number): number => 0.5 * k0 * q * q;
  const occupied = (q: number): number => -A * q + 0.5 * k1 * q * q;
  let best = Infinity;
  let qBest = 0;
  const qMax = (4 * A) / Math.min(k0, k1);
  const steps = 400000;
  for (let i = 0; i <= steps; i++) {
    const q = (qMax * i) / steps;
    const e = occupied(q);
    if (e < best) {
      best = e;
      qBest = q;
    }
  }
  // thermal depth: relaxed empty state (minimum of empty(q) = 0 at q = 0) minus relaxed occupied state
  return { thermal: 0 - best, vertical: empty(qBest) - occupied(qBest) };
}

describe('small polaron: configuration-coordinate model', () => {
  it('equal curvatures: the vertical depth is twice the thermal one (Austin & Mott 1969, from memory; derived here by search)', () => {
    for (const [A, k] of [
      [1, 1],
      [0.7, 2.3],
      [3, 0.5],
    ] as const) {
      const search = parabolaSearch(A, k, k);
      const model = configurationCoordinateEnergies(A, k);
      expect(model.thermalDepth_eV).toBeCloseTo(search.thermal, 6);
      expect(model.verticalDepth_eV).toBeCloseTo(search.vertical, 4);
      expect(search.vertical / search.thermal).toBeCloseTo(2, 3);
      expect(model.relaxation_eV).toBeCloseTo(model.thermalDepth_eV, 12);
    }
  });

  it('unequal curvatures: the model follows the parabolas (ratio 1 + k0/k1, not 2)', () => {
    const search = parabolaSearch(1.2, 3, 1.5);
    const model = configurationCoordinateEnergies(1.2, 3, 1.5);
    expect(model.thermalDepth_eV).toBeCloseTo(search.thermal, 6);
    expect(model.verticalDepth_eV).toBeCloseTo(search.vertical, 4);
    expect(model.verticalDepth_eV / model.thermalDepth_eV).toBeCloseTo(1 + 3 / 1.5, 12);
  });
});

describe('small polaron: photoemission binding energy to thermal depth', () => {
  it('E_F at E_C: E_th = E_B / 2; verticalPolaronDepth_eV is the inverse', () => {
    expect(thermalPolaronDepth_eV(0.85)).toBeCloseTo(0.425, 12);
    expect(verticalPolaronDepth_eV(thermalPolaronDepth_eV(1.7))).toBeCloseTo(1.7, 12);
  });

  it('E_F at a partly filled polaron level (E_C - E_F = E_th) is a fixed point: E_th = E_B (exact, by iteration)', () => {
    for (const eb of [0.4, 1.3, 2]) {
      let eth = 0;
      for (let i = 0; i < 80; i++) eth = thermalPolaronDepth_eV(eb, eth);
      expect(eth).toBeCloseTo(eb, 10);
    }
  });

  it('rejects a negative binding energy (InputError)', () => {
    expect(() => thermalPolaronDepth_eV(-0.1)).toThrow();
  });
});

describe('library localised levels are thermal levels converted from the cited photoemission values', () => {
  const lib = loadBuiltinLibrary();
  const level = (name: string): number => lib.supports.get(name)!.localisedLevel_eV!.value;
  it('rutile: Ti 3d gap state 0.85 eV below E_F (Wendt et al., Science 320, 1755 (2008)), E_F at E_C', () => {
    expect(level('TiO2-rutile')).toBeCloseTo(thermalPolaronDepth_eV(0.85, 0), 12);
  });
  it('anatase: 0.73 eV below E_F (Payne et al., Top. Catal. 60 (2017)), E_F at E_C', () => {
    expect(level('TiO2-anatase')).toBeCloseTo(thermalPolaronDepth_eV(0.73, 0), 12);
  });
  it('ceria: Ce 4f at 1.3 eV below E_F (resonant ARPES of Ce2O3(111), cuni-ce2o3), E_F at the partly filled level', () => {
    expect(level('CeO2')).toBeCloseTo(thermalPolaronDepth_eV(1.3, level('CeO2')), 12);
  });
  it('WO3: W5+ states 2.0 eV above the VBM with the 3.28 eV gap (Weinhardt 2008), vertical depth from E_C', () => {
    expect(level('WO3')).toBeCloseTo(thermalPolaronDepth_eV(3.28 - 2.0, 0), 12);
  });
});

describe('reduced rutile: the bulk Fermi level approaches E_C as donors fill the polaron sites (library values)', () => {
  const lib = loadBuiltinLibrary();
  const rutile = lib.supports.get('TiO2-rutile')!;
  const T = 300;
  const kT = (CODATA2018.k * T) / CODATA2018.q;
  const sites = rutile.localisedSiteDensity_cm3!.value * 1e6;
  const depth = rutile.localisedLevel_eV!.value;
  const support = (nd: number): SupportElectronic => ({
    temperature_K: T,
    bandGap_eV: rutile.bandGap_eV.value,
    electronMass_me: rutile.electronMass_me.value,
    holeMass_me: rutile.holeMass_me.value,
    donors: { density_m3: nd, kind: 'single' },
    acceptors: { density_m3: 0 },
    statistics: 'boltzmann',
    localised: { siteDensity_m3: sites, level_eV: depth },
  });
  const bulkOf = (nd: number) => solveBulkNeutrality(makeChargeModel(support(nd)));

  it('E_C - E_F falls monotonically from 1e16 to 1e23 cm^-3 of donors', () => {
    let previous = Infinity;
    for (let log = 22; log <= 29; log += 0.25) {
      const xi = bulkOf(10 ** log).fermiLevelBelowConduction_eV;
      expect(xi).toBeLessThan(previous);
      previous = xi;
    }
  });

  it('dilute limit N_D << N_L: E_C - E_F = E_L + kT ln(g N_L / N_D) (mass action with f << 1; Sze & Ng ch. 1)', () => {
    for (const nd of [1e22, 1e24]) {
      // leading order; the neglected f and n/N_D terms shift it by ~kT f ~ 1e-6 eV
      expect(bulkOf(nd).fermiLevelBelowConduction_eV).toBeCloseTo(depth + kT * Math.log((2 * sites) / nd), 5);
    }
  });

  it('sites filled, N_D = N_L + n: E_C - E_F = kT ln(N_C / n) (Boltzmann, Sze & Ng eq. 1.21), E_F within kT of E_C', () => {
    const nc = 2 * Math.pow((2 * Math.PI * rutile.electronMass_me.value * CODATA2018.me * CODATA2018.k * T) / CODATA2018.h ** 2, 1.5);
    for (const excess of [1e25, 3e25]) {
      const bulk = bulkOf(sites + excess);
      // leading order; the still-empty sites N_L (1 - f) ~ 3e21 m^-3 shift it by ~kT N_L (1 - f) / n ~ 1e-5 eV
      expect(bulk.fermiLevelBelowConduction_eV).toBeCloseTo(kT * Math.log(nc / excess), 4);
      expect(Math.abs(bulk.fermiLevelBelowConduction_eV)).toBeLessThan(2 * kT);
    }
  });
});
