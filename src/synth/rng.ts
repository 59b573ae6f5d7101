/**
 * A seeded pseudorandom number generator: xoshiro128** seeded through splitmix32.
 * Every random choice of the renderer (scenario, background, noise) draws from one
 * of these, seeded from the study seed, the clip index and a stream name, so clip k
 * of a study is the same whatever the study's clip count.
 *
 * References:
 * [1] "Scrambled linear pseudorandom number generators", ACM Transactions on
 *     Mathematical Software 47(4), 2021. DOI 10.1145/3460772
 * [2] "A note on the generation of random normal deviates", Annals of Mathematical
 *     Statistics 29(2), 1958. DOI 10.1214/aoms/1177706645
 */

/** A stream of pseudorandom numbers. Not cryptographic. */
export interface Rng {
  /** The next raw 32-bit output (unsigned integer). */
  nextUint32(): number;
  /** Uniform on [0, 1), 53 random bits. */
  uniform(): number;
  /** Uniform on [min, max). */
  uniformIn(min: number, max: number): number;
  /** Standard normal deviate (Box–Muller, [2]), or `mean + sd·z` when given. */
  normal(mean?: number, sd?: number): number;
  /** A uniformly chosen integer from `min` to `max`, both included. */
  integer(min: number, max: number): number;
  /** The generator's state, 4 unsigned 32-bit words (for tests and forks). */
  state(): [number, number, number, number];
}

/** One step of splitmix32 (a 32-bit variant of SplitMix, common practice, no source). */
function splitmix32(x: number): [number, number] {
  const next = (x + 0x9e3779b9) | 0;
  let z = next;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  z ^= z >>> 16;
  return [next, z >>> 0];
}

/** Folds numbers and strings into one 32-bit seed (FNV-1a over their text; common practice, no source). */
function hashParts(parts: readonly (number | string)[]): number {
  let h = 0x811c9dc5;
  const text = parts.map((p) => (typeof p === 'number' ? `n${p}` : `s${p}`)).join('\u0000');
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

const rotl = (x: number, k: number): number => ((x << k) | (x >>> (32 - k))) >>> 0;

/**
 * Creates a seeded generator.
 *
 * @param seed - the study seed (any number or string), or an explicit 4-word state
 *   (`{ state: [a, b, c, d] }`, not all zero) as in the reference implementation of [1].
 * @param stream - further parts (clip index, stream name) hashed with the seed, so
 *   different parts give independent streams.
 * @returns a generator; the same arguments always give the same sequence.
 */
export function createRng(
  seed: number | string | { state: readonly [number, number, number, number] },
  ...stream: (number | string)[]
): Rng {
  const s = new Uint32Array(4);
  if (typeof seed === 'object') {
    for (let i = 0; i < 4; i++) s[i] = seed.state[i] >>> 0;
    if ((s[0] | s[1] | s[2] | s[3]) === 0) throw new RangeError('xoshiro128** state must not be all zero');
  } else {
    let x = hashParts([seed, ...stream]);
    for (let i = 0; i < 4; i++) {
      const [next, out] = splitmix32(x);
      x = next;
      s[i] = out;
    }
    if ((s[0] | s[1] | s[2] | s[3]) === 0) s[0] = 1;
  }
  let spare = NaN;

  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(s[1], 5) >>> 0, 7), 9) >>> 0; // output scrambler ** of [1]
    const t = (s[1] << 9) >>> 0;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotl(s[3], 11);
    return result;
  };
  const uniform = (): number => {
    const hi = nextUint32() >>> 5; // 27 bits
    const lo = nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  };
  const normal = (mean = 0, sd = 1): number => {
    if (!Number.isNaN(spare)) {
      const z = spare;
      spare = NaN;
      return mean + sd * z;
    }
    let u1 = uniform();
    while (u1 === 0) u1 = uniform();
    const u2 = uniform();
    const r = Math.sqrt(-2 * Math.log(u1)); // Box–Muller transform, [2]
    spare = r * Math.sin(2 * Math.PI * u2);
    return mean + sd * r * Math.cos(2 * Math.PI * u2);
  };
  return {
    nextUint32,
    uniform,
    uniformIn: (min, max) => min + (max - min) * uniform(),
    normal,
    integer: (min, max) => {
      if (!Number.isInteger(min) || !Number.isInteger(max) || max < min) {
        throw new RangeError(`integer(${min}, ${max}): need integers with min <= max`);
      }
      return min + Math.floor(uniform() * (max - min + 1));
    },
    state: () => [s[0], s[1], s[2], s[3]],
  };
}
