/**
 * Lomb–Scargle periodogram of unevenly sampled series (gaps from lost frames are fine).
 *
 * References:
 * [1] "Studies in astronomical time series analysis. II. Statistical aspects of spectral analysis of unevenly
 *     spaced data", The Astrophysical Journal 263, 1982. DOI 10.1086/160554 (eq. 10, normalised power)
 */

/**
 * Sum over `series` of the normalised Lomb–Scargle power at each frequency of `freqHz`.
 * Each series is centred on its mean; a constant series contributes nothing. Returns a new array.
 */
export function lombScargle(tS: ArrayLike<number>, series: ArrayLike<number>[], freqHz: ArrayLike<number>): Float64Array {
  const n = tS.length;
  const power = new Float64Array(freqHz.length);
  const centred = series.map((y) => {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += y[i];
    mean /= n;
    const c = new Float64Array(n);
    let variance = 0;
    for (let i = 0; i < n; i++) {
      c[i] = y[i] - mean;
      variance += c[i] * c[i];
    }
    return { c, variance: variance / Math.max(n - 1, 1) };
  });
  const cosv = new Float64Array(n);
  const sinv = new Float64Array(n);
  for (let k = 0; k < freqHz.length; k++) {
    const w = 2 * Math.PI * freqHz[k];
    let s2 = 0;
    let c2 = 0;
    for (let i = 0; i < n; i++) {
      s2 += Math.sin(2 * w * tS[i]);
      c2 += Math.cos(2 * w * tS[i]);
    }
    const tau = Math.atan2(s2, c2) / (2 * w); // eq. 11 of [1]
    let cc = 0;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const a = w * (tS[i] - tau);
      cosv[i] = Math.cos(a);
      sinv[i] = Math.sin(a);
      cc += cosv[i] * cosv[i];
      ss += sinv[i] * sinv[i];
    }
    let total = 0;
    for (const { c, variance } of centred) {
      if (!(variance > 0)) continue;
      let yc = 0;
      let ys = 0;
      for (let i = 0; i < n; i++) {
        yc += c[i] * cosv[i];
        ys += c[i] * sinv[i];
      }
      total += ((yc * yc) / Math.max(cc, 1e-300) + (ys * ys) / Math.max(ss, 1e-300)) / (2 * variance); // eq. 10 of [1]
    }
    power[k] = total;
  }
  return power;
}
