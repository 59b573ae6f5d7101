import { describe, expect, it } from 'vitest';
import { createBackgroundModel } from '../../src/vision/background.ts';
import { foregroundMask } from '../../src/vision/foreground.ts';

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

  it('update touches exactly the pixels a per-pixel reference touches (window, excluded box, row phase), with the same floats', () => {
    // Reference: the rule of the TSDoc applied pixel by pixel (a naive loop; common practice, no source).
    const w = 23, h = 17, rate = 0.02, staticFrames = 3, staticGray = 6;
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) >>> 0) >>> 16) & 255;
    const bg = createBackgroundModel(w, h, { rate, staticFrames, staticGray });
    const init = new Uint8Array(w * h).map(() => rand());
    bg.initFromFrames([init]);
    const ref = Float32Array.from(bg.data);
    const still = new Uint8Array(w * h);
    let prev = init;
    const cases = [
      { win: { x0: 0, y0: 0, x1: w, y1: h }, ex: null, step: 1, phase: 0 },
      { win: { x0: 3, y0: 2, x1: 20, y1: 15 }, ex: { x0: 6, y0: 4, x1: 11, y1: 9 }, step: 1, phase: 0 },
      { win: { x0: 0, y0: 1, x1: w, y1: h }, ex: { x0: 0, y0: 0, x1: 5, y1: 30 }, step: 4, phase: 3 },
      { win: { x0: 2, y0: 5, x1: 9, y1: 12 }, ex: { x0: 7, y0: 0, x1: 40, y1: 8 }, step: 4, phase: 1 },
      { win: { x0: 0, y0: 0, x1: w, y1: h }, ex: { x0: 5, y0: 5, x1: 5, y1: 9 }, step: 2, phase: 0 },
    ];
    for (let round = 0; round < 6; round++) {
      for (const c of cases) {
        // Half the pixels barely change (static foreground gets absorbed), half change a lot.
        const frame = prev.map((v, i) => (i % 2 ? Math.min(255, v + (rand() % 5)) : rand()));
        const mask = new Uint8Array(w * h).map(() => (rand() < 100 ? 1 : 0));
        bg.update(frame, prev, mask, 1.03, c.win, c.ex, c.step, c.phase);
        for (let y = c.win.y0; y < c.win.y1; y++) {
          if (c.step > 1 && y % c.step !== c.phase) continue;
          for (let x = c.win.x0; x < c.win.x1; x++) {
            if (c.ex && x >= c.ex.x0 && x < c.ex.x1 && y >= c.ex.y0 && y < c.ex.y1) continue;
            const i = y * w + x;
            if (mask[i] === 0) { ref[i] += rate * (frame[i] * (1 / 1.03) - ref[i]); still[i] = 0; }
            else if (Math.abs(frame[i] - prev[i]) <= staticGray) {
              if (++still[i] >= staticFrames) { ref[i] = frame[i] * (1 / 1.03); still[i] = 0; }
            } else still[i] = 0;
          }
        }
        prev = frame;
      }
    }
    expect(Array.from(bg.data)).toEqual(Array.from(ref));
  });

  it('with no mask and a threshold, updates exactly as with the mask foregroundMask gives (rows on a phase, a hole excluded)', () => {
    const w = 37, h = 23, n = w * h;
    let seed = 7;
    const rnd = (): number => ((seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff);
    const init = Array.from({ length: 3 }, () => Uint8Array.from({ length: n }, () => 40 + Math.floor(20 * rnd())));
    const a = createBackgroundModel(w, h, { staticFrames: 2 });
    const b = createBackgroundModel(w, h, { staticFrames: 2 });
    a.initFromFrames(init);
    b.initFromFrames(init);
    const win = { x0: 3, y0: 1, x1: 35, y1: 22 };
    const exclude = { x0: 10, y0: 5, x1: 18, y1: 12 };
    let prev = init[2];
    for (let t = 0; t < 12; t++) {
      // Noise, plus a bright square that moves for a while and then stops (absorbed as static).
      const frame = Uint8Array.from({ length: n }, () => 40 + Math.floor(20 * rnd()));
      const sx = Math.min(t, 6) * 3;
      for (let y = 14; y < 20; y++) for (let x = sx; x < sx + 6; x++) frame[y * w + x] = 200;
      const mask = new Uint8Array(n);
      foregroundMask(frame, a.data, w, win, 12, mask, 1.05);
      a.update(frame, prev, mask, 1.05, win, exclude, 4, t % 4);
      b.update(frame, prev, null, 1.05, win, exclude, 4, t % 4, 12);
      prev = frame;
    }
    expect(Array.from(b.data)).toEqual(Array.from(a.data));
    expect(() => b.update(prev, prev, null, 1, win, null)).toThrow(/no mask and no threshold/);
  });
});
