import { beforeAll, describe, expect, it } from 'vitest';
import { ellipseFromMoments } from '../../src/vision/ellipseFromMoments.ts';
import { labelComponents } from '../../src/vision/labelComponents.ts';
import { loadOpenCv, type Cv } from './opencv.ts';
import { ellipseMask } from './rasterMask.ts';

let cv: Cv;
beforeAll(async () => {
  cv = (await loadOpenCv()).cv;
});

describe('ellipseFromMoments', () => {
  it('moment sums of a rasterised ellipse equal OpenCV moments (binary image) exactly', () => {
    const w = 300, h = 200;
    const mask = ellipseMask(w, h, { cx: 151.3, cy: 97.8, major: 150, minor: 41, angleRad: 0.6 });
    const c = labelComponents(mask, w, h);
    expect(c.count).toBe(1);
    const img = cv.matFromArray(h, w, cv.CV_8UC1, Array.from(mask));
    const m = cv.moments(img, true);
    img.delete();
    // Integer sums below 2^53: exact in double on both sides.
    expect(c.area[0]).toBe(m.m00);
    expect(c.m10[0]).toBe(m.m10);
    expect(c.m01[0]).toBe(m.m01);
    expect(c.m20[0]).toBe(m.m20);
    expect(c.m11[0]).toBe(m.m11);
    expect(c.m02[0]).toBe(m.m02);
    // and the ellipse from them matches OpenCV's central moments (mu20/m00 …) without the pixel correction
    const r = ellipseFromMoments({ m00: c.area[0], m10: c.m10[0], m01: c.m01[0], m20: c.m20[0], m11: c.m11[0], m02: c.m02[0] }, false);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const sxx = m.mu20 / m.m00, syy = m.mu02 / m.m00, sxy = m.mu11 / m.m00;
    const l1 = (sxx + syy) / 2 + Math.hypot((sxx - syy) / 2, sxy);
    expect(Math.abs(r.ellipse.major - 4 * Math.sqrt(l1))).toBeLessThan(1e-9);
    expect(Math.abs(r.ellipse.angleRad - 0.5 * Math.atan2(2 * sxy, sxx - syy))).toBeLessThan(1e-9);
  });

  it('recovers a rasterised ellipse: centre within 0.12 px (0.3 px for the 200×10 sliver), axes within 0.75 px, angle within 0.3°, fill ratio within 2% of 1', () => {
    const w = 260, h = 260;
    for (let deg = 0; deg < 180; deg += 15) {
      for (const ratio of [0.05, 0.2, 0.5, 0.9]) {
        const e = { cx: 130.37, cy: 129.71, major: 200, minor: 200 * ratio, angleRad: (deg * Math.PI) / 180 };
        const c = labelComponents(ellipseMask(w, h, e), w, h);
        // A thin ellipse can rasterise into a few 8-connected runs; sum them.
        const sum = (a: ArrayLike<number>): number => Array.from(a).slice(0, c.count).reduce((p, q) => p + q, 0);
        const r = ellipseFromMoments({ m00: sum(c.area), m10: sum(c.m10), m01: sum(c.m01), m20: sum(c.m20), m11: sum(c.m11), m02: sum(c.m02) });
        expect(r.ok).toBe(true);
        if (!r.ok) continue;
        // Tolerances from the rasterisation itself: a pixel gained or lost at a sliver's tip, 100 px out, moves the centroid ~0.06 px.
        expect(Math.hypot(r.ellipse.cx - e.cx, r.ellipse.cy - e.cy)).toBeLessThan(ratio < 0.1 ? 0.3 : 0.12);
        expect(Math.abs(r.ellipse.major - e.major)).toBeLessThan(0.75);
        expect(Math.abs(r.ellipse.minor - e.minor)).toBeLessThan(0.25);
        const d = Math.abs(r.ellipse.angleRad - e.angleRad);
        expect(Math.min(d, Math.PI - d)).toBeLessThan((0.3 * Math.PI) / 180);
        expect(Math.abs(r.fillRatio - 1)).toBeLessThan(0.02);
      }
    }
  });

  it('a one-pixel-wide run of n pixels has full axes 4·sqrt(n²/12) and 4·sqrt(1/12) with the unit-square correction (closed form)', () => {
    const n = 30;
    let m10 = 0, m20 = 0;
    for (let x = 0; x < n; x++) { m10 += x; m20 += x * x; }
    const r = ellipseFromMoments({ m00: n, m10, m01: 0, m20, m11: 0, m02: 0 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.ellipse.major).toBeCloseTo(4 * Math.sqrt((n * n) / 12), 10);
    expect(r.ellipse.minor).toBeCloseTo(4 * Math.sqrt(1 / 12), 10);
    expect(r.ellipse.angleRad).toBe(0);
  });

  it('returns a reason for an empty region', () => {
    expect(ellipseFromMoments({ m00: 0, m10: 0, m01: 0, m20: 0, m11: 0, m02: 0 })).toEqual({ ok: false, reason: 'empty' });
  });
});
