import { beforeAll, describe, expect, it } from 'vitest';
import { labelComponents } from '../../src/vision/labelComponents.ts';
import { loadOpenCv, type Cv } from './opencv.ts';
import { prng } from './synthSequence.ts';

let cv: Cv;
beforeAll(async () => {
  cv = (await loadOpenCv()).cv;
});

describe('labelComponents', () => {
  it('labelComponents(mask) joins diagonal neighbours (8-connectivity)', () => {
    const w = 5, h = 5;
    const mask = new Uint8Array(w * h);
    for (let i = 0; i < 5; i++) mask[i * w + i] = 1; // a diagonal line
    mask[4] = 1; // pixel (4, 0): its neighbours (3, 0), (3, 1), (4, 1) are empty, so a second component
    const c = labelComponents(mask, w, h);
    expect(c.count).toBe(2);
    expect(c.labels[0]).toBe(c.labels[4 * w + 4]);
    expect(c.area[c.labels[0] - 1]).toBe(5);
  });

  it('areas sum to the mask count, labels run 1..n, and per-component areas match OpenCV connectedComponentsWithStats (8-connectivity)', () => {
    const rand = prng(11);
    const w = 97, h = 61;
    const mask = new Uint8Array(w * h);
    for (let i = 0; i < mask.length; i++) mask[i] = rand() < 0.35 ? 1 : 0;
    const c = labelComponents(mask, w, h);
    const total = mask.reduce((a, b) => a + b, 0);
    expect(Array.from(c.area.subarray(0, c.count)).reduce((a, b) => a + b, 0)).toBe(total);
    const seen = new Set<number>();
    for (let i = 0; i < mask.length; i++) {
      if (mask[i]) {
        expect(c.labels[i]).toBeGreaterThanOrEqual(1);
        expect(c.labels[i]).toBeLessThanOrEqual(c.count);
        seen.add(c.labels[i]);
      } else expect(c.labels[i]).toBe(0);
    }
    expect(seen.size).toBe(c.count);
    const img = cv.matFromArray(h, w, cv.CV_8UC1, Array.from(mask));
    const lab = new cv.Mat(), stats = new cv.Mat(), cents = new cv.Mat();
    const n = cv.connectedComponentsWithStats(img, lab, stats, cents, 8, cv.CV_32S);
    expect(n - 1).toBe(c.count); // OpenCV counts the background as label 0
    const ours = Array.from(c.area.subarray(0, c.count)).sort((a, b) => a - b);
    const theirs: number[] = [];
    for (let k = 1; k < n; k++) theirs.push(stats.intAt(k, cv.CC_STAT_AREA));
    theirs.sort((a, b) => a - b);
    expect(ours).toEqual(theirs);
    [img, lab, stats, cents].forEach((m) => m.delete());
  });

  it('labels only inside the window, flags window and frame borders, and reuses its buffers', () => {
    const w = 20, h = 10;
    const mask = new Uint8Array(w * h);
    for (let y = 2; y < 6; y++) for (let x = 0; x < 8; x++) mask[y * w + x] = 1; // touches the frame's left edge
    for (let y = 3; y < 5; y++) for (let x = 12; x < 20; x++) mask[y * w + x] = 1; // runs past the window's right side
    const c1 = labelComponents(mask, w, h, { x0: 0, y0: 0, x1: 15, y1: 10 });
    expect(c1.count).toBe(2);
    expect(c1.touchesFrame[0]).toBe(1);
    expect(c1.touchesWindow[0]).toBe(0); // the left window side is the frame border
    expect(c1.touchesWindow[1]).toBe(1);
    expect(c1.area[1]).toBe(6);
    expect(c1.maxX[1]).toBe(14);
    const c2 = labelComponents(mask, w, h, undefined, c1);
    expect(c2).toBe(c1);
    expect(c2.area[1]).toBe(16);
    // moment sums: Σx over the first block = 4 rows × (0+…+7)
    expect(c2.m10[0]).toBe(4 * 28);
  });

  it('statistics of each component on a wide odd-sized frame equal the sums over its labelled pixels (row from index exact, borders from the box)', () => {
    const w = 1283, h = 731;
    let seed = 11;
    const rand = () => ((seed = (seed * 1103515245 + 12345) >>> 0) >>> 16) / 65536;
    const mask = new Uint8Array(w * h).map(() => (rand() < 0.45 ? 1 : 0));
    const win = { x0: 1, y0: 0, x1: w - 7, y1: h - 1 };
    const c = labelComponents(mask, w, h, win, undefined, 1 << 17);
    const n = c.count;
    const area = new Float64Array(n), sx = new Float64Array(n), sy = new Float64Array(n), sxy = new Float64Array(n);
    const minX = new Int32Array(n).fill(w), maxX = new Int32Array(n).fill(-1), minY = new Int32Array(n).fill(h), maxY = new Int32Array(n).fill(-1);
    for (let y = win.y0; y < win.y1; y++) {
      for (let x = win.x0; x < win.x1; x++) {
        const l = c.labels[y * w + x];
        if (l === 0) continue;
        const k = l - 1;
        area[k]++; sx[k] += x; sy[k] += y; sxy[k] += x * y;
        minX[k] = Math.min(minX[k], x); maxX[k] = Math.max(maxX[k], x); minY[k] = Math.min(minY[k], y); maxY[k] = Math.max(maxY[k], y);
      }
    }
    expect(c.overflow).toBe(false);
    for (let k = 0; k < n; k++) {
      expect([c.area[k], c.m10[k], c.m01[k], c.m11[k], c.minX[k], c.maxX[k], c.minY[k], c.maxY[k]])
        .toEqual([area[k], sx[k], sy[k], sxy[k], minX[k], maxX[k], minY[k], maxY[k]]);
      const tw = minX[k] === win.x0 || maxX[k] === win.x1 - 1 || maxY[k] === win.y1 - 1; // x0 = 1 > 0; y0 = 0 is the frame's edge
      expect(c.touchesWindow[k]).toBe(tw ? 1 : 0);
      expect(c.touchesFrame[k]).toBe(minY[k] === 0 ? 1 : 0); // the window reaches no other frame edge
    }
  });
});
