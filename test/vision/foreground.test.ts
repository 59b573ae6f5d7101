import { describe, expect, it } from 'vitest';
import { foregroundMask } from '../../src/vision/foreground.ts';

describe('foregroundMask', () => {
  it('marks |frame − gain·background| > threshold inside the window only, brighter and darker alike', () => {
    const w = 6, h = 2;
    const bg = new Float32Array(w * h).fill(100);
    const frame = Uint8Array.from([100, 111, 89, 109, 200, 0, 100, 111, 89, 109, 200, 0]);
    const mask = new Uint8Array(w * h).fill(9);
    const n = foregroundMask(frame, bg, w, { x0: 0, y0: 0, x1: 5, y1: 1 }, 10, mask);
    expect(Array.from(mask)).toEqual([0, 1, 1, 0, 1, 9, 9, 9, 9, 9, 9, 9]);
    expect(n).toBe(3);
    // with a gain of 2 the model reads 200: all but the 200 differ by more than 10
    foregroundMask(frame, bg, w, { x0: 0, y0: 0, x1: 5, y1: 1 }, 10, mask, 2);
    expect(Array.from(mask.subarray(0, 5))).toEqual([1, 1, 1, 1, 0]);
  });
});
