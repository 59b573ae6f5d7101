import { Matrix, inverse } from 'ml-matrix';
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
  // The 3×3 eigenproblem in closed form: a general iterative solver can fail to end on the nearly singular
  // matrices of degenerate samples (five of six points on one line).
  const vecs = realEigenvectors3(Mr.to2DArray());
  let best: number[] | null = null;
  let bestCost = Number.POSITIVE_INFINITY;
  for (const [a, b, c] of vecs) {
    const cond = 4 * a * c - b * b; // the ellipse constraint aᵀC1a > 0 ([2])
    if (!(cond > 0)) continue;
    // Algebraic cost a1ᵀ M a1 per unit constraint; the true solution minimises it.
    let cost = 0;
    const v = [a, b, c];
    for (let r = 0; r < 3; r++) for (let q = 0; q < 3; q++) cost += v[r] * M.get(r, q) * v[q];
    cost /= cond;
    if (cost < bestCost) {
      bestCost = cost;
      best = v;
    }
  }
  if (!best || !best.every(Number.isFinite)) return { ok: false, reason: 'not_an_ellipse' };
  const a1 = best;
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

/**
 * Real eigenvectors of the 3×3 matrix `m` (rows), one per distinct real eigenvalue, in closed form: the roots of
 * the characteristic cubic (trigonometric form for three real roots, Cardano's formula for one; each polished by
 * two Newton steps), and for each root the largest cross product of two rows of m − λI. A root whose rows leave
 * no direction (a repeated eigenvalue) gives no vector. Standard linear algebra, common practice, no source.
 */
export function realEigenvectors3(m: number[][]): number[][] {
  const tr = m[0][0] + m[1][1] + m[2][2];
  const minors = m[0][0] * m[1][1] - m[0][1] * m[1][0] + m[0][0] * m[2][2] - m[0][2] * m[2][0] + m[1][1] * m[2][2] - m[1][2] * m[2][1];
  const det = m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
    + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  // λ³ − tr λ² + minors λ − det = 0; λ = x + tr/3 gives x³ + p x + q = 0.
  const p = minors - (tr * tr) / 3;
  const q = (-2 * tr * tr * tr) / 27 + (tr * minors) / 3 - det;
  const roots: number[] = [];
  const disc = (q * q) / 4 + (p * p * p) / 27;
  if (p < 0 && disc < 0) {
    const r = Math.sqrt(-p / 3);
    const phi = Math.acos(Math.max(-1, Math.min(1, (-q / 2) / (r * r * r))));
    for (let k = 0; k < 3; k++) roots.push(2 * r * Math.cos((phi - 2 * Math.PI * k) / 3) + tr / 3);
  } else {
    const sq = Math.sqrt(Math.max(disc, 0));
    roots.push(Math.cbrt(-q / 2 + sq) + Math.cbrt(-q / 2 - sq) + tr / 3);
  }
  const out: number[][] = [];
  const scaleM = Math.max(...m.flat().map(Math.abs), 1e-300);
  for (let lam of roots) {
    for (let it = 0; it < 2; it++) {
      const f = ((lam - tr) * lam + minors) * lam - det;
      const df = (3 * lam - 2 * tr) * lam + minors;
      if (df !== 0 && Number.isFinite(f / df)) lam -= f / df;
    }
    const a = m.map((row, i) => row.map((v, j) => (i === j ? v - lam : v)));
    const cross = (u: number[], v: number[]) => [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]];
    let bestV: number[] | null = null;
    let bestN = 0;
    for (const [i, j] of [[0, 1], [0, 2], [1, 2]]) {
      const c = cross(a[i], a[j]);
      const nrm = Math.hypot(c[0], c[1], c[2]);
      if (nrm > bestN) { bestN = nrm; bestV = c; }
    }
    if (!bestV || !(bestN > 1e-14 * scaleM * scaleM)) continue;
    const v = bestV.map((x) => x / bestN);
    if (out.every((w) => Math.abs(w[0] * v[0] + w[1] * v[1] + w[2] * v[2]) < 1 - 1e-12)) out.push(v);
  }
  return out;
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
