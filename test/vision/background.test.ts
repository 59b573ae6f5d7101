import { describe, expect, it } from 'vitest';
import { createBackgroundModel } from '../../src/vision/background.ts';

describe('createBackgroundModel', () => {
  it('initialises to the per-pixel median of the first frames (a coin passing through is ignored)', () => {
    const frames = [10, 200, 12, 11, 13].map((v) => new Uint8Array(4).fill(v));
    const bg = createBackgroundModel(2, 2);
    bg.initFromFrames(frames);
    expect(Array.from(bg.data)).toEqual([12, 12, 12, 12]);
  });

  it('absorbs a static ghost after staticFrames unchanged frames and never updates the excluded rectangle', () => {
    const w = 4, h = 1;
    const bg = createBackgroundModel(w, h, { rate: 0.5, staticFrames: 3, staticGray: 2 });
    bg.initFromFrames([new Uint8Array([50, 50, 50, 50])]);
    const frame = new Uint8Array([50, 150, 150, 60]);
    const mask = new Uint8Array([0, 1, 1, 0]);
    const exclude = { x0: 2, y0: 0, x1: 3, y1: 1 };
    for (let k = 0; k < 2; k++) bg.update(frame, frame, mask, 1, { x0: 0, y0: 0, x1: 4, y1: 1 }, exclude);
    expect(bg.data[1]).toBe(50); // not yet
    expect(bg.data[3]).toBeCloseTo(57.5, 5); // running average: 50 → 55 → 57.5
    bg.update(frame, frame, mask, 1, { x0: 0, y0: 0, x1: 4, y1: 1 }, exclude);
    expect(bg.data[1]).toBe(150); // absorbed on the 3rd unchanged frame
    expect(bg.data[2]).toBe(50); // excluded (the coin)
  });
});
