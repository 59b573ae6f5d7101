import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { normalCdf } from '../../src/stats/normalCdf.ts';
import { normalQuantile } from '../../src/stats/normalQuantile.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as { jStat: { normal: { cdf(x: number, mean: number, sd: number): number } } };

describe('normalCdf', () => {
  it('agrees with jStat (a general-purpose statistics library from npm) from −8 to 8', () => {
    for (let x = -8; x <= 8; x += 0.0625) {
      const ref = jStat.normal.cdf(x, 0, 1);
      expect(Math.abs(normalCdf(x) - ref), `x = ${x}`).toBeLessThan(1e-13 + 1e-9 * ref);
    }
  });

  it('has the handbook values Φ(1.96) = 0.9750021 and Φ(−3) = 0.0013499 (standard normal tables; from memory)', () => {
    expect(normalCdf(1.96)).toBeCloseTo(0.9750021, 7);
    expect(normalCdf(-3)).toBeCloseTo(0.0013499, 7);
    expect(normalCdf(0)).toBe(0.5);
  });

  it('inverts the AS 241 quantile in both tails', () => {
    for (const p of [1e-12, 1e-6, 0.001, 0.2, 0.5, 0.8, 0.999, 1 - 1e-9]) {
      const back = normalCdf(normalQuantile(p));
      expect(Math.abs(back - p) / Math.min(p, 1 - p), `p = ${p}`).toBeLessThan(1e-9);
    }
  });

  it('is 0 and 1 at the infinities and NaN for NaN', () => {
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalCdf(Number.NaN)).toBeNaN();
  });
});
