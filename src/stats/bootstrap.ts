/**
 * Seeded nonparametric bootstrap of a sample mean with the percentile interval.
 *
 * Draws `resamples` samples of size n with replacement ([1]), takes each mean, and reports the α/2 and 1 − α/2
 * quantiles of those means (the percentile interval, chapter 13 of [2]; quantiles by definition 7, see
 * `quantiles.ts`). The same seed gives the same interval.
 *
 * References:
 * [1] "Bootstrap methods: another look at the jackknife", The Annals of Statistics 7(1), 1979,
 *     DOI 10.1214/aos/1176344552.
 * [2] "An Introduction to the Bootstrap", Chapman & Hall, 1993, DOI 10.1201/9780429246593.
 */
import { createRng } from './rng.ts';
import { quantiles } from './quantiles.ts';

/** Options of {@link bootstrapMeanInterval}. */
export interface BootstrapOptions {
  /** Seed of the generator (reduced to 32 bits). Required: results are reproducible by design. */
  readonly seed: number;
  /** Number of bootstrap resamples; default 2000. */
  readonly resamples?: number;
  /** Two-sided coverage in (0, 1); default 0.95. */
  readonly confidence?: number;
}

/** Result of {@link bootstrapMeanInterval}. */
export interface BootstrapMeanInterval {
  /** Mean of the finite values. */
  readonly mean: number;
  /** Lower end of the percentile interval. */
  readonly lower: number;
  /** Upper end of the percentile interval. */
  readonly upper: number;
  /** Number of finite values used. */
  readonly n: number;
  /** Number of resamples drawn. */
  readonly resamples: number;
}

/**
 * Percentile bootstrap interval of the mean of `values` (non-finite values are dropped; input not mutated).
 * @returns the interval, or null when no finite value is left or the options are invalid
 */
export function bootstrapMeanInterval(
  values: readonly number[],
  options: BootstrapOptions,
): BootstrapMeanInterval | null {
  const resamples = options.resamples ?? 2000;
  const confidence = options.confidence ?? 0.95;
  if (!Number.isInteger(resamples) || resamples < 1 || !(confidence > 0 && confidence < 1)) return null;
  const sample = values.filter((v) => Number.isFinite(v));
  const n = sample.length;
  if (n === 0) return null;
  let total = 0;
  for (const v of sample) total += v;
  const mean = total / n;
  const rng = createRng(options.seed);
  const means = new Array<number>(resamples);
  for (let b = 0; b < resamples; b++) {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += sample[Math.floor(rng.next() * n)]; // draw with replacement, [1]
    means[b] = sum / n;
  }
  const alpha = 1 - confidence;
  const [lower, upper] = quantiles(means, [alpha / 2, 1 - alpha / 2]) as number[]; // percentile interval of [2]
  return { mean, lower, upper, n, resamples };
}
