/**
 * Power of the two-sided exact binomial test of H0: p = p0 at a given number of trials.
 *
 * The rejection region is equal-tailed and exact: reject when P0(X ≥ x) ≤ α/2 (x ≥ upperCritical) or when
 * P0(X ≤ x) ≤ α/2 (x ≤ lowerCritical), so its size never exceeds α (for p0 = ½ this is the usual two-sided
 * binomial test, whose p-value doubles the smaller tail). Power is P_p(X ≥ upperCritical) + P_p(X ≤ lowerCritical).
 * Tails come from the identity P(X ≥ k) = I_p(k, n − k + 1) (eq. 26.5.24 of [1]).
 *
 * References:
 * [1] "Handbook of Mathematical Functions with Formulas, Graphs, and Mathematical Tables", National Bureau of
 *     Standards Applied Mathematics Series 55, 1964.
 */
import { normalQuantile } from './normalQuantile.ts';
import { regularizedBeta } from './regularizedBeta.ts';

/** P(X ≥ k) for X ~ Binomial(n, p); eq. 26.5.24 of [1]. */
function upperTail(k: number, n: number, p: number): number {
  if (k <= 0) return 1;
  if (k > n) return 0;
  return regularizedBeta(p, k, n - k + 1);
}

/** P(X ≤ k) for X ~ Binomial(n, p). */
function lowerTail(k: number, n: number, p: number): number {
  if (k < 0) return 0;
  if (k >= n) return 1;
  return 1 - regularizedBeta(p, k + 1, n - k);
}

/** Power and rejection region of {@link exactTestPower}. */
export interface ExactTestPower {
  /** Probability of rejecting H0 when the true rate is p. */
  readonly power: number;
  /** Actual size: probability of rejecting when H0 holds (≤ α). */
  readonly size: number;
  /** Largest count rejected on the low side (−1 when none is). */
  readonly lowerCritical: number;
  /** Smallest count rejected on the high side (n + 1 when none is). */
  readonly upperCritical: number;
}

/**
 * Power of the two-sided exact binomial test with `trials` trials.
 * @param trials - number of trials n, a positive integer
 * @param rate - the true success probability p, in [0, 1]
 * @param nullRate - p0 of H0, in (0, 1); default 0.5
 * @param alpha - two-sided significance level, in (0, 1); default 0.05
 */
export function exactTestPower(trials: number, rate: number, nullRate = 0.5, alpha = 0.05): ExactTestPower {
  const n = trials;
  const sd = Math.sqrt(n * nullRate * (1 - nullRate));
  const z = normalQuantile(1 - alpha / 2);
  // upper critical value: smallest k with P0(X ≥ k) ≤ α/2, found by stepping from the normal guess
  let ku = Math.min(n + 1, Math.max(0, Math.ceil(n * nullRate + z * sd)));
  while (ku <= n && upperTail(ku, n, nullRate) > alpha / 2) ku++;
  while (ku - 1 >= 0 && upperTail(ku - 1, n, nullRate) <= alpha / 2) ku--;
  // lower critical value: largest k with P0(X ≤ k) ≤ α/2
  let kl = Math.max(-1, Math.min(n, Math.floor(n * nullRate - z * sd)));
  while (kl >= 0 && lowerTail(kl, n, nullRate) > alpha / 2) kl--;
  while (kl + 1 <= n && lowerTail(kl + 1, n, nullRate) <= alpha / 2) kl++;
  const power = upperTail(ku, n, rate) + lowerTail(kl, n, rate);
  const size = upperTail(ku, n, nullRate) + lowerTail(kl, n, nullRate);
  return { power, size, lowerCritical: kl, upperCritical: ku };
}
