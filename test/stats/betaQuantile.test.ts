import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { betaQuantile } from '../../src/stats/betaQuantile.ts';
import { regularizedBeta } from '../../src/stats/regularizedBeta.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { beta: { inv(p: number, a: number, b: number): number } };
};

describe('betaQuantile', () => {
  it('inverts the distribution function: I(betaQuantile(p)) = p over a grid of shapes', () => {
    for (const [a, b] of [[0.5, 0.5], [1, 1], [2, 9], [81, 183], [0.3, 40], [15, 134], [178_078, 172_680]]) {
      for (const p of [1e-6, 0.025, 0.2, 0.5, 0.8, 0.975, 1 - 1e-6]) {
        const x = betaQuantile(p, a, b);
        expect(x).toBeGreaterThanOrEqual(0);
        expect(x).toBeLessThanOrEqual(1);
        expect(Math.abs(regularizedBeta(x, a, b) - p)).toBeLessThan(1e-9 * Math.max(p, 1e-3));
      }
    }
  });

  it('agrees with jstat beta.inv within 1e-7 (jstat stops at a relative step of 1e-8)', () => {
    for (const [p, a, b] of [[0.025, 81, 183], [0.975, 82, 182], [0.025, 15, 134], [0.975, 16, 133], [0.3, 2.5, 4.5]]) {
      expect(Math.abs(betaQuantile(p, a, b) - jStat.beta.inv(p, a, b))).toBeLessThan(1e-7);
    }
  });

  it('finds tiny quantiles: Beta(1, b) has the closed form 1 − (1 − p)^(1/b)', () => {
    for (const p of [1e-12, 1e-6, 0.025]) {
      const exact = -Math.expm1(Math.log1p(-p) / 50);
      expect(Math.abs(betaQuantile(p, 1, 50) - exact) / exact).toBeLessThan(1e-9);
    }
  });

  it('maps 0 to 0 and 1 to 1, and invalid input to NaN', () => {
    expect(betaQuantile(0, 2, 3)).toBe(0);
    expect(betaQuantile(1, 2, 3)).toBe(1);
    expect(betaQuantile(1.5, 2, 3)).toBeNaN();
    expect(betaQuantile(0.5, -1, 3)).toBeNaN();
  });
});
