/**
 * Second moments of the silhouette of a coin (a solid cylinder) seen under local orthographic projection.
 *
 * The two faces project to ellipses of semi-axes a and a·r (r = |n·d|), offset from each other by the
 * projected axis, of length h·√(1 − r²), along the minor direction; the silhouette is their convex hull:
 * two half-ellipses joined by a rectangle 2a wide. Its area and second moments follow in closed form
 * (integrals of x² and y² over a half-ellipse: π a³ b / 8 and π a b³ / 8; first moment 2 a b² / 3 —
 * standard integrals, common practice, no source).
 */

/** Variances of the silhouette per unit radius², along the major (λMajor) and minor (λMinor) directions. */
export interface SilhouetteVariances {
  lambdaMajor: number;
  lambdaMinor: number;
}

/**
 * Silhouette variances for a coin of radius 1 and thickness ratio `tau` = h / a, seen at |n·d| = `r`.
 * For tau = 0 they are 1/4 and r²/4 (a plain ellipse). Returns a new object; no inputs are mutated.
 */
export function silhouetteVariances(r: number, tau: number): SilhouetteVariances {
  return silhouetteVariancesInto(r, tau, { lambdaMajor: 0, lambdaMinor: 0 });
}

/** As {@link silhouetteVariances}, writing into `out` (no allocation: the rotation fit calls it per frame). Returns `out`. */
export function silhouetteVariancesInto(r: number, tau: number, out: SilhouetteVariances): SilhouetteVariances {
  const b = Math.min(Math.max(r, 0), 1);
  const len = tau * Math.sqrt(Math.max(1 - b * b, 0));
  const area = Math.PI * b + 2 * len;
  if (area <= 0) {
    out.lambdaMajor = 1 / 3;
    out.lambdaMinor = 0;
    return out;
  }
  const ixx = (Math.PI * b) / 4 + (2 / 3) * len;
  const iyy = (len * len * len) / 6 + (Math.PI * b * len * len) / 4 + (4 / 3) * b * b * len + (Math.PI * (b * b * b)) / 4;
  out.lambdaMajor = ixx / area;
  out.lambdaMinor = iyy / area;
  return out;
}

/** Silhouette variances with their partial derivatives in r = |n·d| and in the thickness ratio tau. */
export interface SilhouetteVariancePartials extends SilhouetteVariances {
  dMajorDr: number;
  dMinorDr: number;
  dMajorDTau: number;
  dMinorDTau: number;
}

/**
 * As {@link silhouetteVariancesInto}, with the partial derivatives ∂λ/∂r and ∂λ/∂tau of both variances
 * (quotient rule on the closed forms above; the derivative in r is 0 where r is clamped to [0, 1], and the
 * term through the rim's width is dropped exactly face-on, where √(1 − r²) has no derivative).
 * The variances are bit-identical to {@link silhouetteVariancesInto}. Writes into `out` and returns it.
 */
export function silhouetteVariancePartialsInto(r: number, tau: number, out: SilhouetteVariancePartials): SilhouetteVariancePartials {
  const b = Math.min(Math.max(r, 0), 1);
  const dbDr = r > 0 && r < 1 ? 1 : 0;
  const root = Math.sqrt(Math.max(1 - b * b, 0));
  const len = tau * root;
  const area = Math.PI * b + 2 * len;
  if (area <= 0) {
    out.lambdaMajor = 1 / 3;
    out.lambdaMinor = 0;
    out.dMajorDr = 0;
    out.dMinorDr = 0;
    out.dMajorDTau = 0;
    out.dMinorDTau = 0;
    return out;
  }
  const ixx = (Math.PI * b) / 4 + (2 / 3) * len;
  const iyy = (len * len * len) / 6 + (Math.PI * b * len * len) / 4 + (4 / 3) * b * b * len + (Math.PI * (b * b * b)) / 4;
  const lMaj = ixx / area;
  const lMin = iyy / area;
  out.lambdaMajor = lMaj;
  out.lambdaMinor = lMin;
  // Partials of area, ixx, iyy in b and in len.
  const areaB = Math.PI;
  const areaL = 2;
  const ixxB = Math.PI / 4;
  const ixxL = 2 / 3;
  const iyyB = (Math.PI * len * len) / 4 + (8 / 3) * b * len + (3 * Math.PI * b * b) / 4;
  const iyyL = (len * len) / 2 + (Math.PI * b * len) / 2 + (4 / 3) * b * b;
  const majB = (ixxB - lMaj * areaB) / area;
  const majL = (ixxL - lMaj * areaL) / area;
  const minB = (iyyB - lMin * areaB) / area;
  const minL = (iyyL - lMin * areaL) / area;
  // len = tau √(1 − b²): ∂len/∂b = −tau b / √(1 − b²), ∂len/∂tau = √(1 − b²).
  const lenB = root > 0 ? (-tau * b) / root : 0;
  out.dMajorDr = (majB + majL * lenB) * dbDr;
  out.dMinorDr = (minB + minL * lenB) * dbDr;
  out.dMajorDTau = majL * root;
  out.dMinorDTau = minL * root;
  return out;
}
