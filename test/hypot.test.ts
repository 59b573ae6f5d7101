/**
 * hypot2 and hypot3 against the engine's own Math.hypot, bit for bit (Object.is): they replace it in the hot loops
 * only because they give the same results.
 */
import { describe, expect, it } from 'vitest';
import { hypot2, hypot3 } from '../src/hypot.ts';
import { createRng } from '../src/stats/rng.ts';

describe('hypot2 and hypot3', () => {
  it('equal Math.hypot bit for bit on ten million random pairs and triples of every magnitude', () => {
    const rng = createRng(20261204);
    // 53 random bits: two 32-bit draws.
    const rand = (): number => rng.next() + rng.next() * 2 ** -32;
    // Magnitudes from 1e-300 to 1e300, both signs, and ordinary pixel-sized values most often.
    const draw = (): number => {
      const k = rand();
      const m = (rand() - 0.5) * 2;
      if (k < 0.4) return m * 100;
      if (k < 0.6) return m * 1e-3;
      if (k < 0.8) return m * 1e6;
      return m * 10 ** Math.round((rand() - 0.5) * 600);
    };
    let bad2 = 0, bad3 = 0;
    let example = '';
    for (let i = 0; i < 5_000_000; i++) {
      const x = draw(), y = draw(), z = draw();
      if (!Object.is(hypot2(x, y), Math.hypot(x, y))) { bad2++; example ||= `hypot2(${x}, ${y})`; }
      if (!Object.is(hypot3(x, y, z), Math.hypot(x, y, z))) { bad3++; example ||= `hypot3(${x}, ${y}, ${z})`; }
    }
    expect({ bad2, bad3, example }).toEqual({ bad2: 0, bad3: 0, example: '' });
  });

  it('give the special values Math.hypot gives: infinity before NaN, +0 for zeros, subnormals exact', () => {
    const values = [0, -0, 1, -1, 3, 4, Number.NaN, Infinity, -Infinity, 5e-324, -5e-324, 1e308, -1e308, 2 ** -1074, 1e-310];
    for (const x of values) {
      for (const y of values) {
        expect(Object.is(hypot2(x, y), Math.hypot(x, y)), `hypot2(${x}, ${y})`).toBe(true);
        for (const z of values) expect(Object.is(hypot3(x, y, z), Math.hypot(x, y, z)), `hypot3(${x}, ${y}, ${z})`).toBe(true);
      }
    }
    expect(hypot2(3, 4)).toBe(5);
    expect(hypot3(2, 3, 6)).toBe(7);
  });
});
