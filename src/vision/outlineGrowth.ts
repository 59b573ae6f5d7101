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
 * nothing about coverage and are left out. The others' shortfalls are averaged with weights |C − B|: the
 * coverage becomes a ratio of sums, Σ ±(I − B) / Σ |C − B|, not a mean of ratios. C is read from one pixel, and the
 * coin's texture and the noise there make C − B uncertain; the mean of (I − B)/(C − B) is then too large by about
 * var(C)/(C − B)² (Jensen's inequality for 1/x), so the growth reads short and the coin long, the more so the less
 * contrast; the ratio of sums has no such term to first order (the ratio estimator, common statistics, no source).
 * The mean is scaled to the whole band. Weighting by (C − B)² with C − B read at the same pixel (inverse variance,
 * naively) was tried: it flips the bias's sign instead (the pixels whose C happens to read high count most and
 * have the smallest coverage); on rendered clips px/m read 0.0–0.43% high with it, 0.1–0.46% with |C − B|, and
 * 0.04–0.55% unweighted.
 *
 * Known bias under noise: the coverage is clamped to [0, 1], so a pixel beyond the coin's light (coverage 0) keeps
 * only the upper half of its noise, +σ/√(2π) of coverage, and a fully covered one loses the lower half; the band
 * reaches farther outside than inside, so the growth reads short and the coin long, the more so the more noise and
 * blur (on rendered clips px/m 0.2–0.3% high at σ 2 and 0.5–0.6% at σ 5, lossless or not). Clamping a few noise σ's
 * beyond [0, 1] instead (σ read in a ring beyond the band: an encoder's copied background makes the σ of frame
 * differences far too small) is unbiased on a plain coin, but lets a border brighter than the reference 3 px in
 * count above 1 (px/m then 0.5–1.3% high); with the floor only below 0, the clamp at 1 reads the ends' growth long
 * where their band reaches deep for the blur (px/m down to −0.7% at 480 frames/s in HD). Neither was kept; the
 * cure is a reference level read at the edge itself, which reading it nearer the edge did not give.
 */
import type { Ellipse } from './ellipse.ts';
import { hypot2 } from '../hypot.ts';

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
  const { minContrast, gain, inward, outer } = bandSettings(opts);
  const A = e.major / 2, B = e.minor / 2;
  if (!(B >= inward + 1.5) || !(A >= B) || !boxInFrame(e, outer, width, height)) return Number.NaN;
  const { bandCount, usedCount, missing } = scanBand(frame, background, width, e, 2.5, outer, inward, gain, minContrast, Number.POSITIVE_INFINITY);
  if (bandCount === 0 || usedCount < 0.5 * bandCount) return Number.NaN;
  // Ring area π (A + B) g − π g² = S: the smaller root.
  const S = (missing * bandCount) / usedCount;
  const sum = A + B;
  const disc = sum * sum - (4 * S) / Math.PI;
  if (!(disc >= 0)) return Number.NaN;
  return sum - Math.sqrt(disc);
}

/**
 * Bounds on ρ² = (u/A)² + (v/B)² outside which a pixel cannot lie in the band from `inner` px inside to `outer` px
 * outside the ellipse: its distance from the outline along the ray is d = r_e (ρ − 1) with the edge radius r_e of
 * at least B, so ρ < 1 − inner/B or ρ > 1 + outer/B puts it outside (a quick test before the exact one).
 */
function bandRhoSquared(B: number, inner: number, outer: number): [number, number] {
  const lo = 1 - inner / B;
  const hi = 1 + outer / B;
  return [lo > 0 ? lo * lo * (1 - 1e-9) : -1, hi * hi * (1 + 1e-9)];
}

/**
 * The band's settings from the options: the contrast floor, the gain, the depth inside the edge at which the coin's
 * own level is read (beyond the blur of the edge itself: 3 px and half the blur's reach) and the reach outside.
 */
function bandSettings(opts: OutlineGrowthOptions): { minContrast: number; gain: number; inward: number; outer: number } {
  const reach = Math.max(0, opts.reachPx ?? 0);
  return { minContrast: opts.minContrast ?? 20, gain: opts.gain ?? 1, inward: 3 + 0.5 * reach, outer: 3 + reach };
}

/** True when the box of `e` grown by `outer` px lies inside the frame (the band scan reads all of it). */
function boxInFrame(e: Ellipse, outer: number, width: number, height: number): boolean {
  const A = e.major / 2;
  return Math.floor(e.cx - A - outer) >= 0 && Math.floor(e.cy - A - outer) >= 0
    && Math.ceil(e.cx + A + outer) < width && Math.ceil(e.cy + A + outer) < height;
}

/** What {@link scanBand} counts: band pixels, those with contrast, and the ellipse's share less the coin's over them. */
const BAND = { bandCount: 0, usedCount: 0, missing: 0 };

/**
 * The coverage test over the band from `inner` px inside to `outer` px outside the outline of `e` (along the ray from
 * the centre), limited to the pixels within atan(`tanHalf`) of the major axis (Infinity: all round). Each band pixel
 * with contrast |C − B| ≥ `minContrast` adds the ellipse's share of it less the coin's coverage (I − B)/(C − B), C
 * read `inward` px inside the edge on the same ray, weighted by |C − B|; `missing` is the weighted mean times the
 * number of pixels used. The caller has checked that the box fits in the frame. Writes
 * into one module-level record and returns it (no allocation).
 */
function scanBand(
  frame: Uint8Array, background: Float32Array, width: number, e: Ellipse,
  inner: number, outer: number, inward: number, gain: number, minContrast: number, tanHalf: number,
): typeof BAND {
  const A = e.major / 2, B = e.minor / 2;
  const x0 = Math.floor(e.cx - A - outer), x1 = Math.ceil(e.cx + A + outer);
  const y0 = Math.floor(e.cy - A - outer), y1 = Math.ceil(e.cy + A + outer);
  const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
  const [qIn, qOut] = bandRhoSquared(B, inner, outer);
  const sector = Number.isFinite(tanHalf);
  let bandCount = 0, usedCount = 0, weightSum = 0, weightedMissing = 0;
  for (let y = y0; y <= y1; y++) {
    const dy = y - e.cy;
    for (let x = x0; x <= x1; x++) {
      const dx = x - e.cx;
      const u = c * dx + s * dy, v = -s * dx + c * dy;
      if (sector && Math.abs(v) > tanHalf * Math.abs(u)) continue;
      const q = (u / A) * (u / A) + (v / B) * (v / B);
      if (q < qIn || q > qOut) continue;
      const rho = Math.sqrt(q);
      const rad = Math.sqrt(u * u + v * v);
      // Signed distance from the outline along the ray from the centre (exact on a circle, close on an ellipse).
      const edgeR = rho > 0 ? rad / rho : A;
      const d = rad - edgeR;
      if (d < -inner || d > outer) continue;
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
      // Weighted by |C − B|: the coverage over the band is a ratio of sums, free of the bias a noisy C − B gives
      // the mean of ratios (see the module's comment).
      const weight = Math.abs(den);
      weightSum += weight;
      weightedMissing += weight * (inside - cov);
    }
  }
  BAND.bandCount = bandCount;
  BAND.usedCount = usedCount;
  // The weighted mean shortfall per pixel, over the pixels used.
  BAND.missing = weightSum > 0 ? (weightedMissing / weightSum) * usedCount : 0;
  return BAND;
}

/** Half-angle of the two sectors about the major axis's ends that {@link measureEndGrowth} reads, rad (25°). */
export const END_HALF_ANGLE = (25 * Math.PI) / 180;

/**
 * The arc length L of an ellipse of semi-axes `a` ≥ `b` within both end sectors (polar angle within
 * {@link END_HALF_ANGLE} of the major axis) and the angle Φ through which its normal turns there. For an
 * outline moved along its normals by g, the ring between the two curves within the sectors has the area
 * g L − g² Φ / 2 (the polar area element r dθ / cos β is the arc element ds, β the angle between the ray and the
 * normal; common geometry, no source). With the ellipse (a cos t, b sin t), the sector ends at
 * t_c = atan(a tan θ_c / b), ds = √(a² sin² t + b² cos² t) dt (Simpson's rule, 16 panels), and the normal's
 * direction is atan2(a sin t, b cos t).
 */
export function endSectorArc(a: number, b: number): { length: number; turn: number } {
  const tc = Math.atan((a * Math.tan(END_HALF_ANGLE)) / b);
  const n = 16, h = (2 * tc) / n;
  let integral = 0;
  for (let j = 0; j <= n; j++) {
    const t = -tc + j * h;
    integral += (j === 0 || j === n ? 1 : j % 2 === 1 ? 4 : 2) * hypot2(a * Math.sin(t), b * Math.cos(t));
  }
  return { length: (2 * integral * h) / 3, turn: 4 * Math.atan2(a * Math.sin(tc), b * Math.cos(tc)) };
}

/**
 * How far the ends of the reported major axis lie beyond the coin's edge there, δ (px, on the full major axis;
 * positive when the ellipse is longer than the coin): the coverage test of {@link measureOutlineGrowth} on two
 * sectors of ±25° about the major axis only. The mask outline does not grow alike all round: motion blur along
 * the major axis lengthens it and hardly widens it, and a coin's rim widens the silhouette across the major
 * axis, not along it. At the ends the extent of the face itself is measured, so the major axis less δ is the
 * face's diameter under perspective, whatever the blur, the threshold or the rim. Needs only a major semi-axis
 * of a few pixels more than the reference depth, so thin, tilted views are measured too.
 *
 * An outline moved out by g along its normals encloses, in the sectors, the ring area S = g L − g² Φ / 2
 * ({@link endSectorArc}): g is its smaller root and δ = 2g, the growth at the very ends, where the normal is the
 * major axis. The sector's pixels are those whose centres lie within the half-angle, as the arc's ends.
 * NaN when the ends run out of the frame, the major semi-axis is too short, or fewer than half of the end
 * pixels have contrast. Reads only; allocates nothing.
 */
export function measureEndGrowth(
  frame: Uint8Array, background: Float32Array, width: number, height: number, e: Ellipse, opts: OutlineGrowthOptions = {},
): number {
  const { minContrast, gain, inward, outer } = bandSettings(opts);
  const A = e.major / 2, B = e.minor / 2;
  if (!(A >= inward + 1.5) || !(A >= B) || !(B > 0) || !boxInFrame(e, outer, width, height)) return Number.NaN;
  // Inside the edge the band reaches as far as a blur can pull coverage in, short of the reference.
  const inner = inward - 0.5;
  const { bandCount, usedCount, missing } = scanBand(frame, background, width, e, inner, outer, inward, gain, minContrast, Math.tan(END_HALF_ANGLE));
  if (bandCount === 0 || usedCount < 0.5 * bandCount) return Number.NaN;
  const S = (missing * bandCount) / usedCount;
  const { length, turn } = endSectorArc(A, B);
  const disc = length * length - 2 * turn * S;
  if (!(disc >= 0)) return Number.NaN;
  return (2 * (length - Math.sqrt(disc))) / turn;
}

