import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { normalQuantile } from '../../src/stats/normalQuantile.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { normal: { inv(p: number, mean: number, sd: number): number } };
};

describe('normalQuantile', () => {
  it('agrees with jstat normal.inv within 1e-9 from p = 1e-8 to 1 − 1e-8', () => {
    // beyond that jstat's erfcinv drifts (1.3e-6 at p = 1e-12), so the far tail is checked against values below
    const ps = [1e-8, 1e-4, 0.001, 0.01, 0.025, 0.05, 0.075, 0.1, 0.2, 0.3, 0.5, 0.6, 0.8, 0.9, 0.925, 0.95,
      0.975, 0.99, 0.999, 1 - 1e-6, 1 - 1e-8];
    for (const p of ps) expect(Math.abs(normalQuantile(p) - jStat.normal.inv(p, 0, 1))).toBeLessThan(1e-9);
  });

  it('gives the familiar critical values 1.959964 and 0.841621 (tables of the trade, from memory)', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 12);
    expect(normalQuantile(0.8)).toBeCloseTo(0.8416212335729143, 12);
  });

  it('is odd about ½: Φ⁻¹(1 − p) = −Φ⁻¹(p), and Φ⁻¹(½) = 0', () => {
    expect(normalQuantile(0.5)).toBe(0);
    for (const p of [2 ** -40, 2 ** -20, 0.01, 0.3, 0.49]) // 1 − p exact in binary for the powers of two
      expect(normalQuantile(1 - p) + normalQuantile(p)).toBeCloseTo(0, 8);
  });

  it('reaches the far tail (r > 5 branch) and returns ±Infinity at 0 and 1', () => {
    // Φ⁻¹(1e-300) ≈ −37.0471 (from memory; same value as R's qnorm)
    expect(normalQuantile(1e-300)).toBeCloseTo(-37.04710, 4);
    // Φ⁻¹(1e-12) ≈ −7.034484 (from memory; R's qnorm gives the same to the digits shown)
    expect(normalQuantile(1e-12)).toBeCloseTo(-7.034484, 5);
    expect(normalQuantile(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(normalQuantile(1)).toBe(Number.POSITIVE_INFINITY);
    expect(normalQuantile(2)).toBeNaN();
  });
});
