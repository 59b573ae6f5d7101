/**
 * A small seeded pseudorandom number generator: xoshiro128** of [1] (32-bit state words, period 2^128 − 1),
 * its state filled from the seed by the SplitMix32-style mixer (the murmur3 32-bit finaliser applied to a Weyl
 * sequence with increment 0x9e3779b9; common practice, no source), so nearby seeds give unrelated streams.
 *
 * References:
 * [1] "Scrambled linear pseudorandom number generators", ACM Transactions on Mathematical Software 47(4), 2021,
 *     DOI 10.1145/3460772.
 */

/** A stream of uniform numbers: `next()` in [0, 1) with 32 random bits, `nextUint32()` in [0, 2^32). */
export interface Rng {
  /** The next number, uniform on [0, 1), a multiple of 2^−32. */
  next(): number;
  /** The next 32-bit unsigned integer. */
  nextUint32(): number;
}

/**
 * Creates a generator from a seed; the same seed always gives the same stream.
 * @param seed - any finite number; it is reduced to a 32-bit unsigned integer (`seed >>> 0`)
 */
export function createRng(seed: number): Rng {
  let weyl = seed >>> 0;
  const splitMix = (): number => {
    weyl = (weyl + 0x9e3779b9) >>> 0;
    let z = weyl;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  };
  let s0 = splitMix();
  let s1 = splitMix();
  let s2 = splitMix();
  let s3 = splitMix();
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1; // the all-zero state is the one fixed point
  const rotl = (x: number, k: number): number => ((x << k) | (x >>> (32 - k))) >>> 0;
  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(s1, 5) >>> 0, 7), 9) >>> 0; // scrambler ** of [1]: rotl(s1·5, 7)·9
    const t = (s1 << 9) >>> 0;
    // linear engine of xoshiro128 in [1]
    s2 = (s2 ^ s0) >>> 0;
    s3 = (s3 ^ s1) >>> 0;
    s1 = (s1 ^ s2) >>> 0;
    s0 = (s0 ^ s3) >>> 0;
    s2 = (s2 ^ t) >>> 0;
    s3 = rotl(s3, 11);
    return result;
  };
  return { nextUint32, next: () => nextUint32() / 4294967296 };
}
