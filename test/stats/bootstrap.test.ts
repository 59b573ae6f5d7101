import { describe, expect, it } from 'vitest';
import { bootstrapMeanInterval } from '../../src/stats/bootstrap.ts';
import { createRng } from '../../src/stats/rng.ts';

describe('bootstrapMeanInterval', () => {
  const rng = createRng(11);
  const sample = Array.from({ length: 200 }, () => 0.5 + 0.1 * (rng.next() - 0.5));

  it('is reproducible by seed and changes with the seed', () => {
    const a = bootstrapMeanInterval(sample, { seed: 3 });
    const b = bootstrapMeanInterval(sample, { seed: 3 });
    const c = bootstrapMeanInterval(sample, { seed: 4 });
    expect(a).toEqual(b);
    expect(c!.lower).not.toBe(a!.lower);
  });

  it('covers the sample mean, and its width matches the normal theory 2·1.96·s/√n within 15%', () => {
    // the percentile interval of a mean of n = 200 uniforms is close to normal (central limit theorem)
    const r = bootstrapMeanInterval(sample, { seed: 1, resamples: 4000 })!;
    const mean = sample.reduce((s, v) => s + v, 0) / sample.length;
    expect(r.mean).toBeCloseTo(mean, 14);
    expect(r.lower).toBeLessThan(mean);
    expect(r.upper).toBeGreaterThan(mean);
    const sd = Math.sqrt(sample.reduce((s, v) => s + (v - mean) ** 2, 0) / sample.length);
    const width = 2 * 1.959964 * (sd / Math.sqrt(sample.length));
    expect(Math.abs(r.upper - r.lower - width) / width).toBeLessThan(0.15);
  });

  it('covers the true mean in about 95% of repeated samples (coverage between 0.88 and 0.99 over 300)', () => {
    const draw = createRng(99);
    let covered = 0;
    const trials = 300;
    for (let t = 0; t < trials; t++) {
      const xs = Array.from({ length: 40 }, () => draw.next()); // true mean ½
      const r = bootstrapMeanInterval(xs, { seed: t, resamples: 400 })!;
      if (r.lower <= 0.5 && 0.5 <= r.upper) covered++;
    }
    expect(covered / trials).toBeGreaterThan(0.88);
    expect(covered / trials).toBeLessThan(0.99);
  });

  it('gives a zero-width interval for a constant sample, drops non-finite values, null when empty', () => {
    const r = bootstrapMeanInterval([0.7, 0.7, Number.NaN, 0.7], { seed: 1 })!;
    expect(r.n).toBe(3);
    expect(r.lower).toBeCloseTo(0.7, 14);
    expect(r.upper).toBeCloseTo(0.7, 14);
    expect(bootstrapMeanInterval([], { seed: 1 })).toBeNull();
    expect(bootstrapMeanInterval([1], { seed: 1, resamples: 0 })).toBeNull();
  });
});
