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
  const iyy = len ** 3 / 6 + (Math.PI * b * len * len) / 4 + (4 / 3) * b * b * len + (Math.PI * b ** 3) / 4;
  out.lambdaMajor = ixx / area;
  out.lambdaMinor = iyy / area;
  return out;
}
