import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { regularizedBeta } from '../../src/stats/regularizedBeta.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { ibeta(x: number, a: number, b: number): number; binomial: { cdf(k: number, n: number, p: number): number } };
};

describe('regularizedBeta', () => {
  it('I_x(1, 1) = x and I_x(a, 1) = x^a and I_x(1, b) = 1 − (1 − x)^b (closed forms)', () => {
    for (const x of [0.001, 0.2, 0.5, 0.77, 0.999]) {
      expect(regularizedBeta(x, 1, 1)).toBeCloseTo(x, 14);
      expect(regularizedBeta(x, 3.5, 1)).toBeCloseTo(x ** 3.5, 14);
      expect(regularizedBeta(x, 1, 6)).toBeCloseTo(1 - (1 - x) ** 6, 14);
    }
  });

  it('I_½(a, a) = ½ by symmetry, also for a = 175,000', () => {
    for (const a of [0.3, 2, 17, 1000, 175_000]) expect(Math.abs(regularizedBeta(0.5, a, a) - 0.5)).toBeLessThan(1e-13);
  });

  it('equals the binomial tail sum P(X ≥ k) for n = 40 (exact sum of the pmf)', () => {
    const n = 40;
    const p = 0.37;
    const pmf: number[] = [];
    let lnC = 0;
    for (let k = 0; k <= n; k++) {
      if (k > 0) lnC += Math.log((n - k + 1) / k);
      pmf.push(Math.exp(lnC + k * Math.log(p) + (n - k) * Math.log(1 - p)));
    }
    for (const k of [1, 5, 12, 15, 20, 30, 40]) {
      const tail = pmf.slice(k).reduce((s, v) => s + v, 0);
      expect(Math.abs(regularizedBeta(p, k, n - k + 1) - tail)).toBeLessThan(1e-13);
    }
  });

  it('I_x(½, ½) = (2/π) arcsin √x (closed form, the arcsine distribution)', () => {
    for (const x of [0.001, 0.1, 0.5, 0.9]) {
      expect(regularizedBeta(x, 0.5, 0.5)).toBeCloseTo((2 / Math.PI) * Math.asin(Math.sqrt(x)), 14);
    }
  });

  it('agrees with jstat ibeta for moderate shapes within 2e-8', () => {
    // jstat's continued fraction stops after 100 terms at a 3e-7 step, so it is only good to about 1e-8:
    // a second opinion, not a precise reference (the closed forms above are)
    for (const [x, a, b] of [[0.1, 0.5, 0.5], [0.3, 2, 5], [0.72, 8.5, 3.25], [0.05, 1.5, 30], [0.5, 20, 21]]) {
      expect(Math.abs(regularizedBeta(x, a, b) - jStat.ibeta(x, a, b))).toBeLessThan(2e-8);
    }
  });

  it('agrees with jstat binomial cdf at n = 350,757 within 1e-9 (jstat rounds to 1e-10; its ln Γ of ~2e6 carries ~4e-10)', () => {
    const n = 350_757;
    for (const k of [175_000, 175_378, 176_000, 178_078]) {
      const mine = 1 - regularizedBeta(0.5, k + 1, n - k); // P(X ≤ k)
      expect(Math.abs(mine - jStat.binomial.cdf(k, n, 0.5))).toBeLessThan(1e-9);
    }
  });

  it('clamps x outside [0, 1] and rejects non-positive shapes', () => {
    expect(regularizedBeta(-0.1, 2, 3)).toBe(0);
    expect(regularizedBeta(1.1, 2, 3)).toBe(1);
    expect(regularizedBeta(0.5, 0, 3)).toBeNaN();
  });
});
