import { describe, expect, it } from 'vitest';
import { ellipseFromMoments } from '../../src/vision/ellipseFromMoments.ts';
import { endSectorArc, measureEndGrowth, measureOutlineGrowth } from '../../src/vision/outlineGrowth.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

const W = 160, H = 120;

/**
 * A coin of semi-axes (a, b) at (cx, cy), angle th, gray `coin` over a textured background, each pixel's
 * coverage by 16×16 supersampling (the exact area of the ellipse, π a b, common geometry, no source),
 * optionally smeared along x over `blurPx` px (motion blur: a box filter, which keeps the total).
 */
function scene(a: number, b: number, cx: number, cy: number, th: number, coin: number, blurPx = 0) {
  const rnd = mulberry32(7);
  const bg = new Float32Array(W * H);
  for (let i = 0; i < bg.length; i++) bg[i] = 90 + 30 * rnd();
  const cov = new Float32Array(W * H);
  const c = Math.cos(th), s = Math.sin(th);
  const n = 16;
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
    if (Math.hypot(x - cx, y - cy) > a + 2) continue;
    let k = 0;
    for (let sy = 0; sy < n; sy++) for (let sx = 0; sx < n; sx++) {
      const dx = x - 0.5 + (sx + 0.5) / n - cx, dy = y - 0.5 + (sy + 0.5) / n - cy;
      const u = c * dx + s * dy, v = -s * dx + c * dy;
      if ((u / a) ** 2 + (v / b) ** 2 <= 1) k++;
    }
    cov[y * W + x] = k / (n * n);
  }
  let blurred = cov;
  if (blurPx > 0) {
    blurred = new Float32Array(W * H);
    const taps = 8 * blurPx;
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
      let acc = 0;
      for (let t = 0; t < taps; t++) {
        const xs = x - blurPx / 2 + (t + 0.5) / 8;
        const x0 = Math.floor(xs), f = xs - x0;
        const v0 = x0 >= 0 && x0 < W ? cov[y * W + x0] : 0, v1 = x0 + 1 >= 0 && x0 + 1 < W ? cov[y * W + x0 + 1] : 0;
        acc += (1 - f) * v0 + f * v1;
      }
      blurred[y * W + x] = acc / taps;
    }
  }
  const frame = new Uint8Array(W * H);
  for (let i = 0; i < frame.length; i++) frame[i] = Math.round(blurred[i] * coin + (1 - blurred[i]) * bg[i]);
  return { frame, bg };
}

describe('measureOutlineGrowth', () => {
  it('finds the growth of an ellipse drawn larger than a sharp, anti-aliased coin', () => {
    const { frame, bg } = scene(20, 12, 80.3, 60.6, 0.4, 220);
    for (const grow of [0, 1, 2]) {
      const d = measureOutlineGrowth(frame, bg, W, H, { cx: 80.3, cy: 60.6, major: 40 + grow, minor: 24 + grow, angleRad: 0.4 });
      // Rounding the frame to whole gray levels leaves a few hundredths of a pixel.
      expect(Math.abs(d - grow)).toBeLessThan(0.06);
    }
  });

  it('a dark coin on a brighter background and a gain on the frame measure the same', () => {
    const { frame, bg } = scene(16, 15, 70.5, 55.2, 1.2, 20);
    const gain = 1.1;
    const lit = Uint8Array.from(frame, (v) => Math.min(255, Math.round(v * gain)));
    const d = measureOutlineGrowth(lit, bg, W, H, { cx: 70.5, cy: 55.2, major: 33.5, minor: 31.5, angleRad: 1.2 }, { gain });
    expect(Math.abs(d - 1.5)).toBeLessThan(0.08);
  });

  it('keeps the coin area under motion blur the band reaches', () => {
    const { frame, bg } = scene(20, 14, 80, 60, 0, 230, 4);
    // The mask ellipse of a blurred coin is longer along the blur; any ellipse reported is measured against the true area.
    const d = measureOutlineGrowth(frame, bg, W, H, { cx: 80, cy: 60, major: 41, minor: 29, angleRad: 0 }, { reachPx: 4 });
    // Semi-axes 20.5 and 14.5 against 20 and 14: an outline moved out by 0.5 px on every side, δ = 1.
    const expected = 1;
    expect(Math.abs(d - expected)).toBeLessThan(0.08);
  });

  it('says NaN where it cannot tell: no contrast, a sliver, or the frame border', () => {
    const { frame, bg } = scene(20, 12, 80, 60, 0, 105);
    expect(measureOutlineGrowth(frame, bg, W, H, { cx: 80, cy: 60, major: 41, minor: 25, angleRad: 0 }, { minContrast: 40 })).toBeNaN();
    expect(measureOutlineGrowth(frame, bg, W, H, { cx: 80, cy: 60, major: 41, minor: 6, angleRad: 0 })).toBeNaN();
    expect(measureOutlineGrowth(frame, bg, W, H, { cx: 5, cy: 60, major: 41, minor: 25, angleRad: 0 })).toBeNaN();
  });
});

/** The moment ellipse of the pixels brighter than the background by more than `thr`: what the tracker reports. */
function maskEllipse(frame: Uint8Array, bg: Float32Array, thr: number) {
  let m00 = 0, m10 = 0, m01 = 0, m20 = 0, m11 = 0, m02 = 0;
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
    if (frame[y * W + x] - bg[y * W + x] <= thr) continue;
    m00++; m10 += x; m01 += y; m20 += x * x; m11 += x * y; m02 += y * y;
  }
  const r = ellipseFromMoments({ m00, m10, m01, m20, m11, m02 });
  if (!r.ok) throw new Error('empty mask');
  return r.ellipse;
}

/**
 * A coin with a raised border (the outer 10% of its radius, 25 gray levels brighter than its field, 200) over a
 * background dark on the left (30: contrast 170) and bright on the right (170: contrast 30), noise of σ 3, each
 * pixel's coverage by 16×16 supersampling. The ellipse given is the coin's own outline: the true growth is 0.
 */
function borderedCoin(a: number, b: number, cx: number, cy: number, th: number) {
  const rnd = mulberry32(11);
  const bg = new Float32Array(W * H);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) bg[y * W + x] = x < cx ? 30 : 170;
  const frame = new Uint8Array(W * H);
  const c = Math.cos(th), s = Math.sin(th), n = 16;
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
    let acc = 0;
    for (let sy = 0; sy < n; sy++) for (let sx = 0; sx < n; sx++) {
      const dx = x - 0.5 + (sx + 0.5) / n - cx, dy = y - 0.5 + (sy + 0.5) / n - cy;
      const u = c * dx + s * dy, v = -s * dx + c * dy;
      const q = (u / a) ** 2 + (v / b) ** 2;
      acc += q > 1 ? bg[y * W + x] : q > 0.81 ? 225 : 200;
    }
    // A sum of three uniforms: mean 0, σ 3.
    const g = acc / (n * n) + 6 * (rnd() + rnd() + rnd() - 1.5);
    frame[y * W + x] = Math.max(0, Math.min(255, Math.round(g)));
  }
  return { frame, bg };
}

describe('coverage as a ratio of sums (weighted by contrast)', () => {
  it('lets the stretch of outline with little contrast, where a bright border misleads the coverage, count less', () => {
    const e = { cx: 80.3, cy: 60.6, major: 40, minor: 30, angleRad: 0.3 };
    const { frame, bg } = borderedCoin(20, 15, e.cx, e.cy, e.angleRad);
    // The coverage is read against the field 3 px inside, so the border's pixels count as more than covered:
    // the growth reads below 0. Unweighted, each pixel alike: −0.39 (all round) and −0.34 (ends); weighted by
    // |C − B| (a ratio of sums): −0.22 and −0.19.
    expect(Math.abs(measureOutlineGrowth(frame, bg, W, H, e))).toBeLessThan(0.25);
    expect(Math.abs(measureEndGrowth(frame, bg, W, H, e))).toBeLessThan(0.25);
  });
});

describe('endSectorArc', () => {
  it('is the arc of a circle within the sectors, and the normal turns with the polar angle', () => {
    // On a circle of radius r the sectors hold 2 · 50° of arc: length r · 100° in radians, turn 100°.
    const { length, turn } = endSectorArc(7, 7);
    expect(length).toBeCloseTo(7 * (100 * Math.PI) / 180, 9);
    expect(turn).toBeCloseTo((100 * Math.PI) / 180, 12);
  });
});

describe('measureEndGrowth', () => {
  it('takes the threshold\'s growth off the mask\'s major axis, round or thin, where the all-round growth cannot read a thin view', () => {
    for (const [a, b] of [[10, 9], [10, 6], [10, 4], [20, 8], [20, 18]]) {
      const { frame, bg } = scene(a, b, 80.3, 60.6, 0.3, 220);
      for (const thr of [20, 50, 90]) {
        const e = maskEllipse(frame, bg, thr);
        const d = measureEndGrowth(frame, bg, W, H, e);
        // Uncorrected the major axis is off by up to 0.72 px (low threshold long, high short).
        expect(Math.abs(e.major - d - 2 * a)).toBeLessThan(0.22);
      }
    }
    const { frame, bg } = scene(10, 4, 80.3, 60.6, 0.3, 220);
    const e = maskEllipse(frame, bg, 50);
    expect(measureOutlineGrowth(frame, bg, W, H, e)).toBeNaN();
    expect(Number.isFinite(measureEndGrowth(frame, bg, W, H, e))).toBe(true);
  });

  it('follows motion blur along the major axis better than the all-round growth', () => {
    // Blur of 3 px along x, the major axis; the mask's major axis grows by up to 2.3 px.
    let endSum = 0, allSum = 0;
    for (const [a, b] of [[10, 9], [20, 8], [20, 18]]) {
      const { frame, bg } = scene(a, b, 80.3, 60.6, 0, 220, 3);
      for (const thr of [20, 50, 90]) {
        const e = maskEllipse(frame, bg, thr);
        const end = e.major - measureEndGrowth(frame, bg, W, H, e, { reachPx: 3 }) - 2 * a;
        const all = e.major - measureOutlineGrowth(frame, bg, W, H, e, { reachPx: 3 }) - 2 * a;
        endSum += Math.abs(end);
        allSum += Math.abs(all);
        expect(Math.abs(end)).toBeLessThan(0.85);
      }
    }
    expect(endSum).toBeLessThan(0.5 * allSum);
  });

  it('says NaN where it cannot tell: a major axis too short, no contrast, or the frame border', () => {
    const { frame, bg } = scene(20, 12, 80, 60, 0, 105);
    expect(measureEndGrowth(frame, bg, W, H, { cx: 80, cy: 60, major: 8, minor: 6, angleRad: 0 })).toBeNaN();
    expect(measureEndGrowth(frame, bg, W, H, { cx: 80, cy: 60, major: 41, minor: 25, angleRad: 0 }, { minContrast: 40 })).toBeNaN();
    expect(measureEndGrowth(frame, bg, W, H, { cx: 5, cy: 60, major: 41, minor: 25, angleRad: 0 })).toBeNaN();
  });
});

