/**
 * The static scene behind the coin, drawn once per clip: a smooth gradient with soft blobs,
 * a few straight lines and a faint fixed grain (textured), or a flat gray (plain). Gray levels
 * stay in 12..100 so the coin's faces (brighter) never match the scene.
 */
import { createRng } from './rng.ts';

/** Kind of background. */
export type BackgroundKind = 'textured' | 'plain';

/** Gray level of the plain background. */
export const PLAIN_BACKGROUND_GRAY = 40;

/**
 * Draws a `width`×`height` background (gray levels as floats, row-major, new array) from the seed
 * streams `(seed, clipIndex, 'background')`. Deterministic.
 */
export function makeBackground(kind: BackgroundKind, width: number, height: number, seed: number, clipIndex: number): Float32Array {
  const out = new Float32Array(width * height);
  if (kind === 'plain') {
    out.fill(PLAIN_BACKGROUND_GRAY);
    return out;
  }
  const rng = createRng(seed, clipIndex, 'background');
  const base = rng.uniformIn(40, 62);
  const gx = rng.uniformIn(-18, 18);
  const gy = rng.uniformIn(-18, 18);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let x = 0; x < width; x++) out[row + x] = base + (gx * x) / width + (gy * y) / height;
  }
  const scalePx = Math.max(width, height);
  const blobs = rng.integer(10, 18);
  for (let b = 0; b < blobs; b++) {
    const cx = rng.uniformIn(0, width);
    const cy = rng.uniformIn(0, height);
    const sx = rng.uniformIn(0.015, 0.12) * scalePx;
    const sy = sx * rng.uniformIn(0.5, 1.8);
    const amp = rng.uniformIn(-22, 22);
    const x0 = Math.max(0, Math.floor(cx - 3 * sx));
    const x1 = Math.min(width - 1, Math.ceil(cx + 3 * sx));
    const y0 = Math.max(0, Math.floor(cy - 3 * sy));
    const y1 = Math.min(height - 1, Math.ceil(cy + 3 * sy));
    for (let y = y0; y <= y1; y++) {
      const dy = (y - cy) / sy;
      for (let x = x0; x <= x1; x++) {
        const dx = (x - cx) / sx;
        out[y * width + x] += amp * Math.exp(-0.5 * (dx * dx + dy * dy));
      }
    }
  }
  const lines = rng.integer(3, 7);
  for (let l = 0; l < lines; l++) {
    // a line through a random point at a random angle, anti-aliased by its distance
    const px = rng.uniformIn(0, width);
    const py = rng.uniformIn(0, height);
    const th = rng.uniformIn(0, Math.PI);
    const nx = -Math.sin(th);
    const ny = Math.cos(th);
    const half = rng.uniformIn(0.5, 2.2);
    const amp = rng.uniformIn(-18, 18);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        const d = Math.abs((x - px) * nx + (y - py) * ny);
        if (d < half + 1) out[y * width + x] += amp * Math.min(1, half + 0.5 - d > 0 ? half + 0.5 - d : 0);
      }
    }
  }
  for (let i = 0; i < out.length; i++) {
    const v = out[i] + rng.normal(0, 1.5);
    out[i] = v < 12 ? 12 : v > 100 ? 100 : v;
  }
  return out;
}
