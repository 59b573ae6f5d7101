/**
 * The histogram of precession angles ψ (angle between the coin's axis and the angular momentum, 0..90°) of the
 * measured tosses, with the same-side probability of a coin whose normal starts vertical on a second axis:
 * 1/2 + arcsin(cot² ψ)/π for ψ ≥ 45°, and 1 below (closed form of [1], via `sameSideVertical`).
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007, DOI 10.1137/S0036144504446436.
 */
import type { TossRow } from '../dataset/index.ts';
import { sameSideVertical } from '../physics/index.ts';
import { columnLabel } from './labels.ts';
import { SIDE_COLOURS, renderPlot, type VegaLiteSpec } from './plots.ts';

/** Bins and curve of the precession plot. */
export interface PrecessionHistogramData {
  /** Bins [lowDeg, highDeg) of width `binDeg` over 0..90 (the last one closed), with their counts. */
  readonly bins: readonly { readonly lowDeg: number; readonly highDeg: number; readonly count: number }[];
  /** The same-side probability for a vertical start at ψ = 0, 0.5, …, 90°. */
  readonly curve: readonly { readonly psiDeg: number; readonly pSameSide: number }[];
  /** Number of angles counted (finite, in 0..90, status ok or flagged). */
  readonly n: number;
}

/**
 * Counts the precession angles of measured tosses (status ok or flagged) in bins of `binDeg` (default 5°)
 * over 0..90°, and samples the vertical-start same-side curve every 0.5°.
 */
export function precessionHistogramData(tosses: readonly TossRow[], binDeg = 5): PrecessionHistogramData {
  if (!(binDeg > 0 && 90 % binDeg === 0)) throw new RangeError(`precessionHistogramData: binDeg must divide 90, got ${binDeg}`);
  const nBins = 90 / binDeg;
  const counts = new Array<number>(nBins).fill(0);
  let n = 0;
  for (const row of tosses) {
    if (row.status !== 'ok' && row.status !== 'flagged') continue;
    const psi = row.precession_deg;
    if (typeof psi !== 'number' || !(psi >= 0 && psi <= 90)) continue;
    counts[Math.min(nBins - 1, Math.floor(psi / binDeg))]++;
    n++;
  }
  const bins = counts.map((count, i) => ({ lowDeg: i * binDeg, highDeg: (i + 1) * binDeg, count }));
  const curve = Array.from({ length: 181 }, (_, i) => {
    const psiDeg = i / 2;
    return { psiDeg, pSameSide: sameSideVertical((psiDeg * Math.PI) / 180) };
  });
  return { bins, curve, n };
}

/** The Vega-Lite spec: bars on the left axis (tosses), the curve on the right axis (probability 0.5..1). */
export function precessionHistogramSpec(data: PrecessionHistogramData, size = { width: 720, height: 300 }): VegaLiteSpec {
  const x = { type: 'quantitative', scale: { domain: [0, 90], nice: false }, axis: { values: [0, 15, 30, 45, 60, 75, 90] } };
  return {
    width: size.width,
    height: size.height,
    layer: [
      {
        name: 'precession_bins',
        data: { values: data.bins },
        mark: { type: 'rect', color: '#7c8aa5', opacity: 0.75, stroke: '#ffffff', strokeWidth: 1 },
        encoding: {
          x: { ...x, field: 'lowDeg', title: columnLabel('precession_deg') },
          x2: { field: 'highDeg' },
          y: { field: 'count', type: 'quantitative', title: 'tosses', axis: { titleColor: '#5b6883', tickMinStep: 1 } },
        },
      },
      {
        name: 'same_side_curve',
        data: { values: data.curve },
        mark: { type: 'line', color: SIDE_COLOURS.same, strokeWidth: 2.2 },
        encoding: {
          x: { ...x, field: 'psiDeg' },
          y: {
            field: 'pSameSide',
            type: 'quantitative',
            scale: { domain: [0.5, 1], nice: false, zero: false },
            title: 'same-side probability, vertical start',
            axis: { orient: 'right', titleColor: SIDE_COLOURS.same, grid: false, format: '.2f' },
          },
        },
      },
    ],
    resolve: { scale: { y: 'independent' } },
  };
}

/** The plot as inline SVG. */
export async function precessionHistogramPlot(data: PrecessionHistogramData, idPrefix = 'precession'): Promise<string> {
  return renderPlot(precessionHistogramSpec(data), idPrefix);
}
