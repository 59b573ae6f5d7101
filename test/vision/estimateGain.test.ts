import { describe, expect, it } from 'vitest';
import { estimateGain } from '../../src/vision/estimateGain.ts';

describe('estimateGain', () => {
  it('recovers a global brightness factor of 1.07 within its 1/1024 resolution, ignoring a 10% foreground patch', () => {
    const w = 400, h = 300;
    const bg = Float32Array.from({ length: w * h }, (_, i) => 60 + ((i * 7919) % 120));
    const frame = Uint8Array.from(bg, (v) => Math.min(255, Math.round(v * 1.07)));
    for (let y = 0; y < 95; y++) for (let x = 0; x < 130; x++) frame[y * w + x] = 0;
    // rounding to integers adds up to 0.5/60 relative error per sample; the median keeps it near 0
    expect(Math.abs(estimateGain(frame, bg, w, h, 4) - 1.07)).toBeLessThan(3e-3);
  });

  it('is 1 when the background is too dark to compare', () => {
    expect(estimateGain(new Uint8Array(64 * 64).fill(200), new Float32Array(64 * 64).fill(3), 64, 64, 4)).toBe(1);
  });
});
