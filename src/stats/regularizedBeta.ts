/**
 * The regularized incomplete beta function I_x(a, b) = B(x; a, b) / B(a, b).
 *
 * Evaluated with the continued fraction for the incomplete beta (eq. 26.5.8 of [1]) by the modified Lentz
 * method, using the symmetry I_x(a, b) = 1 − I_{1−x}(b, a) so the fraction is taken where it converges fast
 * (x < (a + 1) / (a + b + 2)), as in §6.4 of [2].
 *
 * References:
 * [1] "Handbook of Mathematical Functions with Formulas, Graphs, and Mathematical Tables", National Bureau of
 *     Standards Applied Mathematics Series 55, 1964.
 * [2] "Numerical Recipes: The Art of Scientific Computing", 3rd edition, Cambridge University Press, 2007.
 */
import { logGamma } from './logGamma.ts';

const TINY = 1e-300;
const EPS = 1e-15;
const MAX_ITERATIONS = 1_000_000;

const HALF_LN_TWO_PI = 0.91893853320467274178;

/**
 * Stirling remainder δ(z) = ln Γ(z) − [(z − ½) ln z − z + ½ ln 2π] by its asymptotic series (eq. 6.1.41 of [1]);
 * five terms are good to 1e-16 for z ≥ 15.
 */
function stirlingRemainder(z: number): number {
  const r = 1 / (z * z);
  return (1 / z) * (1 / 12 - r * (1 / 360 - r * (1 / 1260 - r * (1 / 1680 - r / 1188))));
}

/**
 * ln[x^a (1 − x)^b / B(a, b)], the front factor of the continued fraction. For large shapes the direct form
 * subtracts logarithms of size ~a ln a and loses ~a·1e-16 in relative accuracy; there the Stirling form is used,
 * in which the large terms appear as a ln(x (a + b)/a) = a log1p((x (a + b) − a)/a), near zero in the bulk
 * (the arrangement of the power terms in §6.4 of [2]).
 */
function logFrontFactor(x: number, a: number, b: number): number {
  if (a < 15 || b < 15) return a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b);
  const s = a + b;
  return (
    a * Math.log1p((x * s - a) / a) +
    b * Math.log1p(((1 - x) * s - b) / b) +
    0.5 * Math.log((a * b) / s) -
    HALF_LN_TWO_PI -
    stirlingRemainder(a) -
    stirlingRemainder(b) +
    stirlingRemainder(s)
  );
}

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b), for a, b > 0. */
function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

/** The continued fraction of eq. 26.5.8 of [1] by the modified Lentz method. */
function continuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    // even step: d_{2m} = m (b − m) x / ((a + 2m − 1)(a + 2m))
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    // odd step: d_{2m+1} = −(a + m)(a + b + m) x / ((a + 2m)(a + 2m + 1))
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) return h;
  }
  return Number.NaN; // did not converge: never expected for finite a, b
}

/**
 * I_x(a, b), the regularized incomplete beta function: the Beta(a, b) distribution function at x.
 * Also the binomial upper tail: P(X ≥ k) for X ~ Binomial(n, p) equals I_p(k, n − k + 1).
 * @param x - the point, in [0, 1] (values outside are clamped)
 * @param a - first shape parameter, > 0
 * @param b - second shape parameter, > 0
 * @returns a probability in [0, 1], NaN for invalid shapes
 */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0) || Number.isNaN(x)) return Number.NaN;
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  // front factor x^a (1 − x)^b / B(a, b), in logs
  const lnFront = logFrontFactor(x, a, b);
  if (x < (a + 1) / (a + b + 2)) {
    return (Math.exp(lnFront) * continuedFraction(x, a, b)) / a;
  }
  return 1 - (Math.exp(lnFront) * continuedFraction(1 - x, b, a)) / b;
}

/** ln B(a, b), exported for the modules of this folder that need the beta function. */
export { logBeta };
