import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { sameFaceProbability } from '../../src/estimate/faceProbability.ts';
import { faceChangeTimes } from '../../src/physics/upFace.ts';

// reference library (dev only): jstat 1.9.6
const { jStat } = createRequire(import.meta.url)('jstat') as { jStat: { normal: { cdf(x: number, mean: number, sd: number): number } } };

// End over end (ψ = β = 90°): n·ẑ = cos(Ωt + φ0), a face change every half turn, at Ωt + φ0 = π/2 + kπ.
const HALF_PI = Math.PI / 2;

describe('sameFaceProbability', () => {
  it('with one face change within reach is the normal probability of staying on its side (jStat normal cdf)', () => {
    // 1 rev/s: changes at t = 0.25 s + k · 0.5 s (φ0 = 0); the one at 0.25 s is the only one within 8 SE.
    const omega = 2 * Math.PI;
    expect(faceChangeTimes(HALF_PI, HALF_PI, omega, 0, 0.2 - 0.08, 0.2 + 0.08)).toHaveLength(1);
    for (const [t, se] of [[0.2, 0.01], [0.24, 0.005], [0.26, 0.008], [0.25, 0.003]] as const) {
      const z = 0.25;
      const expected = t < z ? jStat.normal.cdf(z, t, se) : 1 - jStat.normal.cdf(z, t, se);
      expect(sameFaceProbability(HALF_PI, HALF_PI, omega, 0, t, se)).toBeCloseTo(expected, 10);
    }
  });

  it('tends to one half when the timing error spans many face changes, and is 1 without one', () => {
    const omega = 2 * Math.PI * 40; // a change every 12.5 ms
    expect(Math.abs(sameFaceProbability(HALF_PI, HALF_PI, omega, 0.3, 0.4, 0.05) - 0.5)).toBeLessThan(1e-6);
    expect(sameFaceProbability(HALF_PI, HALF_PI, omega, 0.3, 0.4, 0)).toBe(1);
    expect(sameFaceProbability(0.3, 0.3, omega, 0.3, 0.4, 0.05)).toBe(1); // the face never changes
  });

  it('between two changes is the normal mass between them plus that beyond the next but one', () => {
    // Changes at ±12.5 ms around t = 0 (φ0 = 0, 20 rev/s: Ωt = ±π/2); the next ones at ±37.5 ms.
    const omega = 2 * Math.PI * 20, se = 0.01;
    const inside = jStat.normal.cdf(0.0125, 0, se) - jStat.normal.cdf(-0.0125, 0, se);
    const beyond = 2 * (jStat.normal.cdf(-0.0375, 0, se) - jStat.normal.cdf(-0.0625, 0, se));
    const farther = 2 * jStat.normal.cdf(-0.0875, 0, se);
    expect(sameFaceProbability(HALF_PI, HALF_PI, omega, 0, 0, se)).toBeCloseTo(inside + beyond + farther, 6);
  });
});
