/**
 * How far a thresholded outline lies outside the coin's true edge, from the gray levels themselves.
 *
 * A foreground mask keeps every pixel whose difference from the background exceeds a threshold, so a
 * pixel only partly covered by the coin (anti-aliasing, optical blur, motion blur) is counted whole: the
 * moment ellipse of the mask is larger than the coin by an amount that depends on the threshold, the
 * contrast and the blur, not on the coin. The gray levels say how much of each edge pixel the coin covers:
 * with B the background there and C the coin's own level just inside the edge,
 *
 *   coverage c = (I − B) / (C − B),   clamped to [0, 1],
 *
 * (linear mixing of the two intensities within a pixel; common practice, no source). Summed over a band
 * around the reported ellipse, the coverages give the coin's area; the ellipse's own area is π A B. Their
 * difference is the area of the ring by which the ellipse outgrew the coin, π (A + B) g − π g² for an outline
 * moved out by g on every side; the result is the growth of the full axes, δ = 2 g.
 *
 * Blur moves light out of the coin but keeps its total, so the coverage area is the coin's area under any
 * blur that the band holds (`reachPx`). Pixels where coin and background have nearly the same gray level say
 * nothing about coverage and are left out; the sum over the others is scaled to the whole band.
 */
import type { Ellipse } from './ellipse.ts';

/** Options of {@link measureOutlineGrowth}. */
export interface OutlineGrowthOptions {
  /** Least |C − B| (gray levels) for an edge pixel to count (default 20). */
  readonly minContrast?: number;
  /** Extra reach of the band outside the ellipse for blur, px (default 0; the band always reaches 3 px). */
  readonly reachPx?: number;
  /** Background gain: the background predicts the frame as gain · B (default 1, see `estimateGain`). */
  readonly gain?: number;
}

/**
 * Outline growth δ (px, on the FULL axes) of ellipse `e` reported for the coin in `frame`, against the
 * background model `background` (same size, gray levels as float). Positive when the ellipse is larger than
 * the coin. NaN when the ellipse is too thin for an inner reference (minor semi-axis under 1.5 px more than
 * the reference depth), runs out of the frame, or fewer than half of the edge pixels have contrast.
 * Reads only; allocates nothing.
 */
export function measureOutlineGrowth(
  frame: Uint8Array, background: Float32Array, width: number, height: number, e: Ellipse, opts: OutlineGrowthOptions = {},
): number {
  const minContrast = opts.minContrast ?? 20;
  const reach = Math.max(0, opts.reachPx ?? 0);
  const gain = opts.gain ?? 1;
  const A = e.major / 2, B = e.minor / 2;
  // The coin's own level is read this far inside the edge: beyond the blur of the edge itself.
  const inward = 3 + 0.5 * reach;
  if (!(B >= inward + 1.5) || !(A >= B)) return Number.NaN;
  const outer = 3 + reach;
  const x0 = Math.floor(e.cx - A - outer), x1 = Math.ceil(e.cx + A + outer);
  const y0 = Math.floor(e.cy - A - outer), y1 = Math.ceil(e.cy + A + outer);
  if (x0 < 0 || y0 < 0 || x1 >= width || y1 >= height) return Number.NaN;
  const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
  let bandCount = 0, usedCount = 0, missing = 0;
  for (let y = y0; y <= y1; y++) {
    const dy = y - e.cy;
    for (let x = x0; x <= x1; x++) {
      const dx = x - e.cx;
      const u = c * dx + s * dy, v = -s * dx + c * dy;
      const rho = Math.hypot(u / A, v / B);
      const rad = Math.hypot(u, v);
      // Signed distance from the outline along the ray from the centre (exact on a circle, close on an ellipse).
      const edgeR = rho > 0 ? rad / rho : A;
      const d = rad - edgeR;
      if (d < -2.5 || d > outer) continue;
      bandCount++;
      // The coin's level: the pixel `inward` px inside the edge on the same ray.
      const k = rad > 0 ? Math.max(0, (edgeR - inward) / rad) : 0;
      const xi = Math.round(e.cx + dx * k), yi = Math.round(e.cy + dy * k);
      const i = y * width + x;
      const bg = gain * background[i];
      const den = frame[yi * width + xi] - bg;
      if (Math.abs(den) < minContrast) continue;
      usedCount++;
      const cov = Math.min(1, Math.max(0, (frame[i] - bg) / den));
      // The ellipse's own share of the pixel (a half-plane through its edge, to first order).
      const inside = Math.min(1, Math.max(0, 0.5 - d));
      missing += inside - cov;
    }
  }
  if (bandCount === 0 || usedCount < 0.5 * bandCount) return Number.NaN;
  // Ring area π (A + B) g − π g² = S: the smaller root.
  const S = (missing * bandCount) / usedCount;
  const sum = A + B;
  const disc = sum * sum - (4 * S) / Math.PI;
  if (!(disc >= 0)) return Number.NaN;
  return sum - Math.sqrt(disc);
}
