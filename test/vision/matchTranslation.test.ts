import { describe, expect, it } from 'vitest';
import { matchTranslation } from '../../src/vision/matchTranslation.ts';
import { gauss, prng, renderFrame, texturedBackground } from './synthSequence.ts';

describe('matchTranslation', () => {
  it('recovers a known sub-pixel shift of a textured coin over a static background within 0.3 px (closed form: the shift drawn)', () => {
    const rand = prng(21);
    const W = 200, H = 160;
    const bg = texturedBackground(W, H, rand);
    for (const [dx, dy] of [[0, 0], [1.3, -2.6], [-3.4, 0.7], [2.5, 2.5]]) {
      const e = { cx: 100.2, cy: 80.6, major: 40, minor: 22, angleRad: 0.3 };
      const a = renderFrame(W, H, bg, { ellipse: e, gray: 200 }, null, 1.5, rand);
      const b = renderFrame(W, H, bg, { ellipse: { ...e, cx: e.cx + dx, cy: e.cy + dy }, gray: 200 }, null, 1.5, rand);
      // The coin's face texture moves with it in renderFrame (it is defined relative to the centre).
      const m = matchTranslation(a, b, W, H, e, 1, 0, 0, 5);
      expect(m.ok, `${dx},${dy}`).toBe(true);
      if (!m.ok) continue;
      // 0.3 px: parabolic refinement of an SSD minimum is biased towards the integer ("pixel locking",
      // common practice, no source), and the 1-px ring of static background pulls towards zero.
      expect(Math.abs(m.dx - dx), `${dx},${dy}`).toBeLessThan(0.3);
      expect(Math.abs(m.dy - dy), `${dx},${dy}`).toBeLessThan(0.3);
      expect(m.rms).toBeLessThan(20); // at the best INTEGER shift a sub-pixel-shifted edge and the noise (σ 1.5 twice) remain
    }
  });

  it('refines the sub-pixel shift by Gauss–Newton steps: within 0.06 px on a smooth pattern with noise, and a chain of 20 matches drifts under 0.3 px', () => {
    // The pattern is a closed form (a sum of Gaussian blobs, sampled exactly at each shift), so the true shift is
    // known to machine precision. Noise σ 1.5 gray levels per frame.
    const rand = prng(33);
    const W = 120, H = 120;
    const blobs = Array.from({ length: 40 }, () => ({ x: 20 + 80 * rand(), y: 20 + 80 * rand(), s: 2 + 3 * rand(), a: 60 * (rand() - 0.3) }));
    const frame = (ox: number, oy: number, noise: number): Uint8Array => {
      const out = new Uint8Array(W * H);
      for (let y = 0; y < H; y++) {
        for (let x = 0; x < W; x++) {
          let v = 100;
          for (const b of blobs) v += b.a * Math.exp(-((x - ox - b.x) ** 2 + (y - oy - b.y) ** 2) / (2 * b.s * b.s));
          out[y * W + x] = Math.max(0, Math.min(255, Math.round(v + noise * gauss(rand))));
        }
      }
      return out;
    };
    const region = { cx: 60, cy: 60, major: 50, minor: 50, angleRad: 0 };
    const shifts = [[0.1, 0.2], [0.3, -0.4], [-0.45, 0.15], [1.25, -0.35], [0.5, 0.5]];
    // Without noise the parabola's bias stands alone: the refined shift is within 0.015 px, the parabola's is off
    // by several times as much on average.
    let errRefined = 0, errParabola = 0;
    const a0 = frame(0, 0, 0);
    for (const [dx, dy] of shifts) {
      const b = frame(dx, dy, 0);
      const m = matchTranslation(a0, b, W, H, region, 0, 0, 0, 3);
      const p = matchTranslation(a0, b, W, H, region, 0, 0, 0, 3, undefined, { refine: false });
      expect(m.ok && p.ok).toBe(true);
      if (!m.ok || !p.ok) continue;
      expect(Math.hypot(m.dx - dx, m.dy - dy), `${dx},${dy}`).toBeLessThan(0.015);
      errRefined += Math.hypot(m.dx - dx, m.dy - dy);
      errParabola += Math.hypot(p.dx - dx, p.dy - dy);
    }
    expect(errParabola).toBeGreaterThan(4 * errRefined);
    // With noise σ 1.5 in both frames: within 0.06 px.
    const a = frame(0, 0, 1.5);
    for (const [dx, dy] of shifts) {
      const m = matchTranslation(a, frame(dx, dy, 1.5), W, H, region, 0, 0, 0, 3);
      expect(m.ok && Math.hypot(m.dx - dx, m.dy - dy), `${dx},${dy}`).toBeLessThan(0.06);
    }
    // A chain: each frame matched to the one before at the shift found, the pattern moving 0.37, −0.21 px a frame.
    let x = 0, y = 0;
    let prev = a;
    for (let k = 1; k <= 20; k++) {
      const next = frame(0.37 * k, -0.21 * k, 1.5);
      const m = matchTranslation(prev, next, W, H, { ...region, cx: 60 + x, cy: 60 + y }, 0, 0.37, -0.21, 3);
      expect(m.ok).toBe(true);
      if (!m.ok) break;
      x += m.dx; y += m.dy;
      prev = next;
    }
    expect(Math.hypot(x - 0.37 * 20, y + 0.21 * 20)).toBeLessThan(0.3);
  });

  it('judges a half-pixel motion of a sharp edge at its sub-pixel shift (residual near the noise), and keep selects the pixels', () => {
    // A bright bar with sharp vertical edges on a flat background, moved by exactly 1.5 px: the bilinear sample of the
    // moved frame at x + 1.5 equals the original (closed form for a linear ramp between the samples), so the
    // sub-pixel residual is the noise alone (σ 1 twice: about 1.4), while at the integer shift each edge column
    // leaves half the step (40 of 80 gray levels).
    const rand = prng(5);
    const W = 100, H = 60;
    const bar = (x: number, off: number) => Math.max(0, Math.min(1, Math.min(x - (40 + off), 60 + off - x) + 0.5));
    const draw = (off: number) => Uint8Array.from({ length: W * H }, (_, i) => Math.round(60 + 80 * bar(i % W, off) + gauss(rand)));
    const a = draw(0), b = draw(1.5);
    const region = { cx: 50, cy: 30, major: 40, minor: 30, angleRad: 0 };
    const m = matchTranslation(a, b, W, H, region, 1, 0, 0, 4);
    expect(m.ok).toBe(true);
    if (!m.ok) return;
    expect(Math.abs(m.dx - 1.5)).toBeLessThan(0.3);
    expect(m.rms).toBeGreaterThan(8);
    expect(m.rmsSubpixel).toBeLessThan(3);
    // keep: only the bar's pixels (bright in the first frame) take part.
    const k = matchTranslation(a, b, W, H, region, 1, 0, 0, 4, (i) => a[i] > 100);
    expect(k.ok && k.pixels < m.pixels && Math.abs(k.dx - 1.5) < 0.3).toBe(true);
  });

  it('fails as a value when the best shift lies on the border of the search range or the patch is outside', () => {
    const rand = prng(2);
    const W = 120, H = 100;
    const img = Uint8Array.from({ length: W * H }, () => 100 + 40 * gauss(rand));
    const shifted = new Uint8Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) shifted[y * W + x] = img[y * W + Math.max(0, x - 6)];
    const far = matchTranslation(img, shifted, W, H, { cx: 60, cy: 50, major: 20, minor: 12, angleRad: 0 }, 1, 0, 0, 3);
    expect(far.ok).toBe(false);
    const out = matchTranslation(img, img, W, H, { cx: -50, cy: -50, major: 10, minor: 6, angleRad: 0 }, 0, 0, 0, 2);
    expect(out.ok).toBe(false);
  });
});
