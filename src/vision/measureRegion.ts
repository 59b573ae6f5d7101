import type { PixelWindow } from './image.ts';
import type { ComponentLabels } from './labelComponents.ts';

/** Reusable buffers for {@link measureRegion}. Create once per image size. */
export interface RegionScratch {
  readonly state: Uint8Array;
  readonly stack: Int32Array;
  /** Outline points (crack midpoints), first `RegionMeasure.outlineCount` valid. */
  xs: Float64Array;
  ys: Float64Array;
}

/** What {@link measureRegion} measures of one (hole-filled) region. */
export interface RegionMeasure {
  /** Pixels of the region after filling its holes. */
  area: number;
  /** Pixels added by hole filling. */
  holeArea: number;
  /** Raw moment sums of the filled region over pixel centres. */
  m00: number; m10: number; m01: number; m20: number; m11: number; m02: number;
  /** Mean frame gray level over the filled region. */
  meanGray: number;
  /** Outline points written to `scratch.xs/ys` (not counting those cut by the window). */
  outlineCount: number;
  /** Outline steps that were skipped because they face the window or frame border. */
  cutCount: number;
  /** The filled region touches the frame border / a window border inside the frame. */
  touchesFrame: boolean;
  touchesWindow: boolean;
}

/** Allocates the buffers of {@link measureRegion} for a `width × height` image. */
export function createRegionScratch(width: number, height: number): RegionScratch {
  return {
    state: new Uint8Array(width * height),
    stack: new Int32Array(width * height),
    xs: new Float64Array(4096),
    ys: new Float64Array(4096),
  };
}

/**
 * Measures the union of the labelled components with `accept[label] = 1` inside `box`
 * (their joint bounding box, `x0 ≤ x < x1`): fills its holes (pixels not reachable from
 * outside the box through 4-connected non-region pixels; a textured coin face can match
 * the background in places), then sums the moments and the frame's gray level over the
 * filled region and lists its outline as crack midpoints: for every region pixel and
 * each 4-neighbour outside the filled region, the point halfway between the two pixel
 * centres, i.e. on the boundary of the union of unit pixel squares. Steps across the
 * window or frame border are not listed (they are cuts, not the object's edge).
 *
 * Mutates only `scratch`. Labels are read only inside `comps.window`.
 * Hole filling by exterior flood fill is common practice, no source.
 */
export function measureRegion(
  comps: ComponentLabels,
  accept: Uint8Array,
  box: PixelWindow,
  frame: Uint8Array,
  scratch: RegionScratch,
): RegionMeasure {
  const { width, labels } = comps;
  const win = comps.window;
  // Box grown by one pixel, clipped to the labelled window.
  const bx0 = Math.max(win.x0, box.x0 - 1);
  const by0 = Math.max(win.y0, box.y0 - 1);
  const bx1 = Math.min(win.x1, box.x1 + 1);
  const by1 = Math.min(win.y1, box.y1 + 1);
  const { state, stack } = scratch;
  // state: 0 unknown (hole candidate), 1 region, 2 exterior.
  for (let y = by0; y < by1; y++) {
    const row = y * width;
    for (let x = bx0; x < bx1; x++) {
      const l = labels[row + x];
      state[row + x] = l > 0 && accept[l] === 1 ? 1 : 0;
    }
  }
  let top = 0;
  const seed = (i: number): void => {
    if (state[i] === 0) {
      state[i] = 2;
      stack[top++] = i;
    }
  };
  for (let x = bx0; x < bx1; x++) {
    seed(by0 * width + x);
    seed((by1 - 1) * width + x);
  }
  for (let y = by0; y < by1; y++) {
    seed(y * width + bx0);
    seed(y * width + bx1 - 1);
  }
  while (top > 0) {
    const p = stack[--top];
    const py = (p / width) | 0;
    const px = p - py * width;
    if (px > bx0) seed(p - 1);
    if (px < bx1 - 1) seed(p + 1);
    if (py > by0) seed(p - width);
    if (py < by1 - 1) seed(p + width);
  }
  let area = 0, holes = 0, sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0, gray = 0;
  let nOut = 0, nCut = 0;
  let tf = false, tw = false;
  const fw = width;
  const fh = comps.height;
  for (let y = by0; y < by1; y++) {
    const row = y * width;
    for (let x = bx0; x < bx1; x++) {
      const i = row + x;
      const s = state[i];
      if (s === 2) continue;
      if (s === 0) holes++;
      area++;
      sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
      gray += frame[i];
      if (x === 0 || y === 0 || x === fw - 1 || y === fh - 1) tf = true;
      if ((x === win.x0 && x > 0) || (y === win.y0 && y > 0) || (x === win.x1 - 1 && x < fw - 1) || (y === win.y1 - 1 && y < fh - 1)) tw = true;
      // Outline: the four neighbours; outside the box = beyond the window (a cut).
      for (let k = 0; k < 4; k++) {
        const qx = k === 0 ? x - 1 : k === 1 ? x + 1 : x;
        const qy = k === 2 ? y - 1 : k === 3 ? y + 1 : y;
        if (qx < bx0 || qx >= bx1 || qy < by0 || qy >= by1) {
          if (qx < win.x0 || qx >= win.x1 || qy < win.y0 || qy >= win.y1) {
            nCut++;
            continue;
          }
        } else if (state[qy * width + qx] !== 2) continue;
        if (nOut >= scratch.xs.length) grow(scratch);
        scratch.xs[nOut] = (x + qx) / 2;
        scratch.ys[nOut] = (y + qy) / 2;
        nOut++;
      }
    }
  }
  return {
    area, holeArea: holes,
    m00: area, m10: sx, m01: sy, m20: sxx, m11: sxy, m02: syy,
    meanGray: area > 0 ? gray / area : Number.NaN,
    outlineCount: nOut, cutCount: nCut,
    touchesFrame: tf, touchesWindow: tw,
  };
}

function grow(s: RegionScratch): void {
  const xs = new Float64Array(s.xs.length * 2);
  const ys = new Float64Array(s.ys.length * 2);
  xs.set(s.xs);
  ys.set(s.ys);
  s.xs = xs;
  s.ys = ys;
}
