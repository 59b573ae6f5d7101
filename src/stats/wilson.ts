/**
 * The Wilson score interval for a binomial proportion.
 *
 * The interval inverts the score test: the set of p with |x − np| ≤ z √(n p (1 − p)) of [1], in the closed form
 * (x + z²/2 ± z √(x (n − x)/n + z²/4)) / (n + z²), recommended over the Wald interval by [2] (method 3 there).
 *
 * References:
 * [1] "Probable inference, the law of succession, and statistical inference", Journal of the American Statistical
 *     Association 22(158), 1927, DOI 10.1080/01621459.1927.10502953.
 * [2] "Two-sided confidence intervals for the single proportion: comparison of seven methods", Statistics in
 *     Medicine 17(8), 1998, DOI 10.1002/(SICI)1097-0258(19980430)17:8<857::AID-SIM777>3.0.CO;2-E.
 */
import { normalQuantile } from './normalQuantile.ts';

/** A two-sided interval for a proportion: both ends in [0, 1]. */
export interface ProportionInterval {
  /** Lower end, in [0, 1]. */
  readonly lower: number;
  /** Upper end, in [0, 1]. */
  readonly upper: number;
}

/**
 * Wilson score interval for `successes` out of `trials`.
 * @param successes - integer count, 0 ≤ successes ≤ trials
 * @param trials - integer count, > 0
 * @param confidence - two-sided coverage, in (0, 1); default 0.95
 * @returns the interval, or null when there are no trials or the counts are invalid
 */
export function wilsonInterval(successes: number, trials: number, confidence = 0.95): ProportionInterval | null {
  if (!(trials > 0) || !(successes >= 0 && successes <= trials) || !(confidence > 0 && confidence < 1)) return null;
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const z2 = z * z;
  const centre = successes + z2 / 2; // roots of the quadratic (x − n p)² = z² n p (1 − p) of [1]
  const half = z * Math.sqrt((successes * (trials - successes)) / trials + z2 / 4);
  const denominator = trials + z2;
  return {
    lower: successes === 0 ? 0 : Math.max(0, (centre - half) / denominator),
    upper: successes === trials ? 1 : Math.min(1, (centre + half) / denominator),
  };
}
