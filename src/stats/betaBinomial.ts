/**
 * Partial pooling of per-tosser rates: empirical-Bayes beta-binomial.
 *
 * Each tosser i has x_i successes in n_i trials, x_i ~ Binomial(n_i, θ_i), θ_i ~ Beta(α, β). The prior (α, β)
 * is fitted by marginal maximum likelihood ([1]): the beta-binomial log-likelihood
 * ℓ(α, β) = Σ_i [ln B(x_i + α, n_i − x_i + β) − ln B(α, β)] (the likelihood of [1], binomial coefficients dropped) is maximised over
 * the mean μ = α/(α + β) and the precision M = α + β (golden-section search on logit μ inside a grid and
 * golden-section search on ln M ∈ [ln 0.1, ln 10⁶]). The posterior of each tosser is then
 * Beta(α + x_i, β + n_i − x_i) (conjugacy, §5.3 of [2]) with mean (α + x_i)/(M + n_i): the raw rate x_i/n_i pulled
 * toward μ with weight n_i/(M + n_i) on the tosser's own data, as in the parametric empirical-Bayes scheme of [3].
 *
 * When the data show no spread beyond binomial noise the likelihood keeps rising as M → ∞ (it tends to the
 * binomial likelihood of a common rate): the fit then reports complete pooling, every tosser's rate is the pooled
 * rate X/N and the interval is that of a common rate under the Jeffreys prior, Beta(X + ½, N − X + ½).
 *
 * The posterior intervals treat (α, β) as known, so they are somewhat too narrow when there are few tossers.
 *
 * References:
 * [1] "The analysis of binary responses from toxicological experiments involving reproductive effects and
 *     teratogenicity", Biometrics 31(4), 1975, DOI 10.2307/2529795.
 * [2] "Bayesian Data Analysis", 3rd edition, CRC Press, 2013, DOI 10.1201/b16018.
 * [3] "Parametric empirical Bayes inference: theory and applications", Journal of the American Statistical
 *     Association 78(381), 1983, DOI 10.1080/01621459.1983.10477920.
 */
import { betaQuantile } from './betaQuantile.ts';
import { logBeta } from './regularizedBeta.ts';

/** Counts of one group (tosser). */
export interface GroupCounts {
  /** Successes x_i (e.g. same-side outcomes), integer ≥ 0. */
  readonly successes: number;
  /** Trials n_i, integer ≥ successes. */
  readonly trials: number;
}

/** The shrunken rate of one group. */
export interface PooledRate {
  /** Raw rate x_i/n_i (null when n_i = 0). */
  readonly raw: number | null;
  /** Posterior mean of θ_i. */
  readonly rate: number;
  /** Lower end of the equal-tailed posterior interval. */
  readonly lower: number;
  /** Upper end of the equal-tailed posterior interval. */
  readonly upper: number;
  /** Weight n_i/(M + n_i) of the group's own data (1 under no pooling, 0 under complete pooling). */
  readonly ownWeight: number;
}

/** A successful fit of {@link poolRates}. */
export interface PooledRates {
  readonly ok: true;
  /** Prior shape α (Infinity under complete pooling). */
  readonly alpha: number;
  /** Prior shape β (Infinity under complete pooling). */
  readonly beta: number;
  /** Prior mean μ = α/(α + β): the pooled rate. */
  readonly meanRate: number;
  /** Prior precision M = α + β (Infinity under complete pooling). */
  readonly precision: number;
  /** Between-group sd of true rates implied by the prior, √(μ(1 − μ)/(M + 1)). */
  readonly betweenSd: number;
  /** True when the data show no spread beyond binomial noise (M → ∞). */
  readonly completePooling: boolean;
  /** One entry per input group, in input order. */
  readonly rates: PooledRate[];
}

/** Options of {@link poolRates}. */
export interface PoolOptions {
  /** Coverage of the posterior intervals, in (0, 1); default 0.95. */
  readonly confidence?: number;
}

const LN_M_MIN = Math.log(0.1);
const LN_M_MAX = Math.log(1e6);
const GOLDEN = (Math.sqrt(5) - 1) / 2;

function goldenMax(f: (t: number) => number, a: number, b: number, iterations: number): { t: number; value: number } {
  let x1 = b - GOLDEN * (b - a);
  let x2 = a + GOLDEN * (b - a);
  let f1 = f(x1);
  let f2 = f(x2);
  for (let i = 0; i < iterations; i++) {
    if (f1 < f2) {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + GOLDEN * (b - a);
      f2 = f(x2);
    } else {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - GOLDEN * (b - a);
      f1 = f(x1);
    }
  }
  return f1 > f2 ? { t: x1, value: f1 } : { t: x2, value: f2 };
}

const logistic = (t: number): number => 1 / (1 + Math.exp(-t));

/**
 * Fits the beta-binomial prior to per-group counts and returns shrunken rates with posterior intervals.
 * Groups with no trials get the prior (their rate is μ). Input is not mutated.
 * @returns `{ ok: false, reason }` when there are no trials at all or a count is invalid
 */
export function poolRates(
  groups: readonly GroupCounts[],
  options: PoolOptions = {},
): PooledRates | { ok: false; reason: string } {
  const confidence = options.confidence ?? 0.95;
  if (!(confidence > 0 && confidence < 1)) return { ok: false, reason: 'confidence must be in (0, 1)' };
  for (const g of groups) {
    if (!Number.isInteger(g.successes) || !Number.isInteger(g.trials) || g.successes < 0 || g.trials < g.successes) {
      return { ok: false, reason: `invalid counts ${g.successes}/${g.trials}` };
    }
  }
  const used = groups.filter((g) => g.trials > 0);
  const totalX = used.reduce((s, g) => s + g.successes, 0);
  const totalN = used.reduce((s, g) => s + g.trials, 0);
  if (totalN === 0) return { ok: false, reason: 'no trials in any group' };
  const tail = (1 - confidence) / 2;
  const pooled = totalX / totalN;

  const completePooling = (): PooledRates => {
    const lower = betaQuantile(tail, totalX + 0.5, totalN - totalX + 0.5);
    const upper = betaQuantile(1 - tail, totalX + 0.5, totalN - totalX + 0.5);
    return {
      ok: true,
      alpha: Number.POSITIVE_INFINITY,
      beta: Number.POSITIVE_INFINITY,
      meanRate: pooled,
      precision: Number.POSITIVE_INFINITY,
      betweenSd: 0,
      completePooling: true,
      rates: groups.map((g) => ({
        raw: g.trials > 0 ? g.successes / g.trials : null,
        rate: pooled,
        lower,
        upper,
        ownWeight: 0,
      })),
    };
  };
  // all successes or all failures, or a single group: nothing to learn about the spread
  if (totalX === 0 || totalX === totalN || used.length < 2) return completePooling();

  // the beta-binomial likelihood of [1], without the binomial coefficients
  const logLik = (mu: number, m: number): number => {
    const a = mu * m;
    const b = (1 - mu) * m;
    const lnB0 = logBeta(a, b);
    let sum = 0;
    for (const g of used) sum += logBeta(g.successes + a, g.trials - g.successes + b) - lnB0;
    return sum;
  };
  // the M → ∞ limit: binomial likelihood of one common rate at its MLE X/N
  const logLikCommon = totalX * Math.log(pooled) + (totalN - totalX) * Math.log1p(-pooled);

  const rawLogits = used.map((g) => Math.log((g.successes + 0.5) / (g.trials - g.successes + 0.5)));
  const tLo = Math.min(...rawLogits) - 1;
  const tHi = Math.max(...rawLogits) + 1;
  const profile = (lnM: number): { mu: number; value: number } => {
    const m = Math.exp(lnM);
    const best = goldenMax((t) => logLik(logistic(t), m), tLo, tHi, 60);
    return { mu: logistic(best.t), value: best.value };
  };
  // coarse grid on ln M, then golden refinement around the best grid point
  const steps = 48;
  let bestIndex = 0;
  let bestValue = Number.NEGATIVE_INFINITY;
  for (let i = 0; i <= steps; i++) {
    const value = profile(LN_M_MIN + ((LN_M_MAX - LN_M_MIN) * i) / steps).value;
    if (value > bestValue) {
      bestValue = value;
      bestIndex = i;
    }
  }
  if (bestIndex === steps) return completePooling();
  const h = (LN_M_MAX - LN_M_MIN) / steps;
  const refined = goldenMax(
    (lnM) => profile(lnM).value,
    LN_M_MIN + h * Math.max(0, bestIndex - 1),
    LN_M_MIN + h * Math.min(steps, bestIndex + 1),
    50,
  );
  if (refined.value <= logLikCommon + 1e-9) return completePooling();
  const precision = Math.exp(refined.t);
  const meanRate = profile(refined.t).mu;
  const alpha = meanRate * precision;
  const beta = (1 - meanRate) * precision;
  return {
    ok: true,
    alpha,
    beta,
    meanRate,
    precision,
    betweenSd: Math.sqrt((meanRate * (1 - meanRate)) / (precision + 1)),
    completePooling: false,
    rates: groups.map((g) => {
      // posterior Beta(α + x_i, β + n_i − x_i), §5.3 of [2]
      const a = alpha + g.successes;
      const b = beta + g.trials - g.successes;
      return {
        raw: g.trials > 0 ? g.successes / g.trials : null,
        rate: a / (a + b),
        lower: betaQuantile(tail, a, b),
        upper: betaQuantile(1 - tail, a, b),
        ownWeight: g.trials / (precision + g.trials),
      };
    }),
  };
}
