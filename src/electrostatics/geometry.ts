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
    depthHoldingVolume(v) {
      let high = 1e-9;
      while (volume(0, high) < v && high < 1) high *= 2;
      let low = 0;
      for (let i = 0; i < 60; i++) {
        const mid = 0.5 * (low + high);
        if (volume(0, mid) < v) low = mid;
        else high = mid;
      }
      return 0.5 * (low + high);
    },
  };
}

/**
 * One particle's cell in an array of areal density N: the support inside the cylinder of radius R = 1/sqrt(pi N)
 * around the particle (the circle with the cell's area), cut into spherical shells of radius rho = a + x about
 * the particle's centre. A shell's area inside the cell is the full hemisphere 2 pi rho^2 while rho <= R and the
 * spherical zone 2 pi rho (rho - sqrt(rho^2 - R^2)) beyond (Archimedes' zone area, height rho - sqrt(rho^2 - R^2)),
 * which tends to the cell's footprint pi R^2 = 1/N; the volumes are exact for the cell. The potential is taken to
 * depend on rho alone: exact for the isolated hemisphere (layer << R) and for the planar layer shared among
 * particles (layer >> R, where the zones flatten to the footprint), and it keeps the hemisphere's extra area near
 * densely packed particles (more charge than the planar share, issue 10 item 4). Replaced the smooth minimum
 * [(2 pi r^2)^-4 + N^4]^(-1/4), which was 4-11% below the 2D axisymmetric cell reference where the layer depth is
 * comparable to the spacing; checked against that reference in test/array2d.test.ts.
 */
export function particleArray(radius_m: number, particleDensity_m2: number): CrossSection {
  const a = radius_m;
  const R = 1 / Math.sqrt(Math.PI * particleDensity_m2);
  const R2 = R * R;
  // area of the shell of radius rho inside the cell
  const area = (rho: number): number => (rho <= R ? 2 * Math.PI * rho * rho : (2 * Math.PI * rho * R2) / (rho + Math.sqrt(rho * rho - R2)));
  // cell volume inside the sphere of radius rho: (2 pi / 3)(rho^3 - (rho^2 - R^2)^(3/2)) (the zone's complement removed)
  const enclosed = (rho: number): number => {
    const outside = rho > R ? Math.pow(rho * rho - R2, 1.5) : 0;
    return ((2 * Math.PI) / 3) * (rho * rho * rho - outside);
  };
  // integral of d rho / A(rho): 1/(2 pi rho) below R; (rho + sqrt(rho^2 - R^2) - R acos(R/rho)) / (2 pi R^2) above
  const resistance = (rho: number): number =>
    rho <= R ? -1 / (2 * Math.PI * rho) : -1 / (2 * Math.PI * R) + (rho - R + Math.sqrt(rho * rho - R2) - R * Math.acos(R / rho)) / (2 * Math.PI * R2);
  const volume = (xa: number, xb: number): number => {
    const ra = a + xa;
    const rb = a + xb;
    // thin shells below R in factored form (no cancellation); elsewhere the difference of the closed form
    if (rb <= R) return ((2 * Math.PI) / 3) * (rb - ra) * (rb * rb + ra * rb + ra * ra);
    const v = enclosed(rb) - enclosed(ra);
    return v > 0 ? v : 0.5 * (area(ra) + area(rb)) * (rb - ra);
  };
  return {
    kind: 'array',
    interfaceArea_m2: 2 * Math.PI * a * a,
    particleFootprint_m2: 1 / particleDensity_m2,
    // the area that makes the discrete flux exact for the potential of a constant flux: (xb - xa) / int d rho / A
    faceArea(xa, xb) {
      const ra = a + xa;
      const rb = a + xb;
      if (rb <= R) return 2 * Math.PI * ra * rb;
      const r = resistance(rb) - resistance(ra);
      // cancellation for very thin cells far out, where A hardly varies: the mean area
      return r > 1e-9 * ((rb - ra) / area(rb)) ? (rb - ra) / r : Math.sqrt(area(ra) * area(rb));
    },
    volume,
    depthHoldingVolume(v) {
      let low = 0;
      let high = Math.max(a, R);
      while (volume(0, high) < v && high < 1) high *= 2;
      for (let i = 0; i < 80; i++) {
        const mid = 0.5 * (low + high);
        if (volume(0, mid) < v) low = mid;
        else high = mid;
      }
      return 0.5 * (low + high);
    },
  };
}
