import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { planTosses } from '../../src/stats/power.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { binomial: { cdf(k: number, n: number, p: number): number } };
};

/** Exact power from jstat alone: equal-tailed critical values under p0 = ½, then the tails under p. */
function jstatPower(n: number, p: number, alpha = 0.05): number {
  const cdf = (k: number, q: number): number => (k < 0 ? 0 : jStat.binomial.cdf(k, n, q));
  let ku = Math.ceil(n / 2);
  while (1 - cdf(ku - 1, 0.5) > alpha / 2) ku++;
  let kl = Math.floor(n / 2);
  while (cdf(kl, 0.5) > alpha / 2) kl--;
  return 1 - cdf(ku - 1, p) + cdf(kl, p);
}

describe('planTosses', () => {
  it('needs 30,658 tosses for p = 0.508 at power 0.8, two-sided α = 0.05 (normal approximation, by hand)', () => {
    // by hand: z = 1.959964, 0.841621; √(½·½) = 0.5, √(0.508·0.492) = 0.499936;
    // ((1.959964·0.5 + 0.841621·0.499936) / 0.008)² = (1.400739 / 0.008)² = 175.0924² = 30,657.3 → 30,658
    const plan = planTosses({ sameSideRate: 0.508 });
    expect(plan.normalTosses).toBe(30_658);
  });

  it('finds the exact n where the exact test first reaches the power (checked with jstat binomial cdf)', () => {
    const plan = planTosses({ sameSideRate: 0.508 });
    expect(jstatPower(plan.exactTosses, 0.508)).toBeGreaterThanOrEqual(0.8);
    expect(jstatPower(plan.exactTosses - 1, 0.508)).toBeLessThan(0.8);
    expect(Math.abs(plan.exactPower - jstatPower(plan.exactTosses, 0.508))).toBeLessThan(1e-9);
    // the exact test is a little conservative, so it needs slightly more than the approximation
    expect(plan.exactTosses).toBeGreaterThanOrEqual(plan.normalTosses);
    expect(plan.exactTosses).toBeLessThan(plan.normalTosses * 1.01);
  });

  it('for a large bias (p = 0.7) no n below the exact answer reaches the power (full scan with jstat)', () => {
    const plan = planTosses({ sameSideRate: 0.7, power: 0.9 });
    for (let n = 1; n < plan.exactTosses; n++) expect(jstatPower(n, 0.7)).toBeLessThan(0.9);
    expect(jstatPower(plan.exactTosses, 0.7)).toBeGreaterThanOrEqual(0.9);
  });

  it('is symmetric about ½ and grows as the bias shrinks', () => {
    expect(planTosses({ sameSideRate: 0.45 }).normalTosses).toBe(planTosses({ sameSideRate: 0.55 }).normalTosses);
    expect(planTosses({ sameSideRate: 0.51 }).normalTosses).toBeLessThan(planTosses({ sameSideRate: 0.505 }).normalTosses);
  });

  it('shares tosses among tossers with the design effect 1 + (m − 1)·ICC, ICC = s²/(p q)', () => {
    // design effect: "Survey Sampling", John Wiley & Sons, 1965; ICC of a beta-binomial: Biometrics 31(4), 1975
    const plan = planTosses({ sameSideRate: 0.508, tossers: 60, tosserSd: 0.02 });
    const c = plan.clustered!;
    expect(c.icc).toBeCloseTo(0.02 ** 2 / (0.508 * 0.492), 15);
    expect(c.feasible).toBe(true);
    const m = c.tossesPerTosser!;
    expect(c.designEffect).toBeCloseTo(1 + (m - 1) * c.icc, 12);
    expect(c.totalTosses).toBe(m * 60);
    // enough at m, not enough at m − 1: the smallest share meeting N ≥ n₀ · deff
    expect(m * 60).toBeGreaterThanOrEqual(plan.normalTosses * (1 + (m - 1) * c.icc));
    expect((m - 1) * 60).toBeLessThan(plan.normalTosses * (1 + (m - 2) * c.icc));
  });

  it('reports infeasible when k ≤ n₀·ICC, with the fewest tossers that would do', () => {
    const plan = planTosses({ sameSideRate: 0.508, tossers: 40, tosserSd: 0.02 });
    const c = plan.clustered!;
    expect(c.feasible).toBe(false);
    expect(c.tossesPerTosser).toBeNull();
    expect(c.minimumTossers).toBe(Math.floor(plan.normalTosses * c.icc) + 1);
    expect(planTosses({ sameSideRate: 0.508, tossers: c.minimumTossers, tosserSd: 0.02 }).clustered!.feasible).toBe(true);
  });

  it('with no spread splits n₀ evenly: ⌈n₀ / k⌉ each', () => {
    const plan = planTosses({ sameSideRate: 0.508, tossers: 7 });
    expect(plan.clustered!.tossesPerTosser).toBe(Math.ceil(30_658 / 7));
    expect(plan.clustered!.designEffect).toBe(1);
  });

  it('rejects impossible options with a RangeError', () => {
    expect(() => planTosses({ sameSideRate: 0.5 })).toThrow(RangeError);
    expect(() => planTosses({ sameSideRate: 0.6, power: 1 })).toThrow(RangeError);
    expect(() => planTosses({ sameSideRate: 0.6, tossers: 0 })).toThrow(RangeError);
    expect(() => planTosses({ sameSideRate: 0.6, tossers: 3, tosserSd: 0.6 })).toThrow(RangeError);
  });
});
