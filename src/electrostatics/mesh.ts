// Length scales, initial guess and mesh for the Poisson solve, all from the planar first integral
//   (du/dx)^2 = 2 beta G(u),  G(u) = integral_0^u N(xi_bulk - u') du'   (Sze & Ng ch. 4, surface space charge),
// which is exact for a planar semi-infinite support and a good guide for every other geometry.
import type { ChargeModel } from '../bulk/equilibrium.js';
import type { CrossSection } from './geometry.js';

export interface PlanarFirstIntegral {
  /** |u_s| */
  magnitude: number;
  sign: number;
  /** generalised Debye length in the bulk, 1/sqrt(beta |dN/dxi|), m (Infinity when nothing screens) */
  bulkScreening_m: number;
  /** net charge density / q left in the bulk by the neutrality tolerance, per m^3: the solver subtracts it */
  bulkResidue_m3: number;
  /** the same at the interface, m */
  surfaceScreening_m: number;
  /** width of a parabola with the same interface slope: 2 |u_s| / |u'(0)|, m */
  effectiveWidth_m: number;
  /** planar interface slope |u'(0)| = sqrt(2 beta G(u_s)), 1/m */
  interfaceSlope_per_m: number;
  /** depth at which |u| has fallen to fraction * |u_s| (planar), m; Infinity if never */
  depthAtFraction(fraction: number): number;
  /** planar profile u(x) for an initial guess */
  guess(x_m: number): number;
  /** local length of the planar profile |u / u'| at depth x, m: the scale the mesh must resolve there */
  localLength(x_m: number): number;
}

const GEOMETRIC_POINTS = 24;
const UNIFORM_POINTS = 24;
const SMALLEST_FRACTION = 1e-14;
/** |u| below which the first-integral table uses the bulk's linear response instead of the charge model, kT */
const LINEAR_TABLE_U = 1e-4;

export function planarFirstIntegral(model: ChargeModel, xiBulk: number, uSurface: number, beta: number): PlanarFirstIntegral {
  const sign = uSurface >= 0 ? 1 : -1;
  const magnitude = Math.abs(uSurface);
  const charge = new Float64Array(2);
  model.netCharge(xiBulk, charge);
  // the bulk is neutral only to the bisection tolerance (~1e-13 of N_D); subtracting that residue keeps
  // N(u) - N(0) of the sign of u, so G(u) > 0 even for bendings of a few meV
  const bulkResidue = charge[0]!;
  const bulkSlope = Math.abs(charge[1]!);
  const bulkScreening_m = bulkSlope > 0 ? 1 / Math.sqrt(beta * bulkSlope) : Infinity;
  model.netCharge(xiBulk - uSurface, charge);
  const surfaceSlope = Math.abs(charge[1]!);
  const surfaceScreening_m = surfaceSlope > 0 ? 1 / Math.sqrt(beta * surfaceSlope) : Infinity;

  // fractions s of |u_s|: geometric near 0 (where x(u) diverges logarithmically), uniform above
  const fractions: number[] = [0];
  // at least one point per kT of bending, so sharp ionisation fronts (a few kT wide in u) are seen (two per kT cost
  // a tenth of a typical solve and changed neither the iterations nor the meshes of 9000 random cases by 1%)
  const uniformPoints = Math.min(4000, Math.max(UNIFORM_POINTS, Math.ceil(magnitude)));
  const firstUniform = 1 / uniformPoints;
  const growth = Math.pow(firstUniform / SMALLEST_FRACTION, 1 / GEOMETRIC_POINTS);
  for (let k = 0, f = SMALLEST_FRACTION; k < GEOMETRIC_POINTS; k++, f *= growth) fractions.push(f);
  for (let k = 1; k <= uniformPoints; k++) fractions.push(k / uniformPoints);
  const m = fractions.length;
  // plain arrays: a typed array larger than a few doubles costs an off-heap allocation and a finaliser for the
  // garbage collector, which made up half the time of this function
  const take = (): number[] => new Array<number>(m).fill(0);
  const uValues = take();
  const gValues = take();
  const debyeLengths = take();
  const chargeValues = take();
  const chargeSlopes = take();
  let previousCharge = 0;
  // dN/du in the bulk: below LINEAR_TABLE_U the table takes N = s1 u (relative error <= |u|, as |N''| <= 2|N'| for
  // carriers and defect occupancies) instead of calling the charge model (a fifth of the calls of this function)
  const bulkChargeSlope = bulkSlope;
  const bulkDebye = bulkScreening_m;
  for (let k = 0; k < m; k++) {
    const u = sign * magnitude * fractions[k]!;
    uValues[k] = u;
    if (Math.abs(u) <= LINEAR_TABLE_U && bulkChargeSlope > 0) {
      const linear = bulkChargeSlope * u;
      debyeLengths[k] = bulkDebye;
      chargeValues[k] = linear;
      chargeSlopes[k] = bulkChargeSlope;
      if (k > 0) gValues[k] = gValues[k - 1]! + 0.5 * (previousCharge + linear) * (u - uValues[k - 1]!);
      previousCharge = linear;
      continue;
    }
    model.netCharge(xiBulk - u, charge);
    // N has the sign of u (dN/du > 0, N(0) = 0), so G grows monotonically; trapezoid in u
    const currentCharge = k === 0 ? 0 : charge[0]! - bulkResidue;
    // local (generalised) Debye length: resolves carrier layers and defect-ionisation fronts
    debyeLengths[k] = charge[1]! !== 0 ? 1 / Math.sqrt(beta * Math.abs(charge[1]!)) : Infinity;
    chargeValues[k] = currentCharge;
    chargeSlopes[k] = Math.abs(charge[1]!);
    if (k > 0) gValues[k] = gValues[k - 1]! + 0.5 * (previousCharge + currentCharge) * (u - uValues[k - 1]!);
    previousCharge = currentCharge;
  }
  const slopes = take();
  for (let k = 0; k < m; k++) slopes[k] = Math.sqrt(2 * beta * Math.max(gValues[k]!, 0));
  // x(u_k) = integral from u_k to u_s of du / |u'|, accumulated downward from the surface
  const depth = take();
  depth[m - 1] = 0;
  for (let k = m - 2; k >= 1; k--) {
    const du = Math.abs(uValues[k + 1]! - uValues[k]!);
    const a = slopes[k + 1]!;
    const b = slopes[k]!;
    depth[k] = a > 0 && b > 0 ? depth[k + 1]! + 0.5 * du * (1 / a + 1 / b) : Infinity;
  }
  depth[0] = Infinity;
  const interfaceSlope_per_m = slopes[m - 1]!;
  const effectiveWidth_m = interfaceSlope_per_m > 0 ? (2 * magnitude) / interfaceSlope_per_m : Infinity;

  const depthAtFraction = (fraction: number): number => {
    if (magnitude === 0) return 0;
    for (let k = m - 1; k >= 1; k--) {
      if (fractions[k]! <= fraction) return depth[k]!;
    }
    return depth[1]!;
  };

  /**
   * Linear interpolation of a tabulated quantity at depth x. depth[k] falls as k rises (depth[m-1] = 0 at the
   * surface, depth[0] = infinity), so the bracket depth[k] >= x >= depth[k+1] is found by bisection.
   * Returns undefined beyond the deepest finite table point.
   */
  const atDepth = (values: number[], x: number): number | undefined => {
    if (!(depth[1]! >= x)) return undefined;
    let deep = 1; // depth[deep] >= x
    let shallow = m - 1; // depth[shallow] <= x
    while (shallow - deep > 1) {
      const mid = (deep + shallow) >> 1;
      if (depth[mid]! >= x) deep = mid;
      else shallow = mid;
    }
    const dk = depth[deep]!;
    const d1 = depth[shallow]!;
    const t = dk === d1 ? 0 : (x - d1) / (dk - d1);
    return values[shallow]! + t * (values[deep]! - values[shallow]!);
  };

  const guess = (x: number): number => {
    if (magnitude === 0) return 0;
    if (x <= 0) return uSurface;
    const inside = atDepth(uValues, x);
    if (inside !== undefined) return inside;
    // beyond the table: linear screening tail
    const decay = Number.isFinite(bulkScreening_m) ? Math.exp(-(x - depth[1]!) / bulkScreening_m) : 1;
    return uValues[1]! * decay;
  };

  const lengths = take();
  for (let k = 1; k < m; k++) {
    const profileLength = slopes[k]! > 0 ? Math.abs(uValues[k]!) / slopes[k]! : Infinity;
    // length over which the charge density itself changes, |N / (dN/du u')|: an ionisation front of a deep donor at
    // low temperature is a few kT wide in u, far thinner in x than the local Debye length (issue 10, item 5)
    const chargeLength = chargeSlopes[k]! > 0 && slopes[k]! > 0 ? Math.abs(chargeValues[k]!) / (chargeSlopes[k]! * slopes[k]!) : Infinity;
    lengths[k] = Math.min(profileLength, debyeLengths[k]!, chargeLength);
  }
  const localLength = (x: number): number => {
    if (magnitude === 0) return bulkScreening_m;
    return atDepth(lengths, Math.max(x, 0)) ?? (Number.isFinite(bulkScreening_m) ? bulkScreening_m : lengths[1]!);
  };

  return {
    localLength,
    bulkResidue_m3: bulkResidue,
    magnitude,
    sign,
    bulkScreening_m,
    surfaceScreening_m,
    effectiveWidth_m,
    interfaceSlope_per_m,
    depthAtFraction,
    guess,
  };
}

export interface MeshOptions {
  firstIntegral: PlanarFirstIntegral;
  thickness_m?: number | undefined;
  maxDomain_m: number;
  refinement: number;
  geometry: CrossSection;
  /**
   * 'zero-field' (default): the domain must reach where the layer has decayed (|u| < 1e-13 |u_s|).
   * 'screened': the solver closes the far end with the screened-tail condition (see poisson.ts), so the domain
   * only has to reach the linear tail, |u| <= min(1e-5 |u_s|, 1e-3).
   */
  farBoundary?: 'zero-field' | 'screened';
}

export interface Mesh {
  x: Float64Array;
  /** the semi-infinite domain was capped at maxDomain */
  truncated: boolean;
}

/** cell size near the interface and in the layer, as fractions of the governing length */
const SURFACE_CELL_FRACTION = 0.1;
const CORE_CELL_FRACTION = 0.3;
/** growth of the cell size with depth near the interface (fraction of depth) */
const GRADING = 0.12;
/** growth of the cell size with distance beyond the layer, where the potential is exponentially small */
const TAIL_GRADING = 0.25;
const MAX_NODES = 20000;

/**
 * Graded mesh from a smooth spacing function h(x) = smoothmin(h_s + g x, h_c + g_t softplus(x - x_layer)),
 * so that bisecting every cell gives the next member of one mesh family (used for Richardson extrapolation).
 */
export function buildMesh(options: MeshOptions): Mesh {
  const { nodes, truncated } = meshNodes(options);
  return { x: Float64Array.from(nodes), truncated };
}

/** The nodes of buildMesh as a plain array (the caller copies them into its own buffer: one allocation less). */
export function meshNodes(options: MeshOptions): { nodes: number[]; truncated: boolean } {
  const fi = options.firstIntegral;
  const bulkFinite = Number.isFinite(fi.bulkScreening_m);
  const coreEnd = fi.depthAtFraction(1e-6);
  const screened = options.farBoundary === 'screened';
  // deep enough that the profile itself holds all but ~1e-5 of the charge (the rest is the tail the far-end
  // condition accounts for), so a report that integrates the profile sees the whole charge
  const tailFraction = Math.min(1e-5, 1e-3 / Math.max(fi.magnitude, 1e-300));
  const decayedEnd = screened
    ? fi.depthAtFraction(Math.max(tailFraction, SMALLEST_FRACTION * 10)) + (bulkFinite ? fi.bulkScreening_m : 0)
    : fi.depthAtFraction(SMALLEST_FRACTION * 10) + (bulkFinite ? 5 * fi.bulkScreening_m : 0);
  let end: number;
  let truncated = false;
  if (options.thickness_m !== undefined) {
    end = options.thickness_m;
  } else if (Number.isFinite(decayedEnd) && decayedEnd > 0 && decayedEnd <= options.maxDomain_m) {
    end = decayedEnd;
  } else {
    end = options.maxDomain_m;
    truncated = true;
  }
  const particleRadius = options.geometry.kind === 'planar' ? Infinity : Math.sqrt((options.geometry.interfaceFluxArea_m2 ?? options.geometry.interfaceArea_m2) / (2 * Math.PI));
  const coreLength = bulkFinite ? fi.bulkScreening_m : fi.effectiveWidth_m;
  let hCore = CORE_CELL_FRACTION * coreLength;
  // the layer's own width bounds the surface cell too: a depletion layer of fully ionised donors in a frozen-out
  // bulk has neither a finite surface nor a short bulk screening length (issue 10, item 5)
  let hSurface = SURFACE_CELL_FRACTION * Math.min(fi.surfaceScreening_m, coreLength, fi.effectiveWidth_m, particleRadius);
  if (!Number.isFinite(hCore) || hCore <= 0) hCore = end / 200;
  if (!Number.isFinite(hSurface) || hSurface <= 0) hSurface = end / 400;
  hCore = Math.min(hCore, end / 20);
  hSurface = Math.min(hSurface, hCore);
  const layerEnd = Number.isFinite(coreEnd) ? Math.min(coreEnd, end) : end;
  hSurface /= options.refinement;
  hCore /= options.refinement;
  let scale = 1;
  for (let attempt = 0; attempt < 30; attempt++) {
    const nodes = generate(end, layerEnd, hSurface * scale, hCore * scale, options.refinement, (x) => scale * CORE_CELL_FRACTION * fi.localLength(x) / options.refinement);
    if (nodes !== null) return { nodes, truncated };
    scale *= 1.5;
  }
  throw new RangeError(`mesh generation failed: more than ${MAX_NODES} nodes even after coarsening 30 times`);
}

function generate(
  end: number,
  layerEnd: number,
  hSurface: number,
  hCore: number,
  refinement: number,
  localCell: (x: number) => number,
): number[] | null {
  const nodes = [0];
  let x = 0;
  const grading = GRADING / refinement;
  const tailGrading = TAIL_GRADING / refinement;
  const softness = Math.max(hCore * 10, 1e-300);
  while (x < end) {
    if (nodes.length > MAX_NODES) return null;
    const near = hSurface + grading * x;
    const beyond = x - layerEnd;
    const softplus = beyond > 0 ? beyond + softness * Math.log1p(Math.exp(-beyond / softness)) : softness * Math.log1p(Math.exp(beyond / softness));
    // the profile's own length scale inside the layer, never finer than the surface cell; free growth in the tail
    // may go below the surface cell (down to 1% of it) to resolve ionisation fronts inside the layer
    const local = Math.max(Math.min(localCell(x), hCore), 0.01 * hSurface);
    const far = local + tailGrading * softplus;
    const h = 1 / Math.sqrt(1 / (near * near) + 1 / (far * far));
    if (x + h >= end || end - (x + h) < 0.3 * h) {
      nodes.push(end);
      break;
    }
    x += h;
    nodes.push(x);
  }
  return nodes;
}

/** Insert the midpoint of every cell: the next member of the mesh family (written to `out` when given). */
export function bisectMesh(x: Float64Array, out: Float64Array = new Float64Array(2 * x.length - 1)): Float64Array {
  for (let i = 0; i < x.length - 1; i++) {
    out[2 * i] = x[i]!;
    out[2 * i + 1] = 0.5 * (x[i]! + x[i + 1]!);
  }
  out[out.length - 1] = x[x.length - 1]!;
  return out;
}
