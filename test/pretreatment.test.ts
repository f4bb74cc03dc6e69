import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  DILUTE_LIMIT_SITE_FRACTION,
  HYDROGEN_CAUTIONS,
  WATER_GAS_GIBBS_FORMATION_KJ_MOL,
  frozenInDonorDensity,
  oxygenPressureFromHydrogenWater,
  vacancyDonorDensity,
  vacancyDonorDensityFromHydrogen,
  waterGibbsFormation_kJ_mol,
} from '../src/inputs/pretreatment.js';
import { InputError } from '../src/errors.js';
import { K_BOLTZMANN_EV_PER_K } from '../src/constants.js';

// Illustrative reducible-oxide parameters (invented for the test, not a real material).
const oxide = { enthalpy_eV: 4, entropy_kB: 10, oxygenSites_cm3: 5e22, temperature_K: 1000 };

function log10Donors(log10pO2: number, base = oxide): number {
  return vacancyDonorDensity({ ...base, oxygenPressure_bar: 10 ** log10pO2 }).log10DonorDensity_cm3;
}

describe('oxygen-vacancy mass action', () => {
  it('donor density falls with slope -1/6 in log pO2 (numeric derivative)', () => {
    // Brouwer regime n = 2[V_O] of O_O = V_O^2+ + 2e' + 1/2 O2 gives n ~ pO2^(-1/6): common practice, no source.
    const h = 1e-3;
    for (const x of [-25, -20, -15]) {
      const slope = (log10Donors(x + h) - log10Donors(x - h)) / (2 * h);
      expect(Math.abs(slope - -1 / 6)).toBeLessThan(1e-9);
    }
  });

  it('matches the closed form n = 2 N_O (K/4)^(1/3) pO2^(-1/6)', () => {
    // Closed form from K = [V_O] n^2 pO2^(1/2), n = 2[V_O]: common practice, no source.
    const out = vacancyDonorDensity({ ...oxide, oxygenPressure_bar: 1e-20 });
    const K = Math.exp(10 - 4 / (K_BOLTZMANN_EV_PER_K * 1000));
    const fraction = (K / 4) ** (1 / 3) * 1e-20 ** (-1 / 6);
    expect(out.massActionConstant / K).toBeCloseTo(1, 12);
    expect(out.vacancySiteFraction / fraction).toBeCloseTo(1, 12);
    expect(out.donorDensity_cm3 / (2 * 5e22 * fraction)).toBeCloseTo(1, 12);
    expect(out.donorDensity_cm3).toBeCloseTo(2 * out.vacancyDensity_cm3, 0);
    // and the mass-action law itself closes: [V_O] n^2 pO2^(1/2) = K with n = 2[V_O] in site fractions
    const v = out.vacancySiteFraction;
    expect((v * (2 * v) ** 2 * Math.sqrt(1e-20)) / K).toBeCloseTo(1, 10);
  });

  it('has activation energy H/3 in 1/T (numeric derivative)', () => {
    // d ln n / d(1/T) = -H/(3k) from the cube root: common practice, no source.
    const ln = (t: number) => Math.log(vacancyDonorDensity({ ...oxide, temperature_K: t, oxygenPressure_bar: 1e-20 }).donorDensity_cm3);
    const t = 900;
    const dt = 0.01;
    const slope = (ln(t + dt) - ln(t - dt)) / (1 / (t + dt) - 1 / (t - dt));
    expect(slope / (-4 / (3 * K_BOLTZMANN_EV_PER_K))).toBeCloseTo(1, 6);
  });

  it('keeps slope -1/6 everywhere in the dilute range (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 2, max: 8, noNaN: true }), fc.double({ min: 500, max: 1500, noNaN: true }), (h, t) => {
        const base = { enthalpy_eV: h, entropy_kB: 5, oxygenSites_cm3: 4e22, temperature_K: t };
        const a = vacancyDonorDensity({ ...base, oxygenPressure_bar: 1 }, { beyondDiluteLimit: 'flag' });
        const b = vacancyDonorDensity({ ...base, oxygenPressure_bar: 1e-6 }, { beyondDiluteLimit: 'flag' });
        return Math.abs((b.log10DonorDensity_cm3 - a.log10DonorDensity_cm3) / -6 - -1 / 6) < 1e-9;
      }),
    );
  });

  it('refuses results beyond the dilute limit unless asked to flag them', () => {
    const harsh = { enthalpy_eV: 1, entropy_kB: 10, oxygenSites_cm3: 5e22, temperature_K: 1500, oxygenPressure_bar: 1e-30 };
    expect(() => vacancyDonorDensity(harsh)).toThrow(InputError);
    expect(() => vacancyDonorDensity(harsh)).toThrow(/dilute limit/);
    const flagged = vacancyDonorDensity(harsh, { beyondDiluteLimit: 'flag' });
    expect(flagged.beyondDiluteLimit).toBe(true);
    expect(flagged.vacancySiteFraction).toBeGreaterThan(DILUTE_LIMIT_SITE_FRACTION);
    expect(vacancyDonorDensity({ ...oxide, oxygenPressure_bar: 1e-20 }).beyondDiluteLimit).toBe(false);
  });

  it('rejects out-of-range inputs naming the field', () => {
    expect(() => vacancyDonorDensity({ ...oxide, oxygenPressure_bar: 0 })).toThrow(/oxygenPressure_bar/);
    expect(() => vacancyDonorDensity({ ...oxide, temperature_K: 5000, oxygenPressure_bar: 1 })).toThrow(/temperature_K/);
    expect(() => vacancyDonorDensity({ ...oxide, oxygenSites_cm3: 1e10, oxygenPressure_bar: 1 })).toThrow(/oxygenSites_cm3/);
  });

  it('frozen-in mode returns the density set at the reduction temperature', () => {
    const reduction = { ...oxide, temperature_K: 1100, oxygenPressure_bar: 1e-18 };
    const frozen = frozenInDonorDensity({ reduction, reactionTemperature_K: 500 });
    expect(frozen.donorDensity_cm3).toBe(vacancyDonorDensity(reduction).donorDensity_cm3);
    expect(frozen.mode).toBe('frozen-in');
    expect(frozen.reductionTemperature_K).toBe(1100);
    expect(frozen.reactionTemperature_K).toBe(500);
    expect(() => frozenInDonorDensity({ reduction, reactionTemperature_K: -3 })).toThrow(/reactionTemperature_K/);
  });
});

describe('water formation Gibbs energy (NIST-JANAF)', () => {
  it('is -228.6 kJ/mol at 298.15 K and about -192.6 kJ/mol at 1000 K', () => {
    // M. W. Chase, NIST-JANAF Thermochemical Tables, 4th ed., J. Phys. Chem. Ref. Data Monograph 9 (1998),
    // table H-064, H2O(g): delta-f G = -228.582 kJ/mol at 298.15 K and -192.590 kJ/mol at 1000 K
    // (from memory of NIST-JANAF, matched against public transcriptions of H-064 found by search; verify).
    expect(waterGibbsFormation_kJ_mol(298.15)).toBeCloseTo(-228.6, 1);
    expect(waterGibbsFormation_kJ_mol(298.15)).toBeCloseTo(-228.582, 6);
    expect(waterGibbsFormation_kJ_mol(1000)).toBeCloseTo(-192.6, 1);
    expect(waterGibbsFormation_kJ_mol(1500)).toBeCloseTo(-164.376, 6);
  });

  it('interpolates linearly between table rows and the table is monotonic', () => {
    expect(waterGibbsFormation_kJ_mol(950)).toBeCloseTo((-198.083 + -192.59) / 2, 9);
    for (let i = 1; i < WATER_GAS_GIBBS_FORMATION_KJ_MOL.length; i++) {
      expect(WATER_GAS_GIBBS_FORMATION_KJ_MOL[i]![0]).toBeGreaterThan(WATER_GAS_GIBBS_FORMATION_KJ_MOL[i - 1]![0]);
      expect(WATER_GAS_GIBBS_FORMATION_KJ_MOL[i]![1]).toBeGreaterThan(WATER_GAS_GIBBS_FORMATION_KJ_MOL[i - 1]![1]);
    }
  });

  it('throws outside 298–1500 K', () => {
    expect(() => waterGibbsFormation_kJ_mol(250)).toThrow(InputError);
    expect(() => waterGibbsFormation_kJ_mol(1600)).toThrow(/temperature_K.*298 to 1500 K/);
    expect(() => waterGibbsFormation_kJ_mol(Number.NaN)).toThrow(/temperature_K/);
    expect(Number.isFinite(waterGibbsFormation_kJ_mol(298))).toBe(true);
  });
});

describe('pO2 of an H2/H2O mixture', () => {
  it('is about 8e-21 bar for H2/H2O = 1 at 1000 K', () => {
    // Arithmetic check exp(2 * -192590 / (8.314 * 1000)) = 7.6e-21 bar (common practice, no source); R = 8.314 here
    // versus CODATA R = 8.314462618 in the code changes the result by 0.3 %.
    const out = oxygenPressureFromHydrogenWater({ temperature_K: 1000, hydrogenToWater: 1 });
    const byHand = Math.exp((2 * -192590) / (8.314 * 1000));
    expect(Math.abs(out.oxygenPressure_bar / byHand - 1)).toBeLessThan(0.005);
    // Known order of magnitude ~1e-20 bar for an equimolar H2/H2O mixture at 1000 K (common practice, no source).
    expect(out.log10OxygenPressure_bar).toBeGreaterThan(-21);
    expect(out.log10OxygenPressure_bar).toBeLessThan(-19.5);
    expect(out.waterGibbsFormation_kJ_mol).toBeCloseTo(-192.59, 6);
  });

  it('scales as (pH2O/pH2)^2', () => {
    // pO2 ~ (pH2O/pH2)^2 from H2 + 1/2 O2 = H2O: common practice, no source.
    const a = oxygenPressureFromHydrogenWater({ temperature_K: 800, hydrogenToWater: 1 });
    const b = oxygenPressureFromHydrogenWater({ temperature_K: 800, hydrogenToWater: 10 });
    expect(a.log10OxygenPressure_bar - b.log10OxygenPressure_bar).toBeCloseTo(2, 10);
  });

  it('feeds the vacancy model and rejects bad ratios', () => {
    const direct = vacancyDonorDensity({
      ...oxide,
      oxygenPressure_bar: oxygenPressureFromHydrogenWater({ temperature_K: 1000, hydrogenToWater: 100 }).oxygenPressure_bar,
    });
    const viaHydrogen = vacancyDonorDensityFromHydrogen({ ...oxide, hydrogenToWater: 100 });
    expect(viaHydrogen.donorDensity_cm3).toBe(direct.donorDensity_cm3);
    expect(viaHydrogen.hydrogenToWater).toBe(100);
    expect(() => oxygenPressureFromHydrogenWater({ temperature_K: 1000, hydrogenToWater: 0 })).toThrow(/hydrogenToWater/);
  });
});

describe('hydrogen cautions', () => {
  it('cover flammability, purging, explosive mixtures, pyrophoric catalysts and local practice', () => {
    const text = HYDROGEN_CAUTIONS.join(' ');
    // Flammability range ~4–75 vol% in air (from memory of common safety data, verify against the supplier SDS).
    expect(text).toMatch(/4–75 vol%/);
    expect(text).toMatch(/[Pp]urge/);
    expect(text).toMatch(/explosive/);
    expect(text).toMatch(/pyrophoric/);
    expect(text).toMatch(/passivate/);
    expect(text).toMatch(/local codes/);
    expect(text).toMatch(/not process-safety guidance/);
  });
});
