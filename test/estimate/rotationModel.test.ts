import { describe, expect, it } from 'vitest';
import {
  P,
  PARAM_COUNT,
  lFrame,
  lFramePartials,
  modelMoments,
  modelMomentsGradInto,
  sqrtModelMomentsGradInto,
  type RotationFrame,
} from '../../src/estimate/rotationModel.ts';
import { viewGeometry } from '../../src/estimate/viewGeometry.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

/** Square root of a 2×2 SPD matrix by its eigen-decomposition (independent of the closed form in the model). */
function sqrtmEigen(xx: number, xy: number, yy: number): [number, number, number] {
  const half = 0.5 * (xx + yy);
  const diff = Math.hypot(0.5 * (xx - yy), xy);
  const l1 = half + diff;
  const l2 = Math.max(half - diff, 0);
  const th = 0.5 * Math.atan2(2 * xy, xx - yy);
  const c = Math.cos(th);
  const s = Math.sin(th);
  const a = Math.sqrt(l1);
  const b = Math.sqrt(l2);
  return [a * c * c + b * s * s, (a - b) * c * s, a * s * s + b * c * c];
}

function randomCase(rand: () => number, growth: boolean): { p: Float64Array; f: RotationFrame } {
  const p = new Float64Array(PARAM_COUNT);
  p[P.radiusPx] = 15 + 30 * rand();
  p[P.depthRate] = rand() - 0.5;
  p[P.alpha] = 0.2 + 2.7 * rand();
  p[P.gamma] = 6.2 * rand();
  p[P.psi] = 0.2 + 2.7 * rand();
  p[P.omega] = 50 + 400 * rand();
  p[P.phi0] = 6.2 * rand();
  p[P.deltaPx] = growth ? 3 * rand() - 1.5 : 0;
  p[P.blur] = growth ? rand() : 0;
  p[P.rim] = 0.6 + 0.8 * rand();
  // A perspective view (640 × 480, f = 800 px) at a random image point, moving at a few px per frame.
  const geom = viewGeometry(640 * rand(), 480 * rand(), 800, 319.5, 239.5);
  const f: RotationFrame = { tS: 0.3 * rand(), sxx: 0, sxy: 0, syy: 0, vxPx: 6 * rand() - 3, vyPx: 6 * rand() - 3, geom };
  return { p, f };
}

describe('rotationModel gradients', () => {
  const tau = 0.144;
  const tMid = 0.15;
  it('modelMomentsGradInto returns the moments of modelMoments bit for bit', () => {
    const rand = mulberry32(11);
    const out = new Float64Array(3 + 3 * PARAM_COUNT);
    for (let trial = 0; trial < 50; trial++) {
      const { p, f } = randomCase(rand, trial % 2 === 0);
      modelMomentsGradInto(p, f, tau, tMid, lFramePartials(p[P.alpha], p[P.gamma]), out);
      const mm = modelMoments(p, f, tau, tMid, lFrame(p[P.alpha], p[P.gamma]));
      expect([out[0], out[1], out[2]]).toEqual([mm.sxx, mm.sxy, mm.syy]);
    }
  });

  it('the analytic Jacobian of √Σ matches central differences of the model to 1e-5 relative (random parameters and frames)', () => {
    // Definition of the derivative; central differences with step 1e-6·max(|p|, 1) (common practice, no source).
    // The error is measured against the largest entry of each column, so a tiny entry is not judged on its own.
    const rand = mulberry32(5);
    const out = new Float64Array(3 + 3 * PARAM_COUNT);
    let worst = 0;
    for (let trial = 0; trial < 200; trial++) {
      const { p, f } = randomCase(rand, trial % 3 !== 0);
      sqrtModelMomentsGradInto(p, f, tau, tMid, lFramePartials(p[P.alpha], p[P.gamma]), out);
      const m0 = modelMoments(p, f, tau, tMid);
      const q0 = sqrtmEigen(m0.sxx, m0.sxy, m0.syy);
      for (let c = 0; c < 3; c++) expect(Math.abs(out[c] - q0[c])).toBeLessThan(1e-9 * Math.max(1, Math.abs(q0[c])));
      for (let j = 0; j < PARAM_COUNT; j++) {
        const h = 1e-6 * Math.max(Math.abs(p[j]), 1);
        const hi = Float64Array.from(p);
        const lo = Float64Array.from(p);
        hi[j] += h;
        lo[j] -= h;
        const a = modelMoments(hi, f, tau, tMid);
        const b = modelMoments(lo, f, tau, tMid);
        const qa = sqrtmEigen(a.sxx, a.sxy, a.syy);
        const qb = sqrtmEigen(b.sxx, b.sxy, b.syy);
        let scale = 0;
        for (let c = 0; c < 3; c++) scale = Math.max(scale, Math.abs(out[3 + c * PARAM_COUNT + j]));
        // Columns that vanish (within the noise of the differences) are judged against a floor of 1e-6 px per unit.
        scale = Math.max(scale, 1e-6);
        for (let c = 0; c < 3; c++) {
          const fd = (qa[c] - qb[c]) / (2 * h);
          worst = Math.max(worst, Math.abs(fd - out[3 + c * PARAM_COUNT + j]) / scale);
        }
      }
    }
    expect(worst).toBeLessThan(1e-5);
  });

  it('the δ and blur columns exist also where the outline growth is off (δ = b = 0): Σ changes at first order', () => {
    const rand = mulberry32(2);
    const { p, f } = randomCase(rand, false);
    const out = new Float64Array(3 + 3 * PARAM_COUNT);
    modelMomentsGradInto(p, f, tau, tMid, lFramePartials(p[P.alpha], p[P.gamma]), out);
    const h = 1e-6;
    const hi = Float64Array.from(p);
    hi[P.deltaPx] = h;
    const lo = Float64Array.from(p);
    lo[P.deltaPx] = -h;
    const a = modelMoments(hi, f, tau, tMid);
    const b = modelMoments(lo, f, tau, tMid);
    const fd = (a.sxx - b.sxx) / (2 * h);
    expect(Math.abs(out[3 + P.deltaPx])).toBeGreaterThan(0);
    expect(Math.abs(out[3 + P.deltaPx] - fd) / Math.abs(fd)).toBeLessThan(1e-6);
  });
});
