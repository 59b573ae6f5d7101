import { createRequire } from 'node:module';
import binomialTest from '@stdlib/stats-binomial-test';
import { describe, expect, it } from 'vitest';
import { clopperPearsonInterval } from '../../src/stats/clopperPearson.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: {
    beta: { inv(p: number, a: number, b: number): number };
    binomial: { cdf(k: number, n: number, p: number): number };
  };
};

describe('clopperPearsonInterval', () => {
  // "Two-sided confidence intervals for the single proportion: comparison of seven methods",
  // Statistics in Medicine 17(8), 1998, Table I, method 5 (exact, Clopper–Pearson).
  // Values to 4 decimals, FROM MEMORY (the table itself could not be retrieved here).
  const tableI: [number, number, number, number][] = [
    [81, 263, 0.2527, 0.3676],
    [15, 148, 0.0578, 0.1617],
    [0, 20, 0.0, 0.1684],
    [1, 29, 0.0009, 0.1776],
  ];
  it.each(tableI)('%i/%i matches Table I of the 1998 comparison of seven methods', (x, n, lo, hi) => {
    const ci = clopperPearsonInterval(x, n)!;
    expect(Math.abs(ci.lower - lo)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(ci.upper - hi)).toBeLessThanOrEqual(5e-5);
  });

  it('agrees with @stdlib/stats-binomial-test within 1e-10, up to 350,757 trials', () => {
    for (const [x, n] of [[81, 263], [15, 148], [1, 29], [7, 9], [178_078, 350_757]]) {
      const ref = binomialTest(x, n).ci;
      const ci = clopperPearsonInterval(x, n)!;
      expect(Math.abs(ci.lower - ref[0])).toBeLessThan(1e-10);
      expect(Math.abs(ci.upper - ref[1])).toBeLessThan(1e-10);
    }
  });

  it('agrees with the beta quantiles of jstat (beta.inv) within 1e-7', () => {
    for (const [x, n] of [[81, 263], [15, 148], [1, 29]]) {
      const ci = clopperPearsonInterval(x, n)!;
      expect(Math.abs(ci.lower - jStat.beta.inv(0.025, x, n - x + 1))).toBeLessThan(1e-7);
      expect(Math.abs(ci.upper - jStat.beta.inv(0.975, x + 1, n - x))).toBeLessThan(1e-7);
    }
  });

  it('puts α/2 in each binomial tail at its ends (jstat binomial cdf, the defining property)', () => {
    for (const [x, n] of [[81, 263], [15, 148], [1, 29]]) {
      const ci = clopperPearsonInterval(x, n)!;
      expect(1 - jStat.binomial.cdf(x - 1, n, ci.lower)).toBeCloseTo(0.025, 8); // P(X ≥ x | lower)
      expect(jStat.binomial.cdf(x, n, ci.upper)).toBeCloseTo(0.025, 8); // P(X ≤ x | upper)
    }
  });

  it('has lower 0 at x = 0 and upper 1 at x = n, where the one tail is α/2: 1 − 0.025^(1/n)', () => {
    expect(clopperPearsonInterval(0, 20)!.lower).toBe(0);
    expect(clopperPearsonInterval(20, 20)!.upper).toBe(1);
    expect(clopperPearsonInterval(0, 20)!.upper).toBeCloseTo(1 - 0.025 ** (1 / 20), 12);
  });

  it('returns null without trials or with impossible counts', () => {
    expect(clopperPearsonInterval(0, 0)).toBeNull();
    expect(clopperPearsonInterval(4, 3)).toBeNull();
  });
});
