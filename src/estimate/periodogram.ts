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
/** Frequencies between exact recomputations of the stepped sines and cosines. */
const RESEED = 64;

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
  // cos ωt and sin ωt of every sample at the current frequency. On an even grid of frequencies they are stepped from
  // one frequency to the next by the rotation through Δω·t (angle addition), and recomputed exactly every
  // RESEED frequencies so rounding cannot build up; otherwise computed afresh.
  const cw = new Float64Array(n);
  const sw = new Float64Array(n);
  const cStep = new Float64Array(n);
  const sStep = new Float64Array(n);
  const f0 = freqHz.length > 0 ? freqHz[0] : 0;
  const df = freqHz.length > 1 ? freqHz[1] - freqHz[0] : 0;
  let even = df > 0;
  for (let k = 2; k < freqHz.length && even; k++) even = Math.abs(freqHz[k] - (f0 + k * df)) <= 1e-9 * Math.abs(freqHz[k]);
  if (even) {
    for (let i = 0; i < n; i++) {
      cStep[i] = Math.cos(2 * Math.PI * df * tS[i]);
      sStep[i] = Math.sin(2 * Math.PI * df * tS[i]);
    }
  }
  for (let k = 0; k < freqHz.length; k++) {
    const w = 2 * Math.PI * freqHz[k];
    if (!even || k % RESEED === 0) {
      for (let i = 0; i < n; i++) {
        cw[i] = Math.cos(w * tS[i]);
        sw[i] = Math.sin(w * tS[i]);
      }
    } else {
      for (let i = 0; i < n; i++) {
        const c = cw[i];
        const s = sw[i];
        cw[i] = c * cStep[i] - s * sStep[i];
        sw[i] = s * cStep[i] + c * sStep[i];
      }
    }
    // Σ sin 2ωt and Σ cos 2ωt by the double angle.
    let s2 = 0;
    let c2 = 0;
    for (let i = 0; i < n; i++) {
      s2 += 2 * sw[i] * cw[i];
      c2 += cw[i] * cw[i] - sw[i] * sw[i];
    }
    const tau = Math.atan2(s2, c2) / (2 * w); // eq. 11 of [1]
    // cos ω(t − τ) and sin ω(t − τ) by angle subtraction.
    const ct = Math.cos(w * tau);
    const st = Math.sin(w * tau);
    let cc = 0;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const c = cw[i] * ct + sw[i] * st;
      const s = sw[i] * ct - cw[i] * st;
      cosv[i] = c;
      sinv[i] = s;
      cc += c * c;
      ss += s * s;
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
