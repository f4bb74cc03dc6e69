// Cross-section functions A(x) for the one-dimensional Poisson equation (1/A) d/dx (A eps dpsi/dx) = -rho.
// A geometry supplies the two integrals the finite-volume scheme needs, so new geometries only add one object.

export interface CrossSection {
  readonly kind: string;
  /** cross-section at the interface (x = 0), m^2 (planar: 1 per m^2 of interface) */
  readonly interfaceArea_m2: number;
  /** area used for the flux between nodes at xa < xb (exact for the geometry's harmonic solution where possible) */
  faceArea(xa: number, xb: number): number;
  /** volume of the slab between xa < xb, m^3 */
  volume(xa: number, xb: number): number;
  /** thickness W of a layer next to the interface with the given volume, m (inverse of volume(0, W)) */
  depthHoldingVolume(volume_m3: number): number;
  /** interface area belonging to one particle, m^2, when it differs from interfaceArea_m2 (planar: its footprint) */
  readonly particleFootprint_m2?: number;
  /**
   * flux area of the first face, faceArea(0, 0), when it differs from interfaceArea_m2 (disc: the flux tube of a
   * charged disc is 2 pi a^2 wide at the disc, twice the contact area, because the field of a disc is singular at
   * its rim); Gauss's law at the interface divides the charge by it
   */
  readonly interfaceFluxArea_m2?: number;
}

/** Planar contact, per m^2 of interface: A = 1. */
export const PLANAR: CrossSection = {
  kind: 'planar',
  interfaceArea_m2: 1,
  faceArea: () => 1,
  volume: (xa, xb) => xb - xa,
  depthHoldingVolume: (v) => v,
};

/** Hemispherical support shell around a particle of radius a: A = 2 pi r^2 with r = a + x. */
export function hemisphere(radius_m: number): CrossSection {
  const a = radius_m;
  return {
    kind: 'hemisphere',
    interfaceArea_m2: 2 * Math.PI * a * a,
    // 2 pi r_a r_b makes the discrete flux exact for the spherical harmonic solution psi ~ 1/r
    faceArea: (xa, xb) => 2 * Math.PI * (a + xa) * (a + xb),
    // (2 pi / 3)(r_b^3 - r_a^3) in factored form: no cancellation for thin shells, and no pow()
    volume: (xa, xb) => {
      const ra = a + xa;
      const rb = a + xb;
      return ((2 * Math.PI) / 3) * (rb - ra) * (rb * rb + ra * rb + ra * ra);
    },
    depthHoldingVolume: (v) => Math.cbrt(a ** 3 + (3 * v) / (2 * Math.PI)) - a,
  };
}

/**
 * A particle resting on the support, touching it through its flat circular footprint of radius a (a disc on the
 * surface of the half-space support, the gas above it taking no flux). The coordinate c is the depth on the axis,
 * its level sets the confocal oblate half-spheroids of focal radius a (semi-axes sqrt(a^2 + c^2) and c), which are the
 * equipotentials of a charged disc (Smythe, Static and Dynamic Electricity, 3rd ed., sec. 5.271; potential
 * ~ arctan(a / c) on the level set c). The exact 1D reduction for that coordinate (as for the particle array below):
 *  - volume inside c: half the spheroid, (2 pi / 3)(a^2 + c^2) c;
 *  - flux area A_f(c) = integral |grad c| dS = 2 pi (a^2 + c^2): flux conservation of the disc's potential,
 *    A_f d/dc arctan(a / c) = const, with A_f -> 2 pi c^2 far away (a hemisphere).
 * Exact for a Laplace (unscreened) layer: the charge is then 4 eps a V, the capacitance of a disc on a dielectric
 * half-space (half of the isolated disc's 8 eps a; Jackson, Classical Electrodynamics, 3rd ed., sec. 3.12). In a
 * layer thin against a the potential is not constant on the spheroids (they crowd at the rim), and the tube holds
 * sqrt(A_f(0) dV/dc(0)) = sqrt(4/3) pi a^2 of planar layer instead of pi a^2: about 15% too much charge (measured
 * against a 2D axisymmetric reference in test/disc2d.test.ts). The contact (interfaceArea_m2) is the footprint
 * pi a^2, half the 2 pi a^2 that `hemisphere` (a particle sunk into the support) counts.
 */
export function disc(radius_m: number): CrossSection {
  const a = radius_m;
  const a2 = a * a;
  const volume = (ca: number, cb: number): number => ((2 * Math.PI) / 3) * (cb - ca) * (a2 + ca * ca + ca * cb + cb * cb);
  return {
    kind: 'disc',
    interfaceArea_m2: Math.PI * a2,
    interfaceFluxArea_m2: 2 * Math.PI * a2,
    // exact for the disc's harmonic solution: (c_b - c_a) / int dc / A_f = (c_b - c_a) 2 pi a / (arctan(c_b/a) -
    // arctan(c_a/a)), the arctan difference written as one arctan (no cancellation for thin cells)
    faceArea: (ca, cb) => {
      const d = cb - ca;
      if (!(d > 0)) return 2 * Math.PI * (a2 + ca * ca);
      return (2 * Math.PI * a * d) / Math.atan((a * d) / (a2 + ca * cb));
    },
    volume,
    depthHoldingVolume: (v) => depthByBisection(volume, v, a),
  };
}

/**
 * One particle's cell in an array of particles resting on the support (areal density N), each touching it through its
 * flat footprint of radius a: the disc contact (see disc) inside the cylinder of radius R = 1/sqrt(pi N).
 *  - Level sets: the disc's confocal oblate half-spheroids (semi-axes A = sqrt(a^2 + c^2) and c), clipped by the
 *    cylinder; the volume inside level c is exact, (2 pi / 3) c A^2 [1 - (1 - R^2/A^2)^(3/2)] once A > R (the
 *    spheroid's part inside the cylinder), (2 pi / 3) c A^2 before; deep down it grows like pi R^2 c.
 *  - Flux area: the disc's 2 pi (a^2 + c^2) while the spheroid fits in the cell, the cell's footprint pi R^2 deep
 *    down (the cell's lowest lateral mode decays as exp(-3.83 z/R)), joined geometrically where the spheroid meets
 *    the cell wall: A_f = A_disc^(1 - s) (pi R^2)^s, s = t / (1 + t), t = (A / R)^10, the same centre and steepness as
 *    particleArray (chosen there against its 2D reference; not refitted here).
 * Measured against the 2D axisymmetric disc reference with a flux-free wall at R (test/reference/disc2d.ts) in
 * test/disc2d.test.ts.
 */
export function discArray(radius_m: number, particleDensity_m2: number): CrossSection {
  const a = radius_m;
  const a2 = a * a;
  const R2 = 1 / (Math.PI * particleDensity_m2);
  const footprint = Math.PI * R2;
  const enclosed = (c: number): number => {
    const A2 = a2 + c * c;
    if (A2 <= R2) return ((2 * Math.PI) / 3) * c * A2;
    return ((2 * Math.PI) / 3) * c * A2 * (1 - Math.pow(1 - R2 / A2, 1.5));
  };
  const fluxArea = (c: number): number => {
    const A2 = a2 + c * c;
    const discArea = 2 * Math.PI * A2;
    const q = A2 / R2;
    const t = q * q * q * q * q; // (A / R)^10
    const s = t / (1 + t);
    return s < 1e-12 ? discArea : discArea * Math.exp(s * Math.log(footprint / discArea));
  };
  const lone = disc(a);
  const volume = (ca: number, cb: number): number => {
    // inside the cylinder: the isolated disc's volumes (factored, no cancellation for thin cells); beyond, the closed form
    if (a2 + cb * cb <= R2) return lone.volume(ca, cb);
    return Math.max(0, enclosed(cb) - enclosed(ca));
  };
  return {
    kind: 'disc-array',
    interfaceArea_m2: Math.PI * a2,
    interfaceFluxArea_m2: fluxArea(0),
    // geometric mean: second order, and within the cell the disc's own flux areas
    faceArea: (ca, cb) => Math.sqrt(fluxArea(ca) * fluxArea(cb)),
    volume,
    depthHoldingVolume: (v) => depthByBisection(volume, v, Math.max(a, Math.sqrt(R2))),
  };
}

/** Depth W with volume(0, W) = v for a monotone volume, by bisection from a first guess of the bracket, m. */
function depthByBisection(volume: (xa: number, xb: number) => number, v: number, firstHigh: number): number {
  let high = firstHigh;
  while (volume(0, high) < v && high < 1) high *= 2;
  let low = 0;
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (low + high);
    if (volume(0, mid) < v) low = mid;
    else high = mid;
  }
  return 0.5 * (low + high);
}

/**
 * Generic hook: any smooth positive A(x); integrals by Gauss–Legendre (3 points per segment, exact for quintics).
 * depthHoldingVolume is found by bisection on the monotone volume.
 */
export function crossSectionFromFunction(kind: string, area: (x_m: number) => number): CrossSection {
  const nodes = [-Math.sqrt(3 / 5), 0, Math.sqrt(3 / 5)];
  const weights = [5 / 9, 8 / 9, 5 / 9];
  const segment = (xa: number, xb: number): number => {
    const half = 0.5 * (xb - xa);
    const mid = 0.5 * (xa + xb);
    let sum = 0;
    for (let k = 0; k < 3; k++) sum += weights[k]! * area(mid + half * nodes[k]!);
    return sum * half;
  };
  // long spans (depthHoldingVolume) are split into geometric pieces so A may vary by orders of magnitude
  const volume = (xa: number, xb: number): number => {
    const length = xb - xa;
    if (length <= 0) return 0;
    const start = Math.max(xa, 1e-12);
    if (xb / start < 1.5) return segment(xa, xb);
    let sum = segment(xa, start);
    const pieces = Math.ceil(Math.log(xb / start) / Math.log(1.2));
    let left = start;
    for (let k = 1; k <= pieces; k++) {
      const right = k === pieces ? xb : start * Math.pow(xb / start, k / pieces);
      sum += segment(left, right);
      left = right;
    }
    return sum;
  };
  return {
    kind,
    interfaceArea_m2: area(0),
    // harmonic-mean-like choice: the area that makes the flux exact for A(x) linear between nodes is the log-mean;
    // the geometric mean is second-order accurate and reduces to the hemisphere's exact choice for A ~ r^2
    faceArea: (xa, xb) => Math.sqrt(area(xa) * area(xb)),
    volume,
    depthHoldingVolume: (v) => depthByBisection(volume, v, 1e-9),
  };
}

/**
 * One particle's cell in an array of areal density N: the support inside the cylinder of radius R = 1/sqrt(pi N)
 * around the particle (the circle with the cell's area), in zones labelled by the radius rho = a + x about the
 * particle's centre, the potential taken to depend on rho alone.
 *  - Volumes are the cell's own: a shell inside the cylinder is the full hemisphere while rho <= R and the
 *    spherical zone of height h = rho - sqrt(rho^2 - R^2) beyond (Archimedes), so the volume inside rho is
 *    (2 pi / 3)(rho^3 - (rho^2 - R^2)^(3/2)), which grows like pi R^2 rho deep down; it keeps the support beside
 *    the particle (at touching coverage the true charge exceeds the planar share, issue 10 item 4).
 *  - The flux area follows the shape of the equipotentials. For a coordinate x whose level sets are the
 *    equipotentials, the exact 1D reduction of div grad u has flux area A_f = integral |grad x| dS and volume
 *    dV/dx = integral dS / |grad x| over the level set. Near the particle the equipotentials are the spheres
 *    themselves: A_f = dV/drho = the zone area A_z = 2 pi rho h (the hemisphere's 2 pi rho^2 while rho <= R). Deep
 *    down they are flat (the cell's lowest lateral mode decays as exp(-3.83 z/R)): a plane at depth z(rho) holding
 *    the same volume has pi R^2 dz/drho = A_z, so A_f = (pi R^2)^2 / A_z, below the footprint where the zone is
 *    wider than it. The flux area passes from one to the other at the cell radius, where a sphere stops fitting in
 *    the cell: A_f = A_z (pi R^2 / A_z)^(2 s), s = t / (1 + t), t = (rho / R)^10; both limits tend to the footprint.
 *    The centre (rho = R) is geometry; the steepness 10 is the one number chosen against the 2D reference, on the
 *    training grids of test/array2d.test.ts (1e9-3e13 cm^-2 x 1, 3, 10 nm x layer 0.1, 1, 10x the spacing, and
 *    5e9-5e13 x 1, 2, 5, 10 nm x 0.15, 0.5, 2, 6x; worst 1.96, 1.81, 1.81, 1.85% for 8, 10, 12, 16) and checked on
 *    held-out grids not used to choose it. The former smooth minimum A_h / (1 + (A_h N)^4)^(1/4) was 9% low for
 *    thin layers round near-touching particles (5 nm at 2e12 cm^-2, layer 0.15x the spacing), the zone area alone
 *    10% high for layers deeper than the spacing.
 * Checked against the 2D axisymmetric cell reference (test/reference/axisymmetric2d.ts) in test/array2d.test.ts.
 */
export function particleArray(radius_m: number, particleDensity_m2: number): CrossSection {
  const a = radius_m;
  const n = particleDensity_m2;
  const R2 = 1 / (Math.PI * n);
  // cell volume inside the sphere of radius rho
  const enclosed = (rho: number): number => {
    const outside = rho * rho > R2 ? Math.pow(rho * rho - R2, 1.5) : 0;
    return ((2 * Math.PI) / 3) * (rho * rho * rho - outside);
  };
  const footprint = Math.PI * R2;
  // flux area A_z (pi R^2 / A_z)^(2s), s = t / (1 + t), t = (rho/R)^10 (see above); integer powers written out
  const fluxArea = (rho: number): number => {
    const rho2 = rho * rho;
    // zone height rho - sqrt(rho^2 - R^2) written as R^2 / (rho + sqrt(rho^2 - R^2)): no cancellation deep down
    const zone = 2 * Math.PI * rho * (rho2 <= R2 ? rho : R2 / (rho + Math.sqrt(rho2 - R2)));
    const q = rho2 / R2;
    const q2 = q * q;
    const t = q2 * q2 * q;
    const flat = t / (1 + t);
    return flat < 1e-12 ? zone : zone * Math.exp(2 * flat * Math.log(footprint / zone));
  };
  const volume = (xa: number, xb: number): number => {
    const ra = a + xa;
    const rb = a + xb;
    // shells inside the cylinder in factored form (no cancellation for thin shells); beyond, the closed form
    if (rb * rb <= R2) return ((2 * Math.PI) / 3) * (rb - ra) * (rb * rb + ra * rb + ra * ra);
    return Math.max(0, enclosed(rb) - enclosed(ra));
  };
  return {
    kind: 'array',
    interfaceArea_m2: 2 * Math.PI * a * a,
    // geometric mean: second order, and the hemisphere's exact 2 pi r_a r_b where the footprint does not bite
    faceArea: (xa, xb) => Math.sqrt(fluxArea(a + xa) * fluxArea(a + xb)),
    volume,
    depthHoldingVolume: (v) => depthByBisection(volume, v, Math.max(a, Math.sqrt(R2))),
  };
}
