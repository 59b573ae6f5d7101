import { describe, expect, it } from 'vitest';
import type { TossRow } from '../../src/dataset/index.ts';
import { precessionHistogramData, precessionHistogramPlot } from '../../src/report/precessionHistogram.ts';
import { markGroup, paths } from './svgParse.ts';

const rows = (angles: (number | null)[], status = 'ok'): TossRow[] =>
  angles.map((precession_deg, i) => ({ toss_id: `t${i}`, status, precession_deg })) as unknown as TossRow[];

describe('precessionHistogramData', () => {
  it('counts every angle in 0..90 once, in 5° bins, 90 in the last bin, failed rows never', () => {
    const d = precessionHistogramData([...rows([0, 4.99, 5, 44.9, 45, 89.9, 90, null, -1, 91]), ...rows([30], 'failed')]);
    expect(d.bins).toHaveLength(18);
    expect(d.n).toBe(7);
    expect(d.bins.reduce((s, b) => s + b.count, 0)).toBe(7);
    expect(d.bins[0].count).toBe(2);
    expect(d.bins[1].count).toBe(1);
    expect(d.bins[8].count).toBe(1); // 44.9
    expect(d.bins[9].count).toBe(1); // 45
    expect(d.bins[17].count).toBe(2); // 89.9 and 90
  });
  it('samples the vertical-start same-side probability 1/2 + arcsin(cot² ψ)/π', () => {
    // closed form of "Dynamical bias in the coin toss", SIAM Review 49(2), 2007, DOI 10.1137/S0036144504446436
    const d = precessionHistogramData([]);
    const at = (deg: number) => d.curve.find((c) => c.psiDeg === deg)!.pSameSide;
    expect(at(90)).toBeCloseTo(0.5, 12);
    expect(at(60)).toBeCloseTo(0.5 + Math.asin(1 / 3) / Math.PI, 12); // cot² 60° = 1/3: 0.60817
    expect(at(60)).toBeCloseTo(0.60817, 5);
    expect(at(30)).toBe(1); // below 45° the coin never turns over
    expect(d.curve).toHaveLength(181);
  });
});

describe('precessionHistogramPlot', () => {
  it('draws 18 bars and the curve on a second y axis', async () => {
    const svg = await precessionHistogramPlot(precessionHistogramData(rows([10, 50, 55, 80])), 'h');
    expect(paths(markGroup(svg, 'precession_bins'))).toHaveLength(18);
    expect(paths(markGroup(svg, 'same_side_curve'))).toHaveLength(1);
    expect(svg.match(/aria-label="Y-axis/g)).toHaveLength(2);
    expect(svg).toContain('same-side probability, vertical start');
    expect(svg).toContain('precession_deg (deg)');
  });
});
