/**
 * Global brightness factor of a frame against the background model: the median of
 * frame / background over a sparse grid (every `step`-th pixel and row, default 16),
 * using only background values ≥ 16 gray levels. Lamp flicker and exposure drift scale
 * the whole image; the coin and the hand cover few samples, so the median ignores them.
 * Clamped to [0.5, 2]; 1 when no sample qualifies. Resolution 1/1024. Does not mutate.
 *
 * Common practice (global illumination compensation), no source.
 */
export function estimateGain(frame: Uint8Array, background: Float32Array, width: number, height: number, step = 16): number {
  const hist = HIST;
  hist.fill(0);
  let n = 0;
  const off = step >> 1;
  for (let y = off; y < height; y += step) {
    const row = y * width;
    for (let x = off; x < width; x += step) {
      const b = background[row + x];
      if (b < 16) continue;
      let bin = Math.round(((frame[row + x] / b) - 0.5) * BINS_PER_UNIT);
      if (bin < 0) bin = 0;
      else if (bin >= hist.length) bin = hist.length - 1;
      hist[bin]++;
      n++;
    }
  }
  if (n < 16) return 1;
  let cum = 0;
  for (let k = 0; k < hist.length; k++) {
    cum += hist[k];
    if (cum >= n / 2) return 0.5 + k / BINS_PER_UNIT;
  }
  return 1;
}

const BINS_PER_UNIT = 1024;
const HIST = new Int32Array(Math.round(1.5 * BINS_PER_UNIT) + 1);
