// The barrier a capacitance-voltage measurement reports (src/derived/capacitanceVoltage.ts): the Mott–Schottky
// analysis of the model's own C(V) over 0-1 V reverse bias.
//
// Checked against:
// - the exact planar first integral for fully ionised donors and Boltzmann electrons, Q^2 = 2 eps q N (V - kT +
//   kT e^(-V/kT)) (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 4 (surface space charge); the barrier
//   from the intercept, Phi_B = V_i + kT/q + (E_C - E_F), ch. 3, section from memory, verify). With C taken as the
//   difference quotient over a step h, 1/C^2 at the step's middle is low by (sqrt(V + h) - sqrt(V))^2 / A^2 for
//   Q = A sqrt(V) (derived here), about h^2 / (4 V) in volts: 2 mV at V = 0.3 V, so the intercept is good to a few mV;
// - the layer relation of Cowley & Sze (J. Appl. Phys. 36, 3212 (1965)) solved at each bias by bisection here, with
//   the interface states in equilibrium with the metal, and the qualitative result that a barrier which falls with
//   reverse bias reads higher by C-V than at zero bias (Rhoderick & Williams, Metal-Semiconductor Contacts, 2nd ed.,
//   ch. 3, from memory, verify).
import { describe, expect, it } from 'vitest';
import { capacitanceBarrier, CV_BIAS_STEP_V, CV_MAX_REVERSE_BIAS_V, CV_MIN_R_SQUARED } from '../src/derived/capacitanceVoltage.js';
import { solveContact, interfaceParametersOf } from '../src/contact.js';
import { resolveContact, supportElectronicOf } from '../src/inputs/contactInput.js';
import { makeChargeModel, solveBulkNeutrality } from '../src/bulk/equilibrium.js';
import { planarChargeOfBending } from '../src/derived/exchange.js';
import { interfaceStateCharge_C_per_m2 } from '../src/interface/interfaceStates.js';
import { CODATA2018, bisectIncreasing } from './helpers.js';

const Q = CODATA2018.q;
const EPS0 = 8.8541878128e-12; // CODATA 2018
const T = 300;
const kT = (CODATA2018.k * T) / Q;

/** exact first integral, fully ionised donors N (m^-3), Boltzmann electrons, no holes; V in volts */
const exactCharge = (eps: number, nd: number) => (v: number): number => Math.sqrt(2 * eps * EPS0 * Q * nd * (v - kT + kT * Math.exp(-v / kT)));

describe('Mott–Schottky barrier of a given Q(V)', () => {
  it('returns the barrier of a depleted contact with shallow donors (exact first integral), to a few mV', () => {
    const xi = 0.12;
    for (const eps of [8.7, 100]) {
      for (const nd of [1e22, 1e24]) {
        for (const bending of [0.3, 0.6, 1.0]) {
          const q = exactCharge(eps, nd);
          const cv = capacitanceBarrier((bias) => q(bending + bias), xi, kT)!;
          expect(cv, `eps ${eps}, N ${nd}, V ${bending}`).not.toBeNull();
          // the step's bias: (sqrt(V + h) - sqrt(V))^2 <= h^2 / (4 V) at the first step, V = bending - kT
          const bound = CV_BIAS_STEP_V ** 2 / (4 * (bending - kT));
          expect(Math.abs(cv.barrier_eV - (bending + xi)), `eps ${eps}, N ${nd}, V ${bending}`).toBeLessThan(bound);
          expect(cv.rSquared).toBeGreaterThan(0.999);
          expect(cv.reverseBias_V).toEqual([0, CV_MAX_REVERSE_BIAS_V]);
        }
      }
    }
  });

  it('gives nothing where the analysis does not apply: no depletion, a constant capacitance, a curved plot', () => {
    expect(capacitanceBarrier(() => 0.01, 0.1, kT)).toBeNull(); // C = 0
    expect(capacitanceBarrier((b) => -0.01 * b, 0.1, kT)).toBeNull(); // C < 0
    expect(capacitanceBarrier((b) => 0.01 * (1 + b), 0.1, kT)).toBeNull(); // constant C: 1/C^2 flat
    // 1/C^2 quadratic in bias with a large curvature: R^2 below the threshold
    const curved = (b: number) => 1e-3 * Math.log(1 + 20 * b) + 1e-6 * b;
    const fitCurved = capacitanceBarrier(curved, 0.1, kT);
    expect(fitCurved).toBeNull();
    expect(CV_MIN_R_SQUARED).toBe(0.99);
    // a nearly flat straight line (the capacitance barely changes with bias) extrapolates to a built-in potential of
    // 30 V: read without a gap, not reported within a 3.4 eV gap
    const farIntercept = (b: number) => 0.01 * Math.sqrt(30 + b);
    expect(capacitanceBarrier(farIntercept, 0.1, kT)!.barrier_eV).toBeGreaterThan(29);
    expect(capacitanceBarrier(farIntercept, 0.1, kT, 3.4)).toBeNull();
  });
});

describe('the capacitance barrier of a contact', () => {
  it('ideal model, shallow donors: the C-V barrier equals the barrier (within the donor ionisation and step effects)', () => {
    const r = solveContact({ metal: 'Pt', support: 'ZnO', barrierModel: 'ideal', donors: 1e17, donorLevel: 0, statistics: 'boltzmann', temperature: T });
    expect(r.capacitanceBarrier).not.toBeNull();
    expect(Math.abs(r.capacitanceBarrier!.barrier_eV - r.electronBarrier_eV)).toBeLessThan(0.01);
  });

  it('interface states behind a layer: an independent solution of the layer relation at each bias gives the same C-V barrier, above the zero-bias one', () => {
    const options = { metal: 'Pt', support: 'ZnO', donors: 2e17, temperature: T };
    const r = solveContact(options);
    expect(r.barrierModel).toBe('interface-states');
    const cv = r.capacitanceBarrier!;
    // C-V barriers exceed the zero-bias barrier when the barrier falls with reverse bias (Rhoderick & Williams)
    expect(cv.barrier_eV).toBeGreaterThan(r.electronBarrier_eV + 0.01);
    // independent: Phi_B(V_R) from Phi_B = phi_m - chi + Q_m delta/(eps_i eps0), Q_m = -(Q_sc(Phi_B - xi + V_R) + Q_it(Phi_B)),
    // by bisection; C = -dQ_m/dV_R over 0.1 V steps; 1/C^2 fitted by ordinary least squares (normal equations)
    const resolved = resolveContact(options);
    const model = makeChargeModel(supportElectronicOf(resolved.support, T, resolved.statistics));
    const bulk = solveBulkNeutrality(model);
    const p = interfaceParametersOf(resolved);
    const planar = planarChargeOfBending(model, bulk.reducedFermiLevel, resolved.support.permittivity, T);
    const s = resolved.support;
    const layer = p.layerThickness_m / (p.layerPermittivity * EPS0);
    const xi = bulk.fermiLevelBelowConduction_eV;
    const metalCharge = (bias: number): number => {
      const qm = (phi: number) => -(planar(phi - xi + bias) + interfaceStateCharge_C_per_m2(phi, s.bandGap_eV, p.neutralLevelAboveValence_eV, p.stateDensity_per_eV_m2, T));
      const f = (phi: number) => phi - (resolved.metal.workFunction_eV - s.electronAffinity_eV + qm(phi) * layer);
      return qm(bisectIncreasing(f, -2, 4));
    };
    const h = CV_BIAS_STEP_V;
    const xs: number[] = [];
    const ys: number[] = [];
    for (let i = 0; i < CV_MAX_REVERSE_BIAS_V / h - 0.5; i++) {
      const c = -(metalCharge((i + 1) * h) - metalCharge(i * h)) / h;
      xs.push((i + 0.5) * h);
      ys.push(1 / (c * c));
    }
    const n = xs.length;
    const mx = xs.reduce((a, b) => a + b, 0) / n;
    const my = ys.reduce((a, b) => a + b, 0) / n;
    const slope = xs.reduce((acc, x, i) => acc + (x - mx) * (ys[i]! - my), 0) / xs.reduce((acc, x) => acc + (x - mx) ** 2, 0);
    const intercept = my - slope * mx;
    expect(cv.barrier_eV).toBeCloseTo(intercept / slope + kT + xi, 6);
  });

  it('a field-dependent permittivity bends the 1/C^2 line; without it the barrier is recovered', () => {
    const base = { metal: 'Au', support: 'SrTiO3', barrierModel: 'ideal' as const, donors: 1e20, temperature: T };
    const linear = solveContact({ ...base, permittivityNonlinearity: 0 });
    const landau = solveContact(base);
    expect(Math.abs(linear.capacitanceBarrier!.barrier_eV - linear.electronBarrier_eV)).toBeLessThan(0.02);
    expect(landau.capacitanceBarrier === null || landau.capacitanceBarrier.rSquared < linear.capacitanceBarrier!.rSquared).toBe(true);
    expect(landau.capacitanceBarrier?.barrier_eV ?? 0).not.toBeCloseTo(landau.electronBarrier_eV, 2);
  });

  it('only planar contacts on n-type supports in depletion have one', () => {
    expect(solveContact({ metal: 'Pt', support: 'ZnO', geometry: 'disc', particleDiameter: 3 }).capacitanceBarrier).toBeNull();
    // a metal below the support's affinity (Schottky–Mott) accumulates electrons: no depletion, no Mott–Schottky analysis
    const accumulation = solveContact({ workFunction: 3.8, support: 'ZnO', barrierModel: 'ideal' });
    expect(accumulation.bandBending_eV).toBeLessThan(0);
    expect(accumulation.capacitanceBarrier).toBeNull();
    // a degenerate support (E_F above E_C at the interface: negative barrier) has no Schottky barrier to read
    const degenerate = solveContact({ metal: 'Au', support: 'SnO2', donors: 1e20 });
    expect(degenerate.electronBarrier_eV).toBeLessThan(0);
    expect(degenerate.capacitanceBarrier).toBeNull();
  });
});
