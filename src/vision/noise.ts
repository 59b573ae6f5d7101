/**
 * Robust sensor-noise σ (gray levels) of one frame from the difference of two frames of
 * a static scene: σ = 1.4826 · MAD(a − b) / √2, on a sparse grid (every `step`-th pixel
 * of every `step`-th row, default 3). Moving objects touch few samples and the median
 * ignores them. The MAD of integer differences is resolved to 1/2 gray level by
 * linear interpolation inside the histogram bin. Does not mutate its inputs.
 *
 * References:
 * [1] "Robust Statistics", Wiley, 1981 (the MAD and its Gaussian consistency factor
 *     1.4826 = 1/Φ⁻¹(3/4); cited from memory). The √2 is the σ of a difference of two
 *     independent frames, a closed form.
 */
export function estimateNoiseSigma(a: Uint8Array, b: Uint8Array, width: number, height: number, step = 3): number {
  const hist = HIST;
  hist.fill(0);
  let n = 0;
  for (let y = 0; y < height; y += step) {
    const row = y * width;
    for (let x = 0; x < width; x += step) {
      const d = a[row + x] - b[row + x];
      hist[d < 0 ? -d : d]++;
      n++;
    }
  }
  if (n === 0) return Number.NaN;
  if (hist[0] === n) return 0;
  // Median of |d| (the differences are centred on 0 for a static scene): MAD.
  const half = n / 2;
  let cum = 0;
  for (let v = 0; v < 256; v++) {
    const c = hist[v];
    if (cum + c >= half) {
      // |d| = 0 covers [0, 0.5), value v ≥ 1 covers [v − 0.5, v + 0.5).
      const lo = v === 0 ? 0 : v - 0.5;
      const w = v === 0 ? 0.5 : 1;
      const mad = lo + (w * (half - cum)) / Math.max(1, c);
      return (1.4826 * mad) / Math.SQRT2;
    }
    cum += c;
  }
  return Number.NaN;
}

const HIST = new Int32Array(256);
