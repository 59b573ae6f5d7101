/**
 * Robust linear least squares by iteratively reweighted least squares with Tukey's biweight,
 * the scale re-estimated each round by the median absolute deviation.
 *
 * References:
 * [1] "The fitting of power series, meaning polynomials, illustrated on band-spectroscopic data",
 *     Technometrics 16(2), 1974 (the biweight). DOI 10.1080/00401706.1974.10489171
 * [2] "Robust regression using iteratively reweighted least-squares",
 *     Communications in Statistics – Theory and Methods 6(9), 1977. DOI 10.1080/03610927708827533
 */
import { Matrix, inverse, solve } from 'ml-matrix';

export interface RobustFitOptions {
  /** Tukey biweight tuning constant in units of the robust scale (default 4.685, 95% efficiency at the normal). */
  c?: number;
  /** Iterations of reweighting (default 20). */
  iterations?: number;
  /** A floor for the robust scale, in the units of y (default 1e-9), so exact data do not divide by zero. */
  minScale?: number;
  /** Prior weights per observation (default 1). */
  weights?: ArrayLike<number>;
  /** Skip reweighting: plain (weighted) least squares. */
  plain?: boolean;
}

export type RobustFitResult =
  | {
      ok: true;
      coef: number[];
      /** Standard errors from σ² (Xᵀ W X)⁻¹ with σ the robust scale of the final residuals. */
      se: number[];
      covariance: number[][];
      /** Final robustness weights (0 for rejected points) times the prior weights. */
      weights: Float64Array;
      residuals: Float64Array;
      /** Robust scale (1.4826 · MAD) of the residuals of the kept points. */
      sigma: number;
    }
  | { ok: false; reason: string };

function median(values: number[]): number {
  if (values.length === 0) return Number.NaN;
  const s = Float64Array.from(values).sort(); // numeric order, faster than a comparator
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : 0.5 * (s[mid - 1] + s[mid]);
}

function weightedSolve(x: number[][], y: ArrayLike<number>, w: ArrayLike<number>): { coef: number[]; xtwxInv: Matrix } | null {
  const n = x[0].length;
  const a = Matrix.zeros(n, n);
  const b = Matrix.zeros(n, 1);
  for (let i = 0; i < x.length; i++) {
    const wi = w[i];
    if (!(wi > 0)) continue;
    const row = x[i];
    for (let j = 0; j < n; j++) {
      b.set(j, 0, b.get(j, 0) + wi * row[j] * y[i]);
      for (let k = 0; k < n; k++) a.set(j, k, a.get(j, k) + wi * row[j] * row[k]);
    }
  }
  try {
    const coef = solve(a, b).to1DArray();
    if (!coef.every(Number.isFinite)) return null;
    return { coef, xtwxInv: inverse(a) };
  } catch {
    return null;
  }
}

/**
 * Fits y ≈ X·coef robustly. `x` holds one design row per observation. Does not mutate its inputs.
 * Returns `{ ok: false }` when there are fewer usable points than coefficients or the design is singular.
 */
export function robustLinearFit(x: number[][], y: ArrayLike<number>, opts: RobustFitOptions = {}): RobustFitResult {
  const m = x.length;
  if (m === 0) return { ok: false, reason: 'no points' };
  const n = x[0].length;
  const prior = opts.weights ?? new Float64Array(m).fill(1);
  let usable = 0;
  for (let i = 0; i < m; i++) if (prior[i] > 0) usable++;
  if (usable < n) return { ok: false, reason: `too few points (${usable}) for ${n} coefficients` };
  const c = opts.c ?? 4.685;
  const minScale = opts.minScale ?? 1e-9;
  const w = Float64Array.from(prior);
  const res = new Float64Array(m);
  let sol = weightedSolve(x, y, w);
  if (!sol) return { ok: false, reason: 'singular design' };
  let sigma = Number.NaN;
  const rounds = opts.plain ? 1 : (opts.iterations ?? 20);
  for (let it = 0; it < rounds; it++) {
    const abs: number[] = [];
    for (let i = 0; i < m; i++) {
      let pred = 0;
      for (let j = 0; j < n; j++) pred += x[i][j] * sol.coef[j];
      res[i] = y[i] - pred;
      if (prior[i] > 0) abs.push(Math.abs(res[i]));
    }
    sigma = Math.max(1.4826 * median(abs), minScale);
    if (opts.plain) break;
    for (let i = 0; i < m; i++) {
      const u = res[i] / (c * sigma);
      w[i] = prior[i] > 0 && Math.abs(u) < 1 ? prior[i] * (1 - u * u) ** 2 : 0;
    }
    const next = weightedSolve(x, y, w);
    if (!next) break;
    const change = next.coef.reduce((s, v, j) => Math.max(s, Math.abs(v - sol!.coef[j])), 0);
    sol = next;
    if (change < 1e-12 * (1 + Math.max(...sol.coef.map(Math.abs)))) break;
  }
  // Final residuals and scale from the kept points.
  const kept: number[] = [];
  let wsum = 0;
  let wres2 = 0;
  for (let i = 0; i < m; i++) {
    let pred = 0;
    for (let j = 0; j < n; j++) pred += x[i][j] * sol.coef[j];
    res[i] = y[i] - pred;
    if (w[i] > 0) {
      kept.push(Math.abs(res[i]));
      wsum += w[i];
      wres2 += w[i] * res[i] * res[i];
    }
  }
  const keptCount = kept.length;
  // Residual variance of the weighted fit (unbiased for the kept points), a robust floor from the MAD.
  const s2 = keptCount > n ? (wres2 / wsum) * (keptCount / (keptCount - n)) : sigma * sigma;
  const cov = sol.xtwxInv.clone().mul(s2 * (wsum / Math.max(keptCount, 1)));
  const covariance = cov.to2DArray();
  const se = covariance.map((row, j) => Math.sqrt(Math.max(row[j], 0)));
  return { ok: true, coef: sol.coef, se, covariance, weights: w, residuals: res, sigma: Math.sqrt(s2) };
}
