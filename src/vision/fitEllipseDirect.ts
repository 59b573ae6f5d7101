import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import { conicToEllipse, ellipseToConic, type Conic, type Ellipse } from './ellipse.ts';

/** Result of {@link fitEllipseDirect}. `rms` is the RMS Sampson (first-order geometric) distance, px. */
export type DirectFitResult =
  | { readonly ok: true; readonly ellipse: Ellipse; readonly conic: Conic; readonly rms: number }
  | { readonly ok: false; readonly reason: 'too_few_points' | 'no_spread' | 'not_an_ellipse' };

/**
 * Direct least-squares ellipse fit: minimises the algebraic distance Σ(aᵀd)² under the
 * ellipse-specific constraint 4AC − B² = 1, in the numerically stable form that splits
 * the scatter matrix into quadratic and linear blocks and solves a 3×3 eigenproblem.
 * The points are centred on their mean and scaled to unit RMS radius first and the
 * result is mapped back at the end, so clouds far from the origin fit as well as near it.
 *
 * Uses the first `count` entries of `xs`, `ys` (default: all). Does not mutate them.
 * Needs at least 5 points that are not all on one line; returns
 * `{ ok: false, reason }` for too few points, no spread (all equal or collinear), or
 * a solution that is not a real ellipse.
 *
 * References:
 * [1] "Numerically stable direct least squares fitting of ellipses", Proc. WSCG 1998
 *     (the block decomposition and reduced eigenproblem implemented below).
 * [2] "Direct least square fitting of ellipses", IEEE Trans. Pattern Analysis and
 *     Machine Intelligence 21(5), 1999, DOI 10.1109/34.765658 (the constraint).
 * Equation numbers are not quoted: the steps are named after the papers' notation.
 */
export function fitEllipseDirect(xs: ArrayLike<number>, ys: ArrayLike<number>, count = Math.min(xs.length, ys.length)): DirectFitResult {
  const n = count;
  if (n < 5) return { ok: false, reason: 'too_few_points' };
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += xs[i];
    my += ys[i];
  }
  mx /= n;
  my /= n;
  let r2 = 0;
  for (let i = 0; i < n; i++) r2 += (xs[i] - mx) ** 2 + (ys[i] - my) ** 2;
  const scale = Math.sqrt(r2 / (2 * n)); // unit RMS per coordinate after scaling
  if (!(scale > 1e-12) || !Number.isFinite(scale)) return { ok: false, reason: 'no_spread' };

  // Scatter blocks S1 = D1ᵀD1, S2 = D1ᵀD2, S3 = D2ᵀD2 with D1 = [u², uv, v²], D2 = [u, v, 1] ([1]).
  const s1 = new Float64Array(9);
  const s2 = new Float64Array(9);
  const s3 = new Float64Array(9);
  const d1 = [0, 0, 0];
  const d2 = [0, 0, 1];
  for (let i = 0; i < n; i++) {
    const u = (xs[i] - mx) / scale;
    const v = (ys[i] - my) / scale;
    d1[0] = u * u; d1[1] = u * v; d1[2] = v * v;
    d2[0] = u; d2[1] = v;
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        s1[r * 3 + c] += d1[r] * d1[c];
        s2[r * 3 + c] += d1[r] * d2[c];
        s3[r * 3 + c] += d2[r] * d2[c];
      }
    }
  }
  const S1 = new Matrix([[s1[0], s1[1], s1[2]], [s1[3], s1[4], s1[5]], [s1[6], s1[7], s1[8]]]);
  const S2 = new Matrix([[s2[0], s2[1], s2[2]], [s2[3], s2[4], s2[5]], [s2[6], s2[7], s2[8]]]);
  const S3 = new Matrix([[s3[0], s3[1], s3[2]], [s3[3], s3[4], s3[5]], [s3[6], s3[7], s3[8]]]);
  // S3 is n·cov of (u, v, 1): singular when the points are collinear.
  const det3 = S3.get(0, 0) * (S3.get(1, 1) * S3.get(2, 2) - S3.get(1, 2) * S3.get(2, 1))
    - S3.get(0, 1) * (S3.get(1, 0) * S3.get(2, 2) - S3.get(1, 2) * S3.get(2, 0))
    + S3.get(0, 2) * (S3.get(1, 0) * S3.get(2, 1) - S3.get(1, 1) * S3.get(2, 0));
  if (!(Math.abs(det3) > 1e-10 * n * n * n)) return { ok: false, reason: 'no_spread' };

  const T = inverse(S3).mmul(S2.transpose()).mul(-1); // a2 = T a1 (linear part from the quadratic part, [1])
  const M = S1.add(S2.mmul(T)); // reduced scatter matrix ([1])
  // Premultiply by C1⁻¹ with C1 = [[0,0,2],[0,-1,0],[2,0,0]]: rows M3/2, −M2, M1/2 ([1]).
  const Mr = new Matrix([
    [M.get(2, 0) / 2, M.get(2, 1) / 2, M.get(2, 2) / 2],
    [-M.get(1, 0), -M.get(1, 1), -M.get(1, 2)],
    [M.get(0, 0) / 2, M.get(0, 1) / 2, M.get(0, 2) / 2],
  ]);
  const eig = new EigenvalueDecomposition(Mr, { assumeSymmetric: false });
  const vecs = eig.eigenvectorMatrix;
  const im = eig.imaginaryEigenvalues;
  let best = -1;
  let bestCost = Number.POSITIVE_INFINITY;
  for (let k = 0; k < 3; k++) {
    if (Math.abs(im[k]) > 1e-12 * (1 + Math.abs(eig.realEigenvalues[k]))) continue;
    const a = vecs.get(0, k);
    const b = vecs.get(1, k);
    const c = vecs.get(2, k);
    const cond = 4 * a * c - b * b; // the ellipse constraint aᵀC1a > 0 ([2])
    if (!(cond > 0)) continue;
    // Algebraic cost a1ᵀ M a1 per unit constraint; the true solution minimises it.
    let cost = 0;
    const v = [a, b, c];
    for (let r = 0; r < 3; r++) for (let q = 0; q < 3; q++) cost += v[r] * M.get(r, q) * v[q];
    cost /= cond;
    if (cost < bestCost) {
      bestCost = cost;
      best = k;
    }
  }
  if (best < 0) return { ok: false, reason: 'not_an_ellipse' };
  const a1 = [vecs.get(0, best), vecs.get(1, best), vecs.get(2, best)];
  const a2 = [0, 1, 2].map((r) => T.get(r, 0) * a1[0] + T.get(r, 1) * a1[1] + T.get(r, 2) * a1[2]);
  const unit = conicToEllipse([a1[0], a1[1], a1[2], a2[0], a2[1], a2[2]]);
  if (!unit.ok) return { ok: false, reason: 'not_an_ellipse' };
  const e = unit.ellipse;
  const ellipse: Ellipse = {
    cx: mx + scale * e.cx,
    cy: my + scale * e.cy,
    major: scale * e.major,
    minor: scale * e.minor,
    angleRad: e.angleRad,
  };
  const conic = ellipseToConic(ellipse);
  return { ok: true, ellipse, conic, rms: sampsonRms(conic, xs, ys, n) };
}

/** RMS of the Sampson distance |Q(p)| / |∇Q(p)| of the points to a conic, px. */
function sampsonRms(q: Conic, xs: ArrayLike<number>, ys: ArrayLike<number>, n: number): number {
  const [A, B, C, D, E, F] = q;
  let s = 0;
  for (let i = 0; i < n; i++) {
    const x = xs[i];
    const y = ys[i];
    const val = A * x * x + B * x * y + C * y * y + D * x + E * y + F;
    const gx = 2 * A * x + B * y + D;
    const gy = B * x + 2 * C * y + E;
    const g2 = gx * gx + gy * gy;
    s += g2 > 0 ? (val * val) / g2 : 0;
  }
  return Math.sqrt(s / n);
}
