/**
 * Per-tosser same-side rates as a dot-and-interval chart: the observed rate with its Wilson score interval and
 * the partially pooled rate with its interval, both taken from the study summary (nothing is recomputed here),
 * with the pooled mean and 50 % as reference lines.
 */
import type { StudySummary } from '../stats/summarize.ts';
import { SIDE_COLOURS, renderPlot, type VegaLiteSpec } from './plots.ts';

/** One row per tosser and estimate. */
export interface TosserRateRow {
  readonly tosser: string;
  readonly estimate: string;
  readonly rate: number;
  readonly lower: number;
  readonly upper: number;
}

/** The rows of the chart: the observed (Wilson) and pooled rate of each tosser that has same-side data. */
export function tosserRateRows(summary: StudySummary): TosserRateRow[] {
  const pct = Math.round(summary.confidence * 100);
  const rows: TosserRateRow[] = [];
  for (const g of summary.tossers) {
    const name = g.tosser === '' || g.tosser === null ? '(no tosser)' : g.tosser;
    const o = g.observedSameSide;
    if (o.rate !== null && o.wilson !== null) rows.push({ tosser: name, estimate: `observed, Wilson ${pct} %`, rate: o.rate, lower: o.wilson.lower, upper: o.wilson.upper });
    const p = g.pooledSameSide;
    if (p !== null) rows.push({ tosser: name, estimate: `pooled across tossers, ${pct} %`, rate: p.rate, lower: p.lower, upper: p.upper });
  }
  return rows;
}

/** The chart's Vega-Lite spec (one row band per tosser, the two estimates offset within it). */
export function tosserRatesSpec(summary: StudySummary, width = 720): VegaLiteSpec {
  const rows = tosserRateRows(summary);
  const tossers = [...new Set(rows.map((r) => r.tosser))];
  const estimates = [...new Set(rows.map((r) => r.estimate))];
  const y = { field: 'tosser', type: 'nominal', title: null, sort: tossers };
  const yOffset = { field: 'estimate', type: 'nominal', scale: { domain: estimates, paddingOuter: 0.4 } };
  const colour = { field: 'estimate', type: 'nominal', title: null, scale: { domain: estimates, range: ['#1f2430', SIDE_COLOURS.same] } };
  const x = { type: 'quantitative', scale: { domain: [0, 1], nice: false }, axis: { format: '.0%' }, title: 'same-side rate' };
  const refs = [{ at: 0.5, what: 'even' }, ...(summary.pooling ? [{ at: summary.pooling.meanRate, what: 'pooled mean' }] : [])];
  return {
    width,
    height: { step: 26 },
    layer: [
      { data: { values: refs }, mark: { type: 'rule', strokeDash: [4, 3], color: '#9aa3af' }, encoding: { x: { ...x, field: 'at' } } },
      { data: { values: rows }, mark: { type: 'rule', strokeWidth: 2 }, encoding: { y, yOffset, x: { ...x, field: 'lower' }, x2: { field: 'upper' }, color: colour } },
      { name: 'rate_dots', data: { values: rows }, mark: { type: 'point', filled: true, size: 50, opacity: 1 }, encoding: { y, yOffset, x: { ...x, field: 'rate' }, color: colour } },
    ],
  };
}

/** The chart as inline SVG, or null when no tosser has same-side data. */
export async function tosserRatesPlot(summary: StudySummary, idPrefix = 'tossers'): Promise<string | null> {
  if (tosserRateRows(summary).length === 0) return null;
  return renderPlot(tosserRatesSpec(summary), idPrefix);
}
