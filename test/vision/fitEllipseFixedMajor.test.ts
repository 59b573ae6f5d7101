import { describe, expect, it } from 'vitest';
import { fitEllipseFixedMajor } from '../../src/vision/fitEllipseFixedMajor.ts';
import { fitEllipseTrimmed } from '../../src/vision/fitEllipseTrimmed.ts';
import { gauss, prng } from './synthSequence.ts';

/** Points on an ellipse (semi-axes a, b, angle t) at eccentric anomalies in [s0, s1), with Gaussian noise σ. */
function arc(e: { cx: number; cy: number; a: number; b: number; t: number }, s0: number, s1: number, n: number, sigma: number, rand: () => number) {
  const xs: number[] = [], ys: number[] = [];
  for (let i = 0; i < n; i++) {
    const s = s0 + ((s1 - s0) * i) / n;
    const u = e.a * Math.cos(s), v = e.b * Math.sin(s);
    xs.push(e.cx + u * Math.cos(e.t) - v * Math.sin(e.t) + sigma * gauss(rand));
    ys.push(e.cy + u * Math.sin(e.t) + v * Math.cos(e.t) + sigma * gauss(rand));
  }
  return { xs, ys };
}

// Reference: the closed-form ellipse x = c + R(t)·(a cos s, b sin s) (parametric form by eccentric anomaly, a closed form).
describe('fitEllipseFixedMajor', () => {
  it('recovers centre, minor axis and angle from the full outline (every 15° of angle, noise σ 0.2 px, far from the origin) within 0.1 px, minor within 0.2 px, angle within 0.02 rad', () => {
    const rand = prng(11);
    for (let deg = 0; deg < 180; deg += 15) {
      const t = (deg * Math.PI) / 180;
      const e = { cx: 1210.3, cy: 655.8, a: 12, b: 5, t };
      const { xs, ys } = arc(e, 0, 2 * Math.PI, 120, 0.2, rand);
      const r = fitEllipseFixedMajor(xs, ys, xs.length, 24, { start: { cx: 1212, cy: 654, major: 24, minor: 7, angleRad: t + 0.1 } });
      expect(r.ok, `${deg}°`).toBe(true);
      if (!r.ok) continue;
      expect(Math.hypot(r.ellipse.cx - e.cx, r.ellipse.cy - e.cy), `${deg}°`).toBeLessThan(0.1);
      expect(Math.abs(r.ellipse.minor - 10), `${deg}°`).toBeLessThan(0.2); // noise σ 0.2 on 120 points
      expect(r.ellipse.major).toBe(24);
      const da = Math.abs(r.ellipse.angleRad - t);
      expect(Math.min(da, Math.PI - da), `${deg}°`).toBeLessThan(0.02);
      expect(r.coverage).toBe(1);
    }
  });

  it('on a short arc (the two long sides of a thin ellipse, its ends hidden by fingers) it holds the diameter where the free fit cannot', () => {
    const rand = prng(5);
    const e = { cx: 300, cy: 350, a: 12, b: 3, t: 0.05 };
    const top = arc(e, Math.PI / 4, (3 * Math.PI) / 4, 30, 0.25, rand);
    const bottom = arc(e, (5 * Math.PI) / 4, (7 * Math.PI) / 4, 30, 0.25, rand);
    const xs = [...top.xs, ...bottom.xs], ys = [...top.ys, ...bottom.ys];
    // "Fingers": outline points of two round tips 1–4 px beyond the coin's ends, as in a merged blob.
    for (let i = 0; i < 16; i++) {
      const s = (Math.PI * i) / 16 - Math.PI / 2;
      xs.push(316 + 5 * Math.cos(s), 284 - 5 * Math.cos(s));
      ys.push(350 + 5 * Math.sin(s), 350 + 5 * Math.sin(s));
    }
    const n = xs.length;
    // As the tracker calls it: the prediction as the start, the free trimmed fit as a second start.
    const free = fitEllipseTrimmed(xs, ys, n);
    expect(free.ok).toBe(true);
    if (!free.ok) return;
    // The free five-parameter fit misses the diameter by more than 6 % (its centre is fine here).
    expect(Math.abs(free.ellipse.major - 24)).toBeGreaterThan(1.5);
    const r = fitEllipseFixedMajor(xs, ys, n, 24, { start: { cx: 301, cy: 349, major: 24, minor: 5, angleRad: 0 }, centreSigmaPx: 2.4, altStarts: [free.ellipse] });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.hypot(r.ellipse.cx - e.cx, r.ellipse.cy - e.cy)).toBeLessThan(0.6);
    expect(Math.abs(r.ellipse.minor - 6)).toBeLessThan(0.4);
    expect(r.coverage).toBeGreaterThan(0.4);
    expect(r.coverage).toBeLessThan(0.75);
    expect(r.ellipse.major).toBe(24);
  });

  it('ignores a cluster of outliers (a fingertip outline crossing the coin) by the biweight', () => {
    const rand = prng(8);
    const e = { cx: 100, cy: 80, a: 10, b: 7, t: 1.1 };
    const { xs, ys } = arc(e, 0, 2 * Math.PI, 80, 0.2, rand);
    for (let i = 0; i < 25; i++) { xs.push(96 + 0.4 * i); ys.push(93 + 0.3 * gauss(rand)); }
    const r = fitEllipseFixedMajor(xs, ys, xs.length, 20, { start: { cx: 101.5, cy: 81, major: 20, minor: 12, angleRad: 1 } });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.hypot(r.ellipse.cx - e.cx, r.ellipse.cy - e.cy)).toBeLessThan(0.15);
    expect(Math.abs(r.ellipse.minor - 14)).toBeLessThan(0.2);
    expect(r.inliers).toBeLessThan(xs.length - 15);
  });

  it('fails as a value on too few points or a non-finite start', () => {
    const r = fitEllipseFixedMajor([1, 2, 3], [1, 2, 3], 3, 10, { start: { cx: 0, cy: 0, major: 10, minor: 5, angleRad: 0 } });
    expect(r.ok).toBe(false);
    const q = fitEllipseFixedMajor([1, 2, 3, 4, 5, 6, 7], [1, 2, 3, 4, 5, 6, 7], 7, 10, { start: { cx: NaN, cy: 0, major: 10, minor: 5, angleRad: 0 } });
    expect(q.ok).toBe(false);
  });
});
