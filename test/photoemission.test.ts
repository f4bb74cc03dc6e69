import { describe, expect, it } from 'vitest';
import {
  kineticEnergy_eV,
  monolayerThickness_m,
  observedBandBending_eV,
  seahDenchImfpCompound_m,
} from '../src/derived/photoemission.js';
import { InputError } from '../src/errors.js';

function mesh(n: number, length: number, grade = 1): number[] {
  return Array.from({ length: n }, (_, i) => length * (i / (n - 1)) ** grade);
}

describe('observedBandBending_eV (exponentially weighted depth average)', () => {
  it('is exact for a piecewise-linear profile: u0 (1 - x/W) on [0, W], 0 beyond', () => {
    // Closed form: (1/L) int_0^W u0 (1 - x/W) e^{-x/L} dx = u0 [1 - (L/W)(1 - e^{-W/L})] (elementary integral).
    const u0 = 0.8;
    const W = 3e-9;
    const L = 1.5e-9;
    const expected = u0 * (1 - (L / W) * (1 - Math.exp(-W / L)));
    expect(observedBandBending_eV([0, W], [u0, 0], L, 0)).toBeCloseTo(expected, 14);
  });

  it('matches the closed form u0 D / (D + L) for an exponential profile u0 exp(-x/D) on a graded mesh', () => {
    // (1/L) int_0^inf u0 e^{-x/D} e^{-x/L} dx = u0 D / (D + L) (elementary integral).
    const u0 = 1.2;
    const D = 5e-9;
    const L = 2e-9;
    const x = mesh(400, 200e-9, 2);
    const u = x.map((xi) => u0 * Math.exp(-xi / D));
    // piecewise-linear interpolation of the exponential: second-order error, ~2e-5 on this mesh
    expect(observedBandBending_eV(x, u, L, 0)).toBeCloseTo((u0 * D) / (D + L), 4);
  });

  it('uses L = lambda cos(theta): 60 degrees halves the sampling depth', () => {
    const x = mesh(400, 200e-9, 2);
    const u = x.map((xi) => Math.exp(-xi / 4e-9));
    expect(observedBandBending_eV(x, u, 4e-9, 60)).toBeCloseTo(observedBandBending_eV(x, u, 2e-9, 0), 12);
  });

  it('sees the full value of a uniform shift and 0 for a profile beyond the information depth', () => {
    expect(observedBandBending_eV(mesh(50, 1e-6), new Array(50).fill(0.3), 2e-9, 0)).toBeCloseTo(0.3, 12);
    const x = [500e-9, 600e-9];
    expect(observedBandBending_eV(x, [0, 0.5], 2e-9, 0)).toBeLessThan(1e-100);
  });

  it('rejects bad input', () => {
    expect(() => observedBandBending_eV([0, 1e-9], [0], 1e-9, 0)).toThrow(RangeError);
    expect(() => observedBandBending_eV([1e-9, 0], [0, 0], 1e-9, 0)).toThrow(RangeError);
    expect(() => observedBandBending_eV([0, 1e-9], [0, 0], 0, 0)).toThrow(InputError);
    expect(() => observedBandBending_eV([0, 1e-9], [0, 0], 1e-9, 90)).toThrow(InputError);
  });
});

describe('Seah-Dench inelastic mean free path (Surf. Interface Anal. 1, 2 (1979); formula from memory, verify)', () => {
  it('monolayer thickness of ZnO: a^3 = M/(rho n N_A), worked by hand', () => {
    // M = 81.38 g/mol, rho = 5.61 g/cm^3 (handbook values from memory), n = 2:
    // 81.38 / (5.61 * 2 * 6.02214e23) = 1.2044e-23 cm^3 -> a = 2.292e-8 cm = 0.2292 nm.
    expect(monolayerThickness_m(81.38, 5.61, 2) * 1e9).toBeCloseTo(0.2292, 3);
  });

  it('lambda at E = 465 eV (Zn 2p with Al K-alpha) in ZnO, worked by hand', () => {
    // lambda_m = 2170/465^2 + 0.72 sqrt(0.2292 * 465) = 0.01004 + 0.72 * 10.324 = 7.443 monolayers -> 1.706 nm.
    const a = 0.2292e-9;
    expect(seahDenchImfpCompound_m(465, a) * 1e9).toBeCloseTo(1.706, 2);
  });

  it('has its minimum at low energy and grows as sqrt(E) at high energy', () => {
    const a = 0.25e-9;
    const l1000 = seahDenchImfpCompound_m(1000, a);
    const l4000 = seahDenchImfpCompound_m(4000, a);
    expect(l4000 / l1000).toBeCloseTo(2, 2);
    expect(seahDenchImfpCompound_m(5, a)).toBeGreaterThan(seahDenchImfpCompound_m(60, a));
  });

  it('kinetic energy = h nu - E_B, and rejects photons below the level', () => {
    expect(kineticEnergy_eV(1486.6, 1022)).toBeCloseTo(464.6, 10);
    expect(() => kineticEnergy_eV(100, 1022)).toThrow(InputError);
  });
});
