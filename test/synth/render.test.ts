import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderStudy, scenarioCamera, scenarioRanges, type StudyClip } from '../../src/synth/study.ts';
import { createClipRenderer, frameCount } from '../../src/synth/render.ts';
import { buildMotion } from '../../src/synth/motion.ts';
import { sampleScenario } from '../../src/synth/scenario.ts';
import { resolveSynthOptions } from '../../src/synth/options.ts';
import { PLAIN_BACKGROUND_GRAY } from '../../src/synth/background.ts';
import { projectCircle } from '../../src/synth/camera.ts';
import { decodeFrames } from '../../src/video/index.ts';
import { loadOpenCv, type Cv } from './helpers.ts';

function setup(over: Parameters<typeof resolveSynthOptions>[0]) {
  const o = resolveSynthOptions(over);
  const sc = sampleScenario(scenarioRanges(o), o.seed, 0);
  const motion = buildMotion(sc);
  const cam = scenarioCamera(sc);
  return { o, sc, motion, cam };
}

describe('createClipRenderer', () => {
  it('renders every frame of the motion, deterministically, in any order', () => {
    const { o, motion, cam } = setup({ outDir: 'x', seed: 3, width: 160, height: 120, captureFps: 240 });
    const settings = { exposureFraction: 0.5, noiseSigma: 2, background: 'textured', seed: o.seed } as const;
    const r1 = createClipRenderer(motion, cam, settings);
    const r2 = createClipRenderer(motion, cam, settings);
    expect(r1.framesTotal).toBe(frameCount(motion));
    expect(r1.framesTotal).toBe(Math.floor(motion.endTS * 240) + 1);
    const k = Math.floor(r1.framesTotal / 2);
    const a = r1.renderFrame(k);
    r2.renderFrame(0);
    expect(Buffer.from(r2.renderFrame(k)).equals(Buffer.from(a))).toBe(true);
    expect(a.length).toBe(160 * 120);
  });

  it('adds Gaussian sensor noise of the requested σ (sample σ within 3 %, mean within 0.05)', () => {
    const { o, motion, cam } = setup({ outDir: 'x', seed: 4, hand: false });
    const clean = createClipRenderer(motion, cam, { exposureFraction: 0, noiseSigma: 0, background: 'textured', seed: o.seed }).renderFrame(5);
    const noisy = createClipRenderer(motion, cam, { exposureFraction: 0, noiseSigma: 4, background: 'textured', seed: o.seed }).renderFrame(5);
    let s = 0;
    let s2 = 0;
    let n = 0;
    for (let i = 0; i < clean.length; i++) {
      if (clean[i] < 20 || clean[i] > 235) continue; // away from clipping
      const d = noisy[i] - clean[i];
      s += d;
      s2 += d * d;
      n += 1;
    }
    const mean = s / n;
    // rounding both images adds the variance of a difference of two roundings, about 1/6 (common practice)
    const sd = Math.sqrt(s2 / n - mean * mean - 1 / 6);
    expect(Math.abs(mean)).toBeLessThan(0.05);
    expect(Math.abs(sd - 4) / 4).toBeLessThan(0.03);
  });

  it('draws a hand that holds the coin at the first and last frames, covering part of its edge only', () => {
    const withHand = setup({ outDir: 'x', seed: 5, hand: true });
    const settings = { exposureFraction: 0, noiseSigma: 0, background: 'plain', seed: 5 } as const;
    const r = createClipRenderer(withHand.motion, withHand.cam, settings);
    // the same coin motion (same hold and catch), the hand not drawn
    const coinOnly = createClipRenderer(buildMotion({ ...withHand.sc, hand: false }), withHand.cam, settings);
    const coinArea = Math.PI * ((withHand.cam.focalPx * 0.01213) / 0.6) ** 2;
    for (const k of [0, r.framesTotal - 1]) {
      const a = r.renderFrame(k);
      const c = coinOnly.renderFrame(k);
      let hand = 0;
      let coin = 0;
      let covered = 0;
      for (let i = 0; i < a.length; i++) {
        const isCoin = c[i] !== PLAIN_BACKGROUND_GRAY;
        if (isCoin) coin += 1;
        if (a[i] !== c[i]) {
          hand += 1;
          if (isCoin) covered += 1;
        }
      }
      expect(hand).toBeGreaterThan(10 * coinArea); // a hand is far bigger than the coin
      expect(covered).toBeGreaterThan(0); // thumb or fingertip over the coin's edge
      expect(covered).toBeLessThan(0.6 * coin); // but the coin stays mostly visible
    }
    const noHand = setup({ outDir: 'x', seed: 5, hand: false });
    const r2 = createClipRenderer(noHand.motion, noHand.cam, settings);
    const changed = r2.renderFrame(0).reduce((acc, v) => acc + (v !== PLAIN_BACKGROUND_GRAY ? 1 : 0), 0);
    expect(changed).toBeLessThan(2 * coinArea);
  });

  it('makes heads and tails differ from each other and from the background in mean brightness', () => {
    const { o, sc, motion, cam } = setup({ outDir: 'x', seed: 8, hand: false, precessionDeg: [90, 90], spinRevS: [20, 20] });
    const r = createClipRenderer(motion, cam, { exposureFraction: 0, noiseSigma: 0, background: 'plain', seed: o.seed });
    // the in-flight frames where each face looks most squarely at the camera (n·d < 0: heads towards it)
    let best = { heads: { k: -1, c: 0 }, tails: { k: -1, c: 0 } };
    for (let k = 0; k < r.framesTotal; k++) {
      const st = motion.stateAt(k / sc.captureFps);
      if (!st.inFlight) continue;
      const d = [st.center[0] - cam.centerWorld[0], st.center[1] - cam.centerWorld[1], st.center[2] - cam.centerWorld[2]];
      const c = (st.normal[0] * d[0] + st.normal[1] * d[1] + st.normal[2] * d[2]) / Math.hypot(...d);
      if (-c > best.heads.c) best = { ...best, heads: { k, c: -c } };
      if (c > best.tails.c) best = { ...best, tails: { k, c } };
    }
    expect(Math.min(best.heads.c, best.tails.c)).toBeGreaterThan(0.8);
    const mean = (k: number) => {
      let s = 0;
      let n = 0;
      for (const v of r.renderFrame(k)) if (v !== PLAIN_BACKGROUND_GRAY) { s += v; n += 1; }
      return s / n;
    };
    const h = mean(best.heads.k);
    const t = mean(best.tails.k);
    expect(h - t).toBeGreaterThan(25);
    expect(t - PLAIN_BACKGROUND_GRAY).toBeGreaterThan(40);
  });
});

describe('a clean render (no noise, no blur, no hand, thin coin, lossless) segmented and fitted with OpenCV', () => {
  let dir = '';
  let clip: StudyClip;
  let cv: Cv;
  beforeAll(async () => {
    ({ cv } = await loadOpenCv());
    dir = await mkdtemp(join(tmpdir(), 'tossmeter-synth-clean-'));
    const { clips } = await renderStudy({
      outDir: dir, count: 1, seed: 21, captureFps: 240, noiseSigma: 0, exposureFraction: 0, hand: false,
      coinThicknessMm: 0.01, lossless: true, background: 'plain', focalPx: 1800, launchSpeedMS: [1, 1], spinRevS: [7, 7],
    });
    clip = clips[0];
  }, 120_000);
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('matches the projected truth ellipse: centre within 0.5 px, axis ratio within 0.02 (axis ratio > 0.2)', async () => {
    // Reference: OpenCV 4.12 fitEllipse (@techstark/opencv-js) on the outer contour of a thresholded mask.
    const truth = clip.truth;
    let checked = 0;
    let worstCentre = 0;
    let worstRatio = 0;
    for await (const fr of decodeFrames(clip.file, { pixFmt: 'gray' })) {
      const t = truth.frames[fr.index];
      const e = t.ellipse!;
      if (!(t.axis_ratio! > 0.2)) continue;
      const margin = e.major / 2 + 3;
      if (e.cx < margin || e.cy < margin || e.cx > fr.width - 1 - margin || e.cy > fr.height - 1 - margin) continue;
      // threshold halfway between the background and the coin's median gray (the coin's brightness varies)
      const fg: number[] = [];
      for (const v of fr.data) if (Math.abs(v - PLAIN_BACKGROUND_GRAY) > 10) fg.push(v);
      fg.sort((a, b) => a - b);
      const level = PLAIN_BACKGROUND_GRAY + 0.5 * (fg[fg.length >> 1] - PLAIN_BACKGROUND_GRAY);
      const mask = new Uint8Array(fr.data.length);
      for (let i = 0; i < mask.length; i++) mask[i] = fr.data[i] > level ? 255 : 0;
      const src = cv.matFromArray(fr.height, fr.width, cv.CV_8UC1, Array.from(mask));
      const contours = new cv.MatVector();
      const hierarchy = new cv.Mat();
      cv.findContours(src, contours, hierarchy, cv.RETR_EXTERNAL, cv.CHAIN_APPROX_NONE);
      let best = -1;
      let bestArea = 0;
      for (let i = 0; i < contours.size(); i++) {
        const a = cv.contourArea(contours.get(i));
        if (a > bestArea) { bestArea = a; best = i; }
      }
      const rr = cv.fitEllipse(contours.get(best));
      src.delete(); contours.delete(); hierarchy.delete();
      const major = Math.max(rr.size.width, rr.size.height);
      const minor = Math.min(rr.size.width, rr.size.height);
      const dc = Math.hypot(rr.center.x - e.cx, rr.center.y - e.cy);
      const dr = Math.abs(minor / major - t.axis_ratio!);
      worstCentre = Math.max(worstCentre, dc);
      worstRatio = Math.max(worstRatio, dr);
      checked += 1;
    }
    if (process.env.SYNTH_DEBUG) console.log({ checked, worstCentre, worstRatio });
    expect(checked).toBeGreaterThan(10);
    expect(worstCentre).toBeLessThan(0.5);
    expect(worstRatio).toBeLessThan(0.02);
  });
});
