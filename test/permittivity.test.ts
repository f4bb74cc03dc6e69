import { describe, expect, it } from 'vitest';
import { devonshirePermittivity, devonshirePolarisation, imageForceValidity } from '../src/electrostatics/permittivity.js';
import { CODATA2018 } from './helpers.js';

describe('Devonshire field-dependent permittivity (Devonshire, Phil. Mag. 40, 1040 (1949); from memory, verify)', () => {
  const eps0r = 300;
  const beta = 8e9; // recalled SrTiO3 value, from memory, verify (only the formula's limits are checked here)
  it('the polarisation solves E = alpha P + beta P^3 (exact cubic)', () => {
    const alpha = 1 / (CODATA2018.eps0 * eps0r);
    for (const e of [0, 1e3, 1e6, 1e8, 1e10]) {
      const p = devonshirePolarisation(e, alpha, beta);
      expect(Math.abs(alpha * p + beta * p ** 3 - e)).toBeLessThanOrEqual(1e-9 * Math.max(e, 1));
    }
  });
  it('eps_r(0) at zero field; eps_r = dP/dE / eps0 (numerical derivative of the exact root)', () => {
    expect(devonshirePermittivity(0, eps0r, beta)).toBeCloseTo(eps0r, 6);
    const alpha = 1 / (CODATA2018.eps0 * eps0r);
    for (const e of [1e6, 3e7, 1e8, 1e9]) {
      const h = e * 1e-5;
      const dpde = (devonshirePolarisation(e + h, alpha, beta) - devonshirePolarisation(e - h, alpha, beta)) / (2 * h);
      expect(devonshirePermittivity(e, eps0r, beta) / (dpde / CODATA2018.eps0)).toBeCloseTo(1, 6);
    }
  });
  it('falls as E^(-2/3) at large fields (P ~ (E/beta)^(1/3), limit of the cubic)', () => {
    const a = devonshirePermittivity(1e10, eps0r, beta);
    const b = devonshirePermittivity(8e10, eps0r, beta);
    expect(Math.abs(a / b / 4 - 1)).toBeLessThan(0.02);
  });
});

describe('image-force validity (Sze & Ng, 3rd ed., ch. 3: x_m = sqrt(q / (16 pi eps E)))', () => {
  it('x_m from the closed form; 1e9 V/m with eps_opt 5 is inside 1 nm and flagged', () => {
    const check = imageForceValidity(1e9, 5);
    const expected = Math.sqrt(CODATA2018.q / (16 * Math.PI * 5 * CODATA2018.eps0 * 1e9));
    expect(check.maximumDistance_m / expected).toBeCloseTo(1, 9);
    expect(check.valid).toBe(false);
    expect(imageForceValidity(1e6, 5).valid).toBe(true);
    expect(imageForceValidity(0, 5).maximumDistance_m).toBe(1);
  });
});
