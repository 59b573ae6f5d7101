import { describe, expect, it } from 'vitest';
import { normalAt, precessionFrame, normalize, type Vec3 } from '../../src/physics/index.ts';
import { fitRotation } from '../../src/estimate/fitRotation.ts';
import { P, PARAM_COUNT, ellipseMoments, modelMoments, type RotationFrame } from '../../src/estimate/rotationModel.ts';
import { viewGeometry } from '../../src/estimate/viewGeometry.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

const rng = mulberry32;

/**
 * Frames of a thin coin (radius `radiusPx`) seen orthographically along the camera's Z axis, from the physics
 * closed form `normalAt`: the image is an ellipse with semi-axes a and a|n·d|, minor axis along n's projection
 * (DESIGN §3). Independent of the fit's own silhouette model.
 */
function makeFrames(opts: { lHat: Vec3; psiDeg: number; spinRevS: number; fps: number; frames: number; radiusPx: number; noise: number; seed: number }) {
  const rand = rng(opts.seed);
  const out: RotationFrame[] = [];
  const params = { lHat: opts.lHat, psiRad: (opts.psiDeg * Math.PI) / 180, omegaRadS: 2 * Math.PI * opts.spinRevS, phi0Rad: 0.3 };
  for (let k = 0; k < opts.frames; k++) {
    const t = k / opts.fps;
    const n = normalAt(params, t);
    const r = Math.abs(n[2]);
    const angleMinor = Math.atan2(n[1], n[0]);
    const major = 2 * opts.radiusPx * (1 + opts.noise * (rand() - 0.5));
    const minor = 2 * opts.radiusPx * r * (1 + opts.noise * (rand() - 0.5)) + opts.noise * (rand() - 0.5);
    const angle = angleMinor + Math.PI / 2;
    const [sxx, sxy, syy] = ellipseMoments(major, Math.max(minor, 0), angle);
    out.push({ tS: t, sxx, sxy, syy, vxPx: 0, vyPx: 0, geom: viewGeometry(0, 0, null, 0, 0) });
  }
  return { frames: out, params };
}

describe('fitRotation', () => {
  // Camera frame: ẑ_world is −Y; ℓ tilted 30° from the vertical towards the camera.
  const lHat = normalize([0, -Math.cos(Math.PI / 6), Math.sin(Math.PI / 6)] as Vec3);
  for (const [psiDeg, spin] of [[85, 38], [60, 22], [40, 50]] as const) {
    it(`recovers spin ${spin} rev/s and precession ${psiDeg}° from noisy thin-coin moments at 1000 frames/s`, () => {
      const { frames } = makeFrames({ lHat, psiDeg, spinRevS: spin, fps: 1000, frames: 450, radiusPx: 40, noise: 0.01, seed: 3 });
      const tMid = frames.reduce((s, f) => s + f.tS, 0) / frames.length;
      const fit = fitRotation(frames, { tau: 0, captureFps: 1000, tMidS: tMid });
      expect(fit.ok).toBe(true);
      if (!fit.ok) return;
      const p = fit.params;
      // 0.3% on spin and 1° on precession are the accuracy targets of the measure issue.
      expect(Math.abs(p[P.omega] / (2 * Math.PI) - spin) / spin).toBeLessThan(0.003);
      // ψ and 180° − ψ (with L reversed) are the same motion: compare the folded angle.
      const psiFit = (Math.min(p[P.psi], Math.PI - p[P.psi]) * 180) / Math.PI;
      expect(Math.abs(psiFit - psiDeg)).toBeLessThan(1);
      expect(Math.abs(p[P.radiusPx] - 40) / 40).toBeLessThan(0.005);
      expect(fit.standardErrors[P.omega]).toBeGreaterThan(0);
    });
  }
  it('recovers the parameters of a thick coin seen in perspective, moving, with outline growth (round trip through the model)', () => {
    // Known parameters → model moments (perspective rays of a 640×480 view, f = 900 px) → fit: exercises the analytic
    // Jacobian on every term (depth trend, silhouette of the rim, J Σ Jᵀ, outline growth, blur).
    const truth = new Float64Array(PARAM_COUNT);
    truth[P.radiusPx] = 38;
    truth[P.depthRate] = 0.2;
    truth[P.alpha] = 1.1;
    truth[P.gamma] = 2.0;
    truth[P.psi] = (70 * Math.PI) / 180;
    truth[P.omega] = 2 * Math.PI * 31;
    truth[P.phi0] = 0.7;
    truth[P.deltaPx] = 0.8;
    truth[P.blur] = 0.3;
    truth[P.rim] = 1;
    const tau = 0.144;
    const fps = 1000;
    const rand = rng(9);
    const frames: RotationFrame[] = [];
    for (let k = 0; k < 300; k++) {
      const tS = k / fps;
      const u = 200 + 0.8 * k;
      const v = 300 - 1.2 * k + 0.004 * k * k;
      const f: RotationFrame = { tS, sxx: 0, sxy: 0, syy: 0, vxPx: 0.8, vyPx: -1.2 + 0.008 * k, geom: viewGeometry(u, v, 900, 319.5, 239.5) };
      const mm = modelMoments(truth, f, tau, 0.15);
      const e = 1 + 0.003 * (rand() - 0.5);
      frames.push({ ...f, sxx: mm.sxx * e, sxy: mm.sxy * e, syy: mm.syy * e });
    }
    const fit = fitRotation(frames, { tau, captureFps: fps, tMidS: 0.15 });
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    const p = fit.params;
    // Accuracy targets of the measure issue: 0.3% on spin, 1° on precession; 1% on the scale.
    expect(Math.abs(p[P.omega] / truth[P.omega] - 1)).toBeLessThan(0.003);
    const psiFit = (Math.min(p[P.psi], Math.PI - p[P.psi]) * 180) / Math.PI;
    expect(Math.abs(psiFit - 70)).toBeLessThan(1);
    expect(Math.abs(p[P.radiusPx] / 38 - 1)).toBeLessThan(0.01);
  });
  it('rejects too few frames with a reason', () => {
    const { frames } = makeFrames({ lHat, psiDeg: 80, spinRevS: 30, fps: 1000, frames: 8, radiusPx: 40, noise: 0, seed: 1 });
    const fit = fitRotation(frames, { tau: 0, captureFps: 1000, tMidS: 0 });
    expect(fit.ok).toBe(false);
  });
});
