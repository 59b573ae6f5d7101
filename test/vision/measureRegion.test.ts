import { describe, expect, it } from 'vitest';
import { labelComponents } from '../../src/vision/labelComponents.ts';
import { createRegionScratch, measureRegion } from '../../src/vision/measureRegion.ts';
import { ellipseMask } from './rasterMask.ts';

describe('measureRegion', () => {
  it('fills the holes of a ring: filled area equals the full disc, hole area the inner disc', () => {
    const w = 80, h = 80;
    const outer = ellipseMask(w, h, { cx: 40, cy: 40, major: 50, minor: 50, angleRad: 0 });
    const inner = ellipseMask(w, h, { cx: 42, cy: 38, major: 20, minor: 14, angleRad: 0.5 });
    const ring = outer.map((v, i) => (v && !inner[i] ? 1 : 0));
    const frame = new Uint8Array(w * h).fill(100);
    const c = labelComponents(ring, w, h);
    expect(c.count).toBe(1);
    const accept = new Uint8Array(c.count + 1);
    accept[1] = 1;
    const m = measureRegion(c, accept, { x0: c.minX[0], y0: c.minY[0], x1: c.maxX[0] + 1, y1: c.maxY[0] + 1 }, frame, createRegionScratch(w, h));
    expect(m.area).toBe(outer.reduce((a, b) => a + b, 0));
    expect(m.holeArea).toBe(inner.reduce((a, b) => a + b, 0));
    expect(m.meanGray).toBe(100);
    expect(m.touchesFrame).toBe(false);
  });

  it('lists the outline as crack midpoints: a w×h rectangle gives 2(w+h) points on its pixel-square boundary', () => {
    const W = 30, H = 20;
    const mask = new Uint8Array(W * H);
    for (let y = 5; y < 12; y++) for (let x = 4; x < 17; x++) mask[y * W + x] = 1; // 13 × 7
    const c = labelComponents(mask, W, H);
    const accept = new Uint8Array(2);
    accept[1] = 1;
    const s = createRegionScratch(W, H);
    const m = measureRegion(c, accept, { x0: 4, y0: 5, x1: 17, y1: 12 }, new Uint8Array(W * H), s);
    expect(m.outlineCount).toBe(2 * (13 + 7));
    for (let i = 0; i < m.outlineCount; i++) {
      const x = s.xs[i], y = s.ys[i];
      const onVertical = (x === 3.5 || x === 16.5) && y >= 5 && y <= 11;
      const onHorizontal = (y === 4.5 || y === 11.5) && x >= 4 && x <= 16;
      expect(onVertical || onHorizontal).toBe(true);
    }
  });

  it('does not list steps across the window border (a cut) and flags the frame border', () => {
    const W = 30, H = 20;
    const mask = new Uint8Array(W * H);
    for (let y = 0; y < 6; y++) for (let x = 10; x < 20; x++) mask[y * W + x] = 1; // touches the top edge
    const c = labelComponents(mask, W, H);
    const accept = new Uint8Array(2);
    accept[1] = 1;
    const m = measureRegion(c, accept, { x0: 10, y0: 0, x1: 20, y1: 6 }, new Uint8Array(W * H), createRegionScratch(W, H));
    expect(m.touchesFrame).toBe(true);
    expect(m.cutCount).toBe(10);
    expect(m.outlineCount).toBe(10 + 2 * 6);
  });
});
