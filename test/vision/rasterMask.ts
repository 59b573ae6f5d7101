/** Test helper: binary mask of the pixels whose centre lies inside an ellipse (independent of src/). */
import type { Ellipse } from '../../src/vision/ellipse.ts';

export function ellipseMask(width: number, height: number, e: Ellipse): Uint8Array {
  const m = new Uint8Array(width * height);
  const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const dx = x - e.cx, dy = y - e.cy;
      const u = (dx * c + dy * s) / (e.major / 2), v = (-dx * s + dy * c) / (e.minor / 2);
      if (u * u + v * v <= 1) m[y * width + x] = 1;
    }
  }
  return m;
}
