import type { Conic } from './ellipse.ts';
import { fitEllipseDirect, type DirectFitResult } from './fitEllipseDirect.ts';

/** Options of {@link fitEllipseTrimmed}. */
export interface TrimmedFitOptions {
  /** Random 6-point samples tried for the starting fit (default 60; fixed seed, deterministic). */
  readonly samples?: number;
  /** Share of the points kept by each trimming step (default 0.6). */
  readonly keepFraction?: number;
  /** Trimming steps (default 4). */
  readonly iterations?: number;
  /** Final inliers: within `k` robust σ of the trimmed fit (σ = 1.4826·MAD of the kept distances; default 2.5). */
  readonly k?: number;
  /** Never trim points closer than this to the fit, px (default 1). */
  readonly floorPx?: number;
}

/** {@link fitEllipseDirect}'s result plus the number of points kept. */
export type TrimmedFitResult = DirectFitResult & { readonly used: number };

/**
 * Direct ellipse fit robust to outliers: a random-sample-consensus start (6-point fits,
 * the one with most points within floorPx, refitted to them), least-trimmed-squares concentration steps
 * (refit to the `keepFraction` of points with the smallest Sampson distance, repeat),
 * then a final refit to all points within max(floorPx, k·1.4826·MAD) of that fit. The trimming works on the
 * consensus start's inliers followed by the input points after as many (a documented quirk that the tracker's
 * settings were chosen with; see the comment at `bx`).
 * For an outline of which part belongs to something else (the hand).
 * Uses the first `count` points. Does not mutate its inputs.
 *
 * References: [1] "Numerically stable direct least squares fitting of ellipses",
 * Proc. WSCG 1998 (the fit). [2] "Computing LTS regression for large data sets", Data Mining
 * and Knowledge Discovery 12, 2006, DOI 10.1007/s10618-005-0024-4 (concentration steps; cited from memory).
 * [3] "Random sample consensus: a paradigm for model fitting with applications to image analysis and
 *     automated cartography", Communications of the ACM 24(6), 1981, DOI 10.1145/358669.358692.
 */
export function fitEllipseTrimmed(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  count: number,
  opts: TrimmedFitOptions = {},
): TrimmedFitResult {
  const iterations = opts.iterations ?? 4;
  const k = opts.k ?? 2.5;
  const floorPx = opts.floorPx ?? 1;
  // A plain loop: a mapping closure made at every call deoptimised the fit (a new call target each time).
  const wx = new Float64Array(count), wy = new Float64Array(count);
  for (let i = 0; i < count; i++) { wx[i] = xs[i]; wy[i] = ys[i]; }
  const keep = opts.keepFraction ?? 0.6;
  let n = count;
  let fit = fitEllipseDirect(wx, wy, n);
  const dist = new Float64Array(count);
  // Random-sample consensus start: the 6-point fit with most points within floorPx.
  const samples = opts.samples ?? 60;
  if (fit.ok && count >= 12 && samples > 0) {
    let seed = 12345;
    const rnd = (): number => { seed = (Math.imul(seed, 1103515245) + 12345) >>> 0; return seed / 4294967296; };
    const sx = new Float64Array(6), sy = new Float64Array(6);
    let bestIn = 0;
    // Each sample that beats the best so far; the start is the refit to the inliers of the last of them whose
    // refit succeeds (refitted once, at the end, not at every improvement).
    const improving: Conic[] = [];
    for (let trial = 0; trial < samples; trial++) {
      for (let j = 0; j < 6; j++) { const q = Math.floor(rnd() * count); sx[j] = xs[q]; sy[j] = ys[q]; }
      const f = fitEllipseDirect(sx, sy, 6);
      if (!f.ok) continue;
      // Count the points within floorPx; stop once this sample can no longer beat the best.
      let nin = 0;
      for (let i = 0; i < count && nin + (count - i) > bestIn; i++) if (withinSampson(f.conic, xs[i], ys[i], floorPx)) nin++;
      if (nin > bestIn) {
        bestIn = nin;
        improving.push(f.conic);
      }
    }
    const selectInliers = (q: Conic): number => {
      let m = 0;
      for (let i = 0; i < count; i++) if (withinSampson(q, xs[i], ys[i], floorPx)) { wx[m] = xs[i]; wy[m] = ys[i]; m++; }
      return m;
    };
    const last = improving.length - 1;
    let q = last;
    for (; q >= 0; q--) {
      const g = fitEllipseDirect(wx, wy, selectInliers(improving[q]));
      if (g.ok) { fit = g; break; }
    }
    // wx, wy keep the best sample's inliers (below), whichever refit succeeded.
    if (last >= 0 && q !== last) selectInliers(improving[last]);
  }
  const order = new Float64Array(count);
  // Concentration steps of least trimmed squares: refit to the `keep` share of points
  // closest to the current fit, so a structured outlier set cannot hold the fit.
  const h = Math.max(6, Math.floor(keep * count));
  // The points the concentration steps and the final inlier set work on: the consensus start's inliers (the best
  // sample's, first in wx, wy), then the input points after as many (the rest of wx, wy). Working on all the input
  // points instead was tried: on rendered clips it lost the release on 2 of 10 and moved catches by frames.
  const bx = Float64Array.from(wx), by = Float64Array.from(wy);
  for (let it = 0; it < iterations && fit.ok; it++) {
    for (let i = 0; i < count; i++) dist[i] = sampson(fit.conic, bx[i], by[i]);
    order.set(dist);
    order.sort();
    const cut = order[h - 1];
    let m = 0;
    for (let i = 0; i < count && m < h; i++) {
      if (dist[i] <= cut) { wx[m] = bx[i]; wy[m] = by[i]; m++; }
    }
    const next = fitEllipseDirect(wx, wy, m);
    if (!next.ok) break;
    fit = next;
    n = m;
  }
  // Final inlier set: all points within max(floorPx, k·1.4826·MAD) of the trimmed fit.
  if (fit.ok) {
    for (let i = 0; i < count; i++) dist[i] = sampson(fit.conic, bx[i], by[i]);
    order.set(dist);
    order.sort();
    const limit = Math.max(floorPx, k * 1.4826 * order[h >> 1]);
    let m = 0;
    for (let i = 0; i < count; i++) if (dist[i] <= limit) { wx[m] = bx[i]; wy[m] = by[i]; m++; }
    if (m >= 6) {
      const next = fitEllipseDirect(wx, wy, m);
      if (next.ok) { fit = next; n = m; }
    }
  }
  return { ...fit, used: n };
}

/**
 * `sampson(q, x, y) <= limit` without the square root: |value| ≤ limit · |gradient| compared squared (the same
 * answer but for ties within rounding; the consensus count runs this for every point of every sample).
 */
function withinSampson(q: Conic, x: number, y: number, limit: number): boolean {
  // Indexed, not destructured: a destructuring assignment allocated an iterator per call here.
  const A = q[0], B = q[1], C = q[2], D = q[3], E = q[4], F = q[5];
  const val = A * x * x + B * x * y + C * y * y + D * x + E * y + F;
  const gx = 2 * A * x + B * y + D;
  const gy = B * x + 2 * C * y + E;
  const g2 = gx * gx + gy * gy;
  return g2 > 0 && val * val <= limit * limit * g2;
}

function sampson(q: Conic, x: number, y: number): number {
  const A = q[0], B = q[1], C = q[2], D = q[3], E = q[4], F = q[5];
  const val = A * x * x + B * x * y + C * y * y + D * x + E * y + F;
  const gx = 2 * A * x + B * y + D;
  const gy = B * x + 2 * C * y + E;
  const g = Math.sqrt(gx * gx + gy * gy);
  return g > 0 ? Math.abs(val) / g : Number.POSITIVE_INFINITY;
}
