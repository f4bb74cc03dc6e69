// The classic systems of examples/catalyst-systems.md run from library data and give the stated qualitative outcome
// (issue 12 item 7). Each check names the published observation it reflects.
import { describe, expect, it } from 'vitest';
import { solveContact } from '../src/contact.js';

describe('classic metal–support systems from library data (examples/catalyst-systems.md)', () => {
  it('Cu on reduced ZnO: electrons from the reduced oxide to Cu (Frost, Nature 334, 577 (1988), junction effect)', () => {
    const r = solveContact({ metal: 'Cu', support: 'ZnO', reductionTemperature: '573 K', hydrogenToWater: 100, temperature: '523 K' });
    expect(r.pretreatment.hydrogenToWater).toBe(100);
    expect(r.donorDensity_cm3).toBeGreaterThan(0);
    expect(r.direction).toBe('support-to-metal');
    expect(r.cautions.some((c) => /hydrogen/i.test(c))).toBe(true);
  });

  it('Au on MgO: F-centre electrons go to Au (Sterrer et al., PRL 98, 096107 (2007)), negligibly in bulk equilibrium', () => {
    const r = solveContact({ metal: 'Au', support: 'MgO' });
    expect(r.direction).toBe('support-to-metal');
    expect(Math.abs(r.electronsPerParticle)).toBeLessThan(1e-3);
  });

  it('Pt on ceria with defaults: not undoped, Pt loses electrons (Lykhach et al., Nat. Mater. 15, 284 (2016))', () => {
    const r = solveContact({ metal: 'Pt', support: 'CeO2', geometry: 'hemisphere', particleDiameter: '1.6 nm' });
    expect(r.warnings.map((w) => w.code)).not.toContain('undoped-support');
    expect(r.direction).toBe('metal-to-support');
    expect(r.electronsPerParticle).toBeLessThan(0);
  });

  it('Ag on thoria runs from library data (ThO2 added in this round)', () => {
    const r = solveContact({ metal: 'Ag', support: 'ThO2' });
    expect(r.support).toBe('ThO2');
    expect(Math.abs(r.electronsPerParticle)).toBeLessThan(1);
  });
});
