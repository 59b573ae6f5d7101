import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { wilsonInterval } from '../../src/stats/wilson.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { normal: { inv(p: number, mean: number, sd: number): number } };
};

describe('wilsonInterval', () => {
  // "Two-sided confidence intervals for the single proportion: comparison of seven methods",
  // Statistics in Medicine 17(8), 1998, Table I, method 3 (score, no continuity correction).
  // Values to 4 decimals, FROM MEMORY (the table itself could not be retrieved here).
  const tableI: [number, number, number, number][] = [
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0.0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ];
  it.each(tableI)('%i/%i matches Table I of the 1998 comparison of seven methods', (x, n, lo, hi) => {
    const ci = wilsonInterval(x, n)!;
    expect(Math.abs(ci.lower - lo)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(ci.upper - hi)).toBeLessThanOrEqual(5e-5);
  });

  it('gives 0.506042–0.509351 for 178,078 same-side of 350,757 flips', () => {
    // "Fair coins tend to land on the same side they started: evidence from 350,757 flips", arXiv 2310.04153, 2023
    // (the counts; the interval to 6 decimals as given in our brief, the paper reports 0.506–0.509)
    const ci = wilsonInterval(178_078, 350_757)!;
    expect(Math.abs(ci.lower - 0.506042)).toBeLessThanOrEqual(5e-7);
    expect(Math.abs(ci.upper - 0.509351)).toBeLessThanOrEqual(5e-7);
  });

  it('its ends solve the score equation (x − n p)² = z² n p (1 − p) with z from jstat', () => {
    const z = jStat.normal.inv(0.975, 0, 1);
    for (const [x, n] of [[81, 263], [15, 148], [1, 29], [178_078, 350_757]]) {
      const ci = wilsonInterval(x, n)!;
      for (const p of [ci.lower, ci.upper]) {
        const lhs = (x - n * p) ** 2;
        const rhs = z * z * n * p * (1 - p);
        expect(Math.abs(lhs - rhs) / rhs).toBeLessThan(1e-9);
      }
    }
  });

  it('contains x/n, stays in [0, 1], mirrors under x → n − x and widens with the confidence', () => {
    for (const [x, n] of [[0, 5], [3, 7], [7, 7], [40, 100]]) {
      const ci = wilsonInterval(x, n)!;
      const mirror = wilsonInterval(n - x, n)!;
      expect(ci.lower).toBeGreaterThanOrEqual(0);
      expect(ci.upper).toBeLessThanOrEqual(1);
      expect(ci.lower).toBeLessThanOrEqual(x / n);
      expect(ci.upper).toBeGreaterThanOrEqual(x / n);
      expect(mirror.lower).toBeCloseTo(1 - ci.upper, 12);
      const wide = wilsonInterval(x, n, 0.99)!;
      expect(wide.upper - wide.lower).toBeGreaterThan(ci.upper - ci.lower);
    }
  });

  it('returns null without trials or with impossible counts', () => {
    expect(wilsonInterval(0, 0)).toBeNull();
    expect(wilsonInterval(5, 3)).toBeNull();
    expect(wilsonInterval(1, 3, 1)).toBeNull();
  });
});
