// Property-based tests over the valid input space (fast-check): every case converges or raises a typed error,
// never NaN, and the solution obeys Gauss's law and the expected monotonic trends.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { solveContact, type ContactOptions } from '../src/contact.js';
import { ConvergenceError, InputError } from '../src/errors.js';
import type { MaterialsLibrary } from '../src/materials/types.js';
import type { ContactResult } from '../src/types.js';

const EMPTY: MaterialsLibrary = { metals: new Map(), supports: new Map(), references: new Map() };

const contactArbitrary = fc.record({
  workFunction: fc.double({ min: 2, max: 8, noNaN: true }),
  electronAffinity: fc.double({ min: 0.5, max: 6, noNaN: true }),
  bandGap: fc.double({ min: 0.5, max: 10, noNaN: true }),
  permittivity: fc.double({ min: 2, max: 300, noNaN: true }),
  electronMass: fc.double({ min: 0.05, max: 10, noNaN: true }),
  holeMass: fc.double({ min: 0.05, max: 10, noNaN: true }),
  donorsLog10: fc.double({ min: 10, max: 22, noNaN: true }),
  donorLevelFraction: fc.option(fc.double({ min: 0, max: 0.5, noNaN: true }), { nil: undefined }),
  temperature: fc.double({ min: 50, max: 1500, noNaN: true }),
  geometry: fc.constantFrom('planar', 'hemisphere', 'array', 'disc', 'disc-array'),
  particleDiameter: fc.double({ min: 0.5, max: 50, noNaN: true }),
  statistics: fc.constantFrom('fermi-dirac', 'boltzmann'),
});

type Sample = typeof contactArbitrary extends fc.Arbitrary<infer T> ? T : never;

function optionsOf(s: Sample): ContactOptions {
  return {
    workFunction: s.workFunction,
    electronAffinity: s.electronAffinity,
    bandGap: s.bandGap,
    permittivity: s.permittivity,
    electronMass: s.electronMass,
    holeMass: s.holeMass,
    donors: 10 ** s.donorsLog10,
    ...(s.donorLevelFraction !== undefined ? { donorLevel: s.donorLevelFraction * s.bandGap } : {}),
    temperature: s.temperature,
    geometry: s.geometry as ContactOptions['geometry'],
    particleDiameter: s.particleDiameter,
    // keep particles apart: the spacing must exceed the diameter
    ...(s.geometry === 'array' || s.geometry === 'disc-array' ? { particleDensity: Math.min(1e12, 0.5 / (s.particleDiameter * 1e-7) ** 2) } : {}),
    statistics: s.statistics as ContactOptions['statistics'],
    materials: EMPTY,
  };
}

function allFinite(value: unknown, path = 'result'): string[] {
  if (typeof value === 'number') return Number.isNaN(value) ? [path] : [];
  if (Array.isArray(value)) return value.flatMap((v, i) => (typeof v === 'number' && Number.isNaN(v) ? [`${path}[${i}]`] : []));
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => allFinite(v, `${path}.${k}`));
  return [];
}

function trySolve(options: ContactOptions): ContactResult | null {
  try {
    return solveContact(options);
  } catch (error) {
    // the only acceptable failures are typed ones
    expect(error instanceof InputError || error instanceof ConvergenceError, String(error)).toBe(true);
    return null;
  }
}

describe('property: valid inputs never give NaN and obey Gauss', () => {
  it('converges or raises a typed error; the result has no NaN and is neutral', () => {
    fc.assert(
      fc.property(contactArbitrary, (sample) => {
        const r = trySolve(optionsOf(sample));
        if (r === null) return;
        expect(allFinite(r)).toEqual([]);
        expect(Number.isFinite(r.electronsPerParticle)).toBe(true);
        // the metal carries exactly the opposite charge: the support charge, integrated from the profile by the
        // trapezoid rule, matches the reported space charge (independent of the solver's own sum, mesh accuracy)
        const x = r.profile.x_nm.map((v) => v * 1e-9);
        const rho = r.profile.chargeDensity_C_per_m3;
        // where the solver could not reach its mesh tolerance it must say so (warning 'mesh-accuracy')
        if (r.geometry === 'planar' && !r.warnings.some((w) => w.code === 'mesh-accuracy')) {
          let integral = 0;
          for (let i = 0; i + 1 < x.length; i++) integral += 0.5 * (rho[i]! + rho[i + 1]!) * (x[i + 1]! - x[i]!);
          const scale = Math.abs(r.spaceCharge_C_per_m2) + 1e-30;
          expect(Math.abs(integral - r.spaceCharge_C_per_m2) / scale).toBeLessThan(0.01);
        }
        // direction is consistent with the sign of the charge
        if (r.direction === 'support-to-metal') expect(r.spaceCharge_C_per_m2).toBeGreaterThan(0);
        if (r.direction === 'metal-to-support') expect(r.spaceCharge_C_per_m2).toBeLessThan(0);
      }),
      { numRuns: 150, seed: 20261202 },
    );
  });

  it('more donors give a thinner layer (depletion)', () => {
    fc.assert(
      fc.property(fc.double({ min: 14, max: 20, noNaN: true }), fc.double({ min: 0.4, max: 2, noNaN: true }), (log10Donors, excess) => {
        const base: ContactOptions = {
          electronAffinity: 4,
          bandGap: 3.2,
          permittivity: 10,
          electronMass: 0.3,
          holeMass: 1,
          workFunction: 4 + excess,
          materials: EMPTY,
        };
        const thin = solveContact({ ...base, donors: 10 ** (log10Donors + 1) });
        const thick = solveContact({ ...base, donors: 10 ** log10Donors });
        expect(thin.chargeDepth90_nm).toBeLessThan(thick.chargeDepth90_nm);
      }),
      { numRuns: 40, seed: 7 },
    );
  });

  it('a larger work-function difference gives more charge', () => {
    fc.assert(
      fc.property(fc.double({ min: -1.5, max: 1.5, noNaN: true }), fc.double({ min: 0.05, max: 0.5, noNaN: true }), (offset, extra) => {
        const base: ContactOptions = {
          electronAffinity: 4,
          bandGap: 3.2,
          permittivity: 10,
          electronMass: 0.3,
          holeMass: 1,
          donors: 1e18,
          geometry: 'hemisphere',
          materials: EMPTY,
        };
        const small = solveContact({ ...base, workFunction: 4.1 + offset });
        const larger = solveContact({ ...base, workFunction: 4.1 + offset + Math.sign(small.bandBending_eV || 1) * extra });
        expect(Math.abs(larger.electronsPerParticle)).toBeGreaterThan(Math.abs(small.electronsPerParticle));
      }),
      { numRuns: 40, seed: 11 },
    );
  });
});
