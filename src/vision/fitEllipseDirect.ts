import { conicToEllipse, ellipseToConic, type Conic, type Ellipse } from './ellipse.ts';
import { hypot3 } from '../hypot.ts';

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
  const s1 = S1.fill(0);
  const s2 = S2.fill(0);
  const s3 = S3.fill(0);
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
  // S3 is n·cov of (u, v, 1): singular when the points are collinear.
  const det3 = s3[0] * (s3[4] * s3[8] - s3[5] * s3[7])
    - s3[1] * (s3[3] * s3[8] - s3[5] * s3[6])
    + s3[2] * (s3[3] * s3[7] - s3[4] * s3[6]);
  if (!(Math.abs(det3) > 1e-10 * n * n * n)) return { ok: false, reason: 'no_spread' };

  // T = −S3⁻¹ S2ᵀ: a2 = T a1 (the linear part from the quadratic part, [1]); M = S1 + S2 T, the reduced scatter
  // matrix ([1]). Plain 3×3 arithmetic in the operation order of ml-matrix's LU inverse and product (row-major
  // scratch, no allocation: the trimmed fit calls this for every random sample).
  const inv = INV;
  if (!invert3(s3, inv)) return { ok: false, reason: 'no_spread' };
  const T = TT;
  for (let j = 0; j < 3; j++) {
    for (let i = 0; i < 3; i++) {
      let acc = 0;
      for (let k = 0; k < 3; k++) acc += inv[i * 3 + k] * s2[j * 3 + k];
      T[i * 3 + j] = acc * -1;
    }
  }
  const M = MM;
  for (let j = 0; j < 3; j++) {
    for (let i = 0; i < 3; i++) {
      let acc = 0;
      for (let k = 0; k < 3; k++) acc += s2[i * 3 + k] * T[k * 3 + j];
      M[i * 3 + j] = s1[i * 3 + j] + acc;
    }
  }
  // Premultiply by C1⁻¹ with C1 = [[0,0,2],[0,-1,0],[2,0,0]]: rows M3/2, −M2, M1/2 ([1]).
  const Mr = [
    [M[6] / 2, M[7] / 2, M[8] / 2],
    [-M[3], -M[4], -M[5]],
    [M[0] / 2, M[1] / 2, M[2] / 2],
  ];
  // The 3×3 eigenproblem in closed form: a general iterative solver can fail to end on the nearly singular
  // matrices of degenerate samples (five of six points on one line).
  const vecs = realEigenvectors3(Mr);
  let best: number[] | null = null;
  let bestCost = Number.POSITIVE_INFINITY;
  for (const [a, b, c] of vecs) {
    const cond = 4 * a * c - b * b; // the ellipse constraint aᵀC1a > 0 ([2])
    if (!(cond > 0)) continue;
    // Algebraic cost a1ᵀ M a1 per unit constraint; the true solution minimises it.
    let cost = 0;
    const v = [a, b, c];
    for (let r = 0; r < 3; r++) for (let q = 0; q < 3; q++) cost += v[r] * M[r * 3 + q] * v[q];
    cost /= cond;
    if (cost < bestCost) {
      bestCost = cost;
      best = v;
    }
  }
  if (!best || !best.every(Number.isFinite)) return { ok: false, reason: 'not_an_ellipse' };
  const a1 = best;
  const a2 = [0, 1, 2].map((r) => T[r * 3] * a1[0] + T[r * 3 + 1] * a1[1] + T[r * 3 + 2] * a1[2]);
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

const S1 = new Float64Array(9);
const S2 = new Float64Array(9);
const S3 = new Float64Array(9);
const INV = new Float64Array(9);
const TT = new Float64Array(9);
const MM = new Float64Array(9);
const LU = new Float64Array(9);
const COL = new Float64Array(3);
const PIV = new Float64Array(3);

/**
 * Inverse of the row-major 3×3 matrix `a` into `out`: LU decomposition with partial pivoting (Crout's column
 * order) and a solve against the identity, in the operation order of ml-matrix's `inverse` (`LuDecomposition`),
 * so the results agree to the bit. False when a pivot is 0 (singular). Standard linear algebra, no source.
 */
function invert3(a: Float64Array, out: Float64Array): boolean {
  const lu = LU;
  lu.set(a);
  for (let i = 0; i < 3; i++) PIV[i] = i;
  for (let j = 0; j < 3; j++) {
    for (let i = 0; i < 3; i++) COL[i] = lu[i * 3 + j];
    for (let i = 0; i < 3; i++) {
      const kmax = Math.min(i, j);
      let s = 0;
      for (let k = 0; k < kmax; k++) s += lu[i * 3 + k] * COL[k];
      COL[i] -= s;
      lu[i * 3 + j] = COL[i];
    }
    let p = j;
    for (let i = j + 1; i < 3; i++) if (Math.abs(COL[i]) > Math.abs(COL[p])) p = i;
    if (p !== j) {
      for (let k = 0; k < 3; k++) {
        const t = lu[p * 3 + k];
        lu[p * 3 + k] = lu[j * 3 + k];
        lu[j * 3 + k] = t;
      }
      const v = PIV[p];
      PIV[p] = PIV[j];
      PIV[j] = v;
    }
    if (lu[j * 3 + j] !== 0) for (let i = j + 1; i < 3; i++) lu[i * 3 + j] = lu[i * 3 + j] / lu[j * 3 + j];
  }
  for (let j = 0; j < 3; j++) if (lu[j * 3 + j] === 0) return false;
  // X = the identity's rows in pivot order, then forward and back substitution.
  const X = out;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) X[i * 3 + j] = PIV[i] === j ? 1 : 0;
  for (let k = 0; k < 3; k++) {
    for (let i = k + 1; i < 3; i++) for (let j = 0; j < 3; j++) X[i * 3 + j] = X[i * 3 + j] - X[k * 3 + j] * lu[i * 3 + k];
  }
  for (let k = 2; k >= 0; k--) {
    for (let j = 0; j < 3; j++) X[k * 3 + j] = X[k * 3 + j] / lu[k * 3 + k];
    for (let i = 0; i < k; i++) for (let j = 0; j < 3; j++) X[i * 3 + j] = X[i * 3 + j] - X[k * 3 + j] * lu[i * 3 + k];
  }
  return true;
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
  let scaleM = 1e-300;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) scaleM = Math.max(scaleM, Math.abs(m[i][j]));
  for (let lam of roots) {
    for (let it = 0; it < 2; it++) {
      const f = ((lam - tr) * lam + minors) * lam - det;
      const df = (3 * lam - 2 * tr) * lam + minors;
      if (df !== 0 && Number.isFinite(f / df)) lam -= f / df;
    }
    // Rows of m − λI; the largest cross product of two of them.
    const a00 = m[0][0] - lam, a01 = m[0][1], a02 = m[0][2];
    const a10 = m[1][0], a11 = m[1][1] - lam, a12 = m[1][2];
    const a20 = m[2][0], a21 = m[2][1], a22 = m[2][2] - lam;
    let b0 = 0, b1 = 0, b2 = 0;
    let bestN = 0;
    for (let pair = 0; pair < 3; pair++) {
      const u0 = pair < 2 ? a00 : a10, u1 = pair < 2 ? a01 : a11, u2 = pair < 2 ? a02 : a12;
      const w0 = pair === 0 ? a10 : a20, w1 = pair === 0 ? a11 : a21, w2 = pair === 0 ? a12 : a22;
      const c0 = u1 * w2 - u2 * w1, c1 = u2 * w0 - u0 * w2, c2 = u0 * w1 - u1 * w0;
      const nrm = hypot3(c0, c1, c2);
      if (nrm > bestN) { bestN = nrm; b0 = c0; b1 = c1; b2 = c2; }
    }
    if (!(bestN > 0) || !(bestN > 1e-14 * scaleM * scaleM)) continue;
    const v = [b0 / bestN, b1 / bestN, b2 / bestN];
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
