import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/stats/rng.ts';
import { quantiles } from '../../src/stats/quantiles.ts';

// reference library (dev only): jstat 1.9.6; jStat.quantiles(arr, ps, 1, 1) is definition 7 of
// "Sample quantiles in statistical packages", The American Statistician 50(4), 1996
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { quantiles(arr: number[], ps: number[], alphap: number, betap: number): number[] };
};

describe('quantiles', () => {
  it('interpolates between order statistics (definition 7): 1..10 at 5% is 1.45, {1,2,3,4} median 2.5', () => {
    const ten = Array.from({ length: 10 }, (_, i) => i + 1);
    expect(quantiles(ten, [0.05])![0]).toBeCloseTo(1.45, 12); // h = 9·0.05 + 1 = 1.45
    expect(quantiles([4, 1, 3, 2], [0.5])![0]).toBe(2.5);
    expect(quantiles(ten, [0, 1])).toEqual([1, 10]);
  });

  it('agrees with jstat quantiles (alphap = betap = 1) on random samples', () => {
    const rng = createRng(5);
    for (const n of [2, 3, 17, 250]) {
      const xs = Array.from({ length: n }, () => rng.next() * 100 - 30);
      const ps = [0.05, 0.25, 0.5, 0.75, 0.95];
      const mine = quantiles(xs, ps)!;
      const ref = jStat.quantiles(xs, ps, 1, 1);
      for (let i = 0; i < ps.length; i++) expect(mine[i]).toBeCloseTo(ref[i], 10);
    }
  });

  it('ignores non-finite values, does not mutate its input, and returns null when nothing is left', () => {
    const xs = [3, Number.NaN, 1, Number.POSITIVE_INFINITY, 2];
    const copy = [...xs];
    expect(quantiles(xs, [0.5])).toEqual([2]);
    expect(xs).toEqual(copy);
    expect(quantiles([Number.NaN], [0.5])).toBeNull();
    expect(quantiles([], [0.5])).toBeNull();
  });

  it('is monotone in the probability', () => {
    const xs = [5, 1, 9, 2, 2, 7];
    const q = quantiles(xs, [0.05, 0.25, 0.5, 0.75, 0.95])!;
    for (let i = 1; i < q.length; i++) expect(q[i]).toBeGreaterThanOrEqual(q[i - 1]);
  });
});
