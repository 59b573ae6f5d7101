/**
 * The quantile function (inverse distribution function) of the Beta(a, b) distribution.
 *
 * Solves I_x(a, b) = p for x by Newton's method on the distribution function (the density is the derivative),
 * safeguarded by a bracket that every step keeps: a step that leaves the bracket is replaced by bisection
 * (geometric bisection when the bracket spans orders of magnitude, so tiny quantiles are reached quickly).
 * This is the classic safeguarded Newton scheme of §9.4 of [1]; I_x(a, b) comes from `regularizedBeta.ts`.
 *
 * References:
 * [1] "Numerical Recipes: The Art of Scientific Computing", 3rd edition, Cambridge University Press, 2007.
 */
import { logBeta, regularizedBeta } from './regularizedBeta.ts';

const MAX_ITERATIONS = 400;

/**
 * x such that P(X ≤ x) = p for X ~ Beta(a, b).
 * @param p - a probability in [0, 1]; 0 gives 0 and 1 gives 1
 * @param a - first shape parameter, > 0
 * @param b - second shape parameter, > 0
 * @returns the quantile in [0, 1], NaN for invalid input
 */
export function betaQuantile(p: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0) || !(p >= 0 && p <= 1)) return Number.NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  const lnB = logBeta(a, b);
  let lo = 0;
  let hi = 1;
  // start from the mean, a good guess near the bulk
  let x = a / (a + b);
  for (let i = 0; i < MAX_ITERATIONS; i++) {
    const f = regularizedBeta(x, a, b) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    // density of Beta(a, b) at x, the derivative of I_x(a, b)
    const lnDensity = (a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - lnB;
    const density = Math.exp(lnDensity);
    let next = density > 0 && Number.isFinite(density) ? x - f / density : Number.NaN;
    if (!(next > lo && next < hi)) {
      // bisection, geometric when the bracket spans orders of magnitude (towards 0 or towards 1)
      if (lo === 0) next = hi / 16;
      else if (hi === 1) next = 1 - (1 - lo) / 16;
      else if (hi / lo > 4) next = Math.sqrt(lo * hi);
      else if ((1 - lo) / (1 - hi) > 4) next = 1 - Math.sqrt((1 - lo) * (1 - hi));
      else next = (lo + hi) / 2;
    }
    if (Math.abs(next - x) <= 2e-16 * Math.max(x, 1e-300) || hi - lo <= 2e-16 * hi) return next;
    x = next;
  }
  return x;
}
