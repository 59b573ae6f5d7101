import { describe, expect, it } from 'vitest';
import { canonicalAxisAngle, conicToEllipse, ellipseToConic } from '../../src/vision/ellipse.ts';

describe('ellipse ↔ conic', () => {
  it('ellipseToConic of a circle of radius r is x² + y² − r² scaled to −1 at the centre (closed form)', () => {
    const q = ellipseToConic({ cx: 0, cy: 0, major: 10, minor: 10, angleRad: 0.3 });
    const expected = [1 / 25, 0, 1 / 25, 0, 0, -1];
    q.forEach((v, i) => expect(Math.abs(v - expected[i])).toBeLessThan(1e-15));
  });

  it('round-trips every 15° of angle, axis ratios 0.05–1, centres far from the origin, any scale of the conic', () => {
    for (let deg = 0; deg < 180; deg += 15) {
      for (const ratio of [0.05, 0.3, 0.7, 0.999]) {
        const e = { cx: 1234.5, cy: -876.25, major: 80, minor: 80 * ratio, angleRad: (deg * Math.PI) / 180 };
        const q = ellipseToConic(e).map((v) => -3.7 * v) as unknown as Parameters<typeof conicToEllipse>[0];
        const r = conicToEllipse(q);
        expect(r.ok).toBe(true);
        if (!r.ok) continue;
        // 1e-6 px: with the centre ~1e3 px out, F ~ (1e3/a)² and the conic keeps ~10 digits of the axes.
        expect(Math.abs(r.ellipse.cx - e.cx)).toBeLessThan(1e-6);
        expect(Math.abs(r.ellipse.cy - e.cy)).toBeLessThan(1e-6);
        expect(Math.abs(r.ellipse.major - e.major)).toBeLessThan(1e-6);
        expect(Math.abs(r.ellipse.minor - e.minor)).toBeLessThan(1e-6);
        const d = Math.abs(r.ellipse.angleRad - e.angleRad);
        if (ratio < 0.99) expect(Math.min(d, Math.PI - d)).toBeLessThan(1e-6);
        expect(r.ellipse.angleRad).toBeGreaterThanOrEqual(0);
        expect(r.ellipse.angleRad).toBeLessThan(Math.PI);
        // points on the ellipse satisfy the conic (closed form)
        const [A, B, C, D, E, F] = ellipseToConic(e);
        const t = 0.7, c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
        const x = e.cx + 40 * Math.cos(t) * c - 40 * ratio * Math.sin(t) * s;
        const y = e.cy + 40 * Math.cos(t) * s + 40 * ratio * Math.sin(t) * c;
        expect(Math.abs(A * x * x + B * x * y + C * y * y + D * x + E * y + F)).toBeLessThan(1e-6);
      }
    }
  });

  it('rejects a hyperbola, a parabola and an imaginary ellipse', () => {
    expect(conicToEllipse([1, 0, -1, 0, 0, -1]).ok).toBe(false); // x² − y² = 1
    expect(conicToEllipse([1, 0, 0, 0, -1, 0]).ok).toBe(false); // y = x²
    expect(conicToEllipse([1, 0, 1, 0, 0, 1])).toEqual({ ok: false, reason: 'imaginary' }); // x² + y² = −1
  });

  it('canonicalAxisAngle folds any angle into [0, π)', () => {
    expect(canonicalAxisAngle(-0.1)).toBeCloseTo(Math.PI - 0.1, 12);
    expect(canonicalAxisAngle(Math.PI)).toBe(0);
    expect(canonicalAxisAngle(7 * Math.PI + 0.2)).toBeCloseTo(0.2, 9);
  });
});
