import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  SLOW_EXCHANGE_THRESHOLD_S,
  equilibrationTime_s,
  richardsonConstant_A_per_m2_K2,
  slowExchange,
  thermionicExchangeCurrent_A_per_m2,
} from '../src/derived/exchange.js';
import { InputError } from '../src/errors.js';
import { K_BOLTZMANN_EV_PER_K } from '../src/constants.js';

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
