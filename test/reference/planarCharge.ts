// Exact planar space charge from the first integral of Poisson's equation, for the statistical accuracy tests.
// Q = sign(u_s) sqrt(2 eps eps0 kT * int_0^u_s (N(xi_b - v) - N(xi_b)) dv)   (Sze & Ng, Physics of Semiconductor
// Devices, 3rd ed., ch. 4, surface space-charge relation). The integral is done here by composite 5-point
// Gauss–Legendre on pieces at most 0.2 kT wide (nodes and weights: Abramowitz & Stegun, Table 25.4): for charge
// models that vary on the kT scale its error is far below 1e-10, and it is 20-50x cheaper than the 200,000-interval
// Simpson rule of test/helpers.ts (exactPlanarCharge), against which test/errorControl.test.ts checks it.
import { makeChargeModel, solveBulkNeutrality, type SupportElectronic } from '../../src/bulk/equilibrium.js';
import { CODATA2018 } from '../helpers.js';

const NODES = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
const WEIGHTS = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];

export function gaussPlanarCharge(support: SupportElectronic, relativePermittivity: number, bandBending_eV: number): number {
  const model = makeChargeModel(support);
  const bulk = solveBulkNeutrality(model);
  const xi = bulk.reducedFermiLevel;
  const out = new Float64Array(2);
  model.netCharge(xi, out);
  const residue = out[0]!;
  const u = bandBending_eV / model.kT_eV;
  const pieces = Math.max(4, Math.ceil(Math.abs(u) / 0.2));
  const width = u / pieces;
  let sum = 0;
  for (let p = 0; p < pieces; p++) {
    const mid = (p + 0.5) * width;
    for (let k = 0; k < 5; k++) {
      model.netCharge(xi - (mid + 0.5 * width * NODES[k]!), out);
      sum += WEIGHTS[k]! * (out[0]! - residue);
    }
  }
  const integral = 0.5 * width * sum;
  return Math.sign(u) * Math.sqrt(2 * relativePermittivity * CODATA2018.eps0 * CODATA2018.k * support.temperature_K * Math.max(integral, 0));
}
