import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { logGamma } from '../../src/stats/logGamma.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as { jStat: { gammaln(x: number): number } };

describe('logGamma', () => {
  it('logGamma(n) equals ln((n − 1)!) for n = 1..25 (closed form, Γ(n) = (n − 1)!)', () => {
    let lnFactorial = 0;
    for (let n = 1; n <= 25; n++) {
      if (n > 1) lnFactorial += Math.log(n - 1);
      // 1e-13 relative: the Lanczos g = 7 set is good to about 1e-15
      expect(Math.abs(logGamma(n) - lnFactorial)).toBeLessThanOrEqual(1e-13 * Math.max(1, lnFactorial));
    }
  });

  it('logGamma(1/2) is ln √π and logGamma(3/2) is ln(√π / 2) (closed forms)', () => {
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    expect(logGamma(1.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI) / 2), 14);
  });

  it('agrees with jstat gammaln from 0.01 to 1e6 within 1e-12 relative', () => {
    for (const x of [0.01, 0.1, 0.37, 0.99, 2.5, 7.3, 42.1, 180.5, 1e3 + 0.25, 175_379, 350_758, 1e6]) {
      const ref = jStat.gammaln(x);
      expect(Math.abs(logGamma(x) - ref)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(ref)));
    }
  });

  it('returns NaN for x ≤ 0', () => {
    expect(logGamma(0)).toBeNaN();
    expect(logGamma(-1.5)).toBeNaN();
  });
});
