import { createRequire } from 'node:module';
import binomialTest from '@stdlib/stats-binomial-test';
import { describe, expect, it } from 'vitest';
import { exactTestPower } from '../../src/stats/binomialTestPower.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { binomial: { cdf(k: number, n: number, p: number): number } };
};
const cdf = (k: number, n: number, p: number): number => (k < 0 ? 0 : jStat.binomial.cdf(k, n, p));

describe('exactTestPower', () => {
  it('rejects exactly the counts the two-sided exact test of @stdlib/stats-binomial-test rejects (n = 100, 247)', () => {
    for (const n of [100, 247]) {
      const { lowerCritical, upperCritical } = exactTestPower(n, 0.6);
      for (let x = 0; x <= n; x++) {
        const rejected = binomialTest(x, n, { p: 0.5, alpha: 0.05 }).pValue <= 0.05;
        expect(rejected).toBe(x <= lowerCritical || x >= upperCritical);
      }
    }
  });

  it('puts at most α/2 in each tail of H0 and is maximal (jstat binomial cdf)', () => {
    for (const n of [10, 100, 1000, 30_000]) {
      const r = exactTestPower(n, 0.51);
      expect(1 - cdf(r.upperCritical - 1, n, 0.5)).toBeLessThanOrEqual(0.025 + 1e-10);
      expect(1 - cdf(r.upperCritical - 2, n, 0.5)).toBeGreaterThan(0.025);
      expect(cdf(r.lowerCritical, n, 0.5)).toBeLessThanOrEqual(0.025 + 1e-10);
      expect(cdf(r.lowerCritical + 1, n, 0.5)).toBeGreaterThan(0.025);
      expect(r.size).toBeLessThanOrEqual(0.05 + 1e-10);
    }
  });

  it('power equals the two tail sums under the alternative (jstat binomial cdf) and its size at p = p0', () => {
    for (const [n, p] of [[100, 0.6], [1000, 0.53], [30_719, 0.508]]) {
      const r = exactTestPower(n, p);
      const ref = 1 - cdf(r.upperCritical - 1, n, p) + cdf(r.lowerCritical, n, p);
      expect(Math.abs(r.power - ref)).toBeLessThan(1e-9);
      expect(exactTestPower(n, 0.5).power).toBeCloseTo(r.size, 12);
    }
  });

  it('rejects nothing when n is too small for α (n = 5: the most extreme count has probability 1/32 > 0.025)', () => {
    const r = exactTestPower(5, 0.9);
    expect(r.lowerCritical).toBe(-1);
    expect(r.upperCritical).toBe(6);
    expect(r.power).toBe(0);
  });
});
