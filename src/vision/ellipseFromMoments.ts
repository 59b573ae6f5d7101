import { canonicalAxisAngle, type Ellipse } from './ellipse.ts';
import { hypot2 } from '../hypot.ts';

/** Raw moment sums of a pixel set over pixel centres: Σ1, Σx, Σy, Σx², Σxy, Σy². */
export interface RegionMoments {
  readonly m00: number;
  readonly m10: number;
  readonly m01: number;
  readonly m20: number;
  readonly m11: number;
  readonly m02: number;
}

/** Result of {@link ellipseFromMoments}. */
export type MomentsEllipseResult =
  | { readonly ok: true; readonly ellipse: Ellipse; readonly fillRatio: number }
  | { readonly ok: false; readonly reason: 'empty' | 'not_finite' };

/**
 * The ellipse with the same area centroid and second central moments as a pixel set.
 * For a uniformly filled ellipse of semi-axes a ≥ b the central second moments are
 * a²/4 and b²/4 along its axes, so the FULL axes are 4·sqrt(eigenvalue) of the
 * covariance and the major axis lies along the leading eigenvector.
 *
 * `pixelArea` (default true) treats each pixel as a unit square instead of a point:
 * it adds 1/12 px² to both variances (the second moment of a unit square about its
 * centre), which removes the bias of thin slivers (an n-pixel run has point variance
 * (n² − 1)/12 but area variance n²/12).
 *
 * `fillRatio` is m00 / (π/4 · major · minor): 1 for a filled ellipse, smaller for a
 * region with gaps, different from 1 for shapes that are not ellipses.
 *
 * References:
 * [1] "Image analysis via the general theory of moments", Journal of the Optical
 *     Society of America 70(8), 1980, DOI 10.1364/JOSA.70.000920 (moment ellipse;
 *     cited from memory). The 4·sqrt(λ) relation for a uniform ellipse is a closed form.
 */
export function ellipseFromMoments(m: RegionMoments, pixelArea = true): MomentsEllipseResult {
  if (!(m.m00 > 0)) return { ok: false, reason: 'empty' };
  const cx = m.m10 / m.m00;
  const cy = m.m01 / m.m00;
  const corr = pixelArea ? 1 / 12 : 0;
  const sxx = Math.max(0, m.m20 / m.m00 - cx * cx) + corr; // central moments μ20/μ00
  const syy = Math.max(0, m.m02 / m.m00 - cy * cy) + corr;
  const sxy = m.m11 / m.m00 - cx * cy;
  const mid = (sxx + syy) / 2;
  const rad = hypot2((sxx - syy) / 2, sxy);
  const l1 = mid + rad;
  const l2 = Math.max(0, mid - rad);
  const major = 4 * Math.sqrt(l1); // a = 2·sqrt(λ1) for a uniform ellipse
  const minor = 4 * Math.sqrt(l2);
  const angleRad = rad === 0 ? 0 : canonicalAxisAngle(0.5 * Math.atan2(2 * sxy, sxx - syy));
  if (![cx, cy, major, minor, angleRad].every(Number.isFinite)) return { ok: false, reason: 'not_finite' };
  const fillRatio = minor > 0 ? m.m00 / ((Math.PI / 4) * major * minor) : Number.POSITIVE_INFINITY;
  return { ok: true, ellipse: { cx, cy, major, minor, angleRad }, fillRatio };
}
