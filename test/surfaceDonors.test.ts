// Donor-like surface states at the metal/support interface (src/interface/interfaceStates.ts, --surface-donors): a
// sheet of donors at one level, ionised with the donor occupancy, added to the interface charge of the Cowley–Sze
// alignment.
//
// Checked against:
// - the ionised-donor occupancy N_D+ = N_D / (1 + g_D exp((E_F - E_D)/kT)), g_D = 2 (Sze & Ng, Physics of
//   Semiconductor Devices, 3rd ed., ch. 1; section from memory, verify);
// - the Cowley–Sze layer relation Phi_B = phi_m - chi + Q_m delta / (eps_i eps0) (Cowley & Sze, J. Appl. Phys. 36,
//   3212 (1965)) solved here independently by bisection for a donor sheet alone;
// - Bardeen's pinning (Phys. Rev. 71, 717 (1947)): a dense sheet of surface states at one level holds E_F near it,
//   with the slope S = 1 / (1 + (delta / (eps_i eps0)) dQ_s/dPhi_B) of the same relation (derived here from it);
// - the neutrality of the contact: metal charge = -(space charge + interface charge).
import { describe, expect, it } from 'vitest';
import {
  DONOR_DEGENERACY,
  solveInterfaceAlignment,
  surfaceDonorCharge_C_per_m2,
  type InterfaceAlignmentInput,
  type SurfaceDonors,
} from '../src/interface/interfaceStates.js';
import { solveContact } from '../src/contact.js';
import { resolveContact } from '../src/inputs/contactInput.js';
import { samplingRanges } from '../src/derived/uncertainty.js';
import { InputError } from '../src/errors.js';
import { CODATA2018, bisectIncreasing } from './helpers.js';
import { bandDiagramSpec } from '../src/output/figures.js';
import { formatContactSummary } from '../src/output/summary.js';

const Q = CODATA2018.q;
const EPS0 = 8.8541878128e-12; // CODATA 2018
const T = 300;
const kT = (CODATA2018.k * T) / Q;

describe('ionised surface donors', () => {
  const donors: SurfaceDonors = { density_per_m2: 1e18, depthBelowConduction_eV: 0.4 };

  it('follow the donor occupancy with g_D = 2 (Sze & Ng)', () => {
    expect(DONOR_DEGENERACY).toBe(2);
    for (const barrier of [0, 0.2, 0.38, 0.4, 0.42, 0.6, 1.5]) {
      const fermiMinusLevel = donors.depthBelowConduction_eV - barrier; // E_F - E_D
      const expected = (Q * donors.density_per_m2) / (1 + 2 * Math.exp(fermiMinusLevel / kT));
      expect(surfaceDonorCharge_C_per_m2(barrier, donors, T)).toBeCloseTo(expected, 12);
    }
    // E_F at the level: one in three ionised
    expect(surfaceDonorCharge_C_per_m2(0.4, donors, T) / (Q * 1e18)).toBeCloseTo(1 / 3, 12);
  });

  it('lie in [0, q N], rise with the barrier, stay finite at extreme arguments, and step at zero temperature', () => {
    let last = -1;
    for (let b = -50; b <= 50; b += 0.25) {
      const q = surfaceDonorCharge_C_per_m2(b, donors, T);
      expect(Number.isFinite(q)).toBe(true);
      expect(q).toBeGreaterThanOrEqual(last);
      expect(q).toBeLessThanOrEqual(Q * 1e18);
      expect(q).toBeGreaterThanOrEqual(0);
      last = q;
    }
    expect(surfaceDonorCharge_C_per_m2(0.5, donors)).toBe(Q * 1e18);
    expect(surfaceDonorCharge_C_per_m2(0.3, donors)).toBe(0);
    expect(surfaceDonorCharge_C_per_m2(0.5, undefined, T)).toBe(0);
    expect(surfaceDonorCharge_C_per_m2(0.5, { density_per_m2: 0, depthBelowConduction_eV: 0.4 }, T)).toBe(0);
  });
});

describe('the alignment with a donor sheet', () => {
  // a donor sheet alone (no gap states, no space charge): Phi_B = phi_m - chi - Q_sd(Phi_B) delta / (eps_i eps0)
  const layer = { layerThickness_m: 0.5e-9, layerPermittivity: 2 };
  const perCharge = layer.layerThickness_m / (layer.layerPermittivity * EPS0);
  const input = (workFunction_eV: number, donors: SurfaceDonors): InterfaceAlignmentInput => ({
    metalWorkFunction_eV: workFunction_eV,
    electronAffinity_eV: 4.2,
    bandGap_eV: 3.2,
    fermiLevelBelowConduction_eV: 0.1,
    stateDensity_per_eV_m2: 0,
    neutralLevelAboveValence_eV: 2.5,
    ...layer,
    surfaceDonors: donors,
    temperature_K: T,
    spaceCharge: () => 0,
    tolerance_eV: 1e-12,
  });
  /** independent bisection of Phi - (phi_m - chi - Q_sd(Phi) delta/(eps_i eps0)) = 0 */
  const bisect = (workFunction_eV: number, donors: SurfaceDonors): number => {
    const f = (phi: number) => phi - (workFunction_eV - 4.2 - (Q * donors.density_per_m2 * perCharge) / (1 + 2 * Math.exp((donors.depthBelowConduction_eV - phi) / kT)));
    return bisectIncreasing(f, -10, 10);
  };

  it('solves the Cowley–Sze layer relation (independent bisection, 1e-9 eV)', () => {
    for (const density of [1e15, 1e16, 1e17, 1e18]) {
      for (const wf of [4.5, 5.0, 5.6]) {
        const donors = { density_per_m2: density, depthBelowConduction_eV: 0.6 };
        const a = solveInterfaceAlignment(input(wf, donors));
        expect(Math.abs(a.electronBarrier_eV - bisect(wf, donors)), `N ${density}, phi_m ${wf}`).toBeLessThan(1e-9);
        // neutrality: metal charge = -(space charge + interface charge), the interface charge being the donors
        expect(a.surfaceDonorCharge_C_per_m2).toBe(a.interfaceStateCharge_C_per_m2);
        expect(a.metalCharge_C_per_m2).toBeCloseTo(-(a.spaceCharge_C_per_m2 + a.interfaceStateCharge_C_per_m2), 15);
      }
    }
  });

  it('a dense sheet pins E_F just above its level (Bardeen), with the slope of the layer relation', () => {
    const donors = { density_per_m2: 1e19, depthBelowConduction_eV: 0.6 };
    const b1 = solveInterfaceAlignment(input(5.2, donors)).electronBarrier_eV;
    const b2 = solveInterfaceAlignment(input(5.3, donors)).electronBarrier_eV;
    // within a few kT of the level: the donors give up only the charge the layer needs
    expect(b1).toBeLessThan(0.6);
    expect(b1).toBeGreaterThan(0.6 - 8 * kT);
    // S = 1 / (1 + (delta/(eps_i eps0)) dQ_sd/dPhi), dQ_sd/dPhi = Q_sd (1 - Q_sd/(qN)) / kT for the donor occupancy
    const mid = solveInterfaceAlignment(input(5.25, donors));
    const qsd = mid.surfaceDonorCharge_C_per_m2;
    const slope = 1 / (1 + (perCharge * qsd * (1 - qsd / (Q * donors.density_per_m2))) / kT);
    expect((b2 - b1) / 0.1).toBeCloseTo(slope, 3);
    expect(slope).toBeLessThan(0.05);
  });

  it('no sheet, or an empty one, gives exactly the result without it', () => {
    const plain = { ...input(5.1, { density_per_m2: 0, depthBelowConduction_eV: 0.6 }), stateDensity_per_eV_m2: 1e17 };
    const none = solveInterfaceAlignment({ ...plain, surfaceDonors: undefined });
    const empty = solveInterfaceAlignment(plain);
    expect(empty.electronBarrier_eV).toBe(none.electronBarrier_eV);
    expect(empty.surfaceDonorCharge_C_per_m2).toBe(0);
  });

  it('refuses a level outside the gap and a density beyond two per surface site, naming the field', () => {
    expect(() => solveInterfaceAlignment(input(5, { density_per_m2: 1e18, depthBelowConduction_eV: 3.5 }))).toThrow(/depthBelowConduction_eV/);
    expect(() => solveInterfaceAlignment(input(5, { density_per_m2: 2e19, depthBelowConduction_eV: 0.5 }))).toThrow(/density_per_m2/);
  });
});

describe('--surface-donors in a contact', () => {
  const base = { metal: 'Au', support: 'TiO2-rutile', geometry: 'disc' as const, particleDiameter: 2, temperature: 300 };

  it('the donors under the footprint and the neutrality of the particle add up', () => {
    const r = solveContact({ ...base, surfaceDonors: 1e14 });
    const it = r.interfaceStates!;
    expect(it.surfaceDonors_per_cm2).toBeCloseTo(1e14, 0);
    // default level: the support's localised (polaron) level from the library
    expect(it.surfaceDonorLevel_eV).toBe(resolveContact(base).support.localisedLevel_eV);
    expect(it.surfaceDonorsIonisedFraction!).toBeGreaterThan(0);
    expect(it.surfaceDonorsIonisedFraction!).toBeLessThanOrEqual(1);
    const footprint_m2 = Math.PI * 1e-9 ** 2;
    expect(it.electronsFromSurfaceDonors).toBeCloseTo((it.surfaceDonorCharge_C_per_m2 * footprint_m2) / Q, 9);
    expect(it.electronsFromSurfaceDonors).toBeLessThanOrEqual(1e18 * footprint_m2 + 1e-9);
    // the particle's electrons are the interface charge and the space charge under it
    expect(r.electronsPerParticle).toBeCloseTo(it.electronsFromInterfaceStates + it.electronsFromSpaceCharge, 6);
    // ionised donors are positive charge at the surface: the support's bands bend down relative to no donors
    const without = solveContact(base);
    expect(r.bandBending_eV).toBeLessThan(without.bandBending_eV);
    expect(without.interfaceStates!.surfaceDonors_per_cm2).toBe(0);
    expect(without.interfaceStates!.surfaceDonorsIonisedFraction).toBeNull();
    // an explicit 0 is the same contact as none
    expect(solveContact({ ...base, surfaceDonors: 0 }).barrierHeight_eV).toBe(without.barrierHeight_eV);
  });

  it('the summary and the band diagram say how many of them are ionised; without them neither mentions them', () => {
    const r = solveContact({ ...base, surfaceDonors: 1e14 });
    const pct = Math.round(100 * r.interfaceStates!.surfaceDonorsIonisedFraction!);
    expect(formatContactSummary(r)).toMatch(/surface donors\s+1e\+?14 cm\^-2 at 0\.425 eV below E_C, \d+(\.\d+)?% ionised/);
    const subtitle = JSON.stringify((bandDiagramSpec(r) as { title?: unknown }).title);
    expect(subtitle).toContain(`surface donors 0.425 eV below E_C: ${pct}% of 1e14 cm⁻² ionised`);
    const plain = solveContact(base);
    expect(formatContactSummary(plain)).not.toContain('surface donors');
    expect(JSON.stringify((bandDiagramSpec(plain) as { title?: unknown }).title)).not.toContain('surface donors');
  });

  it('its level is sampled by --uncertainty within the library range of the localised level', () => {
    const ranges = samplingRanges(resolveContact({ ...base, surfaceDonors: 1e14 }));
    expect(ranges.get('surfaceDonorLevel_eV')).toEqual(ranges.get('localisedLevel_eV'));
    expect(samplingRanges(resolveContact(base)).has('surfaceDonorLevel_eV')).toBe(false);
  });

  it('bad input is a typed error naming the flag', () => {
    const err = (o: Record<string, unknown>) => {
      try {
        solveContact({ ...base, ...o });
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        return (e as Error).message;
      }
      throw new Error('no error');
    };
    expect(err({ surfaceDonors: 1e13, barrierModel: 'ideal' })).toMatch(/--surface-donors/);
    expect(err({ surfaceDonors: -1 })).toMatch(/--surface-donors/);
    expect(err({ surfaceDonors: 1e16 })).toMatch(/--surface-donors/);
    // ZnO has no localised level in the library: the level must be given
    expect(err({ support: 'ZnO', surfaceDonors: 1e13 })).toMatch(/--surface-donor-level/);
    expect(solveContact({ ...base, support: 'ZnO', surfaceDonors: 1e13, surfaceDonorLevel: 0.3 }).interfaceStates!.surfaceDonorLevel_eV).toBe(0.3);
  });
});
