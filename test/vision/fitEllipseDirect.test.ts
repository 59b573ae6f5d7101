import { beforeAll, describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import { canonicalAxisAngle, conicToEllipse, type Ellipse } from '../../src/vision/ellipse.ts';
import { fitEllipseDirect, realEigenvectors3 } from '../../src/vision/fitEllipseDirect.ts';
import { loadOpenCv, type Cv } from './opencv.ts';
import { gauss, prng } from './synthSequence.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

let cv: Cv;
beforeAll(async () => {
  cv = (await loadOpenCv()).cv;
});

/** Points on an ellipse at evenly spaced parameter values over [t0, t1), plus Gaussian noise. */
function samplePoints(e: Ellipse, n: number, sigma: number, rand: () => number, t0 = 0, t1 = 2 * Math.PI): { xs: number[]; ys: number[] } {
  const xs: number[] = [], ys: number[] = [];
  const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
  for (let i = 0; i < n; i++) {
    const t = t0 + ((t1 - t0) * i) / n;
    const u = (e.major / 2) * Math.cos(t), v = (e.minor / 2) * Math.sin(t);
    xs.push(e.cx + u * c - v * s + sigma * gauss(rand));
    ys.push(e.cy + u * s + v * c + sigma * gauss(rand));
  }
  return { xs, ys };
}

/** OpenCV RotatedRect → our Ellipse (RotatedRect's angle is that of its `width` side, degrees). */
function fromRotatedRect(r: { center: { x: number; y: number }; size: { width: number; height: number }; angle: number }): Ellipse {
  const w = r.size.width, h = r.size.height;
  const deg = w >= h ? r.angle : r.angle + 90;
  return { cx: r.center.x, cy: r.center.y, major: Math.max(w, h), minor: Math.min(w, h), angleRad: canonicalAxisAngle((deg * Math.PI) / 180) };
}

function cvFit(xs: number[], ys: number[], direct: boolean): Ellipse {
  const flat: number[] = [];
  for (let i = 0; i < xs.length; i++) flat.push(xs[i], ys[i]);
  const mat = cv.matFromArray(xs.length, 1, cv.CV_32FC2, flat);
  try {
    return fromRotatedRect(direct ? cv.fitEllipseDirect(mat) : cv.fitEllipse(mat));
  } finally {
    mat.delete();
  }
}

/**
 * Independent reference: the original direct fit as a 6×6 generalised eigenproblem
 * S a = λ C a ("Direct least square fitting of ellipses", IEEE TPAMI 21(5), 1999,
 * DOI 10.1109/34.765658), solved as eig(S⁻¹ C) on centred, scaled points; the solution
 * is the eigenvector whose eigenvalue is positive.
 */
function referenceDirectFit(xs: number[], ys: number[]): Ellipse {
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n, my = ys.reduce((a, b) => a + b, 0) / n;
  const sc = Math.max(...xs.map((x, i) => Math.hypot(x - mx, ys[i] - my)));
  const D = new Matrix(xs.map((x, i) => {
    const u = (x - mx) / sc, v = (ys[i] - my) / sc;
    return [u * u, u * v, v * v, u, v, 1];
  }));
  const S = D.transpose().mmul(D);
  const C = Matrix.zeros(6, 6);
  C.set(0, 2, 2); C.set(2, 0, 2); C.set(1, 1, -1);
  const eig = new EigenvalueDecomposition(inverse(S).mmul(C));
  // S⁻¹C a = (1/λ) a: the ellipse is the eigenvector with a positive eigenvalue.
  let k = -1;
  for (let j = 0; j < 6; j++) if (Math.abs(eig.imaginaryEigenvalues[j]) < 1e-12 && eig.realEigenvalues[j] > 1e-12 && (k < 0 || eig.realEigenvalues[j] > eig.realEigenvalues[k])) k = j;
  const a = eig.eigenvectorMatrix.getColumn(k);
  const r = conicToEllipse([a[0], a[1], a[2], a[3], a[4], a[5]]);
  if (!r.ok) throw new Error('reference fit failed');
  const e = r.ellipse;
  return { cx: mx + sc * e.cx, cy: my + sc * e.cy, major: sc * e.major, minor: sc * e.minor, angleRad: e.angleRad };
}

function angleDiff(a: number, b: number): number {
  const d = Math.abs(canonicalAxisAngle(a) - canonicalAxisAngle(b));
  return Math.min(d, Math.PI - d);
}

describe('fitEllipseDirect', () => {
  it('reproduces the direct fit of the published 8-point test set ("Least-squares fitting of circles and ellipses", BIT 34, 1994)', () => {
    const r = fitEllipseDirect([1, 2, 5, 7, 9, 3, 6, 8], [7, 6, 8, 7, 5, 7, 2, 4]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // Values from the issue (computed with two implementations): centre (5.06388, 5.06975),
    // semi-axes 3.77566 and 2.64233, major axis 157.877° from +x. Tolerance 1e-4: their rounding is 5e-6.
    expect(Math.abs(r.ellipse.cx - 5.06388)).toBeLessThan(1e-4);
    expect(Math.abs(r.ellipse.cy - 5.06975)).toBeLessThan(1e-4);
    expect(Math.abs(r.ellipse.major / 2 - 3.77566)).toBeLessThan(1e-4);
    expect(Math.abs(r.ellipse.minor / 2 - 2.64233)).toBeLessThan(1e-4);
    expect(Math.abs((r.ellipse.angleRad * 180) / Math.PI - 157.877)).toBeLessThan(1e-3);
    // and the independent 6×6 formulation agrees to 1e-8
    const ref = referenceDirectFit([1, 2, 5, 7, 9, 3, 6, 8], [7, 6, 8, 7, 5, 7, 2, 4]);
    expect(Math.abs(ref.cx - r.ellipse.cx)).toBeLessThan(1e-8);
    expect(Math.abs(ref.major - r.ellipse.major)).toBeLessThan(1e-8);
    expect(angleDiff(ref.angleRad, r.ellipse.angleRad)).toBeLessThan(1e-8);
  });

  it('agrees with the independent 6×6 solution and with OpenCV fitEllipseDirect over a sweep of angles, axis ratios and noise, far from the origin', () => {
    const rand = prng(20240607);
    let checked = 0;
    for (let deg = 0; deg < 180; deg += 15) {
      for (const ratio of [0.05, 0.2, 0.5, 0.8, 1]) {
        for (const sigma of [0, 0.3, 1]) {
          const truth: Ellipse = { cx: 1500 + 100 * rand(), cy: 900 + 100 * rand(), major: 120, minor: 120 * ratio, angleRad: (deg * Math.PI) / 180 };
          const { xs, ys } = samplePoints(truth, 90, sigma, rand);
          const r = fitEllipseDirect(xs, ys);
          expect(r.ok).toBe(true);
          if (!r.ok) continue;
          const e = r.ellipse;
          if (sigma > 0) {
            // (With exact points the 6×6 scatter matrix is singular; the truth is the reference there.)
            const ref = referenceDirectFit(xs, ys);
            // Same estimator, double precision both: 1e-6 px.
            expect(Math.abs(e.cx - ref.cx) + Math.abs(e.cy - ref.cy)).toBeLessThan(1e-6);
            expect(Math.abs(e.major - ref.major) + Math.abs(e.minor - ref.minor)).toBeLessThan(1e-6);
          }
          if (sigma > 0 && ratio >= 0.2) {
            // OpenCV gets float32 points (≈1e-4 px at 1500 px): same estimator, 2e-3 px. Observed
            // here: OpenCV 4.12's fitEllipseDirect differs by 0.1–1 px on exact points and on the
            // thinnest noisy ellipse (it seems to switch to another solution there), so those
            // cases are checked against the truth and the 6×6 reference only.
            const cvE = cvFit(xs, ys, true);
            expect(Math.abs(e.cx - cvE.cx) + Math.abs(e.cy - cvE.cy)).toBeLessThan(2e-3);
            expect(Math.abs(e.major - cvE.major) + Math.abs(e.minor - cvE.minor)).toBeLessThan(2e-3);
            if (ratio < 0.95) expect(angleDiff(e.angleRad, cvE.angleRad)).toBeLessThan(1e-4);
          }
          if (sigma === 0) {
            // Exact data: the truth itself, to rounding; OpenCV's other estimator (fitEllipse) too.
            expect(Math.abs(e.cx - truth.cx) + Math.abs(e.cy - truth.cy)).toBeLessThan(1e-6);
            expect(Math.abs(e.minor - truth.minor)).toBeLessThan(1e-6);
            if (ratio < 0.95) expect(angleDiff(e.angleRad, truth.angleRad)).toBeLessThan(1e-8);
            const cvF = cvFit(xs, ys, false);
            expect(Math.abs(e.cx - cvF.cx) + Math.abs(e.cy - cvF.cy)).toBeLessThan(2e-2);
            expect(Math.abs(e.major - cvF.major) + Math.abs(e.minor - cvF.minor)).toBeLessThan(2e-2);
          } else {
            // Noisy data: within a few noise σ of the truth and of OpenCV's fitEllipse (a different
            // algebraic fit). Loose (4σ, 8σ): algebraic fits are biased on thin noisy ellipses.
            expect(Math.hypot(e.cx - truth.cx, e.cy - truth.cy)).toBeLessThan(4 * sigma);
            const cvF = cvFit(xs, ys, false);
            expect(Math.hypot(e.cx - cvF.cx, e.cy - cvF.cy)).toBeLessThan(4 * sigma);
            expect(Math.abs(e.major - cvF.major)).toBeLessThan(8 * sigma);
          }
          checked++;
        }
      }
    }
    expect(checked).toBe(12 * 5 * 3);
  });

  it('fits a 120° arc (a coin cut by the frame border) within 0.1 px at 0.1 px noise', () => {
    const rand = prng(7);
    const truth: Ellipse = { cx: 640, cy: 10, major: 100, minor: 60, angleRad: 0.4 };
    const { xs, ys } = samplePoints(truth, 80, 0.1, rand, 0, (2 * Math.PI) / 3);
    const r = fitEllipseDirect(xs, ys);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(Math.hypot(r.ellipse.cx - truth.cx, r.ellipse.cy - truth.cy)).toBeLessThan(1);
      expect(r.rms).toBeLessThan(0.2);
    }
  });

  it('returns a reason for too few points, no spread, and a point set that is not an ellipse', () => {
    expect(fitEllipseDirect([1, 2, 3, 4], [1, 2, 3, 5])).toEqual({ ok: false, reason: 'too_few_points' });
    expect(fitEllipseDirect([3, 3, 3, 3, 3, 3], [2, 2, 2, 2, 2, 2])).toEqual({ ok: false, reason: 'no_spread' });
    expect(fitEllipseDirect([0, 1, 2, 3, 4, 5, 6], [0, 2, 4, 6, 8, 10, 12])).toEqual({ ok: false, reason: 'no_spread' });
    // Points on a hyperbola x·y = 1 (both branches): the direct fit still returns an ellipse
    // (it is ellipse-specific), so check the reason only when it fails, and that it never throws.
    const hx = [-4, -2, -1, -0.5, 0.5, 1, 2, 4], hy = hx.map((x) => 1 / x);
    const h = fitEllipseDirect(hx, hy);
    if (!h.ok) expect(['not_an_ellipse', 'no_spread']).toContain(h.reason);
  });
});

describe('realEigenvectors3', () => {
  it('finds the real eigenvectors that ml-matrix finds on random 3×3 matrices', () => {
    const rnd = mulberry32(99);
    let compared = 0;
    for (let trial = 0; trial < 200; trial++) {
      const m = [0, 1, 2].map(() => [0, 1, 2].map(() => rnd() * 2 - 1));
      const ref = new EigenvalueDecomposition(new Matrix(m), { assumeSymmetric: false });
      const ours = realEigenvectors3(m);
      for (let k = 0; k < 3; k++) {
        if (Math.abs(ref.imaginaryEigenvalues[k]) > 1e-9) continue;
        const v = [0, 1, 2].map((r) => ref.eigenvectorMatrix.get(r, k));
        const n = Math.hypot(...v);
        const match = ours.some((w) => Math.abs(Math.abs(w[0] * v[0] + w[1] * v[1] + w[2] * v[2]) / n - 1) < 1e-7);
        expect(match, `trial ${trial} eigenvector ${k}`).toBe(true);
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(300);
  });

  it('ends on the nearly singular matrix of a degenerate sample (five of six points on one line)', () => {
    // The sample that made an iterative eigensolver run forever inside the trimmed fit.
    const xs = [78, 71, 71, 68, 74, 65], ys = [95.5, 95.5, 95.5, 95.5, 95.5, 99.5];
    const r = fitEllipseDirect(xs, ys, 6);
    expect(typeof r.ok).toBe('boolean');
  });
});
