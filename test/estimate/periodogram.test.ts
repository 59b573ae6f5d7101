import { describe, expect, it } from 'vitest';
import { lombScargle } from '../../src/estimate/periodogram.ts';

/**
 * The periodogram against its published definition: the normalised power of eq. 10 (with τ from eq. 11) of
 * "Studies in astronomical time series analysis. II. Statistical aspects of spectral analysis of unevenly spaced
 * data", The Astrophysical Journal 263, 1982 (DOI 10.1086/160554), evaluated here term by term, and, for evenly
 * spaced samples at the Fourier frequencies, the classical periodogram |Σ x e^(−iωt)|² / N that the same paper
 * shows eq. 10 reduces to (both divided by the sample variance, as lombScargle normalises).
 */
function direct(t: number[], y: number[], f: number): number {
  const n = t.length;
  const mean = y.reduce((s, v) => s + v, 0) / n;
  const c = y.map((v) => v - mean);
  const variance = c.reduce((s, v) => s + v * v, 0) / (n - 1);
  const w = 2 * Math.PI * f;
  let s2 = 0;
  let c2 = 0;
  for (const ti of t) {
    s2 += Math.sin(2 * w * ti);
    c2 += Math.cos(2 * w * ti);
  }
  const tau = Math.atan2(s2, c2) / (2 * w);
  let yc = 0, ys = 0, cc = 0, ss = 0;
  for (let i = 0; i < n; i++) {
    const a = w * (t[i] - tau);
    yc += c[i] * Math.cos(a);
    ys += c[i] * Math.sin(a);
    cc += Math.cos(a) ** 2;
    ss += Math.sin(a) ** 2;
  }
  return (yc * yc / cc + ys * ys / ss) / (2 * variance);
}

/** A coin-like series: uneven times (a gap, jitter), a 37.3 Hz line, its harmonic and deterministic noise. */
function series(): { t: number[]; y: number[][] } {
  const t: number[] = [];
  for (let i = 0; i < 900; i++) {
    if (i >= 400 && i < 460) continue; // the coin out of the frame
    t.push(0.05 + i / 2000 + ((i * 37) % 11) * 1e-5);
  }
  const y = [0, 1, 2].map((j) => t.map((ti, i) => Math.cos(2 * Math.PI * 37.3 * ti + j) + 0.4 * Math.cos(2 * Math.PI * 74.6 * ti) + 0.3 * Math.sin(i * 1.7 + j)));
  return { t, y };
}

describe('lombScargle', () => {
  it('matches eq. 10 evaluated term by term on an even frequency grid of 1500 frequencies (stepped sines) and an uneven one', () => {
    const { t, y } = series();
    const even: number[] = [];
    for (let k = 0; k < 1500; k++) even.push(2 + k * 0.2);
    const uneven = even.slice(0, 200).map((f, k) => f + (k % 3) * 1e-3);
    for (const freqs of [even, uneven]) {
      const p = lombScargle(t, y, freqs);
      let worst = 0;
      for (let k = 0; k < freqs.length; k += 7) {
        const ref = y.reduce((s, yi) => s + direct(t, yi, freqs[k]), 0);
        worst = Math.max(worst, Math.abs(p[k] - ref) / Math.max(ref, 1e-3));
      }
      expect(worst).toBeLessThan(1e-9);
    }
  });

  it('puts the highest peak at the line and equals the classical periodogram for even samples at Fourier frequencies', () => {
    const n = 512;
    const dt = 1 / 1000;
    const t = Array.from({ length: n }, (_, i) => i * dt);
    const y = t.map((ti, i) => Math.sin(2 * Math.PI * 50.78125 * ti) + 0.2 * Math.cos(i * 2.3));
    const freqs = Array.from({ length: 200 }, (_, k) => (k + 1) / (n * dt));
    const p = lombScargle(t, [y], freqs);
    let best = 0;
    for (let k = 1; k < p.length; k++) if (p[k] > p[best]) best = k;
    expect(freqs[best]).toBeCloseTo(50.78125, 9);
    const mean = y.reduce((s, v) => s + v, 0) / n;
    const variance = y.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1);
    for (const k of [3, 25, 51, 120, 199]) {
      let re = 0, im = 0;
      for (let i = 0; i < n; i++) {
        re += (y[i] - mean) * Math.cos(2 * Math.PI * freqs[k] * t[i]);
        im -= (y[i] - mean) * Math.sin(2 * Math.PI * freqs[k] * t[i]);
      }
      const classical = (re * re + im * im) / n / variance;
      expect(Math.abs(p[k] - classical) / Math.max(classical, 1e-6)).toBeLessThan(1e-8);
    }
  });
});
