import type { PixelWindow } from './image.ts';

/**
 * Foreground mask by background difference: `mask[i] = 1` where
 * |frame[i] − gain·background[i]| > thresholdGray, else 0, for pixels inside `window`
 * only (the rest of `mask` is left untouched). `gain` (default 1) is a global brightness
 * factor of this frame against the model (lamp flicker, exposure drift), see `estimateGain`.
 * Mutates `mask`; returns the number of foreground pixels in the window.
 *
 * Background subtraction with a per-frame threshold is common practice, no source.
 */
export function foregroundMask(
  frame: Uint8Array,
  background: Float32Array,
  width: number,
  window: PixelWindow,
  thresholdGray: number,
  mask: Uint8Array,
  gain = 1,
): number {
  let count = 0;
  const { x0, y0, x1, y1 } = window;
  for (let y = y0; y < y1; y++) {
    const row = y * width;
    for (let i = row + x0, end = row + x1; i < end; i++) {
      const on = Math.abs(frame[i] - gain * background[i]) > thresholdGray ? 1 : 0;
      mask[i] = on;
      count += on;
    }
  }
  return count;
}
