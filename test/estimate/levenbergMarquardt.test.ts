import { describe, expect, it } from 'vitest';
import { levenbergMarquardt } from '../../src/estimate/levenbergMarquardt.ts';

// NIST Statistical Reference Datasets, nonlinear regression, "Misra1a" (lower difficulty):
// y = b1 (1 − exp(−b2 x)), 14 observations, certified values to 11 digits. Source: NIST StRD, Nonlinear
// Regression datasets, Misra1a (itl.nist.gov/div898/strd/nls/data/misra1a.shtml), 1997 — data and certified
// values typed from memory of that page.
const X = [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0];
const Y = [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.40, 75.47, 81.78];
const CERT = { b1: 2.3894212918e2, b2: 5.5015643181e-4, se1: 2.7070075241, se2: 7.2668688436e-6, rss: 1.2455138894e-1 };

const residuals = (p: Float64Array, out: Float64Array): void => {
  for (let i = 0; i < X.length; i++) out[i] = Y[i] - p[0] * (1 - Math.exp(-p[1] * X[i]));
};
// ∂r/∂b1 = −(1 − e^{−b2 x}), ∂r/∂b2 = −b1 x e^{−b2 x} (closed form of the model above).
const jacobian = (p: Float64Array, out: Float64Array): void => {
  for (let i = 0; i < X.length; i++) {
    const e = Math.exp(-p[1] * X[i]);
    out[2 * i] = -(1 - e);
    out[2 * i + 1] = -p[0] * X[i] * e;
  }
};

describe('levenbergMarquardt', () => {
  for (const [label, jac] of [['finite differences', undefined], ['an analytic Jacobian', jacobian]] as const) {
    it(`reproduces the NIST certified values of Misra1a from start 1 with ${label}`, () => {
      const fit = levenbergMarquardt(residuals, [500, 1e-4], { m: X.length, stepScale: [1, 1e-4], maxIterations: 500, jacobian: jac });
      expect(fit.ok).toBe(true);
      if (!fit.ok) return;
      // The certified values carry 11 significant digits; 1e-6 relative leaves room for the stopping rule.
      expect(Math.abs(fit.params[0] - CERT.b1) / CERT.b1).toBeLessThan(1e-6);
      expect(Math.abs(fit.params[1] - CERT.b2) / CERT.b2).toBeLessThan(1e-6);
      expect(Math.abs(fit.cost - CERT.rss) / CERT.rss).toBeLessThan(1e-8);
      // Standard errors sqrt(σ² (JᵀJ)⁻¹), σ² = RSS/(n − p), as NIST defines them: 1e-4 relative.
      expect(Math.abs(fit.standardErrors[0] - CERT.se1) / CERT.se1).toBeLessThan(1e-4);
      expect(Math.abs(fit.standardErrors[1] - CERT.se2) / CERT.se2).toBeLessThan(1e-4);
    });
  }

  it('takes the same path with an analytic Jacobian as with central differences (agreement to 1e-9)', () => {
    const opts = { m: X.length, stepScale: [1, 1e-4], maxIterations: 6 };
    const a = levenbergMarquardt(residuals, [250, 5e-4], opts);
    const b = levenbergMarquardt(residuals, [250, 5e-4], { ...opts, jacobian });
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    expect(b.iterations).toBe(a.iterations);
    for (let j = 0; j < 2; j++) expect(Math.abs(a.params[j] - b.params[j]) / Math.abs(a.params[j])).toBeLessThan(1e-9);
  });

  it('holds a parameter pinned by equal bounds, also when the analytic Jacobian has a column for it', () => {
    const lower = [-Infinity, 6e-4];
    const upper = [Infinity, 6e-4];
    const fit = levenbergMarquardt(residuals, [200, 6e-4], { m: X.length, lower, upper, jacobian, maxIterations: 200 });
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    expect(fit.params[1]).toBe(6e-4);
    expect(Number.isNaN(fit.standardErrors[1])).toBe(true);
    // With b2 fixed the model is linear in b1: b1 = Σ y g / Σ g², g = 1 − e^{−b2 x} (normal equation, closed form).
    let num = 0;
    let den = 0;
    for (let i = 0; i < X.length; i++) {
      const g = 1 - Math.exp(-6e-4 * X[i]);
      num += Y[i] * g;
      den += g * g;
    }
    expect(Math.abs(fit.params[0] - num / den) / (num / den)).toBeLessThan(1e-9);
  });

  it('rejects fewer residuals than parameters and non-finite starts with a reason', () => {
    expect(levenbergMarquardt(residuals, [1, 2, 3], { m: 2 }).ok).toBe(false);
    const bad = levenbergMarquardt((_p, out) => out.fill(Number.NaN), [1, 1], { m: 3 });
    expect(bad.ok).toBe(false);
  });
});
