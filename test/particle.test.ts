import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  chargingEnergy_eV,
  chargingEnergyOverKT,
  chargingSummary,
  effectivePermittivity,
  isChargeQuantised,
  meanSpacing_m,
  particleAtoms,
  selfCapacitance_F,
  sphereAtoms,
} from '../src/derived/particle.js';
import { InputError } from '../src/errors.js';
import { thermalEnergy_eV } from '../src/constants.js';

// Gold: density 19.3 g/cm^3, molar mass 196.97 g/mol, metallic radius 144 pm
// (from memory of CRC Handbook of Chemistry and Physics, verify).
const gold = { density_g_cm3: 19.3, molarMass_g_mol: 196.97, metallicRadius_pm: 144 };

describe('atom counts', () => {
  it('a 2 nm gold sphere holds about 250 atoms', () => {
    // ~250 atoms in a 2 nm Au sphere: common practice, no source.
    const { atoms } = sphereAtoms({ diameter_m: 2e-9, ...gold });
    expect(atoms).toBeGreaterThan(240);
    expect(atoms).toBeLessThan(260);
    // Arithmetic check: rho (4/3) pi (1 nm)^3 N_A / M = 247.2 (common practice, no source).
    expect(atoms).toBeCloseTo((19.3 * (4 / 3) * Math.PI * 1e-21 * 6.02214076e23) / 196.97, 6);
  });

  it('the hemisphere is exactly half the sphere, with the same dispersion', () => {
    // Geometry: V_hemisphere = V_sphere / 2, curved shell halves too (common practice, no source).
    const sphere = sphereAtoms({ diameter_m: 3e-9, ...gold });
    const hemi = particleAtoms({ diameter_m: 3e-9, ...gold });
    expect(hemi.atoms).toBeCloseTo(sphere.atoms / 2, 10);
    expect(hemi.dispersion).toBeCloseTo(sphere.dispersion, 12);
    expect(hemi.surfaceAtoms).toBeCloseTo(hemi.atoms * hemi.dispersion, 10);
  });

  it('dispersion of a 2 nm sphere follows the one-atomic-diameter shell rule', () => {
    // Shell rule 1 - (1 - 2r/R)^3 with R = 1 nm, r = 0.144 nm: common practice, no source.
    const { dispersion } = sphereAtoms({ diameter_m: 2e-9, ...gold });
    expect(dispersion).toBeCloseTo(1 - (1 - 0.288) ** 3, 12);
  });

  it('large particles approach dispersion 3 t / R', () => {
    // Thin-shell limit of the shell rule: common practice, no source.
    const { dispersion } = particleAtoms({ diameter_m: 200e-9, ...gold });
    const thinShell = (3 * 0.288e-9) / 100e-9;
    expect(Math.abs(dispersion - thinShell) / thinShell).toBeLessThan(0.01);
  });

  it('dispersion is capped at 1 for particles smaller than two atomic diameters', () => {
    const tiny = particleAtoms({ diameter_m: 0.4e-9, ...gold });
    expect(tiny.dispersion).toBe(1);
    expect(tiny.surfaceAtoms).toBe(tiny.atoms);
  });

  it('surface atoms never exceed total atoms and nothing is NaN (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-10, max: 1e-6, noNaN: true }),
        fc.double({ min: 0.1, max: 30, noNaN: true }),
        fc.double({ min: 1, max: 300, noNaN: true }),
        fc.double({ min: 30, max: 300, noNaN: true }),
        (d, rho, m, r) => {
          const out = particleAtoms({ diameter_m: d, density_g_cm3: rho, molarMass_g_mol: m, metallicRadius_pm: r });
          return (
            Number.isFinite(out.atoms) &&
            out.surfaceAtoms <= out.atoms * (1 + 1e-12) &&
            out.dispersion > 0 &&
            out.dispersion <= 1
          );
        },
      ),
    );
  });

  it('rejects out-of-range inputs with InputError naming the field', () => {
    expect(() => particleAtoms({ diameter_m: -1e-9, ...gold })).toThrow(InputError);
    expect(() => particleAtoms({ diameter_m: -1e-9, ...gold })).toThrow(/diameter_m/);
    expect(() => particleAtoms({ diameter_m: 2e-9, ...gold, metallicRadius_pm: Number.NaN })).toThrow(/metallicRadius_pm/);
    expect(() => sphereAtoms({ diameter_m: 2e-9, ...gold, density_g_cm3: 0 })).toThrow(/density_g_cm3.*allowed/);
  });
});

describe('charging energy', () => {
  it('a 1 nm radius sphere in vacuum costs e^2/(8 pi eps0 a) = 0.72 eV', () => {
    // e^2/(4 pi eps0) = 1.439964 eV nm, so E_c = 1.44/2 eV for a = 1 nm: common practice, no source.
    expect(chargingEnergy_eV({ radius_m: 1e-9, permittivityRelative: 1 })).toBeCloseTo(1.439964 / 2, 5);
  });

  it('scales as 1/(eps a) and uses C = 4 pi eps0 eps a', () => {
    const base = chargingEnergy_eV({ radius_m: 1e-9, permittivityRelative: 1 });
    expect(chargingEnergy_eV({ radius_m: 2e-9, permittivityRelative: 5 })).toBeCloseTo(base / 10, 12);
    // Sphere self-capacitance 4 pi eps0 a = 1.11265e-19 F for a = 1 nm: common practice, no source.
    expect(selfCapacitance_F({ radius_m: 1e-9, permittivityRelative: 1 })).toBeCloseTo(1.112650e-19, 24);
  });

  it('effective permittivity is the mean of gas (1) and support', () => {
    // (1 + eps)/2 for a sphere on a planar dielectric boundary: common practice, no source.
    expect(effectivePermittivity(25)).toBe(13);
    expect(() => effectivePermittivity(0.5)).toThrow(/epsSupport/);
  });

  it('flags quantised charging when E_c > kT', () => {
    const kT = thermalEnergy_eV(300);
    const onLowEps = chargingEnergy_eV({ radius_m: 1e-9, permittivityRelative: effectivePermittivity(25) });
    const onHighEps = chargingEnergy_eV({ radius_m: 1e-9, permittivityRelative: effectivePermittivity(86) });
    expect(isChargeQuantised(onLowEps, kT)).toBe(true);
    expect(isChargeQuantised(onHighEps, kT)).toBe(false);
    expect(chargingEnergyOverKT(onLowEps, kT)).toBeCloseTo(onLowEps / kT, 12);
    expect(() => chargingEnergyOverKT(onLowEps, 0)).toThrow(/kT_eV/);
  });

  it('summary reports energy, kT and ratio together', () => {
    const s = chargingSummary({ radius_m: 1e-9, permittivityRelative: 13, temperature_K: 300 });
    expect(s.kT_eV).toBeCloseTo(0.025852, 5);
    expect(s.chargingEnergyOverKT).toBeCloseTo(s.chargingEnergy_eV / s.kT_eV, 12);
    expect(s.chargeQuantised).toBe(true);
    expect(() => chargingSummary({ radius_m: 1e-9, permittivityRelative: 13, temperature_K: -1 })).toThrow(/temperature_K/);
  });
});

describe('mean spacing', () => {
  it('1e12 particles per cm^2 are 10 nm apart on a square lattice', () => {
    // 1/sqrt(N) with N = 1e16 m^-2: common practice, no source.
    expect(meanSpacing_m(1e16)).toBeCloseTo(1e-8, 20);
  });

  it('rejects zero and negative densities', () => {
    expect(() => meanSpacing_m(0)).toThrow(InputError);
    expect(() => meanSpacing_m(-5)).toThrow(/particleDensity_per_m2/);
  });
});
