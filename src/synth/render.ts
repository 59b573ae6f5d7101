/**
 * Renders the frames of one toss: the static background, the coin ray-cast per sample inside its
 * bounding box only (rotated-grid 4× supersampling, motion blur by averaging sub-exposures over the
 * exposure window, centred on the frame time), the hand in front, and Gaussian sensor noise; out come
 * gray8 frames.
 *
 * Sensor noise comes from two precomputed tables of normal deviates (σ/√2 each, 1/16 gray level steps)
 * read at random offsets per frame and added: normal per pixel, cheap, and with no repeating pattern
 * from frame to frame (common practice, no source). Values are quantised by rounding to the nearest
 * gray level and clamping to 0..255.
 */
import type { PinholeCamera } from './camera.ts';
import { castCoinSample, prepareCoinPose, type CoinPose } from './coin.ts';
import { drawHand, makeHandShape } from './hand.ts';
import { makeBackground, type BackgroundKind } from './background.ts';
import type { TossMotion } from './motion.ts';
import { createRng } from './rng.ts';

/** Settings of the renderer (read-only once resolved). */
export interface RenderSettings {
  /** Exposure time as a fraction of the frame interval, 0..1 (0: an instantaneous shutter, no blur). */
  readonly exposureFraction: number;
  /** Sub-exposures averaged over the exposure (default 4; 1 when the exposure is 0). */
  readonly subExposures?: number;
  /** Supersampling per pixel: 1 (centre only) or 4 (rotated grid; default). */
  readonly supersampling?: 1 | 4;
  /** Sensor noise, gray levels (σ of a Gaussian), ≥ 0. */
  readonly noiseSigma: number;
  /** Background kind. */
  readonly background: BackgroundKind;
  /** Study seed (the clip index comes from the motion's scenario). */
  readonly seed: number;
}

/** A renderer of one clip's frames. */
export interface ClipRenderer {
  /** Number of frames of the clip. */
  readonly framesTotal: number;
  /** The background (gray levels as floats, row-major; do not modify). */
  readonly background: Float32Array;
  /** Renders frame `index` (0-based) as gray8 (new array, width·height bytes). */
  renderFrame(index: number): Uint8Array;
  /** All frames in order, lazily. */
  frames(): Generator<Uint8Array, void, undefined>;
}

/** Rotated-grid supersampling offsets (px), common practice, no source. */
const RGSS: readonly (readonly [number, number])[] = [
  [0.125, 0.375],
  [0.375, -0.125],
  [-0.125, -0.375],
  [-0.375, 0.125],
];
const CENTRE: readonly (readonly [number, number])[] = [[0, 0]];

/** Fixed point of the quantiser: gray levels × 16, offset so that every sum indexes {@link QUANT}. */
const FIX = 16;
const FIX_OFFSET = 32768;
/** QUANT[v] = the gray level of fixed-point value v, clamped to 0..255 (v already holds the +½ of rounding). */
const QUANT = (() => {
  const lut = new Uint8Array(65536);
  for (let v = 0; v < 65536; v++) {
    const g = Math.floor((v - FIX_OFFSET) / FIX);
    lut[v] = g < 0 ? 0 : g > 255 ? 255 : g;
  }
  return lut;
})();

/** out[i] = QUANT[work16[i] + a[i + oa] + b[i + ob]] (fixed point; noise tables pre-scaled). */
function addNoise(work16: Int32Array, a: Int16Array, b: Int16Array, oa: number, ob: number, out: Uint8Array): void {
  const n = work16.length;
  for (let i = 0; i < n; i++) out[i] = QUANT[(work16[i] + a[i + oa] + b[i + ob]) & 65535];
}

/** Fixed-point value of a gray level (with the rounding half and the offset). */
function toFixed(v: number): number {
  const x = Math.round(v * FIX) + FIX / 2 + FIX_OFFSET;
  return x < 8 * FIX ? 8 * FIX : x > 65535 - 8 * FIX ? 65535 - 8 * FIX : x;
}

/** Number of frames of a motion at `captureFps`: every frame time k/fps from 0 to the end. */
export function frameCount(motion: TossMotion): number {
  return Math.floor(motion.endTS * motion.scenario.captureFps + 1e-9) + 1;
}

/**
 * Prepares the renderer of `motion` seen by `cam` with `settings`. Builds the background, the hand
 * and the noise tables once; {@link ClipRenderer.renderFrame} then costs the coin's and the hand's
 * boxes plus one pass over the image.
 */
export function createClipRenderer(motion: TossMotion, cam: PinholeCamera, settings: RenderSettings): ClipRenderer {
  const sc = motion.scenario;
  const W = cam.width;
  const H = cam.height;
  const N = W * H;
  const fps = sc.captureFps;
  const exposure = Math.min(1, Math.max(0, settings.exposureFraction));
  const subs = exposure > 0 ? Math.max(1, Math.round(settings.subExposures ?? 4)) : 1;
  const offsets = (settings.supersampling ?? 4) === 4 ? RGSS : CENTRE;
  const background = makeBackground(settings.background, W, H, settings.seed, sc.clipIndex);
  const hand = sc.hand ? makeHandShape(sc.coinRadiusM, sc.handMirrored, sc.handGray, settings.seed, sc.clipIndex) : null;
  const sigma = Math.max(0, settings.noiseSigma);
  const noiseRng = createRng(settings.seed, sc.clipIndex, 'noise');
  const PAD = 65536;
  // noise tables in fixed point, each N(0, σ²/2), cut at ±6σ; the sum of two is N(0, σ²)
  let tableA: Int16Array | null = null;
  let tableB: Int16Array | null = null;
  if (sigma > 0) {
    const k = sigma * Math.SQRT1_2 * FIX;
    const cut = Math.min(4000, 6 * k);
    const fill = (t: Int16Array): void => {
      for (let i = 0; i < t.length; i++) t[i] = Math.round(Math.max(-cut, Math.min(cut, k * noiseRng.normal())));
    };
    tableA = new Int16Array(N + PAD);
    tableB = new Int16Array(N + PAD);
    fill(tableA);
    fill(tableB);
  }
  const framesTotal = frameCount(motion);
  // `work` holds the background between frames; each frame writes into rectangles and restores them after.
  const work = Float32Array.from(background);
  const f = cam.focalPx;
  const offX = new Float64Array(offsets.map((o) => o[0]));
  const offY = new Float64Array(offsets.map((o) => o[1]));
  const K = offsets.length;
  const work16 = new Int32Array(N);
  for (let i = 0; i < N; i++) work16[i] = toFixed(background[i]);
  const background16 = work16.slice();
  const background8 = new Uint8Array(N);
  for (let i = 0; i < N; i++) background8[i] = QUANT[background16[i]];

  const restore = (r: readonly [number, number, number, number]): void => {
    const [x0, y0, x1, y1] = r;
    for (let y = y0; y <= y1; y++) {
      work.set(background.subarray(y * W + x0, y * W + x1 + 1), y * W + x0);
      work16.set(background16.subarray(y * W + x0, y * W + x1 + 1), y * W + x0);
    }
  };
  const toFixedRect = (r: readonly [number, number, number, number]): void => {
    const [x0, y0, x1, y1] = r;
    for (let y = y0; y <= y1; y++) for (let i = y * W + x0; i <= y * W + x1; i++) work16[i] = toFixed(work[i]);
  };

  const drawCoin = (tS: number): [number, number, number, number] | null => {
    const poses: CoinPose[] = [];
    const dt = exposure / fps;
    for (let j = 0; j < subs; j++) {
      const tj = subs === 1 ? tS : tS - dt / 2 + ((j + 0.5) * dt) / subs;
      const st = motion.stateAt(tj);
      poses.push(prepareCoinPose(cam, st.center, st.attitude, sc.coinRadiusM, sc.coinThicknessM));
    }
    let bx0 = Infinity;
    let by0 = Infinity;
    let bx1 = -Infinity;
    let by1 = -Infinity;
    for (const p of poses) {
      if (p.bbox[2] < p.bbox[0]) continue;
      bx0 = Math.min(bx0, p.bbox[0]);
      by0 = Math.min(by0, p.bbox[1]);
      bx1 = Math.max(bx1, p.bbox[2]);
      by1 = Math.max(by1, p.bbox[3]);
    }
    bx0 = Math.max(0, bx0);
    by0 = Math.max(0, by0);
    bx1 = Math.min(W - 1, bx1);
    by1 = Math.min(H - 1, by1);
    if (bx1 < bx0 || by1 < by0) return null;
    const perPixel = subs * K;
    for (let py = by0; py <= by1; py++) {
      for (let px = bx0; px <= bx1; px++) {
        const i = py * W + px;
        let acc = 0;
        let hits = 0;
        for (let j = 0; j < poses.length; j++) {
          const p = poses[j];
          const b = p.bbox;
          if (px < b[0] || px > b[2] || py < b[1] || py > b[3]) continue;
          for (let k = 0; k < K; k++) {
            const g = castCoinSample(p, (px + offX[k] - cam.u0) / f, (py + offY[k] - cam.v0) / f);
            if (g >= 0) {
              acc += g;
              hits += 1;
            }
          }
        }
        if (hits > 0) work[i] = (acc + (perPixel - hits) * background[i]) / perPixel;
      }
    }
    return [bx0, by0, bx1, by1];
  };

  const renderFrame = (index: number): Uint8Array => {
    const tS = index / fps;
    const dirty: [number, number, number, number][] = [];
    const coinBox = drawCoin(tS);
    if (coinBox !== null) dirty.push(coinBox);
    if (hand !== null) {
      const handBox = drawHand(work, cam, hand, motion.stateAt(tS).handAnchor);
      if (handBox !== null) dirty.push(handBox);
    }
    for (const r of dirty) toFixedRect(r);
    const out = new Uint8Array(N);
    if (tableA !== null && tableB !== null) {
      const frameRng = createRng(settings.seed, sc.clipIndex, 'noise', index); // any frame, any order
      const oa = frameRng.integer(0, PAD - 1);
      const ob = frameRng.integer(0, PAD - 1);
      addNoise(work16, tableA, tableB, oa, ob, out);
    } else {
      out.set(background8);
      for (const [x0, y0, x1, y1] of dirty) {
        for (let y = y0; y <= y1; y++) for (let i = y * W + x0; i <= y * W + x1; i++) out[i] = QUANT[work16[i]];
      }
    }
    for (const r of dirty) restore(r);
    return out;
  };

  return {
    framesTotal,
    background,
    renderFrame,
    *frames() {
      for (let k = 0; k < framesTotal; k++) yield renderFrame(k);
    },
  };
}
