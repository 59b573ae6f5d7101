/**
 * Levenberg–Marquardt least squares with a finite-difference Jacobian, box bounds,
 * and standard errors from the Jacobian at the solution.
 *
 * References:
 * [1] "A method for the solution of certain non-linear problems in least squares",
 *     Quarterly of Applied Mathematics 2(2), 1944. DOI 10.1090/qam/10666
 * [2] "An algorithm for least-squares estimation of nonlinear parameters",
 *     Journal of the Society for Industrial and Applied Mathematics 11(2), 1963. DOI 10.1137/0111030
 * [3] "Methods for non-linear least squares problems", 2nd ed., IMM, Technical University of Denmark, 2004
 *     (the damping update of §3.2, eq. 3.16).
 */
import { Matrix, inverse, solve } from 'ml-matrix';

/** Residual function: writes `m` residuals for parameters `p` into `out`. */
export type ResidualFn = (p: Float64Array, out: Float64Array) => void;

export interface LmOptions {
  /** Number of residuals. */
  m: number;
  /** Lower and upper bounds per parameter (default unbounded). */
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
  /** Relative finite-difference step per parameter (default 1e-6 of max(|p|, scale)). */
  stepScale?: ArrayLike<number>;
  /** Iteration limit (default 100). */
  maxIterations?: number;
  /** Stop when the relative decrease of the cost falls below this (default 1e-12). */
  tolerance?: number;
}

export type LmResult =
  | {
      ok: true;
      params: Float64Array;
      /** Standard errors: sqrt(diag(σ² (JᵀJ)⁻¹)), σ² = RSS / (m − n). NaN when JᵀJ is singular. */
      standardErrors: Float64Array;
      covariance: Matrix | null;
      /** Root mean square of the residuals at the solution. */
      rms: number;
      cost: number;
      iterations: number;
      converged: boolean;
    }
  | { ok: false; reason: string };

function clampInto(p: Float64Array, lower?: ArrayLike<number>, upper?: ArrayLike<number>): void {
  for (let i = 0; i < p.length; i++) {
    if (lower && p[i] < lower[i]) p[i] = lower[i];
    if (upper && p[i] > upper[i]) p[i] = upper[i];
  }
}

/** JᵀJ of an m × n Jacobian, by plain loops over its rows (ml-matrix's transpose and product allocate per call). */
function gram(jac: Matrix): Matrix {
  const m = jac.rows;
  const n = jac.columns;
  const out = new Float64Array(n * n);
  const row = new Float64Array(n);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < n; j++) row[j] = jac.get(i, j);
    for (let j = 0; j < n; j++) {
      const v = row[j];
      if (v === 0) continue;
      for (let k = j; k < n; k++) out[j * n + k] += v * row[k];
    }
  }
  const a = new Matrix(n, n);
  for (let j = 0; j < n; j++) for (let k = j; k < n; k++) { a.set(j, k, out[j * n + k]); a.set(k, j, out[j * n + k]); }
  return a;
}

/** Jᵀr as a plain array. */
function jtVector(jac: Matrix, r: Float64Array): number[] {
  const g = new Array<number>(jac.columns).fill(0);
  for (let i = 0; i < jac.rows; i++) for (let j = 0; j < jac.columns; j++) g[j] += jac.get(i, j) * r[i];
  return g;
}

function sumSquares(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return s;
}

/** Central-difference Jacobian (m × n), respecting bounds by one-sided steps at a bound. */
function jacobian(f: ResidualFn, p: Float64Array, m: number, opts: LmOptions, scratch: Float64Array[]): Matrix {
  const n = p.length;
  const jac = new Matrix(m, n);
  const [rPlus, rMinus] = scratch;
  const q = Float64Array.from(p);
  for (let j = 0; j < n; j++) {
    const scale = opts.stepScale ? opts.stepScale[j] : 1;
    const h = 1e-6 * Math.max(Math.abs(p[j]), scale);
    let hi = p[j] + h;
    let lo = p[j] - h;
    if (opts.upper && hi > opts.upper[j]) hi = p[j];
    if (opts.lower && lo < opts.lower[j]) lo = p[j];
    q[j] = hi;
    f(q, rPlus);
    q[j] = lo;
    f(q, rMinus);
    q[j] = p[j];
    const d = hi - lo;
    // A parameter pinned between equal bounds has no derivative: its column stays zero (held fixed).
    if (d === 0) continue;
    for (let i = 0; i < m; i++) jac.set(i, j, (rPlus[i] - rMinus[i]) / d);
  }
  return jac;
}

/**
 * Minimises Σ r_i(p)² from `start`. Returns the solution with standard errors, or
 * `{ ok: false, reason }` when the residuals are not finite at the start.
 */
export function levenbergMarquardt(f: ResidualFn, start: ArrayLike<number>, opts: LmOptions): LmResult {
  const n = start.length;
  const m = opts.m;
  if (m < n) return { ok: false, reason: `too few residuals (${m}) for ${n} parameters` };
  const maxIter = opts.maxIterations ?? 100;
  const tol = opts.tolerance ?? 1e-12;
  let p = Float64Array.from(start);
  clampInto(p, opts.lower, opts.upper);
  const r = new Float64Array(m);
  f(p, r);
  let cost = sumSquares(r);
  if (!Number.isFinite(cost)) return { ok: false, reason: 'residuals are not finite at the start' };
  const scratch = [new Float64Array(m), new Float64Array(m)];
  const trial = new Float64Array(m);
  let lambda = -1;
  let nu = 2;
  let converged = false;
  let iterations = 0;
  let jac = jacobian(f, p, m, opts, scratch);
  for (; iterations < maxIter; iterations++) {
    const jtj = gram(jac);
    const g = Matrix.columnVector(jtVector(jac, r));
    if (lambda < 0) lambda = 1e-3; // dimensionless: the step solves (JᵀJ + λ diag(JᵀJ)) δ = −Jᵀr (Marquardt's scaling, [2])
    // Parameters on a bound whose descent direction (−g) points out of the box are held for this step.
    const held: boolean[] = [];
    for (let j = 0; j < n; j++) {
      const gj = g.get(j, 0);
      held.push(Boolean((opts.lower && p[j] <= opts.lower[j] && gj > 0) || (opts.upper && p[j] >= opts.upper[j] && gj < 0)));
    }
    let improved = false;
    for (let attempt = 0; attempt < 30; attempt++) {
      const a = jtj.clone();
      for (let j = 0; j < n; j++) a.set(j, j, a.get(j, j) + lambda * Math.max(jtj.get(j, j), 1e-12));
      for (let j = 0; j < n; j++) {
        if (!held[j]) continue;
        for (let k = 0; k < n; k++) {
          a.set(j, k, 0);
          a.set(k, j, 0);
        }
        a.set(j, j, 1);
      }
      let step: Matrix;
      try {
        const rhs = g.clone().mul(-1);
        for (let j = 0; j < n; j++) if (held[j]) rhs.set(j, 0, 0);
        step = solve(a, rhs);
      } catch {
        lambda *= nu;
        nu *= 2;
        continue;
      }
      const q = new Float64Array(n);
      for (let j = 0; j < n; j++) q[j] = p[j] + step.get(j, 0);
      clampInto(q, opts.lower, opts.upper);
      f(q, trial);
      const trialCost = sumSquares(trial);
      if (Number.isFinite(trialCost) && trialCost < cost) {
        const rel = (cost - trialCost) / Math.max(cost, 1e-300);
        p = q;
        r.set(trial);
        cost = trialCost;
        lambda *= 1 / 3; // eq. 3.16 of [3], simplified: shrink on success
        nu = 2;
        improved = true;
        if (rel < tol) converged = true;
        break;
      }
      lambda *= nu;
      nu *= 2;
    }
    if (!improved) {
      converged = true; // no downhill step exists at machine precision: a (local) minimum
      break;
    }
    jac = jacobian(f, p, m, opts, scratch);
    if (converged) break;
  }
  const dof = Math.max(m - n, 1);
  const sigma2 = cost / dof;
  const standardErrors = new Float64Array(n).fill(Number.NaN);
  let covariance: Matrix | null = null;
  // Parameters the residuals do not depend on (a zero column, e.g. a term whose regressor vanishes) or that
  // sit on a bound are held fixed for the covariance: their standard error is NaN, the others come from the
  // inverse of JᵀJ over the free columns.
  const jtjAll = gram(jac);
  let maxDiag = 0;
  for (let j = 0; j < n; j++) maxDiag = Math.max(maxDiag, jtjAll.get(j, j));
  const free: number[] = [];
  for (let j = 0; j < n; j++) {
    const atBound = (opts.lower && p[j] <= opts.lower[j]) || (opts.upper && p[j] >= opts.upper[j]);
    if (jtjAll.get(j, j) > 1e-14 * maxDiag && !atBound) free.push(j);
  }
  try {
    const sub = new Matrix(free.length, free.length);
    for (let a = 0; a < free.length; a++) for (let b = 0; b < free.length; b++) sub.set(a, b, jtjAll.get(free[a], free[b]));
    const inv = inverse(sub).mul(sigma2);
    const cov = new Matrix(n, n);
    covariance = cov;
    for (let a = 0; a < free.length; a++) {
      for (let b = 0; b < free.length; b++) cov.set(free[a], free[b], inv.get(a, b));
      const v = inv.get(a, a);
      standardErrors[free[a]] = v >= 0 ? Math.sqrt(v) : Number.NaN;
    }
  } catch {
    covariance = null;
  }
  return { ok: true, params: p, standardErrors, covariance, rms: Math.sqrt(cost / m), cost, iterations, converged };
}
