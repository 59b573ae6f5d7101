import type { Ellipse } from './ellipse.ts';

/** Result of {@link matchTranslation}: failure as a value. */
export type TranslationMatch =
  | {
    readonly ok: true;
    /** Shift, px: the pattern of `from` inside `region` is found at (x + dx, y + dy) in `to`. */
    readonly dx: number;
    readonly dy: number;
    /** RMS gray-level difference at the best integer shift. */
    readonly rms: number;
    /**
     * RMS gray-level difference at the sub-pixel shift (bilinear interpolation of `to`), or `rms` if lower: at the
     * integer shift a sharp edge that moved by a fraction of a pixel leaves a residual of tens of gray levels.
     */
    readonly rmsSubpixel: number;
    /** Pixels compared. */
    readonly pixels: number;
  }
  | { readonly ok: false; readonly reason: string };

/**
 * Translation of an elliptic patch between two gray8 frames of one size by block matching:
 * the pixels of `from` whose centre lies inside `region` grown by `growPx` are compared with
 * `to` at every integer shift within `radiusPx` (Chebyshev) of (`guessDx`, `guessDy`) by the
 * sum of squared differences; the minimum is refined to sub-pixel by a parabola through it and
 * its two neighbours along each axis. For a coin carried by the hand (rigid, slowly turning) the
 * shift is the coin's motion; the background model plays no part, so a ghost of the coin's old
 * place cannot attract it. Fails (`ok: false`) when fewer than 12 pixels lie inside the frame at
 * every shift or the minimum lies on the border of the search range. Does not mutate its inputs.
 * The sub-pixel shift is then refined by Gauss–Newton steps on the interpolated residual (`opts.refine`, default
 * true; see `refineShift`).
 * `keep` (optional) selects the pixels of `from` that take part, by index (e.g. those that differ from the
 * background: the coin and the fingers holding it, which move together, and not the static scene beside them,
 * which would pull the match towards no motion).
 *
 * References:
 * [1] "An iterative image registration technique with an application to stereo vision", Proc. IJCAI 1981
 *     (matching by the squared difference of image patches; cited from memory).
 * Sub-pixel refinement by a parabola through the minimum and its neighbours is common practice, no source.
 */
export function matchTranslation(
  from: Uint8Array,
  to: Uint8Array,
  width: number,
  height: number,
  region: Ellipse,
  growPx: number,
  guessDx: number,
  guessDy: number,
  radiusPx: number,
  keep?: (index: number) => boolean,
  opts: { refine?: boolean } = {},
): TranslationMatch {
  const a = region.major / 2 + growPx, b = region.minor / 2 + growPx;
  if (!(a > 0) || !(b > 0)) return { ok: false, reason: 'empty region' };
  const c = Math.cos(region.angleRad), s = Math.sin(region.angleRad);
  const x0 = Math.max(0, Math.floor(region.cx - a)), x1 = Math.min(width - 1, Math.ceil(region.cx + a));
  const y0 = Math.max(0, Math.floor(region.cy - a)), y1 = Math.min(height - 1, Math.ceil(region.cy + a));
  const idx: number[] = [];
  for (let y = y0; y <= y1; y++) {
    for (let x = x0; x <= x1; x++) {
      const dx = x - region.cx, dy = y - region.cy;
      const u = (c * dx + s * dy) / a, v = (-s * dx + c * dy) / b;
      if (u * u + v * v <= 1 && (keep === undefined || keep(y * width + x))) idx.push(y * width + x);
    }
  }
  if (idx.length < 12) return { ok: false, reason: 'too few pixels' };
  const R = Math.max(1, Math.ceil(radiusPx));
  const gx = Math.round(guessDx), gy = Math.round(guessDy);
  const side = 2 * R + 1;
  const cost = new Float64Array(side * side).fill(Infinity);
  /** cost[k] is exact (not a bound from a sum stopped early). */
  const exact = new Uint8Array(side * side);
  const N = idx.length;
  let bx0 = width, bx1 = -1, by0 = height, by1 = -1;
  for (const p of idx) {
    const py = (p / width) | 0, px = p - py * width;
    if (px < bx0) bx0 = px;
    if (px > bx1) bx1 = px;
    if (py < by0) by0 = py;
    if (py > by1) by1 = py;
  }
  /** Sum of squared differences at shift (sx, sy), stopped once above `stop` when the patch lies inside the frame. */
  const costAt = (sx: number, sy: number, stop: number): { ss: number; n: number; done: boolean } => {
    if (bx0 + sx >= 0 && bx1 + sx < width && by0 + sy >= 0 && by1 + sy < height) {
      // Inside the frame: the same sum in the same order, without the bounds tests; a sum that already exceeds
      // the best so far cannot win and stops (integer sums, so the test is exact).
      const off = sy * width + sx;
      let ss = 0;
      for (let q = 0; q < N; q++) {
        const p = idx[q];
        const d = to[p + off] - from[p];
        ss += d * d;
        if (ss > stop) return { ss, n: N, done: false };
      }
      return { ss, n: N, done: true };
    }
    let ss = 0, n = 0;
    for (const p of idx) {
      const py = (p / width) | 0, px = p - py * width;
      const qx = px + sx, qy = py + sy;
      if (qx < 0 || qy < 0 || qx >= width || qy >= height) continue;
      const d = to[qy * width + qx] - from[p];
      ss += d * d;
      n++;
    }
    return { ss, n, done: true };
  };
  let best = -1;
  for (let j = -R; j <= R; j++) {
    for (let i = -R; i <= R; i++) {
      const r = costAt(gx + i, gy + j, best < 0 ? Infinity : cost[best] * N);
      if (r.n < 12 || r.n < 0.8 * N) continue;
      const k = (j + R) * side + (i + R);
      cost[k] = r.ss / r.n;
      exact[k] = r.done ? 1 : 0;
      if (r.done && (best < 0 || cost[k] < cost[best])) best = k;
    }
  }
  if (best < 0) return { ok: false, reason: 'region outside the frame' };
  const bi = (best % side) - R, bj = Math.floor(best / side) - R;
  if (Math.abs(bi) === R || Math.abs(bj) === R) return { ok: false, reason: 'minimum on the border of the search range' };
  const at = (i: number, j: number): number => {
    const k = (j + R) * side + (i + R);
    if (!exact[k] && Number.isFinite(cost[k])) {
      const r = costAt(gx + i, gy + j, Infinity);
      cost[k] = r.ss / r.n;
      exact[k] = 1;
    }
    return cost[k];
  };
  const parab = (m: number, z: number, p: number): number => {
    const den = m - 2 * z + p;
    return den > 0 && Number.isFinite(den) ? Math.max(-0.5, Math.min(0.5, (0.5 * (m - p)) / den)) : 0;
  };
  const fx = parab(at(bi - 1, bj), at(bi, bj), at(bi + 1, bj));
  const fy = parab(at(bi, bj - 1), at(bi, bj), at(bi, bj + 1));
  let dx = gx + bi + fx, dy = gy + bj + fy;
  if (opts.refine !== false) [dx, dy] = refineShift(from, to, width, height, idx, dx, dy, gx + bi, gy + bj);
  // The residual at the sub-pixel shift (bilinear interpolation of `to`).
  let ss = 0, n = 0;
  for (const p of idx) {
    const d = shiftedResidual(from, to, width, height, p, dx, dy);
    if (Number.isNaN(d)) continue;
    ss += d * d;
    n++;
  }
  const rms = Math.sqrt(at(bi, bj));
  const rmsSubpixel = n >= 12 ? Math.min(Math.sqrt(ss / n), rms) : rms;
  return { ok: true, dx, dy, rms, rmsSubpixel, pixels: idx.length };
}

/**
 * Gauss–Newton refinement of a sub-pixel shift (the additive image-registration step of [1] in the docs of
 * {@link matchTranslation}): the residual `to(p + d) − from(p)`, `to` interpolated bilinearly, against the gradient
 * of `from` by central differences (they leave `from(p)` itself out, so the template's noise does not bias the step;
 * the exact least squares of interpolated images would: interpolation lowers the noise most at half-pixel shifts
 * and pulls towards them); up to 6 steps while the step exceeds 0.002 px, kept within 1 px of the integer shift
 * (`ix`, `iy`). The parabola through the cost's minimum and its neighbours is biased towards the integer shifts by
 * up to a tenth of a pixel; a chain of matches adds those errors up.
 */
function refineShift(
  from: Uint8Array, to: Uint8Array, width: number, height: number, idx: number[], dx0: number, dy0: number, ix: number, iy: number,
): [number, number] {
  const n = idx.length;
  const gxs = new Float64Array(n), gys = new Float64Array(n);
  let hxx = 0, hxy = 0, hyy = 0;
  for (let k = 0; k < n; k++) {
    const p = idx[k];
    const py = (p / width) | 0, px = p - py * width;
    if (px < 1 || py < 1 || px >= width - 1 || py >= height - 1) continue;
    const gx = 0.5 * (from[p + 1] - from[p - 1]), gy = 0.5 * (from[p + width] - from[p - width]);
    gxs[k] = gx; gys[k] = gy;
    hxx += gx * gx; hxy += gx * gy; hyy += gy * gy;
  }
  const det = hxx * hyy - hxy * hxy;
  if (!(det > 1e-9 * Math.max(1, hxx * hyy))) return [dx0, dy0];
  let dx = dx0, dy = dy0;
  for (let it = 0; it < 6; it++) {
    let bx = 0, by = 0;
    for (let k = 0; k < n; k++) {
      if (gxs[k] === 0 && gys[k] === 0) continue;
      const r = shiftedResidual(from, to, width, height, idx[k], dx, dy);
      if (Number.isNaN(r)) continue;
      bx += gxs[k] * r; by += gys[k] * r;
    }
    const sx = -(hyy * bx - hxy * by) / det, sy = -(hxx * by - hxy * bx) / det;
    dx = Math.max(ix - 1, Math.min(ix + 1, dx + sx));
    dy = Math.max(iy - 1, Math.min(iy + 1, dy + sy));
    if (Math.abs(sx) < 0.002 && Math.abs(sy) < 0.002) break;
  }
  return [dx, dy];
}

/** `to` at pixel p of `from` moved by (dx, dy), bilinearly interpolated, less `from` at p; NaN outside the frame. */
function shiftedResidual(from: Uint8Array, to: Uint8Array, width: number, height: number, p: number, dx: number, dy: number): number {
  const py = (p / width) | 0, px = p - py * width;
  const qx = px + dx, qy = py + dy;
  const x0 = Math.floor(qx), y0 = Math.floor(qy);
  if (x0 < 0 || y0 < 0 || x0 + 1 >= width || y0 + 1 >= height) return Number.NaN;
  const ax = qx - x0, ay = qy - y0, q = y0 * width + x0;
  const v = (1 - ay) * ((1 - ax) * to[q] + ax * to[q + 1]) + ay * ((1 - ax) * to[q + width] + ax * to[q + width + 1]);
  return v - from[p];
}
