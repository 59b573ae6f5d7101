/**
 * The Clopper–Pearson ("exact") interval for a binomial proportion.
 *
 * The ends are the p at which the binomial tails equal α/2; through the beta–binomial identity they are Beta
 * quantiles (the limits charted in [1]): lower = B⁻¹(α/2; x, n − x + 1), upper = B⁻¹(1 − α/2; x + 1, n − x),
 * with lower = 0 at x = 0 and upper = 1 at x = n. Method 5 of [2].
 *
 * References:
 * [1] "The use of confidence or fiducial limits illustrated in the case of the binomial", Biometrika 26(4), 1934,
 *     DOI 10.1093/biomet/26.4.404.
 * [2] "Two-sided confidence intervals for the single proportion: comparison of seven methods", Statistics in
 *     Medicine 17(8), 1998, DOI 10.1002/(SICI)1097-0258(19980430)17:8<857::AID-SIM777>3.0.CO;2-E.
 */
import { betaQuantile } from './betaQuantile.ts';
import type { ProportionInterval } from './wilson.ts';

/**
 * Clopper–Pearson interval for `successes` out of `trials`; coverage is at least `confidence` for every p.
 * @param successes - integer count, 0 ≤ successes ≤ trials
 * @param trials - integer count, > 0
 * @param confidence - two-sided coverage, in (0, 1); default 0.95
 * @returns the interval, or null when there are no trials or the counts are invalid
 */
export function clopperPearsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): ProportionInterval | null {
  if (!(trials > 0) || !(successes >= 0 && successes <= trials) || !(confidence > 0 && confidence < 1)) return null;
  const alpha = 1 - confidence;
  const lower = successes === 0 ? 0 : betaQuantile(alpha / 2, successes, trials - successes + 1);
  const upper = successes === trials ? 1 : betaQuantile(1 - alpha / 2, successes + 1, trials - successes);
  return { lower, upper };
}
