/**
 * A hand seen from the side, palm up, holding the coin: a palm, curled fingers whose tip
 * touches one edge of the coin, a thumb over the other edge, and the wrist running out of the
 * frame below. It is a signed distance field of capsules and an ellipse in a vertical plane
 * at the hand's depth, drawn in front of the coin with anti-aliased edges, a rounded shading
 * and a faint skin texture. No motion blur (the hand moves slowly next to the coin).
 */
import type { Vec3 } from '../physics/index.ts';
import type { PinholeCamera } from './camera.ts';
import { createRng } from './rng.ts';

interface Capsule { ax: number; ay: number; bx: number; by: number; r: number }

/** The hand's shape in its plane: metres, x right, y up, origin at the centre of the held coin. */
export interface HandShape {
  capsules: Capsule[];
  palm: { cx: number; cy: number; rx: number; ry: number };
  /** Bounding box [x0, y0, x1, y1], m. */
  box: [number, number, number, number];
  /** Skin texture: `texN`×`texN` grid of values in [−1, 1] with cell `texCellM`. */
  tex: Float32Array;
  texN: number;
  texCellM: number;
  gray: number;
}

/**
 * The hand for a coin of radius `coinRadiusM` (m), mirrored (thumb on the right) when `mirrored`,
 * with skin gray `gray` (0..255) and a texture drawn from `(seed, clipIndex, 'hand')`.
 */
export function makeHandShape(coinRadiusM: number, mirrored: boolean, gray: number, seed: number, clipIndex: number): HandShape {
  const a = coinRadiusM;
  const sx = mirrored ? -1 : 1;
  const cap = (ax: number, ay: number, bx: number, by: number, r: number): Capsule => ({ ax: sx * ax, ay, bx: sx * bx, by, r });
  const capsules = [
    cap(-0.035, -0.032, -a - 0.003, -0.002, 0.0075), // thumb over the left edge
    cap(a + 0.03, -0.03, a + 0.0045, -0.004, 0.0085), // index finger, tip on the right edge
    cap(a + 0.038, -0.04, a + 0.018, -0.022, 0.009), // middle finger, curled
    cap(a + 0.04, -0.05, a + 0.022, -0.038, 0.0085), // ring finger, curled
    cap(-0.012, -0.045, -0.045, -0.32, 0.03), // wrist and forearm
  ];
  const palm = { cx: sx * 0.012, cy: -0.04, rx: 0.05, ry: 0.022 };
  const x0 = Math.min(...capsules.map((c) => Math.min(c.ax, c.bx) - c.r), palm.cx - palm.rx) - 0.002;
  const x1 = Math.max(...capsules.map((c) => Math.max(c.ax, c.bx) + c.r), palm.cx + palm.rx) + 0.002;
  const y0 = Math.min(...capsules.map((c) => Math.min(c.ay, c.by) - c.r), palm.cy - palm.ry) - 0.002;
  const y1 = Math.max(...capsules.map((c) => Math.max(c.ay, c.by) + c.r), palm.cy + palm.ry) + 0.002;
  const rng = createRng(seed, clipIndex, 'hand');
  const texN = 64;
  const tex = new Float32Array(texN * texN);
  for (let i = 0; i < tex.length; i++) tex[i] = rng.uniformIn(-1, 1);
  return { capsules, palm, box: [x0, y0, x1, y1], tex, texN, texCellM: 0.005, gray };
}

/** Polynomial smooth minimum (blends the parts into one blob; common practice in distance-field modelling). */
function smin(a: number, b: number, k: number): number {
  const h = k - Math.abs(a - b);
  return h > 0 ? Math.min(a, b) - (h * h) / (4 * k) : Math.min(a, b);
}

/** Signed distance (m, negative inside) from the hand's outline at plane point (x, y). */
export function handDistance(shape: HandShape, x: number, y: number): number {
  const p = shape.palm;
  const ex = (x - p.cx) / p.rx;
  const ey = (y - p.cy) / p.ry;
  let d = (Math.sqrt(ex * ex + ey * ey) - 1) * Math.min(p.rx, p.ry); // approximate ellipse distance
  const caps = shape.capsules;
  for (let k = 0; k < caps.length; k++) {
    const c = caps[k];
    const px = x - c.ax;
    const py = y - c.ay;
    const bx = c.bx - c.ax;
    const by = c.by - c.ay;
    let hh = (px * bx + py * by) / (bx * bx + by * by);
    hh = hh < 0 ? 0 : hh > 1 ? 1 : hh;
    const qx = px - bx * hh;
    const qy = py - by * hh;
    d = smin(d, Math.sqrt(qx * qx + qy * qy) - c.r, 0.008);
  }
  return d;
}

/** Bilinear value noise of the skin at plane point (x, y), in [−1, 1]. */
function skinTexture(shape: HandShape, x: number, y: number): number {
  const n = shape.texN;
  const fx = x / shape.texCellM + n * 64;
  const fy = y / shape.texCellM + n * 64;
  const ix = Math.floor(fx);
  const iy = Math.floor(fy);
  const tx = fx - ix;
  const ty = fy - iy;
  const i0 = ix % n;
  const i1 = (ix + 1) % n;
  const j0 = (iy % n) * n;
  const j1 = ((iy + 1) % n) * n;
  const t = shape.tex;
  return (t[j0 + i0] * (1 - tx) + t[j0 + i1] * tx) * (1 - ty) + (t[j1 + i0] * (1 - tx) + t[j1 + i1] * tx) * ty;
}

/**
 * Draws the hand with its anchor (the held coin's centre) at world point `anchor` (m) into `frame`
 * (gray levels as floats, row-major, `cam.width`×`cam.height`; mutated in place). The hand lies in the
 * vertical plane y = anchor.y; each pixel's ray is cut with that plane (exact perspective, any roll).
 * Returns the pixel rectangle [x0, y0, x1, y1] it may have changed, or null when nothing is drawn.
 */
export function drawHand(frame: Float32Array, cam: PinholeCamera, shape: HandShape, anchor: Vec3): [number, number, number, number] | null {
  if (!Number.isFinite(anchor[0])) return null;
  const W = cam.width;
  const H = cam.height;
  const R = cam.worldToCam;
  const C = cam.centerWorld;
  const f = cam.focalPx;
  // pixel bounding box of the shape's box corners
  let u0 = Infinity;
  let v0 = Infinity;
  let u1 = -Infinity;
  let v1 = -Infinity;
  for (const lx of [shape.box[0], shape.box[2]]) {
    for (const ly of [shape.box[1], shape.box[3]]) {
      const wx = anchor[0] + lx - C[0];
      const wy = anchor[1] - C[1];
      const wz = anchor[2] + ly - C[2];
      const X = R[0] * wx + R[1] * wy + R[2] * wz;
      const Y = R[3] * wx + R[4] * wy + R[5] * wz;
      const Z = R[6] * wx + R[7] * wy + R[8] * wz;
      if (!(Z > 0)) return null;
      const u = (f * X) / Z + cam.u0;
      const v = (f * Y) / Z + cam.v0;
      u0 = Math.min(u0, u);
      u1 = Math.max(u1, u);
      v0 = Math.min(v0, v);
      v1 = Math.max(v1, v);
    }
  }
  const xa = Math.max(0, Math.floor(u0) - 1);
  const xb = Math.min(W - 1, Math.ceil(u1) + 1);
  const ya = Math.max(0, Math.floor(v0) - 1);
  const yb = Math.min(H - 1, Math.ceil(v1) + 1);
  const depth = anchor[1] - C[1];
  // plane point of pixel (px, py): the ray Rᵀ (xn, yn, 1) cut with the plane y = anchor.y
  const local = (px: number, py: number, out: number[]): boolean => {
    const xn = (px - cam.u0) / f;
    const yn = (py - cam.v0) / f;
    const dx = R[0] * xn + R[3] * yn + R[6];
    const dy = R[1] * xn + R[4] * yn + R[7];
    const dz = R[2] * xn + R[5] * yn + R[8];
    if (!(dy > 0)) return false;
    const t = depth / dy;
    out[0] = C[0] + t * dx - anchor[0];
    out[1] = C[2] + t * dz - anchor[2];
    out[2] = f / (t * dy); // px per metre along the plane (the plane faces the camera)
    return true;
  };
  const q = [0, 0, 0];
  const TILE = 8;
  for (let ty = ya; ty <= yb; ty += TILE) {
    for (let tx = xa; tx <= xb; tx += TILE) {
      // skip tiles whose centre lies farther outside the hand than the tile's half diagonal (+ the edge ramp)
      if (!local(tx + TILE / 2 - 0.5, ty + TILE / 2 - 0.5, q)) continue;
      if (handDistance(shape, q[0], q[1]) * q[2] > TILE * 0.7072 + 1) continue;
      const yEnd = Math.min(yb, ty + TILE - 1);
      const xEnd = Math.min(xb, tx + TILE - 1);
      for (let py = ty; py <= yEnd; py++) {
        for (let px = tx; px <= xEnd; px++) {
          if (!local(px, py, q)) continue;
          const lx = q[0];
          const ly = q[1];
          const d = handDistance(shape, lx, ly);
          const dPx = d * q[2];
          if (dPx > 0.75) continue;
          const alpha = dPx <= -0.5 ? 1 : 0.5 - dPx;
          const inner = -d >= 0.012 ? 1 : -d <= 0 ? 0 : -d / 0.012;
          const round = 0.72 + 0.28 * Math.sqrt(inner); // darker towards the outline: a rounded body
          const lit = ly >= 0 ? 1 : ly <= -0.05 ? 0 : (ly + 0.05) / 0.05; // lit from above
          const skin = shape.gray * round * (1 + 0.05 * skinTexture(shape, lx, ly)) + 10 * lit;
          const i = py * W + px;
          frame[i] = frame[i] * (1 - alpha) + skin * alpha;
        }
      }
    }
  }
  return xa <= xb && ya <= yb ? [xa, ya, xb, yb] : null;
}
