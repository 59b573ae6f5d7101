import { describe, expect, it } from 'vitest';
import { circleConic, conicToEllipse, createCamera, pixelRay, projectCircle, projectPoint, viewCosine, worldToCamera } from '../../src/synth/camera.ts';
import { cross, normalize, type Vec3 } from '../../src/physics/index.ts';
import { loadOpenCv } from './helpers.ts';

const cam0 = createCamera({ focalPx: 800, width: 640, height: 480, centerWorld: [0, -1, 0] });

/** Points on the circle (centre c, normal n, radius a). */
function circlePoints(c: Vec3, n: Vec3, a: number, k: number): Vec3[] {
  const nn = normalize(n);
  const p = normalize(cross(nn, Math.abs(nn[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0]));
  const q = cross(nn, p);
  return Array.from({ length: k }, (_, i) => {
    const t = (2 * Math.PI * i) / k;
    return [c[0] + a * (Math.cos(t) * p[0] + Math.sin(t) * q[0]), c[1] + a * (Math.cos(t) * p[1] + Math.sin(t) * q[1]), c[2] + a * (Math.cos(t) * p[2] + Math.sin(t) * q[2])] as Vec3;
  });
}

describe('createCamera / projectPoint (DEVELOPERS.md conventions)', () => {
  it('a level camera has X = x, Y = −z, Z = y, and the principal point at ((W−1)/2, (H−1)/2)', () => {
    expect(worldToCamera(cam0, [0.1, 0, 0.2])).toEqual([0.1, -0.2, 1]);
    const [u, v] = projectPoint(cam0, [0, 0, 0]);
    expect(u).toBeCloseTo(319.5, 12);
    expect(v).toBeCloseTo(239.5, 12);
    // u = f·X/Z + u0, v = f·Y/Z + v0: a point 0.1 m up at 1 m is 80 px above the centre
    expect(projectPoint(cam0, [0.05, 0, 0.1])).toEqual([319.5 + 40, 239.5 - 80]);
    expect(projectPoint(cam0, [0, -2, 0]).every(Number.isNaN)).toBe(true);
  });

  it('a positive roll turns the image content clockwise (a point to the right moves down)', () => {
    const cam = createCamera({ focalPx: 800, width: 640, height: 480, centerWorld: [0, -1, 0], rollRad: (10 * Math.PI) / 180 });
    const [u, v] = projectPoint(cam, [0.1, 0, 0]);
    expect(v).toBeGreaterThan(239.5);
    expect(Math.atan2(v - 239.5, u - 319.5)).toBeCloseTo((10 * Math.PI) / 180, 12);
  });

  it('pixelRay inverts projectPoint', () => {
    const cam = createCamera({ focalPx: 700, width: 640, height: 480, centerWorld: [0.1, -0.8, 0.2], rollRad: 0.3 });
    const p: Vec3 = [0.05, 0.1, 0.3];
    const [u, v] = projectPoint(cam, p);
    const d = pixelRay(cam, u, v);
    const e = normalize([p[0] - 0.1, p[1] + 0.8, p[2] - 0.2]);
    for (let k = 0; k < 3; k++) expect(d[k]).toBeCloseTo(e[k], 12);
  });
});

describe('projectCircle (the perspective image of a circle)', () => {
  const cases: { c: Vec3; n: Vec3 }[] = [
    { c: [0, 0, 0], n: [0, -1, 0] },
    { c: [0.12, 0.05, 0.1], n: [0.3, -0.6, 0.7] },
    { c: [-0.2, 0.3, -0.15], n: [0, 0, 1] },
    { c: [0.25, -0.2, 0.2], n: [1, -0.2, 0.1] },
  ];
  it('every projected circle point satisfies the conic of [1] (eq. C = H⁻ᵀ diag(1,1,−1) H⁻¹)', () => {
    // [1] "Three-dimensional location estimation of circular features for machine vision",
    //     IEEE Transactions on Robotics and Automation 8(5), 1992.
    for (const { c, n } of cases) {
      const m = circleConic(cam0, c, n, 0.012);
      expect(m).not.toBeNull();
      const C = m!;
      const scale = Math.hypot(...C);
      for (const p of circlePoints(c, n, 0.012, 24)) {
        const [u, v] = projectPoint(cam0, p);
        const x = [u, v, 1];
        let q = 0;
        for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) q += x[i] * C[3 * i + j] * x[j];
        expect(Math.abs(q) / scale).toBeLessThan(1e-9 * (u * u + v * v));
      }
    }
  });

  it('matches OpenCV fitEllipse on 360 projected circle points within 3e-3 px and 1e-3 rad', async () => {
    const { cv } = await loadOpenCv();
    for (const { c, n } of cases) {
      const e = projectCircle(cam0, c, n, 0.03)!;
      const pts = circlePoints(c, n, 0.03, 360).map((p) => projectPoint(cam0, p));
      const mat = cv.matFromArray(pts.length, 1, cv.CV_32FC2, pts.flat());
      const r = cv.fitEllipse(mat);
      mat.delete();
      const major = Math.max(r.size.width, r.size.height);
      const minor = Math.min(r.size.width, r.size.height);
      // float32 points: tolerance a few 1e-4 px
      expect(Math.abs(r.center.x - e.cx)).toBeLessThan(2e-3);
      expect(Math.abs(r.center.y - e.cy)).toBeLessThan(2e-3);
      expect(Math.abs(major - e.major)).toBeLessThan(3e-3);
      expect(Math.abs(minor - e.minor)).toBeLessThan(3e-3);
      if (major - minor > 0.5) {
        // OpenCV's angle is that of `width`; turn it into the major axis direction in [0, π)
        let a = (r.angle * Math.PI) / 180 + (r.size.width >= r.size.height ? 0 : Math.PI / 2);
        a = ((a % Math.PI) + Math.PI) % Math.PI;
        const diff = Math.abs(a - e.angleRad);
        expect(Math.min(diff, Math.PI - diff)).toBeLessThan(1e-3);
      }
      expect(e.major).toBeGreaterThanOrEqual(e.minor);
      expect(e.angleRad >= 0 && e.angleRad < Math.PI).toBe(true);
    }
  });

  it('tends to the orthographic image far from the camera: ratio |n·d|, major = f·2a/Z', () => {
    const far = createCamera({ focalPx: 1e5, width: 640, height: 480, centerWorld: [0, -1000, 0] });
    const n = normalize([0, -Math.cos(1), Math.sin(1)]);
    const e = projectCircle(far, [0, 0, 0], n, 0.012)!;
    expect(e.minor / e.major).toBeCloseTo(viewCosine(far, [0, 0, 0], n), 6);
    expect(e.major).toBeCloseTo((1e5 * 0.024) / 1000, 6);
    expect(e.angleRad).toBeCloseTo(0, 6); // tilted about x: the major axis stays horizontal
  });

  it('shows the known perspective effects near the camera: the ellipse centre is not the projected centre', () => {
    const n = normalize([0, -1, 1]);
    const c: Vec3 = [0, 0, 0.3]; // off axis, above
    const e = projectCircle(cam0, c, n, 0.03)!;
    const [, v] = projectPoint(cam0, c);
    expect(Math.abs(e.cy - v)).toBeGreaterThan(0.05);
  });

  it('conicToEllipse rejects a hyperbola and an empty conic', () => {
    expect(conicToEllipse([1, 0, 0, 0, -1, 0, 0, 0, -1])).toBeNull();
    expect(conicToEllipse([1, 0, 0, 0, 1, 0, 0, 0, 1])).toBeNull();
    const e = conicToEllipse([1 / 16, 0, 0, 0, 1 / 4, 0, 0, 0, -1])!; // x²/16 + y²/4 = 1
    expect(e.major).toBeCloseTo(8, 12);
    expect(e.minor).toBeCloseTo(4, 12);
    expect(e.angleRad).toBeCloseTo(0, 12);
  });
});
