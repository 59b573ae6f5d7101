/**
 * Levenberg–Marquardt least squares with a finite-difference (or caller-supplied analytic) Jacobian, box bounds,
 * and standard errors from the Jacobian at the solution.
 *
 * References:
 * [1] "A method for the solution of certain non-linear problems in least squares",
 *     Quarterly of Applied Mathematics 2(2), 1944. DOI 10.1090/qam/10666
 * [2] "An algorithm for least-squares estimation of nonlinear parameters",
 *     Journal of the Society for Industrial and Applied Mathematics 11(2), 1963. DOI 10.1137/0111030
 * [3] "Methods for non-linear least squares problems", 2nd ed., IMM, Technical University of Denmark, 2004
 *     (the damping update of §3.2, eq. 3.16).
 * [4] "Matrix Computations", 4th ed., Johns Hopkins University Press, 2013 (§3.4, Gaussian elimination with
 *     partial pivoting, in the column-oriented "Crout" order of the JAMA library that ml-matrix ports).
 */
import { Matrix, inverse } from 'ml-matrix';

/** Residual function: writes `m` residuals for parameters `p` into `out`. */
export type ResidualFn = (p: Float64Array, out: Float64Array) => void;

/**
 * Jacobian function: writes ∂r_i/∂p_j for parameters `p` into `out`, row-major m × n (`out[i * n + j]`).
 * `out` arrives filled with zeros only on the first call; write every entry.
 */
export type JacobianFn = (p: Float64Array, out: Float64Array) => void;

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
  /**
   * Analytic Jacobian (default: central differences of `f`). A parameter pinned by equal bounds gets a zero
   * column either way (it is held fixed, as with finite differences).
   */
  jacobian?: JacobianFn;
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

/** JᵀJ (n × n, row-major, both triangles) of a row-major m × n Jacobian, into `out`. */
function gramInto(jac: Float64Array, m: number, n: number, out: Float64Array): void {
  out.fill(0);
  for (let i = 0, row = 0; i < m; i++, row += n) {
    for (let j = 0; j < n; j++) {
      const v = jac[row + j];
      if (v === 0) continue;
      for (let k = j; k < n; k++) out[j * n + k] += v * jac[row + k];
    }
  }
  for (let j = 0; j < n; j++) for (let k = j + 1; k < n; k++) out[k * n + j] = out[j * n + k];
}

/** Jᵀr into `out` (length n). */
function jtVectorInto(jac: Float64Array, r: Float64Array, m: number, n: number, out: Float64Array): void {
  out.fill(0);
  for (let i = 0, row = 0; i < m; i++, row += n) for (let j = 0; j < n; j++) out[j] += jac[row + j] * r[i];
}

function sumSquares(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return s;
}

/**
 * Solves a x = b in place for a square row-major `a` (n × n, overwritten by its LU factors) by Gaussian
 * elimination with partial pivoting (§3.4 of [4]); `x` receives the solution. Returns false when a pivot is
 * exactly zero (singular). Same operations in the same order as ml-matrix's LuDecomposition.solve.
 */
function luSolveInto(a: Float64Array, b: Float64Array, n: number, x: Float64Array, col: Float64Array, piv: Int32Array): boolean {
  for (let i = 0; i < n; i++) piv[i] = i;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) col[i] = a[i * n + j];
    for (let i = 0; i < n; i++) {
      const kmax = Math.min(i, j);
      let s = 0;
      for (let k = 0; k < kmax; k++) s += a[i * n + k] * col[k];
      col[i] -= s;
      a[i * n + j] = col[i];
    }
    let p = j;
    for (let i = j + 1; i < n; i++) if (Math.abs(col[i]) > Math.abs(col[p])) p = i;
    if (p !== j) {
      for (let k = 0; k < n; k++) {
        const t = a[p * n + k];
        a[p * n + k] = a[j * n + k];
        a[j * n + k] = t;
      }
      const v = piv[p];
      piv[p] = piv[j];
      piv[j] = v;
    }
    const d = a[j * n + j];
    if (d !== 0) for (let i = j + 1; i < n; i++) a[i * n + j] /= d;
  }
  for (let j = 0; j < n; j++) if (a[j * n + j] === 0) return false;
  for (let i = 0; i < n; i++) x[i] = b[piv[i]];
  for (let k = 0; k < n; k++) for (let i = k + 1; i < n; i++) x[i] -= x[k] * a[i * n + k];
  for (let k = n - 1; k >= 0; k--) {
    x[k] /= a[k * n + k];
    for (let i = 0; i < k; i++) x[i] -= x[k] * a[i * n + k];
  }
  return true;
}

/** Central-difference Jacobian (row-major m × n) into `jac`, respecting bounds by one-sided steps at a bound. */
function finiteDifferenceJacobian(f: ResidualFn, p: Float64Array, m: number, opts: LmOptions, scratch: Float64Array[], jac: Float64Array): void {
  const n = p.length;
  const [rPlus, rMinus] = scratch;
  const q = Float64Array.from(p);
  for (let j = 0; j < n; j++) {
    const scale = opts.stepScale ? opts.stepScale[j] : 1;
    const h = 1e-6 * Math.max(Math.abs(p[j]), scale);
    let hi = p[j] + h;
    let lo = p[j] - h;
    if (opts.upper && hi > opts.upper[j]) hi = p[j];
    if (opts.lower && lo < opts.lower[j]) lo = p[j];
    const d = hi - lo;
    // A parameter pinned between equal bounds has no derivative: its column stays zero (held fixed).
    if (d === 0) {
      for (let i = 0; i < m; i++) jac[i * n + j] = 0;
      continue;
    }
    q[j] = hi;
    f(q, rPlus);
    q[j] = lo;
    f(q, rMinus);
    q[j] = p[j];
    for (let i = 0; i < m; i++) jac[i * n + j] = (rPlus[i] - rMinus[i]) / d;
  }
}

/**
 * Minimises Σ r_i(p)² from `start`, within the box [lower, upper]. Each step solves
 * (JᵀJ + λ diag(JᵀJ)) δ = −Jᵀr (Marquardt's scaling, [2]) with λ shrunk by 3 on success and grown by
 * ν = 2, 4, 8, … on failure ([3]); J is the central-difference Jacobian (step 1e-6·max(|p_j|, stepScale_j),
 * default scale 1) unless `opts.jacobian` supplies it. Defaults: 100 iterations, tolerance 1e-12.
 * Returns the solution with standard errors, or `{ ok: false, reason }` when the residuals are not finite at the
 * start or there are fewer residuals than parameters. `start` is not mutated.
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
  const jac = new Float64Array(m * n);
  // Parameters pinned by equal bounds: zero columns of an analytic Jacobian, as the finite differences give.
  const pinned: number[] = [];
  if (opts.lower && opts.upper) for (let j = 0; j < n; j++) if (opts.lower[j] === opts.upper[j]) pinned.push(j);
  const evalJacobian = (at: Float64Array): void => {
    if (!opts.jacobian) {
      finiteDifferenceJacobian(f, at, m, opts, scratch, jac);
      return;
    }
    opts.jacobian(at, jac);
    for (const j of pinned) for (let i = 0; i < m; i++) jac[i * n + j] = 0;
  };
  const jtj = new Float64Array(n * n);
  const g = new Float64Array(n);
  const a = new Float64Array(n * n);
  const rhs = new Float64Array(n);
  const step = new Float64Array(n);
  const col = new Float64Array(n);
  const piv = new Int32Array(n);
  const held = new Uint8Array(n);
  let q = new Float64Array(n);
  let lambda = -1;
  let nu = 2;
  let converged = false;
  let iterations = 0;
  evalJacobian(p);
  for (; iterations < maxIter; iterations++) {
    gramInto(jac, m, n, jtj);
    jtVectorInto(jac, r, m, n, g);
    if (lambda < 0) lambda = 1e-3; // dimensionless: the step solves (JᵀJ + λ diag(JᵀJ)) δ = −Jᵀr (Marquardt's scaling, [2])
    // Parameters on a bound whose descent direction (−g) points out of the box are held for this step.
    for (let j = 0; j < n; j++) {
      const gj = g[j];
      held[j] = (opts.lower && p[j] <= opts.lower[j] && gj > 0) || (opts.upper && p[j] >= opts.upper[j] && gj < 0) ? 1 : 0;
    }
    let improved = false;
    for (let attempt = 0; attempt < 30; attempt++) {
      a.set(jtj);
      for (let j = 0; j < n; j++) a[j * n + j] = a[j * n + j] + lambda * Math.max(jtj[j * n + j], 1e-12);
      for (let j = 0; j < n; j++) {
        if (!held[j]) continue;
        for (let k = 0; k < n; k++) {
          a[j * n + k] = 0;
          a[k * n + j] = 0;
        }
        a[j * n + j] = 1;
      }
      for (let j = 0; j < n; j++) rhs[j] = held[j] ? 0 : g[j] * -1;
      if (!luSolveInto(a, rhs, n, step, col, piv)) {
        lambda *= nu;
        nu *= 2;
        continue;
      }
      for (let j = 0; j < n; j++) q[j] = p[j] + step[j];
      clampInto(q, opts.lower, opts.upper);
      f(q, trial);
      const trialCost = sumSquares(trial);
      if (Number.isFinite(trialCost) && trialCost < cost) {
        const rel = (cost - trialCost) / Math.max(cost, 1e-300);
        const swap = p;
        p = q;
        q = swap;
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
    evalJacobian(p);
    if (converged) break;
  }
  const dof = Math.max(m - n, 1);
  const sigma2 = cost / dof;
  const standardErrors = new Float64Array(n).fill(Number.NaN);
  let covariance: Matrix | null = null;
  // Parameters the residuals do not depend on (a zero column, e.g. a term whose regressor vanishes) or that
  // sit on a bound are held fixed for the covariance: their standard error is NaN, the others come from the
  // inverse of JᵀJ over the free columns.
  gramInto(jac, m, n, jtj);
  let maxDiag = 0;
  for (let j = 0; j < n; j++) maxDiag = Math.max(maxDiag, jtj[j * n + j]);
  const free: number[] = [];
  for (let j = 0; j < n; j++) {
    const atBound = (opts.lower && p[j] <= opts.lower[j]) || (opts.upper && p[j] >= opts.upper[j]);
    if (jtj[j * n + j] > 1e-14 * maxDiag && !atBound) free.push(j);
  }
  try {
    const sub = new Matrix(free.length, free.length);
    for (let i = 0; i < free.length; i++) for (let k = 0; k < free.length; k++) sub.set(i, k, jtj[free[i] * n + free[k]]);
    const inv = inverse(sub).mul(sigma2);
    const cov = new Matrix(n, n);
    covariance = cov;
    for (let i = 0; i < free.length; i++) {
      for (let k = 0; k < free.length; k++) cov.set(free[i], free[k], inv.get(i, k));
      const v = inv.get(i, i);
      standardErrors[free[i]] = v >= 0 ? Math.sqrt(v) : Number.NaN;
    }
  } catch {
    covariance = null;
  }
  return { ok: true, params: p, standardErrors, covariance, rms: Math.sqrt(cost / m), cost, iterations, converged };
}
