import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { poolRates, type GroupCounts, type PooledRates } from '../../src/stats/betaBinomial.ts';
import { createRng } from '../../src/stats/rng.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { betaln(a: number, b: number): number; beta: { inv(p: number, a: number, b: number): number } };
};

/** Beta-binomial log-likelihood (Biometrics 31(4), 1975, binomial coefficients dropped), from jstat's ln B. */
function logLik(groups: GroupCounts[], mu: number, m: number): number {
  const a = mu * m;
  const b = (1 - mu) * m;
  return groups.reduce((s, g) => s + jStat.betaln(g.successes + a, g.trials - g.successes + b) - jStat.betaln(a, b), 0);
}

function fitted(groups: GroupCounts[]): PooledRates {
  const r = poolRates(groups);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

describe('poolRates', () => {
  const spread: GroupCounts[] = [
    { successes: 10, trials: 60 },
    { successes: 30, trials: 60 },
    { successes: 50, trials: 60 },
    { successes: 35, trials: 60 },
    { successes: 4, trials: 12 },
  ];

  it('equals the pooled rate X/N for every tosser when all tossers share a rate', () => {
    const same = [
      { successes: 30, trials: 60 },
      { successes: 15, trials: 30 },
      { successes: 45, trials: 90 },
    ];
    const r = fitted(same);
    expect(r.completePooling).toBe(true);
    for (const g of r.rates) expect(g.rate).toBe(90 / 180);
    // interval of the common rate under the Jeffreys prior, Beta(X + ½, N − X + ½), from jstat
    expect(r.rates[0].lower).toBeCloseTo(jStat.beta.inv(0.025, 90.5, 90.5), 6);
  });

  it('shrinks each raw rate toward the fitted mean, less for tossers with more tosses', () => {
    const r = fitted(spread);
    expect(r.completePooling).toBe(false);
    r.rates.forEach((g, i) => {
      const raw = spread[i].successes / spread[i].trials;
      expect(g.raw).toBe(raw);
      const lo = Math.min(raw, r.meanRate);
      const hi = Math.max(raw, r.meanRate);
      expect(g.rate).toBeGreaterThanOrEqual(lo);
      expect(g.rate).toBeLessThanOrEqual(hi);
      // posterior mean (α + x)/(M + n) = w·raw + (1 − w)·μ with w = n/(M + n)
      expect(g.rate).toBeCloseTo(g.ownWeight * raw + (1 - g.ownWeight) * r.meanRate, 12);
    });
    expect(r.rates[4].ownWeight).toBeLessThan(r.rates[0].ownWeight);
  });

  it('reports posterior Beta(α + x, β + n − x) intervals (jstat beta.inv)', () => {
    const r = fitted(spread);
    spread.forEach((g, i) => {
      const a = r.alpha + g.successes;
      const b = r.beta + g.trials - g.successes;
      expect(r.rates[i].lower).toBeCloseTo(jStat.beta.inv(0.025, a, b), 6);
      expect(r.rates[i].upper).toBeCloseTo(jStat.beta.inv(0.975, a, b), 6);
    });
  });

  it('sits at a maximum of the beta-binomial likelihood (computed with jstat betaln)', () => {
    const r = fitted(spread);
    const best = logLik(spread, r.meanRate, r.precision);
    for (const [dmu, fm] of [[0.01, 1], [-0.01, 1], [0, 1.1], [0, 1 / 1.1], [0.005, 1.05]]) {
      expect(logLik(spread, r.meanRate + dmu, r.precision * fm)).toBeLessThan(best + 1e-9);
    }
  });

  it('recovers the mean and spread of tossers drawn from Beta(mean 0.3, precision 20)', () => {
    const rng = createRng(31);
    const groups: GroupCounts[] = [];
    for (let i = 0; i < 150; i++) {
      const theta = jStat.beta.inv(rng.next(), 6, 14);
      let x = 0;
      for (let t = 0; t < 80; t++) if (rng.next() < theta) x++;
      groups.push({ successes: x, trials: 80 });
    }
    const r = fitted(groups);
    expect(Math.abs(r.meanRate - 0.3)).toBeLessThan(0.03);
    expect(r.precision).toBeGreaterThan(20 / 1.7);
    expect(r.precision).toBeLessThan(20 * 1.7);
    expect(r.betweenSd).toBeCloseTo(Math.sqrt((r.meanRate * (1 - r.meanRate)) / (r.precision + 1)), 12);
  });

  it('gives tossers without trials the prior mean, and fails as a value without any trials', () => {
    const r = fitted([...spread, { successes: 0, trials: 0 }]);
    expect(r.rates[5].raw).toBeNull();
    expect(r.rates[5].rate).toBeCloseTo(r.meanRate, 12);
    expect(poolRates([{ successes: 0, trials: 0 }])).toEqual({ ok: false, reason: 'no trials in any group' });
    expect(poolRates([{ successes: 3, trials: 2 }]).ok).toBe(false);
  });
});
