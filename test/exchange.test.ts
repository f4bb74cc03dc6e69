import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  SLOW_EXCHANGE_THRESHOLD_S,
  equilibrationTime_s,
  richardsonConstant_A_per_m2_K2,
  slowExchange,
  thermionicExchangeCurrent_A_per_m2,
} from '../src/derived/exchange.js';
import {
  exchangeCurrentThroughProfile,
  logFermiIntegral,
  forwardSlopeEnergy_eV,
  planarChargeOfBending,
  relativeCurrent,
  relaxationTime99_s,
  tunnellingEnergy_eV,
} from '../src/derived/exchange.js';
import { InputError } from '../src/errors.js';
import { K_BOLTZMANN_EV_PER_K } from '../src/constants.js';
import { makeChargeModel, solveBulkNeutrality } from '../src/bulk/equilibrium.js';
import { CODATA2018, boltzmannPlanarCharge } from './helpers.js';

const A_PER_CM2_PER_A_PER_M2 = 1e-4;

describe('Richardson constant', () => {
  it('is 120 A cm^-2 K^-2 for the free-electron mass', () => {
    // S. M. Sze and K. K. Ng, Physics of Semiconductor Devices, 3rd ed. (Wiley, 2007), ch. 3: A* = 120 A/(cm^2 K^2)
    // for m* = m0; 4 pi q m0 k^2/h^3 evaluates to 120.17.
    const perCm2 = richardsonConstant_A_per_m2_K2(1) * A_PER_CM2_PER_A_PER_M2;
    expect(perCm2).toBeCloseTo(120.17, 1);
    expect(Math.abs(perCm2 - 120) / 120).toBeLessThan(0.002);
  });

  it('scales linearly with the effective mass', () => {
    // A* proportional to m*: Richardson–Dushman, common practice, no source.
    expect(richardsonConstant_A_per_m2_K2(0.26)).toBeCloseTo(0.26 * richardsonConstant_A_per_m2_K2(1), 6);
  });

  it('rejects a non-positive or absurd mass ratio', () => {
    expect(() => richardsonConstant_A_per_m2_K2(0)).toThrow(InputError);
    expect(() => richardsonConstant_A_per_m2_K2(1e4)).toThrow(/massRatio/);
  });
});

describe('thermionic exchange current', () => {
  it('matches A* T^2 exp(-Phi/kT) for a moderate barrier', () => {
    // Richardson–Dushman evaluated by hand: common practice, no source.
    const out = thermionicExchangeCurrent_A_per_m2({ massRatio: 1, temperature_K: 300, barrier_eV: 0.5 });
    const expected = richardsonConstant_A_per_m2_K2(1) * 300 ** 2 * Math.exp(-0.5 / (K_BOLTZMANN_EV_PER_K * 300));
    expect(out.current_A_per_m2 / expected).toBeCloseTo(1, 12);
    expect(out.log10Current_A_per_m2).toBeCloseTo(Math.log10(expected), 10);
  });

  it('gives 0 and a finite log10 instead of NaN for huge barriers', () => {
    const out = thermionicExchangeCurrent_A_per_m2({ massRatio: 1, temperature_K: 250, barrier_eV: 19 });
    expect(out.current_A_per_m2).toBe(0);
    expect(Number.isFinite(out.log10Current_A_per_m2)).toBe(true);
    // log10 J0 = log10(A* T^2) - Phi/(kT ln 10): arithmetic, common practice, no source.
    expect(out.log10Current_A_per_m2).toBeCloseTo(
      Math.log10(richardsonConstant_A_per_m2_K2(1) * 250 ** 2) - 19 / (K_BOLTZMANN_EV_PER_K * 250 * Math.LN10),
      8,
    );
  });

  it('never returns NaN over the allowed ranges (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 100, noNaN: true }),
        fc.double({ min: 1, max: 5000, noNaN: true }),
        fc.double({ min: 0, max: 20, noNaN: true }),
        (m, t, b) => {
          const out = thermionicExchangeCurrent_A_per_m2({ massRatio: m, temperature_K: t, barrier_eV: b });
          return !Number.isNaN(out.current_A_per_m2) && Number.isFinite(out.log10Current_A_per_m2) && out.current_A_per_m2 >= 0;
        },
      ),
    );
  });

  it('rejects negative barriers and temperatures', () => {
    expect(() => thermionicExchangeCurrent_A_per_m2({ massRatio: 1, temperature_K: 300, barrier_eV: -0.1 })).toThrow(/barrier_eV/);
    expect(() => thermionicExchangeCurrent_A_per_m2({ massRatio: 1, temperature_K: 0, barrier_eV: 0.1 })).toThrow(/temperature_K/);
  });
});

describe('equilibration time', () => {
  it('is |Q| / J0', () => {
    // tau = |Q|/J0, 1e-3 C/m^2 at 1e-3 A/m^2 takes 1 s: arithmetic, common practice, no source.
    const out = equilibrationTime_s({ charge_C_per_m2: -1e-3, exchangeCurrent_A_per_m2: 1e-3 });
    expect(out.seconds).toBeCloseTo(1, 12);
    expect(out.log10Seconds).toBeCloseTo(0, 12);
    expect(out.saturated).toBe(false);
  });

  it('stays finite in log space when J0 underflows', () => {
    const { log10Current_A_per_m2, current_A_per_m2 } = thermionicExchangeCurrent_A_per_m2({
      massRatio: 1,
      temperature_K: 250,
      barrier_eV: 19,
    });
    expect(current_A_per_m2).toBe(0);
    const out = equilibrationTime_s({ charge_C_per_m2: 1e-2, log10ExchangeCurrent_A_per_m2: log10Current_A_per_m2 });
    expect(out.saturated).toBe(true);
    expect(out.seconds).toBe(Number.POSITIVE_INFINITY);
    expect(out.log10Seconds).toBeCloseTo(-2 - log10Current_A_per_m2, 9);
    expect(slowExchange(out)).toBe(true);
  });

  it('flags an underflowed current given without its log', () => {
    const out = equilibrationTime_s({ charge_C_per_m2: 1e-2, exchangeCurrent_A_per_m2: 0 });
    expect(out).toEqual({ seconds: Number.POSITIVE_INFINITY, log10Seconds: Number.POSITIVE_INFINITY, saturated: true });
  });

  it('is zero for zero charge', () => {
    const out = equilibrationTime_s({ charge_C_per_m2: 0, exchangeCurrent_A_per_m2: 0 });
    expect(out.seconds).toBe(0);
    expect(out.saturated).toBe(false);
  });

  it('never returns NaN (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -100, max: 100, noNaN: true }), fc.double({ min: -400, max: 10, noNaN: true }), (q, logJ) => {
        const out = equilibrationTime_s({ charge_C_per_m2: q, log10ExchangeCurrent_A_per_m2: logJ });
        return !Number.isNaN(out.seconds) && !Number.isNaN(out.log10Seconds);
      }),
    );
  });

  it('rejects missing or negative currents', () => {
    expect(() => equilibrationTime_s({ charge_C_per_m2: 1 })).toThrow(InputError);
    expect(() => equilibrationTime_s({ charge_C_per_m2: 1, exchangeCurrent_A_per_m2: -1 })).toThrow(/exchangeCurrent_A_per_m2/);
    expect(() => equilibrationTime_s({ charge_C_per_m2: Number.NaN, exchangeCurrent_A_per_m2: 1 })).toThrow(/charge_C_per_m2/);
  });
});

describe('slow exchange', () => {
  it('is slower than one hour', () => {
    expect(SLOW_EXCHANGE_THRESHOLD_S).toBe(3600);
    expect(slowExchange(3600)).toBe(false);
    expect(slowExchange(3601)).toBe(true);
    expect(slowExchange(Number.POSITIVE_INFINITY)).toBe(true);
    expect(() => slowExchange(Number.NaN)).toThrow(InputError);
  });
});

// ---------------------------------------------------------------------------------------------------------------
// issue 10 item 3: relaxation time and tunnelling

const KT300 = (CODATA2018.k * 300) / CODATA2018.q;

/** forward law written out here independently: J/J0 = exp(V/E0) (1 - exp(-V/kT)) (Padovani & Stratton 1966) */
function lawHere(v: number, kT: number, e0: number): number {
  return Math.exp(v / e0) * (1 - Math.exp(-v / kT));
}

describe('current-voltage law', () => {
  it('is the thermionic J0 (e^{qV/kT} - 1) for E0 = kT and linear J0 qV/kT near zero bias (Sze & Ng ch. 3)', () => {
    for (const v of [-0.2, -0.01, 0.003, 0.05, 0.3]) {
      expect(relativeCurrent(v, KT300, KT300) / Math.expm1(v / KT300)).toBeCloseTo(1, 10);
      expect(relativeCurrent(v, KT300, 2.5 * KT300) / lawHere(v, KT300, 2.5 * KT300)).toBeCloseTo(1, 10);
    }
    expect(relativeCurrent(1e-7, KT300, 3 * KT300) / (1e-7 / KT300)).toBeCloseTo(1, 5);
    expect(Number.isFinite(relativeCurrent(50, KT300, KT300))).toBe(true);
  });

  it('E0 = E00 coth(E00/kT): kT in the thermionic limit, E00 in the field-emission limit (Padovani & Stratton 1966)', () => {
    expect(forwardSlopeEnergy_eV(1e-8, KT300) / KT300).toBeCloseTo(1, 12);
    expect(forwardSlopeEnergy_eV(1, KT300)).toBeCloseTo(1, 12);
    expect(forwardSlopeEnergy_eV(KT300, KT300) / (KT300 / Math.tanh(1))).toBeCloseTo(1, 12);
  });

  it('E00 = 18.6 meV sqrt(N / 1e18 cm^-3 / (m_r eps_r)) (Sze & Ng ch. 3 tunnelling energy; value derived here from CODATA)', () => {
    // (q hbar / 2) sqrt(1e24 m^-3 / (m0 eps0)) evaluated by hand with CODATA 2018 constants: 0.018596 eV
    const hbar = CODATA2018.h / (2 * Math.PI);
    const expected = ((CODATA2018.q * hbar) / 2) * Math.sqrt(1e24 / (CODATA2018.me * CODATA2018.eps0)) / CODATA2018.q;
    expect(expected).toBeCloseTo(0.0186, 3);
    expect(tunnellingEnergy_eV(1e24, 1, 1) / expected).toBeCloseTo(1, 9);
    expect(tunnellingEnergy_eV(4e24, 0.25, 4) / expected).toBeCloseTo(2, 9);
  });
});

describe('exchange current through the computed barrier', () => {
  it('flat band (no barrier to tunnel through): A* T^2 ln(1 + e^(-Phi/kT)) exactly, Richardson–Dushman with Fermi–Dirac occupancy', () => {
    // int_Phi^inf f(E) dE = kT ln(1 + e^(-Phi/kT)) (the integral of the Fermi function; Sze & Ng, Physics of
    // Semiconductor Devices, 3rd ed., ch. 3 thermionic emission, before the Boltzmann approximation), so
    // J0 = A* T^2 ln(1 + e^(-Phi/kT)) -> A* T^2 e^(-Phi/kT) for Phi >> kT. The code's upper limit Phi + 40 kT drops e^-40.
    for (const [phi, T] of [[0.5, 300], [0.05, 300], [-0.02, 300], [1.2, 900], [3, 100]] as const) {
      const x = [0, 10e-9, 20e-9];
      const r = exchangeCurrentThroughProfile({ x_m: x, conductionBandAboveFermi_eV: [phi, phi, phi], massRatio: 0.5, temperature_K: T });
      const kT = K_BOLTZMANN_EV_PER_K * T;
      const lnExact = Math.log(richardsonConstant_A_per_m2_K2(0.5) * T * T) + Math.log(Math.log1p(Math.exp(-phi / kT)) - Math.log1p(Math.exp(-phi / kT - 40)));
      expect(Math.abs(r.log10Current_A_per_m2 - lnExact / Math.LN10), `Phi ${phi} T ${T}`).toBeLessThan(1e-12);
    }
  });

  it('logFermiIntegral: ln int_a^b dz/(1+e^z) against a fine Simpson rule and in the far tail (common practice, no source)', () => {
    const simpsonFermi = (a: number, b: number): number => {
      const n = 20000;
      const h = (b - a) / n;
      let sum = 1 / (1 + Math.exp(a)) + 1 / (1 + Math.exp(b));
      for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) / (1 + Math.exp(a + i * h));
      return Math.log((sum * h) / 3);
    };
    for (const [a, b] of [[-5, 5], [0, 40], [2, 3], [29, 69], [31, 71], [-40, -39]] as const) {
      expect(Math.abs(logFermiIntegral(a, b) - simpsonFermi(a, b)), `${a}..${b}`).toBeLessThan(1e-9);
    }
    // far above E_F the integral is e^-a (1 - e^-(b-a)) to relative e^-a: finite in logs where e^-a underflows
    expect(logFermiIntegral(2000, 2040)).toBeCloseTo(-2000 + Math.log1p(-Math.exp(-40)), 9);
    expect(() => logFermiIntegral(1, 1)).toThrow(InputError);
  });

  it('opaque barrier (flat 50 nm top): Richardson–Dushman A* T^2 exp(-Phi/kT) within 1%', () => {
    const x: number[] = [];
    const e: number[] = [];
    for (let i = 0; i <= 400; i++) {
      const t = (i / 400) * 100e-9;
      x.push(t);
      e.push(t < 50e-9 ? 0.8 : 0.8 - 0.7 * Math.min(1, (t - 50e-9) / 10e-9));
    }
    const r = exchangeCurrentThroughProfile({ x_m: x, conductionBandAboveFermi_eV: e, massRatio: 0.3, temperature_K: 300 });
    const rd = richardsonConstant_A_per_m2_K2(0.3) * 300 * 300 * Math.exp(-0.8 / KT300);
    expect(Math.abs(r.current_A_per_m2 / rd - 1)).toBeLessThan(0.01);
    expect(r.tunnellingEnhancement).toBeLessThan(1.01);
  });

  it('parabolic depletion barrier: within 2x of the Padovani–Stratton thermionic-field saturation current (from memory of Sze & Ng ch. 3, verify)', () => {
    // J_s = A* T sqrt(pi E00 (Phi_B - xi)) / (k cosh(E00/kT)) exp(-xi/kT - (Phi_B - xi)/E0), zero bias; saddle-point
    // approximation, so only agreement within a factor 2 is expected over E00/kT = 0.1-2.3
    const T = 300;
    const m = 0.3;
    const eps = 10;
    const phi = 0.8;
    const xi = 0.1;
    const richardson = richardsonConstant_A_per_m2_K2(m);
    for (const n of [1e23, 1e24, 1e25, 3e25]) {
      const v = phi - xi;
      const w = Math.sqrt((2 * eps * CODATA2018.eps0 * v) / (CODATA2018.q * n));
      const x: number[] = [];
      const e: number[] = [];
      for (let i = 0; i <= 2000; i++) {
        const t = (i / 2000) * 1.2 * w;
        x.push(t);
        e.push(xi + v * Math.max(0, 1 - t / w) ** 2);
      }
      const r = exchangeCurrentThroughProfile({ x_m: x, conductionBandAboveFermi_eV: e, massRatio: m, temperature_K: T });
      const e00 = tunnellingEnergy_eV(n, m, eps);
      const e0 = forwardSlopeEnergy_eV(e00, KT300);
      const js = ((richardson * T * Math.sqrt(Math.PI * e00 * v)) / ((KT300 / T) * Math.cosh(e00 / KT300))) * Math.exp(-xi / KT300 - v / e0);
      expect(r.current_A_per_m2 / js, `N ${n}`).toBeGreaterThan(0.5);
      expect(r.current_A_per_m2 / js, `N ${n}`).toBeLessThan(2);
    }
  });
});

describe('exchange current: the skipped deep energies change nothing', () => {
  // Independent straightforward evaluation of the same integral (every kT/2 piece from the band edge to the top, WKB
  // exponent integrated exactly on each linear cell, 5-point Gauss–Legendre: Abramowitz & Stegun table 25.4), against
  // which the production code, which stops once the rest is provably below 4e-18 of the sum, must agree to rounding.
  const GL = [[-0.906179845938664, 0.2369268850561891], [-0.5384693101056831, 0.4786286704993665], [0, 0.5688888888888889], [0.5384693101056831, 0.4786286704993665], [0.906179845938664, 0.2369268850561891]];
  function fullIntegral(x: number[], ec: number[], m: number, T: number): number {
    const kT = K_BOLTZMANN_EV_PER_K * T;
    const kappa = (2 * Math.sqrt(2 * m * CODATA2018.me * CODATA2018.q)) / (CODATA2018.h / (2 * Math.PI));
    const top = Math.max(...ec);
    const lower = Math.max(ec[ec.length - 1]!, Math.min(top, 0) - 40 * kT);
    const lnT = (E: number): number => {
      let sum = 0;
      for (let i = 0; i + 1 < x.length; i++) {
        const a = ec[i]! - E;
        const b = ec[i + 1]! - E;
        const h = x[i + 1]! - x[i]!;
        if (a <= 0 && b <= 0) continue;
        if (a > 0 && b > 0) sum += Math.abs(b - a) < 1e-12 * (a + b) ? h * Math.sqrt(0.5 * (a + b)) : ((2 * h) / 3) * (b ** 1.5 - a ** 1.5) / (b - a);
        else {
          const pos = Math.max(a, b);
          sum += ((2 * ((h * pos) / (pos - Math.min(a, b)))) / 3) * Math.sqrt(pos);
        }
      }
      return -kappa * sum;
    };
    const pieces = Math.max(8, Math.ceil((top - lower) / (0.5 * kT)));
    const w = (top - lower) / pieces;
    let total = kT * (Math.log1p(Math.exp(-top / kT)) - Math.log1p(Math.exp(-top / kT - 40)));
    for (let p = 0; p < pieces; p++) {
      for (const [node, weight] of GL) {
        const E = lower + (p + 0.5) * w + 0.5 * w * node!;
        total += 0.5 * w * weight! * Math.exp(lnT(E)) / (1 + Math.exp(E / kT));
      }
    }
    return Math.log(richardsonConstant_A_per_m2_K2(m) * T * T * total / kT) / Math.LN10;
  }
  it('parabolic depletion barriers from thermionic to field emission, 200-900 K', () => {
    for (const [n, T] of [[1e23, 300], [1e24, 473], [1e25, 300], [3e25, 200], [1e24, 900]] as const) {
      const v = 0.7;
      const w = Math.sqrt((2 * 10 * CODATA2018.eps0 * v) / (CODATA2018.q * n));
      const x: number[] = [];
      const e: number[] = [];
      for (let i = 0; i <= 300; i++) {
        const t = (i / 300) * 1.2 * w;
        x.push(t);
        e.push(0.1 + v * Math.max(0, 1 - t / w) ** 2);
      }
      const r = exchangeCurrentThroughProfile({ x_m: x, conductionBandAboveFermi_eV: e, massRatio: 0.3, temperature_K: T });
      expect(Math.abs(r.log10Current_A_per_m2 - fullIntegral(x, e, 0.3, T)), `N ${n} T ${T}`).toBeLessThan(1e-11);
    }
  });
});

/** A 3.3 eV gap support with single donors only (m_e 0.3, m_h 1): the fixture of the Q(V) checks below. */
function donorOnlySupport(temperature_K: number, donors_m3: number, statistics: 'boltzmann' | 'fermi-dirac') {
  return {
    temperature_K,
    bandGap_eV: 3.3,
    electronMass_me: 0.3,
    holeMass_me: 1,
    donors: { density_m3: donors_m3, kind: 'single' as const },
    acceptors: { density_m3: 0 },
    statistics,
  };
}

describe('planar charge of the band bending (the Q(V) of the relaxation)', () => {
  it('matches the closed form (Boltzmann, fully ionised donors; Sze & Ng, 3rd ed., ch. 4) to 1e-9, on and off its piece grid, in depletion and accumulation, called in any order', () => {
    const model = makeChargeModel(donorOnlySupport(300, 1e23, 'boltzmann'));
    const bulk = solveBulkNeutrality(model);
    const q = planarChargeOfBending(model, bulk.reducedFermiLevel, 8.5, 300);
    const kT = model.kT_eV;
    // deep first (the running sums grow at once), then small, grid points (u = k/2) and between them, and negative V
    for (const u of [60, 1e-6, 0.25, 0.5, 3, 7.3, 40.5, 2.0000001, -1e-5, -0.5, -2.7, -12]) {
      const exact = boltzmannPlanarCharge(bulk.electronDensity_m3, bulk.holeDensity_m3, u, 8.5, 300);
      expect(Math.abs(q(u * kT) / exact - 1), `u = ${u}`).toBeLessThan(1e-9);
    }
    expect(q(0)).toBe(0);
  });

  it('its capacitance dQ/dV is the derivative of the closed form (Boltzmann; Sze & Ng, 3rd ed., ch. 4) to 1e-8, undefined at flat bands', () => {
    const model = makeChargeModel(donorOnlySupport(300, 1e23, 'boltzmann'));
    const bulk = solveBulkNeutrality(model);
    const q = planarChargeOfBending(model, bulk.reducedFermiLevel, 8.5, 300);
    const kT = model.kT_eV;
    const n0 = bulk.electronDensity_m3;
    const p0 = bulk.holeDensity_m3;
    for (const u of [40.5, 1e-4, 0.25, 3, 7.3, -0.5, -2.7, -12]) {
      // dQ/dV = eps eps0 k T N(u) / (Q kT_eV), N(u) = p0 (e^u - 1) - n0 (e^-u - 1): from Q^2 = 2 eps eps0 k T int N du
      const exact = (8.5 * CODATA2018.eps0 * CODATA2018.k * 300 * (p0 * Math.expm1(u) - n0 * Math.expm1(-u))) / boltzmannPlanarCharge(n0, p0, u, 8.5, 300) / kT;
      expect(Math.abs(q.capacitance(u * kT)! / exact - 1), `u = ${u}`).toBeLessThan(1e-8);
    }
    expect(q.capacitance(0)).toBeUndefined();
  });
});

describe('relaxation time to 99% of the equilibrium charge', () => {
  it('linear limit: a capacitor C discharging through q J0 / kT reaches 99% after tau ln 100, tau = C kT/(q J0)', () => {
    const c = 1e-2; // F/m^2
    const out = relaxationTime99_s({ equilibriumBending_eV: 1e-4 * KT300, chargeOfBending: (v) => c * v, log10ExchangeCurrent_A_per_m2: -3, temperature_K: 300 });
    const tau = (c * KT300) / 1e-3;
    expect(out.log10LinearTau_s).toBeCloseTo(Math.log10(tau), 6);
    expect(out.seconds / (tau * Math.log(100))).toBeCloseTo(1, 3);
  });

  it('agrees with a time-domain RK4 integration of dQ/dt = J(V_eq - V(Q)) within 0.5% (Boltzmann planar depletion, closed-form Q(V))', () => {
    const model = makeChargeModel(donorOnlySupport(300, 1e23, 'boltzmann'));
    const bulk = solveBulkNeutrality(model);
    const eps = 8.5;
    const kT = model.kT_eV;
    const n0 = bulk.electronDensity_m3;
    const p0 = bulk.holeDensity_m3;
    // closed form (Sze & Ng ch. 4) and its derivative dQ/dV = eps kT N(u) / (Q kT_eV), N(u) = p0 (e^u - 1) + n0 (1 - e^-u)
    const charge = (v: number): number => boltzmannPlanarCharge(n0, p0, v / kT, eps, 300);
    const capacitance = (v: number): number => {
      const u = v / kT;
      if (Math.abs(u) < 1e-6) return Math.sqrt((eps * CODATA2018.eps0 * (n0 + p0) * CODATA2018.q) / kT); // eps / L_D per volt
      return (eps * CODATA2018.eps0 * CODATA2018.k * 300 * (p0 * Math.expm1(u) - n0 * Math.expm1(-u))) / charge(v) / kT;
    };
    for (const [veq, e0factor] of [[0.6, 1], [0.6, 2], [-0.15, 1]] as const) {
      const e0 = e0factor * kT;
      const log10J0 = -2;
      const j0 = 10 ** log10J0;
      const target = 0.99 * Math.abs(charge(veq));
      // RK4 in V: dV/dt = J0 law(V_eq - V) / C(V); step so that each moves V by <= 0.2% of the remaining deficit
      const rate = (v: number): number => (j0 * lawHere(veq - v, kT, e0)) / capacitance(v);
      let v = 0;
      let t = 0;
      while (Math.abs(charge(v)) < target) {
        const k1 = rate(v);
        const dt = (0.002 * Math.abs(veq - v)) / Math.abs(k1);
        const k2 = rate(v + 0.5 * dt * k1);
        const k3 = rate(v + 0.5 * dt * k2);
        const k4 = rate(v + dt * k3);
        const next = v + (dt / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
        if (Math.abs(charge(next)) >= target) {
          // last partial step: linear interpolation in Q
          const f = (target - Math.abs(charge(v))) / (Math.abs(charge(next)) - Math.abs(charge(v)));
          t += f * dt;
          break;
        }
        v = next;
        t += dt;
      }
      const out = relaxationTime99_s({
        equilibriumBending_eV: veq,
        chargeOfBending: planarChargeOfBending(model, bulk.reducedFermiLevel, eps, 300),
        log10ExchangeCurrent_A_per_m2: log10J0,
        temperature_K: 300,
        slopeEnergy_eV: e0,
      });
      expect(Math.abs(out.seconds / t - 1), `V_eq ${veq} E0/kT ${e0factor}`).toBeLessThan(0.005);
    }
  });

  it('is far shorter than |Q|/J0 for a depletion contact (issue 10: 28-79x)', () => {
    const model = makeChargeModel(donorOnlySupport(473, 1e24, 'fermi-dirac'));
    const bulk = solveBulkNeutrality(model);
    const q = planarChargeOfBending(model, bulk.reducedFermiLevel, 8.5, 473);
    const out = relaxationTime99_s({ equilibriumBending_eV: 0.8, chargeOfBending: q, log10ExchangeCurrent_A_per_m2: 0, temperature_K: 473 });
    const old = equilibrationTime_s({ charge_C_per_m2: q(0.8), log10ExchangeCurrent_A_per_m2: 0 });
    expect(old.seconds / out.seconds).toBeGreaterThan(5);
    expect(Number.isFinite(out.log10Seconds)).toBe(true);
  });
});
