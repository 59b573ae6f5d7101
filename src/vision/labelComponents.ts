import type { PixelWindow } from './image.ts';

/**
 * Connected components of a mask, struct-of-arrays, reusable between frames.
 * Component k (1-based label) has its statistics at index k − 1.
 */
export interface ComponentLabels {
  readonly width: number;
  readonly height: number;
  /** Label per pixel (0 = not in the mask); valid only inside the last window. */
  readonly labels: Int32Array;
  /** Number of components found in the last call. */
  count: number;
  /** True when more components existed than `capacity` (the rest are labelled but not measured). */
  overflow: boolean;
  readonly capacity: number;
  readonly area: Int32Array;
  readonly minX: Int32Array;
  readonly minY: Int32Array;
  readonly maxX: Int32Array;
  readonly maxY: Int32Array;
  /** Raw moment sums over pixel centres (absolute pixel coordinates). */
  readonly m10: Float64Array;
  readonly m01: Float64Array;
  readonly m20: Float64Array;
  readonly m11: Float64Array;
  readonly m02: Float64Array;
  /** 1 if the component has a pixel on a border of the window that lies inside the frame (it may continue outside the window). */
  readonly touchesWindow: Uint8Array;
  /** 1 if the component has a pixel on the border of the frame. */
  readonly touchesFrame: Uint8Array;
  /** Last window processed. */
  window: PixelWindow;
  /** Flood stack (internal scratch). */
  readonly stack: Int32Array;
}

/**
 * Labels the 8-connected components of `mask` (non-zero = set) inside `window`
 * (default: the whole image) and measures each: area (px), bounding box, raw moment sums
 * Σx, Σy, Σx², Σxy, Σy² over pixel centres, and whether it touches the window or the
 * frame border (a window side on the frame border counts as frame, not window). Pixels outside the window are ignored and their labels left untouched.
 *
 * Pass the result of an earlier call as `reuse` to avoid allocating (same width, height);
 * it is overwritten and returned. Labels run 1..count in raster order of first pixel.
 * Does not mutate `mask`.
 *
 * Method: one raster scan with a stack flood fill per new seed (every pixel is pushed once).
 * Common practice, no source.
 */
export function labelComponents(
  mask: Uint8Array,
  width: number,
  height: number,
  window: PixelWindow = { x0: 0, y0: 0, x1: width, y1: height },
  reuse?: ComponentLabels,
  capacity = 4096,
): ComponentLabels {
  const out = reuse && reuse.width === width && reuse.height === height ? reuse : allocate(width, height, capacity);
  const x0 = Math.max(0, window.x0 | 0);
  const y0 = Math.max(0, window.y0 | 0);
  const x1 = Math.min(width, window.x1 | 0);
  const y1 = Math.min(height, window.y1 | 0);
  out.window = { x0, y0, x1, y1 };
  out.count = 0;
  out.overflow = false;
  const labels = out.labels;
  for (let y = y0; y < y1; y++) labels.fill(0, y * width + x0, y * width + x1);
  const stack = out.stack;
  const invWidth = 1 / width;
  let next = 0;
  // Four mask bytes at a time where they are aligned: a mostly empty mask is skipped a word at a time.
  const words = (mask.byteOffset & 3) === 0 ? new Uint32Array(mask.buffer, mask.byteOffset, mask.length >> 2) : null;
  for (let y = y0; y < y1; y++) {
    const row = y * width;
    const rowEnd = row + x1;
    for (let x = x0; x < x1; x++) {
      const seed = row + x;
      if (words !== null && (seed & 3) === 0 && seed + 4 <= rowEnd && words[seed >> 2] === 0) {
        x += 3;
        continue;
      }
      if (mask[seed] === 0 || labels[seed] !== 0) continue;
      next++;
      const k = next - 1;
      const measured = k < out.capacity;
      if (!measured) out.overflow = true;
      let area = 0;
      let sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
      let bx0 = x, bx1 = x, by0 = y, by1 = y;
      let top = 0;
      stack[top++] = seed;
      labels[seed] = next;
      while (top > 0) {
        const p = stack[--top];
        // Row of p without a division: a float estimate, corrected by one row where it rounds the wrong way.
        let py = (p * invWidth) | 0;
        if (py * width > p) py--;
        else if ((py + 1) * width <= p) py++;
        const px = p - py * width;
        area++;
        sx += px; sy += py; sxx += px * px; sxy += px * py; syy += py * py;
        if (px < bx0) bx0 = px;
        if (px > bx1) bx1 = px;
        if (py < by0) by0 = py;
        if (py > by1) by1 = py;
        const ya = py > y0 ? py - 1 : py;
        const yb = py < y1 - 1 ? py + 1 : py;
        const xa = px > x0 ? px - 1 : px;
        const xb = px < x1 - 1 ? px + 1 : px;
        for (let qy = ya; qy <= yb; qy++) {
          const qrow = qy * width;
          for (let qx = xa; qx <= xb; qx++) {
            const q = qrow + qx;
            if (mask[q] !== 0 && labels[q] === 0) {
              labels[q] = next;
              stack[top++] = q;
            }
          }
        }
      }
      // A pixel on a border column or row exists exactly when the bounding box reaches it.
      const tw = (bx0 === x0 && x0 > 0) || (bx1 === x1 - 1 && x1 < width) || (by0 === y0 && y0 > 0) || (by1 === y1 - 1 && y1 < height) ? 1 : 0;
      const tf = bx0 === 0 || bx1 === width - 1 || by0 === 0 || by1 === height - 1 ? 1 : 0;
      if (measured) {
        out.area[k] = area;
        out.minX[k] = bx0; out.maxX[k] = bx1; out.minY[k] = by0; out.maxY[k] = by1;
        out.m10[k] = sx; out.m01[k] = sy; out.m20[k] = sxx; out.m11[k] = sxy; out.m02[k] = syy;
        out.touchesWindow[k] = tw;
        out.touchesFrame[k] = tf;
      }
    }
  }
  out.count = Math.min(next, out.capacity);
  return out;
}

function allocate(width: number, height: number, capacity: number): ComponentLabels {
  return {
    width, height, capacity,
    labels: new Int32Array(width * height),
    count: 0,
    overflow: false,
    area: new Int32Array(capacity),
    minX: new Int32Array(capacity), minY: new Int32Array(capacity),
    maxX: new Int32Array(capacity), maxY: new Int32Array(capacity),
    m10: new Float64Array(capacity), m01: new Float64Array(capacity),
    m20: new Float64Array(capacity), m11: new Float64Array(capacity), m02: new Float64Array(capacity),
    touchesWindow: new Uint8Array(capacity),
    touchesFrame: new Uint8Array(capacity),
    window: { x0: 0, y0: 0, x1: width, y1: height },
    stack: new Int32Array(width * height),
  };
}
