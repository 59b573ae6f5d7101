import { canonicalAxisAngle, type Ellipse } from './ellipse.ts';
import { hypot2 } from '../hypot.ts';

/** Options of {@link fitEllipseFixedMajor}. */
export interface FixedMajorFitOptions {
  /** Starting ellipse (centre, minor axis, angle); its major axis is ignored. The centre prior is about its centre. */
  readonly start: Ellipse;
  /**
   * Further starting ellipses (e.g. a free fit of the same points). Each start is iterated and the
   * result of least final robust cost (biweight at the final cut-off, plus the prior) is returned.
   */
  readonly altStarts?: readonly Ellipse[];
  /**
   * Standard deviation of a Gaussian prior of the centre about `start`'s centre, px
   * (default Infinity: no prior). A short arc leaves the centre along the arc's chord
   * poorly determined; a prior of about the prediction's uncertainty holds it there.
   */
  readonly centreSigmaPx?: number;
  /**
   * Standard deviation of a Gaussian prior of the FULL minor axis about `start.minor`, px (default
   * Infinity: none). An arc of one side only (the coin's other half merged with the fingers) fixes
   * the edge's position but hardly the minor axis; the prior takes it from the neighbouring frames.
   */
  readonly minorSigmaPx?: number;
  /** Gauss–Newton iterations (default 25). */
  readonly iterations?: number;
  /** Tukey biweight constant in robust σ (default 4.685, 95 % Gaussian efficiency). */
  readonly tukeyC?: number;
  /** Lowest robust σ of the residuals, px (default 0.35; crack-midpoint outlines are quantised to 0.5 px). */
  readonly floorPx?: number;
  /** Inliers: |residual| ≤ max(inlierFloorPx, 2.5 σ) (default 1 px). */
  readonly inlierFloorPx?: number;
  /**
   * Largest biweight cut-off in the second half of the iterations, px (default 2). The first half
   * uses tukeyC·σ from the MAD (so a start a few px off converges); outlines of a coin sit within a
   * pixel of their ellipse, and a fixed cut-off keeps nearby outlines (fingertips) from inflating σ.
   */
  readonly maxCutoffPx?: number;
  /** Smallest FULL minor axis, px (default 1; a coin's rim keeps its edge-on silhouette at least that thick). */
  readonly minMinorPx?: number;
}

/** Result of {@link fitEllipseFixedMajor}: failure as a value. */
export type FixedMajorFitResult =
  | {
    readonly ok: true;
    /** The fit; `major` equals the requested one unless the fitted minor exceeds it (then they are swapped). */
    readonly ellipse: Ellipse;
    /** RMS Sampson distance of the inliers, px. */
    readonly rms: number;
    /** Number of inliers. */
    readonly inliers: number;
    /** Fraction of 24 equal sectors of the ellipse's eccentric anomaly that hold an inlier, [0, 1]. */
    readonly coverage: number;
    readonly iterations: number;
  }
  | { readonly ok: false; readonly reason: string };

/**
 * Robust fit of an ellipse whose FULL major axis is known (`majorPx`, the coin's diameter
 * in px: a circle seen at any tilt projects, to first order, to an ellipse whose major
 * axis is the diameter) to outline points (x, y), px. Free parameters: centre, minor axis,
 * angle. Minimises the Tukey biweight of the Sampson distance of each point to the conic
 * `(u/a)² + (v/b)² = 1` (u, v along the axes), by iteratively reweighted Gauss–Newton with
 * Levenberg damping and a numerical Jacobian, from `start`; an optional Gaussian prior
 * keeps the centre near `start`. Meant for short visible arcs (a coin held in the fingers),
 * where a free five-parameter fit is ill-conditioned. Uses the first `count` points;
 * does not mutate its inputs.
 *
 * Fails (`ok: false`) with fewer than 6 points, on a non-finite start, or when no inlier is left.
 *
 * References:
 * [1] "Robust regression using iteratively reweighted least-squares", Communications in
 *     Statistics – Theory and Methods 6(9), 1977, DOI 10.1080/03610927708827533 (IRLS, Tukey's biweight; cited from memory).
 * [2] "Fitting conic sections to 'very scattered' data: an iterative refinement of the Bookstein
 *     algorithm", Computer Graphics and Image Processing 18(1), 1982, DOI 10.1016/0146-664X(82)90101-0
 *     (the Sampson distance, first-order geometric distance to a conic; cited from memory).
 * [3] "A method for the solution of certain non-linear problems in least squares",
 *     Quarterly of Applied Mathematics 2(2), 1944, DOI 10.1090/qam/10666 (damping).
 */
export function fitEllipseFixedMajor(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  count: number,
  majorPx: number,
  opts: FixedMajorFitOptions,
): FixedMajorFitResult {
  const s0 = opts.start;
  if (count < 6) return { ok: false, reason: `needs at least 6 points, got ${count}` };
  if (!(majorPx > 0) || ![s0.cx, s0.cy, s0.minor, s0.angleRad].every(Number.isFinite)) {
    return { ok: false, reason: 'non-finite start or major axis' };
  }
  let best: FixedMajorFitResult | null = null;
  let bestCost = Infinity;
  // Plain records of one shape: the starts arrive built in several ways (literals, spreads), and a start of a
  // new shape deoptimised the fit and had V8 compile it again (14 times in one run over 8 clips).
  const prior = startOf(s0);
  for (const st of [s0, ...(opts.altStarts ?? [])]) {
    if (![st.cx, st.cy, st.minor, st.angleRad].every(Number.isFinite)) continue;
    const res = fitFrom(xs, ys, count, majorPx, opts, prior, startOf(st));
    if (res.result.ok && res.cost < bestCost) { best = res.result; bestCost = res.cost; }
    else if (!best) best = res.result;
  }
  return best!;
}

/** The parts of an ellipse a start needs, as a record of one shape. */
interface Start { cx: number; cy: number; minor: number; angleRad: number }
const startOf = (e: Ellipse): Start => ({ cx: e.cx, cy: e.cy, minor: e.minor, angleRad: e.angleRad });

/** One start `st` of {@link fitEllipseFixedMajor} (`s0`: the prior's start): the result and its final robust cost. */
function fitFrom(
  xs: ArrayLike<number>, ys: ArrayLike<number>, count: number, majorPx: number, opts: FixedMajorFitOptions, s0: Start, st: Start,
): { result: FixedMajorFitResult; cost: number } {
  const a = majorPx / 2;
  const iterations = opts.iterations ?? 25;
  const tukeyC = opts.tukeyC ?? 4.685;
  const floorPx = opts.floorPx ?? 0.35;
  const inlierFloor = opts.inlierFloorPx ?? 1;
  const priorW = Number.isFinite(opts.centreSigmaPx ?? Infinity) ? 1 / (opts.centreSigmaPx! ** 2) : 0;
  const maxCut = opts.maxCutoffPx ?? 2;
  // Prior of the semi-minor axis b = minor / 2: σ_b = σ_minor / 2.
  const minorW = Number.isFinite(opts.minorSigmaPx ?? Infinity) ? 4 / (opts.minorSigmaPx! ** 2) : 0;
  const b0 = s0.minor / 2;
  const bMin = Math.min(a, 0.5 * (opts.minMinorPx ?? 1));
  // Parameters p = [cx, cy, b, θ].
  const p = [st.cx, st.cy, clamp(st.minor / 2, bMin, a), st.angleRad];
  const n = count;
  const r = new Float64Array(n);
  const w = new Float64Array(n);
  const abs = new Float64Array(n);
  const J = new Float64Array(n * 4);
  const rp = new Float64Array(n);
  const rm = new Float64Array(n);
  // Work arrays reused by every iteration (an allocation per step made this fit a main source of garbage).
  const qp = [0, 0, 0, 0], qm = [0, 0, 0, 0], q = [0, 0, 0, 0];
  const A = new Float64Array(16);
  const D = new Float64Array(16);
  const g = new Float64Array(4);

  const residuals = (q: number[], out: Float64Array): void => {
    const c = Math.cos(q[3]), s = Math.sin(q[3]);
    const ia2 = 1 / (a * a), ib2 = 1 / (q[2] * q[2]);
    for (let i = 0; i < n; i++) {
      const dx = xs[i] - q[0], dy = ys[i] - q[1];
      const u = c * dx + s * dy, v = -s * dx + c * dy;
      const f = u * u * ia2 + v * v * ib2 - 1;
      const g = 2 * hypot2(u * ia2, v * ib2);
      // Sampson distance f / |∇f| of [2]; at the centre the gradient vanishes: use the inner distance b.
      out[i] = g > 1e-9 ? f / g : -q[2];
    }
  };
  const robustSigma = (res: Float64Array): number => {
    for (let i = 0; i < n; i++) abs[i] = Math.abs(res[i]);
    abs.sort();
    const med = n % 2 ? abs[(n - 1) >> 1] : 0.5 * (abs[n / 2 - 1] + abs[n / 2]);
    return Math.max(floorPx, 1.4826 * med);
  };
  const cost = (res: Float64Array, sigma: number, q: number[]): number => {
    let sum = 0;
    const k = tukeyC * sigma;
    for (let i = 0; i < n; i++) {
      const z = res[i] / k;
      sum += z * z < 1 ? (k * k / 6) * (1 - (1 - z * z) ** 3) : k * k / 6;
    }
    return sum + 0.5 * priorW * ((q[0] - s0.cx) ** 2 + (q[1] - s0.cy) ** 2) + 0.5 * minorW * (q[2] - b0) ** 2;
  };

  let lambda = 1e-3;
  let it = 0;
  residuals(p, r);
  const half = iterations >> 1;
  for (; it < iterations; it++) {
    // Cut-off k = tukeyC·σ; in the second half at most maxCut (graduated: wide first, then tight).
    let sigma = robustSigma(r);
    if (it >= half) sigma = Math.min(sigma, maxCut / tukeyC);
    const k = tukeyC * sigma;
    // IRLS weights: Tukey's biweight ψ(r)/r of [1].
    let sw = 0;
    for (let i = 0; i < n; i++) {
      const z = r[i] / k;
      w[i] = z * z < 1 ? (1 - z * z) ** 2 : 0;
      sw += w[i];
    }
    if (sw <= 0) return { result: { ok: false, reason: 'no inlier left' }, cost: Infinity };
    // Numerical Jacobian (central differences).
    for (let j = 0; j < 4; j++) {
      for (let k = 0; k < 4; k++) { qp[k] = p[k]; qm[k] = p[k]; }
      qp[j] += JACOBIAN_STEPS[j];
      qm[j] -= JACOBIAN_STEPS[j];
      residuals(qp, rp);
      residuals(qm, rm);
      for (let i = 0; i < n; i++) J[i * 4 + j] = (rp[i] - rm[i]) / (2 * JACOBIAN_STEPS[j]);
    }
    // Normal equations JᵀWJ δ = −JᵀWr, plus the centre prior.
    A.fill(0);
    g.fill(0);
    for (let i = 0; i < n; i++) {
      const wi = w[i];
      if (wi === 0) continue;
      for (let j = 0; j < 4; j++) {
        const jij = J[i * 4 + j] * wi;
        g[j] -= jij * r[i];
        for (let m = j; m < 4; m++) A[j * 4 + m] += jij * J[i * 4 + m];
      }
    }
    A[0] += priorW; A[5] += priorW; A[10] += minorW;
    g[0] -= priorW * (p[0] - s0.cx);
    g[1] -= priorW * (p[1] - s0.cy);
    g[2] -= minorW * (p[2] - b0);
    for (let j = 0; j < 4; j++) for (let m = 0; m < j; m++) A[j * 4 + m] = A[m * 4 + j];
    const c0 = cost(r, sigma, p);
    let improved = false;
    for (let tries = 0; tries < 8; tries++) {
      D.set(A);
      for (let j = 0; j < 4; j++) D[j * 5] += lambda * Math.max(A[j * 5], 1e-9);
      const delta = solve4(D, g);
      if (!delta) { lambda *= 10; continue; }
      q[0] = p[0] + delta[0]; q[1] = p[1] + delta[1]; q[2] = clamp(p[2] + delta[2], bMin, a); q[3] = p[3] + delta[3];
      residuals(q, rp);
      if (cost(rp, sigma, q) <= c0) {
        for (let k = 0; k < 4; k++) p[k] = q[k];
        r.set(rp);
        lambda = Math.max(1e-7, lambda / 10);
        improved = true;
        if (Math.abs(delta[0]) + Math.abs(delta[1]) + Math.abs(delta[2]) < 1e-4 && Math.abs(delta[3]) < 1e-5) it = Math.max(it, half - 1);
        break;
      }
      lambda *= 10;
    }
    if (!improved) {
      if (it >= half) break;
      it = half - 1;
    }
  }
  // Inliers, RMS and angular coverage.
  const sigma = Math.min(robustSigma(r), maxCut / tukeyC);
  const lim = Math.max(inlierFloor, 2.5 * sigma);
  const c = Math.cos(p[3]), s = Math.sin(p[3]);
  const sectors = new Uint8Array(24);
  let m = 0, ss = 0;
  for (let i = 0; i < n; i++) {
    if (Math.abs(r[i]) > lim) continue;
    m++;
    ss += r[i] * r[i];
    const dx = xs[i] - p[0], dy = ys[i] - p[1];
    const u = c * dx + s * dy, v = -s * dx + c * dy;
    const phi = Math.atan2(v / p[2], u / a);
    sectors[Math.min(23, Math.floor(((phi + Math.PI) / (2 * Math.PI)) * 24))] = 1;
  }
  if (m === 0) return { result: { ok: false, reason: 'no inlier left' }, cost: Infinity };
  let hit = 0;
  for (let k = 0; k < 24; k++) hit += sectors[k];
  const b2 = 2 * p[2];
  const swap = b2 > majorPx;
  const ellipse: Ellipse = {
    cx: p[0], cy: p[1],
    major: swap ? b2 : majorPx, minor: swap ? majorPx : b2,
    angleRad: canonicalAxisAngle(swap ? p[3] + Math.PI / 2 : p[3]),
  };
  return { result: { ok: true, ellipse, rms: Math.sqrt(ss / m), inliers: m, coverage: hit / 24, iterations: it }, cost: cost(r, maxCut / tukeyC, p) };
}

/** Central-difference steps of the Jacobian for [cx, cy, b, θ] (px, px, px, rad). */
const JACOBIAN_STEPS = [1e-3, 1e-3, 1e-3, 1e-4];

function clamp(v: number, lo: number, hi: number): number {
  return v < lo ? lo : v > hi ? hi : v;
}

/** Work space of {@link solve4}: the augmented rows [A | b], 4 × 5, and the solution. */
const SOLVE_M = new Float64Array(20);
const SOLVE_X = new Float64Array(4);

/**
 * Solves the 4×4 system A x = b by Gaussian elimination with partial pivoting; null if singular. The solution is a
 * shared array, overwritten by the next call.
 */
function solve4(A: Float64Array, b: Float64Array): Float64Array | null {
  const M = SOLVE_M;
  for (let i = 0; i < 4; i++) {
    for (let j = 0; j < 4; j++) M[i * 5 + j] = A[i * 4 + j];
    M[i * 5 + 4] = b[i];
  }
  for (let col = 0; col < 4; col++) {
    let piv = col;
    for (let i = col + 1; i < 4; i++) if (Math.abs(M[i * 5 + col]) > Math.abs(M[piv * 5 + col])) piv = i;
    if (Math.abs(M[piv * 5 + col]) < 1e-14) return null;
    if (piv !== col) {
      for (let j = 0; j < 5; j++) {
        const t = M[col * 5 + j];
        M[col * 5 + j] = M[piv * 5 + j];
        M[piv * 5 + j] = t;
      }
    }
    for (let i = col + 1; i < 4; i++) {
      const f = M[i * 5 + col] / M[col * 5 + col];
      for (let j = col; j < 5; j++) M[i * 5 + j] -= f * M[col * 5 + j];
    }
  }
  const x = SOLVE_X;
  x.fill(0);
  for (let i = 3; i >= 0; i--) {
    let v = M[i * 5 + 4];
    for (let j = i + 1; j < 4; j++) v -= M[i * 5 + j] * x[j];
    x[i] = v / M[i * 5 + i];
  }
  return x;
}
