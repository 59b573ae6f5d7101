import { describe, expect, it } from 'vitest';
import { estimateNoiseSigma } from '../../src/vision/noise.ts';
import { gauss, prng } from './synthSequence.ts';

describe('estimateNoiseSigma', () => {
  it('recovers the σ of Gaussian noise on a static textured scene within 8%, despite a moving bright square', () => {
    const rand = prng(5);
    const w = 320, h = 240;
    const scene = Float32Array.from({ length: w * h }, (_, i) => 100 + 50 * Math.sin(i * 0.37));
    for (const sigma of [2, 5, 10]) {
      const a = new Uint8Array(w * h), b = new Uint8Array(w * h);
      for (let i = 0; i < w * h; i++) {
        a[i] = Math.round(scene[i] + sigma * gauss(rand));
        b[i] = Math.round(scene[i] + sigma * gauss(rand));
      }
      for (let y = 50; y < 100; y++) for (let x = 50; x < 100; x++) a[y * w + x] = 255; // the "coin" moved
      const est = estimateNoiseSigma(a, b, w, h);
      // 1.4826·MAD is consistent for Gaussian data ("Robust Statistics", Wiley, 1981); 8% covers rounding to integers, sampling and the 3% of moved pixels (which shift the median).
      expect(Math.abs(est / sigma - 1)).toBeLessThan(0.08);
    }
  });

  it('is 0 for identical frames', () => {
    const a = new Uint8Array(100).fill(7);
    expect(estimateNoiseSigma(a, a, 10, 10, 1)).toBe(0);
  });
});
