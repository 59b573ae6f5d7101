/**
 * How many tosses a study needs to tell a same-side rate p from p0 = ½ (two-sided test at level α, given power).
 *
 * - Normal approximation (the one-sample case of the sample-size formula in [1]; section not re-checked):
 *   n = ((z_{1−α/2} √(p0 q0) + z_{power} √(p q)) / (p − p0))², rounded up.
 * - Exact binomial test: the smallest n whose exact equal-tailed test (see `binomialTestPower.ts`) reaches the
 *   power. Exact power saw-tooths in n, so the search finds the first crossing by bisection and then scans
 *   downwards through a window (5% of n, at most 20,000 trials) for any smaller n that also reaches the power.
 * - Several tossers: tosses from one tosser are clustered. With m tosses per tosser and intraclass correlation
 *   ρ the variance inflates by the design effect 1 + (m − 1) ρ ([2], §5.4 from memory). Under a beta-binomial model the
 *   between-tosser variance of rates is s² = ρ p q ([3]), so ρ = s² / (p q). Solving N = n₀ (1 + (N/k − 1) ρ) for
 *   the total N with k tossers gives N = n₀ (1 − ρ) / (1 − n₀ ρ / k), possible only when k > n₀ ρ.
 *
 * References:
 * [1] "Statistical Methods for Rates and Proportions", 3rd edition, Wiley, 2003, DOI 10.1002/0471445428.
 * [2] "Survey Sampling", John Wiley & Sons, 1965.
 * [3] "The analysis of binary responses from toxicological experiments involving reproductive effects and
 *     teratogenicity", Biometrics 31(4), 1975, DOI 10.2307/2529795.
 */
import { exactTestPower } from './binomialTestPower.ts';
import { normalQuantile } from './normalQuantile.ts';

/** Options of {@link planTosses}. */
export interface TossPlanOptions {
  /** The same-side rate p to detect, in (0, 1) and ≠ nullRate. */
  readonly sameSideRate: number;
  /** Desired power, in (0, 1); default 0.8. */
  readonly power?: number;
  /** Two-sided significance level, in (0, 1); default 0.05. */
  readonly alpha?: number;
  /** The rate under H0; default 0.5 (a fair toss). */
  readonly nullRate?: number;
  /** Number of tossers k sharing the tosses (positive integer); omit for independent tosses. */
  readonly tossers?: number;
  /** Standard deviation of the tossers' true same-side rates (≥ 0, < √(p q)); default 0. */
  readonly tosserSd?: number;
}

/** The tossers part of a {@link TossPlan}. */
export interface ClusteredPlan {
  /** Number of tossers k. */
  readonly tossers: number;
  /** Between-tosser sd of same-side rates s. */
  readonly tosserSd: number;
  /** Intraclass correlation ρ = s² / (p q). */
  readonly icc: number;
  /** False when no number of tosses per tosser suffices: k ≤ n₀ ρ. */
  readonly feasible: boolean;
  /** Fewest tossers for which the plan is feasible: ⌊n₀ ρ⌋ + 1. */
  readonly minimumTossers: number;
  /** Tosses each tosser makes, m (null when not feasible). */
  readonly tossesPerTosser: number | null;
  /** Total tosses m k (null when not feasible). */
  readonly totalTosses: number | null;
  /** Design effect 1 + (m − 1) ρ at that m (null when not feasible). */
  readonly designEffect: number | null;
}

/** The result of {@link planTosses}. */
export interface TossPlan {
  readonly sameSideRate: number;
  readonly nullRate: number;
  readonly power: number;
  readonly alpha: number;
  /** Tosses by the normal approximation n₀. */
  readonly normalTosses: number;
  /** Tosses by the exact binomial test (first n reaching the power). */
  readonly exactTosses: number;
  /** Exact power reached at `exactTosses`. */
  readonly exactPower: number;
  /** Rejection region at `exactTosses`: reject for counts ≤ lowerCritical or ≥ upperCritical. */
  readonly exactLowerCritical: number;
  readonly exactUpperCritical: number;
  /** Present when `tossers` was given. */
  readonly clustered: ClusteredPlan | null;
}

/**
 * Sample sizes for detecting a same-side rate against ½. Options must already be validated (the CLI does it);
 * invalid values throw a RangeError naming the option.
 */
export function planTosses(options: TossPlanOptions): TossPlan {
  const p = options.sameSideRate;
  const power = options.power ?? 0.8;
  const alpha = options.alpha ?? 0.05;
  const p0 = options.nullRate ?? 0.5;
  const sd = options.tosserSd ?? 0;
  if (!(p > 0 && p < 1) || p === p0) throw new RangeError('sameSideRate must be in (0, 1) and differ from nullRate');
  if (!(power > 0 && power < 1)) throw new RangeError('power must be in (0, 1)');
  if (!(alpha > 0 && alpha < 1)) throw new RangeError('alpha must be in (0, 1)');
  if (!(p0 > 0 && p0 < 1)) throw new RangeError('nullRate must be in (0, 1)');
  const pq = p * (1 - p);
  if (!(sd >= 0 && sd * sd < pq)) throw new RangeError('tosserSd must be ≥ 0 and below √(p q)');
  if (options.tossers !== undefined && !(Number.isInteger(options.tossers) && options.tossers >= 1)) {
    throw new RangeError('tossers must be a positive integer');
  }

  const zAlpha = normalQuantile(1 - alpha / 2);
  const zPower = normalQuantile(power);
  // sample-size formula of [1], one-sample case
  const root = (zAlpha * Math.sqrt(p0 * (1 - p0)) + zPower * Math.sqrt(pq)) / (p - p0);
  const normalTosses = Math.max(1, Math.ceil(root * root - 1e-9));

  const reaches = (n: number): boolean => exactTestPower(n, p, p0, alpha).power >= power;
  // bracket the first crossing, then bisect
  let hi = normalTosses;
  while (!reaches(hi)) hi *= 2;
  let lo = Math.max(0, Math.floor(hi / 2));
  while (lo > 0 && reaches(lo)) lo = Math.floor(lo / 2);
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (reaches(mid)) hi = mid;
    else lo = mid;
  }
  // saw-tooth: look below the crossing for a smaller n that also reaches the power
  const window = Math.min(20_000, Math.max(100, Math.ceil(0.05 * hi)));
  let exactTosses = hi;
  for (let n = hi - 1; n >= Math.max(1, hi - window); n--) if (reaches(n)) exactTosses = n;
  const exact = exactTestPower(exactTosses, p, p0, alpha);

  let clustered: ClusteredPlan | null = null;
  if (options.tossers !== undefined) {
    const k = options.tossers;
    const icc = (sd * sd) / pq; // [3]: between-tosser variance s² = ρ p q
    const minimumTossers = Math.floor(normalTosses * icc) + 1;
    const feasible = k > normalTosses * icc;
    let tossesPerTosser: number | null = null;
    let designEffect: number | null = null;
    if (feasible) {
      // N = n₀ (1 + (N/k − 1) ρ) solved for N, design effect of §5.4 of [2]
      const total = (normalTosses * (1 - icc)) / (1 - (normalTosses * icc) / k);
      let m = Math.max(1, Math.ceil(total / k - 1e-9));
      // guard against rounding: m k must cover n₀ · deff(m)
      while (m * k < normalTosses * (1 + (m - 1) * icc)) m++;
      tossesPerTosser = m;
      designEffect = 1 + (m - 1) * icc;
    }
    clustered = {
      tossers: k,
      tosserSd: sd,
      icc,
      feasible,
      minimumTossers,
      tossesPerTosser,
      totalTosses: tossesPerTosser === null ? null : tossesPerTosser * k,
      designEffect,
    };
  }

  return {
    sameSideRate: p,
    nullRate: p0,
    power,
    alpha,
    normalTosses,
    exactTosses,
    exactPower: exact.power,
    exactLowerCritical: exact.lowerCritical,
    exactUpperCritical: exact.upperCritical,
    clustered,
  };
}
