/**
 * The standard normal quantile function Φ⁻¹(p).
 *
 * Algorithm AS 241 (PPND16) of [1]: rational minimax approximations in three regions (|p − ½| ≤ 0.425, then
 * r = √(−ln min(p, 1 − p)) ≤ 5 and r > 5), relative accuracy about 1e-16.
 *
 * References:
 * [1] "Algorithm AS 241: The percentage points of the normal distribution", Journal of the Royal Statistical
 *     Society, Series C (Applied Statistics) 37(3), 1988, DOI 10.2307/2347330.
 */

// coefficients of PPND16 in [1], from the degree-0 term up
const A = [
  3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125,
  45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727,
];
const B = [
  1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077, 21213.794301586595867,
  39307.89580009271061, 28729.085735721942674, 5226.495278852854561,
];
const C = [
  1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504,
  1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4,
];
const D = [
  1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455, 0.14810397642748007459,
  0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9,
];
const E = [
  6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123,
  0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5, 2.01033439929228813265e-7,
];
const F = [
  1, 0.59983220655588793769, 0.13692988092273580531, 0.0148753612908506148525, 7.868691311456132591e-4,
  1.8463183175100546818e-5, 1.4215117583164458887e-7, 2.04426310338993978564e-15,
];

function horner(coefficients: readonly number[], x: number): number {
  let value = 0;
  for (let i = coefficients.length - 1; i >= 0; i--) value = value * x + coefficients[i];
  return value;
}

/**
 * z such that Φ(z) = p for the standard normal distribution.
 * @param p - a probability; 0 gives −Infinity, 1 gives +Infinity, outside [0, 1] gives NaN
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return Number.NaN;
  if (p === 0) return Number.NEGATIVE_INFINITY;
  if (p === 1) return Number.POSITIVE_INFINITY;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (q * horner(A, r)) / horner(B, r); // central region of [1]
  }
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let value: number;
  if (r <= 5) {
    r -= 1.6;
    value = horner(C, r) / horner(D, r); // intermediate tail of [1]
  } else {
    r -= 5;
    value = horner(E, r) / horner(F, r); // far tail of [1]
  }
  return q < 0 ? -value : value;
}
