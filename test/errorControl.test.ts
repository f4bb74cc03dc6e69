// Issue 10, item 5: the solver's charge error bound must hold. Thousands of seeded random planar cases over the
// documented input space are compared with the exact planar first integral (Sze & Ng, Physics of Semiconductor
// Devices, 3rd ed., ch. 4): the true relative error may exceed the 1e-5 tolerance only when the solution says so
// (meetsTolerance false) with a bound that covers it.
import { describe, expect, it } from 'vitest';
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../src/bulk/equilibrium.js';
import { PLANAR, hemisphere } from '../src/electrostatics/geometry.js';
import { CHARGE_TOLERANCE, solvePoisson, type PoissonSolution } from '../src/electrostatics/poisson.js';
import { solveContact } from '../src/contact.js';
import { exactPlanarCharge } from './helpers.js';
import { gaussPlanarCharge } from './reference/planarCharge.js';
import { randomCases, type RandomCase } from './reference/randomCases.js';

function solveCase(c: RandomCase, geometry = PLANAR): PoissonSolution {
  return solvePoisson({
    model: makeChargeModel(c.support),
    bulkReducedFermiLevel: c.bulkReducedFermiLevel,
    surfaceBending: c.bandBending_eV / c.kT_eV,
    relativePermittivity: c.relativePermittivity,
    temperature_K: c.support.temperature_K,
    geometry,
  });
}

/** every number in the solution is finite (no NaN, no Infinity) */
function allFinite(s: PoissonSolution): boolean {
  const scalars = [s.totalCharge_C, s.interfaceSlope_per_m, s.domain_m, s.farEndFraction, s.chargeErrorBound];
  return scalars.every(Number.isFinite) && s.u.every(Number.isFinite) && s.netCharge_m3.every(Number.isFinite) && (s.debyeLength_m === null || Number.isFinite(s.debyeLength_m));
}

describe('the Gauss–Legendre reference agrees with the Simpson first integral of test/helpers.ts', () => {
  it('to 1e-8 on 20 random cases (two independent quadratures of the same integral)', () => {
    for (const c of randomCases(11, 20)) {
      const a = gaussPlanarCharge(c.support, c.relativePermittivity, c.bandBending_eV);
      const b = exactPlanarCharge(c.support, c.relativePermittivity, c.bandBending_eV);
      expect(Math.abs(a / b - 1), `case ${c.index}`).toBeLessThan(1e-8);
    }
  });
});

describe('charge error bound holds on 3000 random planar cases (exact first integral, Sze & Ng ch. 4)', () => {
  it('true error <= 1e-5, or the solution carries meetsTolerance = false and a bound >= the true error', () => {
    const cases = randomCases(424242, 3000);
    const violations: string[] = [];
    let flagged = 0;
    let worst = 0;
    for (const c of cases) {
      const solution = solveCase(c);
      expect(allFinite(solution), `case ${c.index}`).toBe(true);
      const exact = gaussPlanarCharge(c.support, c.relativePermittivity, c.bandBending_eV);
      const error = exact === 0 ? Math.abs(solution.totalCharge_C) : Math.abs(solution.totalCharge_C / exact - 1);
      if (!solution.meetsTolerance) flagged++;
      else worst = Math.max(worst, error);
      const allowed = solution.meetsTolerance ? CHARGE_TOLERANCE : Math.max(CHARGE_TOLERANCE, solution.chargeErrorBound);
      if (!(error <= allowed)) violations.push(`case ${c.index}: error ${error.toExponential(2)}, bound ${solution.chargeErrorBound.toExponential(2)}`);
      // the charge's sign follows the band bending's (dN/du > 0)
      if (c.bandBending_eV !== 0 && solution.totalCharge_C !== 0) expect(Math.sign(solution.totalCharge_C), `case ${c.index}`).toBe(Math.sign(c.bandBending_eV));
    }
    expect(violations).toEqual([]);
    expect(worst).toBeLessThanOrEqual(CHARGE_TOLERANCE);
    // the flag is the exception, not the rule
    expect(flagged).toBeLessThan(cases.length / 100);
  });
});

describe('hemisphere and array domains (issue 10 item 5)', () => {
  it('the charge sign follows the band bending on 400 random hemisphere cases, small bendings included', () => {
    const cases = randomCases(977, 400);
    for (const c of cases) {
      const radius = 0.5e-9 * Math.pow(40, (c.index % 7) / 6);
      const solution = solveCase(c, hemisphere(radius));
      expect(allFinite(solution), `case ${c.index}`).toBe(true);
      if (solution.totalCharge_C !== 0) expect(Math.sign(solution.totalCharge_C), `case ${c.index} bb ${c.bandBending_eV}`).toBe(Math.sign(c.bandBending_eV));
    }
  });

  it('regression from the issue: Ni on ZrO2, 1.87441e21 cm^-3, 677.5 K, given barrier -0.54932 eV, hemisphere', () => {
    // the issue reports -1.25e-4 eV band bending but +0.573 electrons (support-to-metal) before the fix
    const result = solveContact({
      metal: 'Ni',
      support: 'ZrO2',
      donors: 1.87441e21,
      temperature: 677.5058149243705,
      barrierModel: 'given',
      barrier: -0.54932,
      geometry: 'hemisphere',
    });
    expect(Math.abs(result.bandBending_eV)).toBeLessThan(1e-2);
    // positive support charge = electrons to the metal; it must have the band bending's sign
    expect(Math.sign(result.spaceCharge_C_per_m2)).toBe(Math.sign(result.bandBending_eV));
    expect(result.solver.domainLength_nm).toBeLessThan(100e3);
  });
});

describe('no Infinity in a solution', () => {
  it('undoped insulator at 50 K: the Debye length is null, every other number finite', () => {
    const support: SupportElectronic = {
      temperature_K: 50,
      bandGap_eV: 7.8,
      electronMass_me: 0.4,
      holeMass_me: 1,
      donors: { density_m3: 0, kind: 'single' },
      acceptors: { density_m3: 0 },
      statistics: 'fermi-dirac',
    };
    const model = makeChargeModel(support);
    const bulk = solveBulkNeutrality(model);
    for (const geometry of [PLANAR, hemisphere(1e-9)]) {
      const solution = solvePoisson({ model, bulkReducedFermiLevel: bulk.reducedFermiLevel, surfaceBending: 1 / model.kT_eV, relativePermittivity: 10, temperature_K: 50, geometry });
      expect(solution.debyeLength_m).toBeNull();
      expect(allFinite(solution)).toBe(true);
    }
  });
});
