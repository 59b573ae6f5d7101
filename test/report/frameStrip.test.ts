import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FrameRow } from '../../src/dataset/index.ts';
import { cropAround, ellipseOverlaySvg, frameStrip, pickStripFrames } from '../../src/report/frameStrip.ts';
import { COIN_PX, IMAGE, makeStudy, type StudyFixture } from './fixtures.ts';

// Pixel convention of the project: origin at the centre of the top-left pixel, so pixel i covers [i − ½, i + ½)
// and a crop from pixel x0 enlarged s times maps x to (x − x0 + ½)·s (common practice, no source).
let study: StudyFixture;
let own: FrameRow[];
beforeAll(async () => {
  study = await makeStudy({ tosses: 1, clips: 1 });
  own = study.frames.filter((f) => f.toss_id === study.tosses[0].toss_id);
});
afterAll(() => study.cleanup());

describe('pickStripFrames', () => {
  it('spreads 6 frames over the flight, first and last flight frames included, sorted', () => {
    const picked = pickStripFrames(own, 6);
    const flying = own.filter((f) => f.in_flight === true).map((f) => f.frame as number);
    expect(picked).toHaveLength(6);
    expect(picked.every((f) => f.in_flight === true)).toBe(true);
    expect(picked[0].frame).toBe(Math.min(...flying));
    expect(picked[5].frame).toBe(Math.max(...flying));
    const idx = picked.map((f) => f.frame as number);
    expect([...idx].sort((a, b) => a - b)).toEqual(idx);
  });
  it('uses every frame with an ellipse when none is in flight, and returns fewer when there are fewer', () => {
    const grounded = own.slice(0, 4).map((f) => ({ ...f, in_flight: false }));
    expect(pickStripFrames(grounded, 6)).toHaveLength(4);
    expect(pickStripFrames(grounded.map((f) => ({ ...f, detected: false })), 6)).toHaveLength(0);
  });
});

describe('cropAround and ellipseOverlaySvg', () => {
  it('crops a square of 2.2 major axes inside the image', () => {
    const picked = pickStripFrames(own);
    for (const f of picked) {
      const c = cropAround(f, picked, IMAGE.width, IMAGE.height);
      expect(c.side).toBe(Math.ceil(2.2 * COIN_PX));
      expect(c.left).toBeGreaterThanOrEqual(0);
      expect(c.top).toBeGreaterThanOrEqual(0);
      expect(c.left + c.side).toBeLessThanOrEqual(IMAGE.width);
      expect(c.top + c.side).toBeLessThanOrEqual(IMAGE.height);
    }
    const corner = { ...picked[0], cx_px: 1, cy_px: IMAGE.height - 2 };
    expect(cropAround(corner, picked, IMAGE.width, IMAGE.height)).toMatchObject({ left: 0, top: IMAGE.height - 49 });
  });
  it('draws the full axes halved into radii at (x − x0 + ½)·s, turned by angle_deg', () => {
    const f = { ...own[0], cx_px: 30.25, cy_px: 40.75, major_px: 20, minor_px: 8, angle_deg: 33 };
    const svg = ellipseOverlaySvg(f, { left: 10, top: 20, side: 50 }, 300);
    const s = 300 / 50;
    expect(svg).toContain(`cx="${((30.25 - 10 + 0.5) * s).toFixed(3)}" cy="${((40.75 - 20 + 0.5) * s).toFixed(3)}" rx="${(10 * s).toFixed(3)}" ry="${(4 * s).toFixed(3)}"`);
    expect(svg).toContain(`rotate(33.000 ${((30.25 - 10 + 0.5) * s).toFixed(3)}`);
  });
});

describe('frameStrip', () => {
  it('decodes the clip once and draws each fitted ellipse on the coin, at twice the display size', async () => {
    const file = join(study.clipsDir, String(study.tosses[0].file));
    const images = await frameStrip(file, own, { count: 6, displayPx: 150 });
    const picked = pickStripFrames(own, 6);
    expect(images.map((i) => i.frame)).toEqual(picked.map((f) => f.frame));
    for (const [n, img] of images.entries()) {
      expect(img.dataUri.startsWith('data:image/png;base64,')).toBe(true);
      const png = Buffer.from(img.dataUri.slice('data:image/png;base64,'.length), 'base64');
      const { data, info } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
      expect([info.width, info.height]).toEqual([300, 300]);
      const px = (x: number, y: number): number[] => {
        const o = (Math.round(y) * info.width + Math.round(x)) * info.channels;
        return [data[o], data[o + 1], data[o + 2]];
      };
      const f = picked[n];
      const crop = cropAround(f, picked, IMAGE.width, IMAGE.height);
      const s = 300 / crop.side;
      const cx = ((f.cx_px as number) - crop.left + 0.5) * s;
      const cy = ((f.cy_px as number) - crop.top + 0.5) * s;
      const t = ((f.angle_deg as number) * Math.PI) / 180;
      const a = ((f.major_px as number) / 2) * s;
      // the end of the major axis lies on the yellow line (#FFD23F): red and green high, blue low
      let best = 0;
      for (let dx = -1; dx <= 1; dx++) for (let dy = -1; dy <= 1; dy++) {
        const [r, g, b] = px(cx + a * Math.cos(t) + dx, cy + a * Math.sin(t) + dy);
        best = Math.max(best, Math.min(r, g) - b);
      }
      expect(best).toBeGreaterThan(80);
      // the crop's corner is the dark background, untouched: gray, not yellow
      const [r, g, b] = px(3, 3);
      expect(Math.max(r, g, b) - Math.min(r, g, b)).toBeLessThan(4);
      expect(r).toBeLessThan(110);
      // inside the coin, along the major axis halfway out: the bright coin (215 in the clip), gray
      const [r2, g2, b2] = px(cx + 0.5 * a * Math.cos(t), cy + 0.5 * a * Math.sin(t));
      expect(Math.min(r2, g2, b2)).toBeGreaterThan(170);
      expect(Math.max(r2, g2, b2) - Math.min(r2, g2, b2)).toBeLessThan(6);
    }
  });
});
