/**
 * Test helper (not a test): a small rasteriser of image sequences for the tracker tests,
 * written independently of src/. Filled rotated ellipses with an anti-aliased edge
 * (4×4 supersampling of edge pixels), a random textured background, a moving blob for a
 * hand, Gaussian noise, and a coin whose face is brighter or darker than the background.
 */
import type { Ellipse } from '../../src/vision/ellipse.ts';

import { mulberry32 as prng } from '../helpers/mulberry32.ts';
export { prng };

/** Standard normal deviate by Box–Muller (closed form). */
export function gauss(rand: () => number): number {
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** A textured background: smooth random waves plus 8-px blocks, gray 60..190. */
export function texturedBackground(width: number, height: number, rand: () => number): Float32Array {
  const bg = new Float32Array(width * height);
  const waves = Array.from({ length: 6 }, () => ({
    kx: (rand() - 0.5) * 0.3, ky: (rand() - 0.5) * 0.3, ph: rand() * 6.28, amp: 10 + 15 * rand(),
  }));
  const bw = Math.ceil(width / 8), bh = Math.ceil(height / 8);
  const blocks = Float32Array.from({ length: bw * bh }, () => (rand() - 0.5) * 30);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let v = 125 + blocks[((y / 8) | 0) * bw + ((x / 8) | 0)];
      for (const w of waves) v += w.amp * Math.sin(w.kx * x + w.ky * y + w.ph);
      bg[y * width + x] = Math.min(190, Math.max(60, v));
    }
  }
  return bg;
}

/** Fraction of pixel (x, y) covered by the ellipse (4×4 supersampling near the edge). */
export function coverage(e: Ellipse, x: number, y: number): number {
  const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
  const a = e.major / 2, b = e.minor / 2;
  const inside = (px: number, py: number): boolean => {
    const dx = px - e.cx, dy = py - e.cy;
    const u = (dx * c + dy * s) / a, v = (-dx * s + dy * c) / b;
    return u * u + v * v <= 1;
  };
  // Distance bound: fully inside / outside when far from the edge.
  const dx = x - e.cx, dy = y - e.cy;
  const u = (dx * c + dy * s), v = (-dx * s + dy * c);
  const rr = Math.sqrt((u * u) / (a * a) + (v * v) / (b * b));
  const slack = 1.5 / Math.max(0.5, b);
  if (rr < 1 - slack) return 1;
  if (rr > 1 + slack) return 0;
  let n = 0;
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) if (inside(x - 0.375 + 0.25 * i, y - 0.375 + 0.25 * j)) n++;
  return n / 16;
}

/** One coin frame's drawing instructions. */
export interface CoinDraw {
  readonly ellipse: Ellipse;
  /** Face gray level (texture ±12 added). */
  readonly gray: number;
}

/** A hand: an ellipse palm plus three finger ellipses, offset from a centre. */
export interface HandDraw {
  readonly cx: number;
  readonly cy: number;
  readonly gray: number;
}

export function handEllipses(h: HandDraw): Ellipse[] {
  return [
    { cx: h.cx, cy: h.cy, major: 120, minor: 70, angleRad: 0.15 },
    { cx: h.cx - 45, cy: h.cy - 40, major: 60, minor: 18, angleRad: 1.3 },
    { cx: h.cx - 10, cy: h.cy - 48, major: 55, minor: 18, angleRad: 1.5 },
    { cx: h.cx + 25, cy: h.cy - 45, major: 50, minor: 17, angleRad: 1.7 },
  ];
}

/**
 * Renders one frame: background, then the hand (behind or in front per `handInFront`),
 * the coin, noise of σ `noiseSigma`. Returns gray8.
 */
export function renderFrame(
  width: number, height: number, bg: Float32Array, coin: CoinDraw | null, hand: HandDraw | null,
  noiseSigma: number, rand: () => number, handInFront = false,
): Uint8Array {
  const img = Float32Array.from(bg);
  const paint = (e: Ellipse, gray: (x: number, y: number) => number): void => {
    const r = e.major / 2 + 2;
    const x0 = Math.max(0, Math.floor(e.cx - r)), x1 = Math.min(width - 1, Math.ceil(e.cx + r));
    const y0 = Math.max(0, Math.floor(e.cy - r)), y1 = Math.min(height - 1, Math.ceil(e.cy + r));
    for (let y = y0; y <= y1; y++) {
      for (let x = x0; x <= x1; x++) {
        const cov = coverage(e, x, y);
        if (cov > 0) img[y * width + x] = (1 - cov) * img[y * width + x] + cov * gray(x, y);
      }
    }
  };
  const drawHand = (): void => {
    if (!hand) return;
    for (const e of handEllipses(hand)) paint(e, (x, y) => hand.gray + 10 * Math.sin(0.3 * x) * Math.sin(0.25 * y));
  };
  if (!handInFront) drawHand();
  if (coin) {
    const e = coin.ellipse;
    paint(e, (x, y) => coin.gray + 12 * Math.sin(0.5 * (x - e.cx)) * Math.cos(0.45 * (y - e.cy)));
  }
  if (handInFront) drawHand();
  const out = new Uint8Array(width * height);
  for (let i = 0; i < out.length; i++) out[i] = Math.max(0, Math.min(255, Math.round(img[i] + noiseSigma * gauss(rand))));
  return out;
}

/** A full toss: frames plus the drawn coin and hand of each. */
export interface TossSequence {
  readonly width: number;
  readonly height: number;
  readonly frames: Uint8Array[];
  readonly coins: (CoinDraw | null)[];
  readonly hands: (HandDraw | null)[];
}

/**
 * A toss: held in the hand (frames 0..release−1, moving up with the hand over the last
 * few), free flight under constant image acceleration `gPx` px/frame², spinning at
 * `revPerFrame` (axis ratio |cos| floored at 0.05, so it passes edge-on), caught by the
 * hand moving in. Face 1 bright (205), face 2 dark (35) on a 60..190 background.
 */
export function tossSequence(opts: {
  width?: number; height?: number; seed?: number; frames?: number; diameterPx?: number;
  apexY?: number; gPx?: number; revPerFrame?: number; noiseSigma?: number;
}): TossSequence {
  const width = opts.width ?? 480, height = opts.height ?? 360;
  const rand = prng(opts.seed ?? 1);
  const nFrames = opts.frames ?? 90;
  const d = opts.diameterPx ?? 60;
  const g = opts.gPx ?? 0.5;
  const rev = opts.revPerFrame ?? 0.037;
  const bg = texturedBackground(width, height, rand);
  const release = 14;
  const y0 = height - 90;
  const apex = opts.apexY ?? 80;
  const v0 = Math.sqrt(2 * g * (y0 - apex));
  const tFlight = (2 * v0) / g;
  const catchT = release + tFlight;
  const frames: Uint8Array[] = [];
  const coins: (CoinDraw | null)[] = [];
  const hands: (HandDraw | null)[] = [];
  for (let t = 0; t < nFrames; t++) {
    // Coin centre.
    let cx: number, cy: number;
    const lift = Math.max(0, Math.min(t, release) - (release - 5)) * 3; // hand lifts 3 px/frame for 5 frames
    if (t < release) {
      cx = width / 2 - 30; cy = y0 + 15 - lift;
    } else {
      const tau = Math.min(t, catchT) - release;
      cx = width / 2 - 30 + 0.8 * tau;
      cy = y0 + 15 - 15 - v0 * tau + 0.5 * g * tau * tau;
    }
    const phase = 2 * Math.PI * rev * Math.max(0, t - release);
    const c = Math.cos(phase);
    const ratio = Math.max(0.05, Math.abs(c));
    const ellipse: Ellipse = { cx, cy, major: d, minor: ratio * d, angleRad: (0.2 + 0.013 * t) % Math.PI };
    const gray = c >= 0 ? 205 : 35;
    // Hand: under the coin while held, away during flight, back for the catch.
    let hand: HandDraw | null = null;
    if (t < release + 6) hand = { cx: width / 2 - 30 + 10, cy: y0 + 15 - lift + 55 + Math.max(0, t - release) * 6, gray: 150 };
    else if (t > catchT - 10) hand = { cx: width / 2 - 30 + 0.8 * (catchT - release) + 10, cy: y0 + 15 + 55 + 10 * Math.max(0, catchT - t), gray: 150 };
    const coin: CoinDraw = { ellipse, gray };
    frames.push(renderFrame(width, height, bg, coin, hand, opts.noiseSigma ?? 3, rand, t < release || t > catchT));
    coins.push(coin);
    hands.push(hand);
  }
  return { width, height, frames, coins, hands };
}

/** Smallest distance between the coin's bounding circle and the hand's ellipses' circles (px; Infinity without hand). */
export function coinHandGap(coin: CoinDraw, hand: HandDraw | null): number {
  if (!hand) return Number.POSITIVE_INFINITY;
  let gap = Number.POSITIVE_INFINITY;
  for (const h of handEllipses(hand)) {
    gap = Math.min(gap, Math.hypot(coin.ellipse.cx - h.cx, coin.ellipse.cy - h.cy) - coin.ellipse.major / 2 - h.major / 2);
  }
  return gap;
}

/**
 * A hand carrying the coin and throwing it: the coin (tilted, axis ratio `ratio`) rests on the
 * fingertips, the hand drawn in front of it; both stand still for `holdFrames` frames, then the
 * hand accelerates upward at `accelPx` px/frame² until `release`; from then the coin flies freely
 * (image gravity `gPx`, slow turn) while the hand brakes and drops away. Velocity is continuous at
 * the release, as in a real throw. Frames hold the coin in the initial background median, so its
 * starting place shows a ghost once it has moved.
 */
export function carrySequence(opts: {
  width?: number; height?: number; seed?: number; frames?: number; diameterPx?: number; ratio?: number;
  holdFrames?: number; release?: number; accelPx?: number; gPx?: number; noiseSigma?: number;
} = {}): TossSequence & { readonly release: number; readonly startCentre: { x: number; y: number } } {
  const width = opts.width ?? 480, height = opts.height ?? 400;
  const rand = prng(opts.seed ?? 2);
  const nFrames = opts.frames ?? 60;
  const d = opts.diameterPx ?? 40;
  const ratio = opts.ratio ?? 0.6;
  const hold = opts.holdFrames ?? 10;
  const release = opts.release ?? 30;
  const acc = opts.accelPx ?? 0.25;
  const g = opts.gPx ?? 0.5;
  const bg = texturedBackground(width, height, rand);
  const x0 = width / 2, y0 = height - 60;
  const handY = (t: number): number => {
    // hand centre: still, accelerating up, then braking at 1.5 px/frame² and falling away
    if (t <= hold) return y0 + 85;
    const tr = Math.min(t, release) - hold;
    let y = y0 + 85 - 0.5 * acc * tr * tr;
    if (t > release) {
      const tau = t - release, v = acc * (release - hold);
      y += -v * tau + 0.75 * tau * tau;
    }
    return y;
  };
  const vRel = acc * (release - hold);
  const frames: Uint8Array[] = [], coins: (CoinDraw | null)[] = [], hands: (HandDraw | null)[] = [];
  for (let t = 0; t < nFrames; t++) {
    let cy: number;
    let cx = x0 - 10;
    if (t <= release) cy = handY(t) - 85;
    else {
      const tau = t - release;
      cy = handY(release) - 85 - vRel * tau + 0.5 * g * tau * tau;
      cx += 0.3 * tau;
    }
    const turn = t > release ? 0.02 * (t - release) : 0;
    const ellipse: Ellipse = { cx, cy, major: d, minor: d * Math.max(0.05, Math.abs(Math.cos(Math.acos(ratio) + turn))), angleRad: 0.1 };
    const coin: CoinDraw = { ellipse, gray: 200 };
    const hy = handY(t);
    const hand: HandDraw | null = hy < height + 60 ? { cx: x0, cy: hy, gray: 150 } : null;
    frames.push(renderFrame(width, height, bg, coin, hand, opts.noiseSigma ?? 2, rand, true));
    coins.push(coin);
    hands.push(hand);
  }
  return { width, height, frames, coins, hands, release, startCentre: { x: x0 - 10, y: y0 } };
}
