/**
 * Sample quantiles by linear interpolation between order statistics: definition 7 of [1] (the default of R
 * and of NumPy), Q(p) = x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋)) with h = (n − 1) p + 1 (1-based order statistics).
 *
 * References:
 * [1] "Sample quantiles in statistical packages", The American Statistician 50(4), 1996, DOI 10.2307/2684934.
 */

/**
 * Quantiles of `values` at each probability in `probs` (one sort for all).
 * Non-finite values (NaN, ±Infinity) are ignored. Does not mutate its input.
 * @param values - the sample
 * @param probs - probabilities in [0, 1]
 * @returns one quantile per probability, or null when no finite value is left
 */
export function quantiles(values: readonly number[], probs: readonly number[]): number[] | null {
  const sorted = values.filter((v) => Number.isFinite(v)).sort((a, b) => a - b);
  const n = sorted.length;
  if (n === 0) return null;
  return probs.map((p) => {
    if (!(p >= 0 && p <= 1)) return Number.NaN;
    const h = (n - 1) * p; // 0-based form of h = (n − 1) p + 1 in [1]
    const lo = Math.floor(h);
    const hi = Math.min(lo + 1, n - 1);
    return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
  });
}
