// The precomputed Fermi–Dirac table (src/bulk/fermiDiracTable.ts, loaded instead of being built at import) must be
// what the quadrature in src/bulk/fermiDirac.ts gives, and right at eta = 0, where the complete Fermi–Dirac
// integral is the Dirichlet eta function: F_j(0) = (1 - 2^-j) zeta(j + 1) (DLMF 25.12.E16 with 25.2.3 / 25.12.E14;
// zeta(3/2) = 2.6123753486854883, zeta(1/2) = -1.4603545088095868, zeta(-1/2) = -0.20788622497735457, from memory
// of DLMF 25.6 and OEIS A078434 / A059750 / A211113, verify).
import { describe, expect, it } from 'vitest';
import {
  STORED_TABLE_MATCHES_GRID,
  computeFermiDiracTable,
  fermiDiracHalf,
  fermiDiracMinusHalf,
  fermiDiracMinusThreeHalves,
} from '../src/bulk/fermiDirac.js';
import { FERMI_DIRAC_TABLE } from '../src/bulk/fermiDiracTable.js';

describe('precomputed Fermi–Dirac table', () => {
  it('fits the grid and equals a fresh quadrature entry by entry (regenerate it if not: header of fermiDirac.ts)', () => {
    expect(STORED_TABLE_MATCHES_GRID).toBe(true);
    const fresh = computeFermiDiracTable();
    const pairs = [
      [FERMI_DIRAC_TABLE.half, fresh.half],
      [FERMI_DIRAC_TABLE.minusHalf, fresh.minusHalf],
      [FERMI_DIRAC_TABLE.minus3Half, fresh.minus3Half],
      [FERMI_DIRAC_TABLE.minus5Half, fresh.minus5Half],
    ] as const;
    for (const [stored, computed] of pairs) {
      expect(stored.length).toBe(computed.length);
      let worst = 0;
      for (let i = 0; i < stored.length; i++) worst = Math.max(worst, Math.abs(stored[i]! / computed[i]! - 1));
      expect(worst).toBeLessThan(1e-14);
    }
  });

  it('F_1/2, F_-1/2, F_-3/2 at eta = 0 (a table node) equal (1 - 2^-j) zeta(j + 1)', () => {
    expect(fermiDiracHalf(0)).toBeCloseTo((1 - 2 ** -0.5) * 2.6123753486854883, 10);
    expect(fermiDiracMinusHalf(0)).toBeCloseTo((1 - 2 ** 0.5) * -1.4603545088095868, 10);
    expect(fermiDiracMinusThreeHalves(0)).toBeCloseTo((1 - 2 ** 1.5) * -0.20788622497735457, 10);
  });
});
