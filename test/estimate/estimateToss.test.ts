import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY } from '../../src/physics/index.ts';
import { depthTrendFromDiameters, estimateToss, type ObservedFrame } from '../../src/estimate/estimateToss.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

/** A normal deviate from two uniforms (Box–Muller; common practice, no source). */
function gaussian(rand: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}

describe('depthTrendFromDiameters', () => {
  // Pinhole: a coin of diameter 2a at depth Z is f · 2a / Z px across (common practice, no source).
  const f = 1108;
  const twoA = 0.02426;
  const series = (z0: number, vz: number, noisePx: number, outliers: boolean) => {
    const g = gaussian(mulberry32(7));
    const tS: number[] = [];
    const d: number[] = [];
    for (let k = 0; k < 400; k++) {
      const t = k / 1000;
      tS.push(t);
      const bad = outliers && k % 10 === 3; // one frame in ten 15% too large (the coin merged with a shadow)
      d.push(((f * twoA) / (z0 + vz * t)) * (bad ? 1.15 : 1) + noisePx * g());
    }
    return { tS, d };
  };

  it('recovers k = vz / Z(t_ref) of a coin moving 14 cm away, with 0.3 px noise and one frame in ten an outlier', () => {
    const { tS, d } = series(0.5, 0.35, 0.3, true);
    const trend = depthTrendFromDiameters(tS, d, 0.2);
    expect(trend.ok).toBe(true);
    if (!trend.ok) return;
    const kTrue = 0.35 / (0.5 + 0.35 * 0.2);
    // 400 frames of 0.3 px on ~47 px: the slope is known to ~0.3%; 1% leaves room for the biweight's loss.
    expect(Math.abs(trend.rate / kTrue - 1)).toBeLessThan(0.01);
    expect(Math.abs(trend.rate - kTrue)).toBeLessThan(4 * trend.rateSe);
    expect(trend.diameterAtRefPx).toBeCloseTo((f * twoA) / (0.5 + 0.35 * 0.2), 1);
  });

  it('is exact on noise-free diameters (1/D is linear in t) where a straight line through D is not', () => {
    const { tS, d } = series(0.75, -0.35, 0, false);
    const trend = depthTrendFromDiameters(tS, d, 0);
    expect(trend.ok).toBe(true);
    if (!trend.ok) return;
    expect(trend.rate).toBeCloseTo(-0.35 / 0.75, 9);
    // The naive relative slope of D itself, (dD/dt) / D at t = 0 from the end points, differs by 7% here.
    const naive = -((d[d.length - 1] - d[0]) / (tS[tS.length - 1] - tS[0])) / d[0];
    expect(Math.abs(naive / (-0.35 / 0.75) - 1)).toBeGreaterThan(0.05);
  });

  it('gives k = 0 within its error for a coin at constant depth, and refuses fewer than 12 frames', () => {
    const { tS, d } = series(0.6, 0, 0.3, false);
    const trend = depthTrendFromDiameters(tS, d, 0.2);
    expect(trend.ok).toBe(true);
    if (trend.ok) expect(Math.abs(trend.rate)).toBeLessThan(4 * trend.rateSe + 1e-12);
    expect(depthTrendFromDiameters(tS.slice(0, 11), d.slice(0, 11), 0).ok).toBe(false);
  });
});

/**
 * A whole toss as observations: the coin held, pushed up with constant acceleration from rest, in ballistic flight
 * (closed form r0 + v0 t + g t²/2), caught and stopped, moving in depth throughout; it turns end over end about a
 * horizontal axis at 25 rev/s in flight. Each frame's ellipse is the exact pinhole image of the coin's circle
 * (u = f X / Z + u0; common practice, no source): 720 points of the circle projected, and the polygon's area
 * moments (Green's theorem; common practice) give the centre and the axes, 4 √λ of the second moments.
 */
function renderToss(depthSpeedMS: number, seed: number, endGrowth?: (speedPxPerFrame: number) => number) {
  const fps = 1000;
  const f = 1108;
  const width = 1280;
  const height = 720;
  const u0 = (width - 1) / 2;
  const v0 = (height - 1) / 2;
  const a = 0.01213;
  const u = 2.3;
  const g = STANDARD_GRAVITY;
  const vel = [0.05, -u, depthSpeedMS]; // camera frame: X right, Y down, Z forward
  const rRelease = [0.01, 0.14, depthSpeedMS < 0 ? 0.75 : 0.62];
  const restS = 0.02;
  const pushS = 0.03;
  const tRelease = restS + pushS;
  const flightS = (2 * u) / g;
  const tCatch = tRelease + flightS;
  const stopS = 0.02;
  const totalS = tCatch + stopS + 0.02;
  const rCatch = [0, 1, 2].map((j) => rRelease[j] + vel[j] * flightS + (j === 1 ? 0.5 * g * flightS * flightS : 0));
  const vCatch = [vel[0], u, vel[2]];
  const position = (t: number): number[] => {
    if (t < tRelease) {
      const s = Math.max(0, t - restS); // from rest to the launch velocity over pushS
      return rRelease.map((r, j) => r - 0.5 * vel[j] * pushS + (0.5 * vel[j] * s * s) / pushS);
    }
    if (t <= tCatch) {
      const s = t - tRelease;
      return rRelease.map((r, j) => r + vel[j] * s + (j === 1 ? 0.5 * g * s * s : 0));
    }
    const s = Math.min(t - tCatch, stopS);
    return rCatch.map((r, j) => r + vCatch[j] * s - (0.5 * vCatch[j] * s * s) / stopS);
  };
  // End over end about ℓ (horizontal, 20° from X towards the depth axis), heads up (−Y) at release.
  const l = [Math.cos(0.35), 0, Math.sin(0.35)];
  const n0 = [0, -1, 0];
  const m0 = [l[1] * n0[2] - l[2] * n0[1], l[2] * n0[0] - l[0] * n0[2], l[0] * n0[1] - l[1] * n0[0]]; // ℓ × n0
  const omega = 2 * Math.PI * 25;
  const normal = (t: number): number[] => {
    const th = omega * (Math.min(Math.max(t, tRelease), tCatch) - tRelease);
    return n0.map((x, j) => Math.cos(th) * x + Math.sin(th) * m0[j]);
  };
  const noise = gaussian(mulberry32(seed));
  const frames: ObservedFrame[] = [];
  for (let k = 0; k / fps <= totalS; k++) {
    const t = k / fps;
    const c = position(t);
    const n = normal(t);
    // An orthonormal pair spanning the coin's plane.
    const ref = Math.abs(n[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
    let e1 = [n[1] * ref[2] - n[2] * ref[1], n[2] * ref[0] - n[0] * ref[2], n[0] * ref[1] - n[1] * ref[0]];
    const len = Math.hypot(e1[0], e1[1], e1[2]);
    e1 = e1.map((x) => x / len);
    const e2 = [n[1] * e1[2] - n[2] * e1[1], n[2] * e1[0] - n[0] * e1[2], n[0] * e1[1] - n[1] * e1[0]];
    const xs: number[] = [];
    const ys: number[] = [];
    for (let q = 0; q < 720; q++) {
      const ph = (2 * Math.PI * q) / 720;
      const p = [0, 1, 2].map((j) => c[j] + a * (Math.cos(ph) * e1[j] + Math.sin(ph) * e2[j]));
      xs.push((f * p[0]) / p[2] + u0);
      ys.push((f * p[1]) / p[2] + v0);
    }
    let area = 0;
    let sx = 0;
    let sy = 0;
    let sxx = 0;
    let syy = 0;
    let sxy = 0;
    for (let q = 0; q < 720; q++) {
      const x0 = xs[q];
      const y0 = ys[q];
      const x1 = xs[(q + 1) % 720];
      const y1 = ys[(q + 1) % 720];
      const cr = x0 * y1 - x1 * y0;
      area += cr / 2;
      sx += ((x0 + x1) * cr) / 6;
      sy += ((y0 + y1) * cr) / 6;
      sxx += ((x0 * x0 + x0 * x1 + x1 * x1) * cr) / 12;
      syy += ((y0 * y0 + y0 * y1 + y1 * y1) * cr) / 12;
      sxy += ((x0 * y1 + 2 * x0 * y0 + 2 * x1 * y1 + x1 * y0) * cr) / 24;
    }
    const cx = sx / area;
    const cy = sy / area;
    const mxx = sxx / area - cx * cx;
    const myy = syy / area - cy * cy;
    const mxy = sxy / area - cx * cy;
    const half = 0.5 * (mxx + myy);
    const root = Math.sqrt(0.25 * (mxx - myy) ** 2 + mxy * mxy);
    // A mask lengthened along the motion (blur, the threshold) by a known amount at the major axis's ends.
    const imageSpeed = (Math.hypot(c[0] - position(t - 1 / fps)[0], c[1] - position(t - 1 / fps)[1]) * f) / c[2];
    const grown = endGrowth ? endGrowth(imageSpeed) : 0;
    const major = 4 * Math.sqrt(half + root) + grown + 0.1 * noise();
    // A real blob is never thinner than about a pixel (and the rim shows edge-on).
    const minor = Math.max(1, 4 * Math.sqrt(Math.max(half - root, 0)) + 0.1 * noise());
    let angleRad = 0.5 * Math.atan2(2 * mxy, mxx - myy);
    if (angleRad < 0) angleRad += Math.PI;
    // In the hand the coin touches the fingers: the tracker follows it by block matching (no outline fit: fitRms NaN).
    const held = t < tRelease || t > tCatch;
    frames.push({
      frame: k, detected: true, cx: cx + 0.05 * noise(), cy: cy + 0.05 * noise(), major, minor, angleRad,
      method: held ? 'boundary' : 'moments', occluded: held, touchingEdge: false,
      outlineGrowthPx: held ? Number.NaN : endGrowth ? endGrowth(0) : 0,
      ...(endGrowth && !held ? { endGrowthPx: grown } : {}),
      fitRms: held ? Number.NaN : 0.05,
    });
  }
  const zMid = rRelease[2] + depthSpeedMS * flightS * 0.5;
  return {
    frames,
    ctx: { captureFps: fps, coinDiameterM: 2 * a, coinThicknessM: 0.0002, focalPx: f, width, height, startFace: 'heads' as const, gravity: g },
    truth: { u, tRelease, pxPerM: f / zMid, apexM: (u * u) / (2 * g) },
  };
}

describe('estimateToss on a coin moving in depth', () => {
  it('gives launch speed, apex, px/m and the depth speed of a toss moving 16 cm towards the camera', () => {
    const { frames, ctx, truth } = renderToss(-0.35, 3);
    const est = estimateToss(frames, ctx);
    expect(est.flags).not.toContain('release_unseen');
    expect(Math.abs((est.releaseTS ?? Infinity) - truth.tRelease) * 1000).toBeLessThanOrEqual(1.5); // frames
    // The tolerances: launch speed 2%, px/m 1% (the clean observations here do better on the launch).
    expect(Math.abs((est.launchSpeedMS ?? 0) / truth.u - 1)).toBeLessThan(0.01);
    expect(Math.abs((est.apexHeightM ?? 0) / truth.apexM - 1)).toBeLessThan(0.02);
    expect(Math.abs((est.pxPerM ?? 0) / truth.pxPerM - 1)).toBeLessThan(0.01);
    // The depth change over the window found: 1/D linear in t through the pinhole gives the depth speed within 2%.
    // (The catch knot of findFlightWindow lands at the end of the hand's stop here, 19 frames late, so
    // depth_change_m itself is 0.55 cm long: a weak point of the window, not of the depth trend.)
    const speed = (est.depthChangeM ?? 0) / ((est.catchTS ?? 0) - (est.releaseTS ?? 0));
    expect(Math.abs(speed / -0.35 - 1)).toBeLessThan(0.02);
    expect(est.scaleChangeRatio).toBeGreaterThan(1);
  });

  it('leaves the release-dependent columns empty when the coin is first seen in flight', () => {
    // The frames up to 20 ms after the release are dropped (the coin at rest in the background until then): which
    // face started up, the flight time and the face changes are then unknown, whatever the rotation fit says.
    const { frames, ctx, truth } = renderToss(-0.35, 3);
    const late = frames.map((f) => (f.frame / ctx.captureFps < truth.tRelease + 0.02
      ? { ...f, detected: false, cx: Number.NaN, cy: Number.NaN, major: Number.NaN, minor: Number.NaN, method: 'none' as const }
      : f));
    const est = estimateToss(late, ctx);
    expect(est.flags).toContain('release_unseen');
    expect(est.releaseTS).toBeNull();
    expect(est.pSameSide).toBeNull();
    expect(est.pSameSideSe).toBeNull();
    expect(est.faceChanges).toBeNull();
    expect(est.spinRevS).not.toBeNull();
  });

  it('gives px/m and the depth speed of a toss moving 16 cm away (depth change over the flight window it finds)', () => {
    // Known weak point (findFlightWindow, not this module): here the release knot lands about 15 frames early, so
    // the depth change is checked as a speed, depth_change_m / (catch − release), which does not depend on it.
    const { frames, ctx, truth } = renderToss(0.35, 4);
    const est = estimateToss(frames, ctx);
    expect(est.releaseTS).not.toBeNull();
    expect(est.catchTS).not.toBeNull();
    const speed = (est.depthChangeM ?? 0) / ((est.catchTS ?? 0) - (est.releaseTS ?? 0));
    expect(Math.abs(speed / 0.35 - 1)).toBeLessThan(0.02);
    expect(Math.abs((est.pxPerM ?? 0) / truth.pxPerM - 1)).toBeLessThan(0.01);
  });

  it('takes each frame\'s growth at the major axis\'s ends off that frame, not one growth for the clip', () => {
    // The major axis is 0.3 px long at rest and 0.6 px more per px of motion per frame (blur along the axis):
    // taking the all-round growth at rest off every frame leaves px/m 2.8% high here.
    const grow = (speed: number) => 0.3 + 0.6 * speed;
    const { frames, ctx, truth } = renderToss(0, 6, grow);
    const est = estimateToss(frames, ctx);
    expect(Math.abs((est.pxPerM ?? 0) / truth.pxPerM - 1)).toBeLessThan(0.003);
    // However many frames, the standard error keeps the growth model's own bias: 0.22 px on the corrected major
    // axis in outlineGrowth's tests (0.25 px, uniform), i.e. at least 0.25/√3 px on the diameter.
    const diameterPx = (est.pxPerM ?? 0) * ctx.coinDiameterM;
    expect((est.pxPerMSe ?? 0) / (est.pxPerM ?? 1)).toBeGreaterThanOrEqual(0.25 / Math.sqrt(3) / diameterPx - 1e-12);
    const allRound = estimateToss(frames.map((f) => ({ ...f, endGrowthPx: undefined })), ctx);
    expect(Math.abs((allRound.pxPerM ?? 0) / truth.pxPerM - 1)).toBeGreaterThan(0.01);
  });

  it('reports no depth change without the focal length', () => {
    const { frames, ctx } = renderToss(0.35, 5);
    const est = estimateToss(frames, { ...ctx, focalPx: null });
    expect(est.depthChangeM).toBeNull();
    expect(est.scaleChangeRatio).not.toBeNull();
  });
});
