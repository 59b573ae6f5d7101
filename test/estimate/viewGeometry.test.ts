import { describe, expect, it } from 'vitest';
import { circleImageMajor, nearFaceMagnification } from '../../src/estimate/viewGeometry.ts';

// The reference: the pinhole projection u = f X / Z, v = f Y / Z of 1440 points of a circle's rim, and its image's
// major axis as the longest chord between them (common geometry, no source).
const f = 554.256;
const aM = 0.01213;
const h = 0.00175;

function inPlaneBasis(n: number[]): [number[], number[]] {
  const t0 = Math.abs(n[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const dot = t0[0] * n[0] + t0[1] * n[1] + t0[2] * n[2];
  const e1raw = [t0[0] - dot * n[0], t0[1] - dot * n[1], t0[2] - dot * n[2]];
  const l1 = Math.hypot(e1raw[0], e1raw[1], e1raw[2]);
  const e1 = e1raw.map((x) => x / l1);
  return [e1, [n[1] * e1[2] - n[2] * e1[1], n[2] * e1[0] - n[0] * e1[2], n[0] * e1[1] - n[1] * e1[0]]];
}

function longestChord(c: number[], n: number[], radius: number): number {
  const [e1, e2] = inPlaneBasis(n);
  const pts: [number, number][] = [];
  for (let k = 0; k < 1440; k++) {
    const t = (2 * Math.PI * k) / 1440;
    const p = [0, 1, 2].map((j) => c[j] + radius * (Math.cos(t) * e1[j] + Math.sin(t) * e2[j]));
    pts.push([(f * p[0]) / p[2], (f * p[1]) / p[2]]);
  }
  let best = 0;
  for (let i = 0; i < pts.length; i++) {
    for (let j = i + 1; j < pts.length; j++) best = Math.max(best, Math.hypot(pts[i][0] - pts[j][0], pts[i][1] - pts[j][1]));
  }
  return best;
}

/** A coin at `c` whose normal is tilted `tiltDeg` from the ray, facing the camera. */
function pose(c: number[], tiltDeg: number): { d: number[]; n: number[]; rho: number } {
  const rho = Math.hypot(c[0], c[1], c[2]);
  const d = c.map((x) => x / rho);
  const w = [d[1], -d[0], 0];
  const wl = Math.hypot(w[0], w[1], w[2]);
  const axis = wl > 1e-9 ? w.map((x) => x / wl) : [1, 0, 0];
  const q = [axis[1] * d[2] - axis[2] * d[1], axis[2] * d[0] - axis[0] * d[2], axis[0] * d[1] - axis[1] * d[0]];
  const th = (tiltDeg * Math.PI) / 180;
  return { d, n: d.map((x, j) => -Math.cos(th) * x + Math.sin(th) * q[j]), rho };
}

const cases: { c: number[]; tiltDeg: number }[] = [
  { c: [0, 0, 0.336], tiltDeg: 0 },
  { c: [0, 0, 0.336], tiltDeg: 45 },
  { c: [0.08, -0.05, 0.336], tiltDeg: 30 },
  { c: [-0.1, 0.06, 0.25], tiltDeg: 65 },
  { c: [0.12, 0.09, 0.3], tiltDeg: 50 },
];

describe('circleImageMajor', () => {
  it.each(cases)('is the pinhole image\'s major axis of a coin at $c tilted $tiltDeg° within 0.2%', ({ c, tiltDeg }) => {
    // First order in the angular size (a / |c| up to 0.05 here): the rest is of order (a / |c|)².
    const { n } = pose(c, tiltDeg);
    const exact = longestChord(c, n, aM);
    expect(Math.abs(circleImageMajor(c, n, aM, f) / exact - 1)).toBeLessThan(2e-3);
  });
});

describe('nearFaceMagnification', () => {
  it.each(cases)('gives the near face\'s major over the mid-plane\'s of a coin at $c tilted $tiltDeg°', ({ c, tiltDeg }) => {
    const { d, n, rho } = pose(c, tiltDeg);
    const near = c.map((x, j) => x + (h / 2) * n[j]); // n faces the camera
    const exact = longestChord(near, n, aM) / longestChord(c, n, aM);
    const mag = nearFaceMagnification(n, d, aM / rho, h / aM, f);
    // The effect is up to h/2 / Z (0.26% face-on at 34 cm); held to 3% of itself.
    expect(Math.abs(mag - exact)).toBeLessThan(0.03 * Math.abs(exact - 1) + 2e-6);
    // The normal's sign does not matter: the near face is the one towards the camera.
    expect(nearFaceMagnification(n.map((x) => -x), d, aM / rho, h / aM, f)).toBeCloseTo(mag, 12);
  });

  it('is h/2 / Z on the axis, face-on, and 1 without a thickness', () => {
    const { d, n } = pose([0, 0, 0.336], 0);
    expect(nearFaceMagnification(n, d, aM / 0.336, h / aM, f)).toBeCloseTo(0.336 / (0.336 - h / 2), 9);
    expect(nearFaceMagnification(n, d, aM / 0.336, 0, f)).toBe(1);
  });
});
