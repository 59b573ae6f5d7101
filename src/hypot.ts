/**
 * `Math.hypot` of two or three numbers, bit for bit, as plain arithmetic that V8 compiles inline.
 *
 * V8 runs `Math.hypot` out of line: each call allocates an array for its arguments and boxes its result, about
 * 25 ns and two objects per call. In the outline fits and the rotation fit it is called tens of millions of times
 * per study, and was a tenth of the garbage. Replacing it with `Math.sqrt(x * x + y * y)` changes the last bit of
 * some results, and those flips move decisions downstream (a release placed 8 frames later on one rendered clip),
 * so these repeat V8's own algorithm instead: the special values first (any infinite argument gives +∞, else any
 * NaN gives NaN, all zero gives +0), then the arguments scaled by the largest magnitude, their squares summed with
 * Kahan's compensation, and the square root scaled back. The test checks them against `Math.hypot` itself, bit for
 * bit, on five million random pairs and as many triples and on the special values; an engine with another
 * algorithm fails it.
 *
 * References:
 * [1] "Further remarks on reducing truncation errors", Communications of the ACM 8(1), 1965,
 *     doi:10.1145/363707.363723 (compensated summation).
 * The order of the steps is V8's implementation of Math.hypot (v8/src/builtins/math.tq), from memory; the test
 * is what confirms it.
 */

/** `Math.hypot(x, y)`, bit for bit, without allocating. */
export function hypot2(x: number, y: number): number {
  const ax = Math.abs(x), ay = Math.abs(y);
  if (ax === Infinity || ay === Infinity) return Infinity;
  if (ax !== ax || ay !== ay) return Number.NaN;
  const max = ax > ay ? ax : ay;
  if (max === 0) return 0;
  // Kahan's sum of two terms: the first leaves no compensation, so it is a plain sum.
  const u = ax / max, v = ay / max;
  return Math.sqrt(u * u + v * v) * max;
}

/** `Math.hypot(x, y, z)`, bit for bit, without allocating. */
export function hypot3(x: number, y: number, z: number): number {
  const ax = Math.abs(x), ay = Math.abs(y), az = Math.abs(z);
  if (ax === Infinity || ay === Infinity || az === Infinity) return Infinity;
  if (ax !== ax || ay !== ay || az !== az) return Number.NaN;
  let max = ax > ay ? ax : ay;
  if (az > max) max = az;
  if (max === 0) return 0;
  const u = ax / max, v = ay / max, w = az / max;
  // Kahan's sum: the first term leaves no compensation; the second's is carried into the third.
  const sum = u * u + v * v;
  const comp = sum - u * u - v * v;
  return Math.sqrt(sum + (w * w - comp)) * max;
}
