// Derived quantities of one Poisson solution (src/derived/spaceCharge.ts), SI in and out, against closed forms.
import { describe, expect, it } from 'vitest';
import { PLANAR, hemisphere } from '../src/electrostatics/geometry.js';
import { chargeEquivalentWidth_m, depletionWidthApprox_m, electronsPerParticle, flowDirection, interfaceField_V_per_m } from '../src/derived/spaceCharge.js';
import { CODATA2018 } from './helpers.js';

describe('space-charge quantities', () => {
  // Depletion approximation W = sqrt(2 eps (V_bi - kT/q) / (q N_D)) (Sze & Ng, Physics of Semiconductor Devices,
  // 3rd ed., eq. 3.9), evaluated here with CODATA 2018 constants for eps_r = 10, V_bi = 0.5 V, N_D = 1e17 cm^-3.
  it('depletion width follows Sze & Ng eq. 3.9 and is null without depletion', () => {
    const eps = 10 * CODATA2018.eps0;
    const kT = (CODATA2018.k * 300) / CODATA2018.q;
    const expected = Math.sqrt((2 * eps * (0.5 - kT)) / (CODATA2018.q * 1e23));
    expect(depletionWidthApprox_m(eps, 0.5, kT, 1e23, true)! / expected).toBeCloseTo(1, 6);
    expect(depletionWidthApprox_m(eps, -0.5, kT, 1e23, true)).toBeNull(); // accumulation
    expect(depletionWidthApprox_m(eps, -0.5, kT, 1e23, false)! / expected).toBeCloseTo(1, 6); // p-type, bands down
  });
  it('electrons per particle: planar charge per area times the footprint pi r^2; a hemisphere is one particle', () => {
    const sigma = 1e-3; // C/m^2
    const r = 1e-9;
    const planar = { ...PLANAR, particleFootprint_m2: Math.PI * r * r };
    expect(electronsPerParticle(sigma, planar) / ((sigma * Math.PI * r * r) / CODATA2018.q)).toBeCloseTo(1, 9);
    expect(electronsPerParticle(2e-19, hemisphere(r)) / (2e-19 / CODATA2018.q)).toBeCloseTo(1, 9);
  });
  it('charge-equivalent width of a planar layer is |Q| / (q N); of a hemisphere the shell of that volume', () => {
    expect(chargeEquivalentWidth_m(1.602176634e-3, 1e23, PLANAR)! / 1e-7).toBeCloseTo(1, 9);
    // shell volume (2 pi / 3)((a + W)^3 - a^3) = |Q| / (q N)
    const a = 2e-9;
    const w = chargeEquivalentWidth_m(1e-18, 1e24, hemisphere(a))!;
    expect((((2 * Math.PI) / 3) * ((a + w) ** 3 - a ** 3)) / (1e-18 / (CODATA2018.q * 1e24))).toBeCloseTo(1, 9);
    expect(chargeEquivalentWidth_m(1e-3, 0, PLANAR)).toBeNull();
  });
  it('field E = (kT/q) du/dx and the flow direction from the sign of the support charge', () => {
    expect(interfaceField_V_per_m(0.025, -4e8)).toBeCloseTo(-1e7, 6);
    expect(flowDirection(0.5, 1e-3)).toBe('support-to-metal');
    expect(flowDirection(-0.5, -1e-3)).toBe('metal-to-support');
    expect(flowDirection(0, 0)).toBe('none');
  });
});
