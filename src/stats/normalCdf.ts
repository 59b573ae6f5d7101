/**
 * The standard normal distribution function Φ(x), to about 1e-14 relative in both tails.
 *
 * Φ(x) = ½ erfc(−x/√2), and erfc z = Q(½, z²) with Q the regularized upper incomplete gamma function; Q(a, y) is
 * summed as the series of the lower function P = 1 − Q for y < a + 1 and as its continued fraction (evaluated by
 * the modified Lentz method) beyond. Standard identities and methods, common practice, no source.
 */

const LN_GAMMA_HALF = 0.5 * Math.log(Math.PI); // ln Γ(½) = ln √π
const EPS = 1e-16;
const TINY = 1e-300;

/** Q(½, y) for y ≥ 0: the regularized upper incomplete gamma function at a = ½. */
function upperGammaHalf(y: number): number {
  if (y <= 0) return 1;
  const a = 0.5;
  const front = Math.exp(-y + a * Math.log(y) - LN_GAMMA_HALF);
  if (y < a + 1) {
    // P(a, y) = e^(−y) y^a / Γ(a) · Σ y^n / (a (a+1) … (a+n)).
    let ap = a;
    let term = 1 / a;
    let sum = term;
    for (let n = 0; n < 500; n++) {
      ap += 1;
      term *= y / ap;
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * EPS) break;
    }
    return 1 - sum * front;
  }
  // Q(a, y) = e^(−y) y^a / Γ(a) · 1 / (y + 1 − a − 1(1 − a) / (y + 3 − a − 2(2 − a) / (y + 5 − a − …))).
  let b = y + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 500; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return front * h;
}

/** Φ(x) = P(Z ≤ x) for a standard normal Z; 0 and 1 at ∓∞, NaN for NaN. */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) return Number.NaN;
  if (x === Number.POSITIVE_INFINITY) return 1;
  if (x === Number.NEGATIVE_INFINITY) return 0;
  const q = upperGammaHalf((x * x) / 2); // erfc(|x|/√2)
  return x >= 0 ? 1 - 0.5 * q : 0.5 * q;
}
