import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TossRow } from '../../src/dataset/index.ts';
import { bandPlaneData, bandPlanePlot } from '../../src/report/bandPlane.ts';
import { MAX_PLOT_POINTS, SIDE_COLOURS } from '../../src/report/plots.ts';
import { G, makeStudy, statusOf, type StudyFixture } from './fixtures.ts';
import { attr, markGroup, markGroups, paths, vertices } from './svgParse.ts';

// The band boundaries of a coin flipped about a horizontal diameter: u·ω = (2k+1)πg/4 with ω in rad/s, i.e.
// spin_rev_s = (2k+1)·g/(8u) ("The probability of heads", American Mathematical Monthly 93(3), 1986,
// DOI 10.2307/2323340). The test inverts vega's linear scales by hand: plot px = (value − lo)/(hi − lo)·size.
const WIDTH = 720;
const HEIGHT = 440;

let study: StudyFixture;
beforeAll(async () => {
  study = await makeStudy({ tosses: 30 });
});
afterAll(() => study.cleanup());

describe('bandPlaneData', () => {
  it('keeps every measured toss (ok and flagged), never a failed one', () => {
    const data = bandPlaneData(study.tosses, { gravityMS2: G });
    const measured = study.tosses.filter((_, i) => statusOf(i) !== 'failed').length;
    expect(measured).toBe(27); // 30 tosses, failed at i = 5, 16, 27
    expect(data.points).toHaveLength(measured);
  });
  it('feeds boundary vertices on u·ω = (2k+1)πg/4, each curve spanning the plot from its top edge to the right edge', () => {
    const data = bandPlaneData(study.tosses, { gravityMS2: G });
    const [, xMax] = data.xDomain;
    const [, yMax] = data.yDomain;
    for (const v of data.boundaries) {
      const omegaRadS = 2 * Math.PI * v.spinRevS;
      expect((v.launchSpeedMS * omegaRadS) / ((2 * v.k + 1) * Math.PI * G / 4)).toBeCloseTo(1, 12);
    }
    const ks = [...new Set(data.boundaries.map((v) => v.k))];
    let visible = 0; // boundaries that cross the plot: ω/(2π) at u = xMax below the top
    while (((2 * visible + 1) * G) / (8 * xMax) < yMax) visible++;
    expect(ks).toEqual(Array.from({ length: visible }, (_, k) => k));
    const k0 = data.boundaries.filter((v) => v.k === 0);
    expect(k0[0].spinRevS).toBeCloseTo(yMax, 9);
    expect(k0[k0.length - 1].launchSpeedMS).toBeCloseTo(xMax, 9);
  });
});

describe('bandPlanePlot', () => {
  it('draws one point mark per measured toss, coloured by the predicted side', async () => {
    const data = bandPlaneData(study.tosses, { gravityMS2: G });
    const { svg, shown, total } = await bandPlanePlot(data, 'p1');
    const points = paths(markGroup(svg, 'toss_points'));
    expect(points).toHaveLength(27);
    expect(shown).toBe(27);
    expect(total).toBe(27);
    const same = study.tosses.filter((t) => t.status !== 'failed' && t.same_side_predicted === true).length;
    expect(points.filter((p) => attr(p, 'fill') === SIDE_COLOURS.same)).toHaveLength(same);
    expect(points.filter((p) => attr(p, 'fill') === SIDE_COLOURS.other)).toHaveLength(27 - same);
    // different shapes too: circles are drawn with arcs, triangles with straight lines only
    for (const p of points) expect(/A/.test(attr(p, 'd')!)).toBe(attr(p, 'fill') === SIDE_COLOURS.same);
  });

  it('puts the boundary curves where spin_rev_s = (2k+1)·g/(8u) says, in plot pixels', async () => {
    const data = bandPlaneData(study.tosses, { gravityMS2: G });
    const { svg } = await bandPlanePlot(data, 'p2');
    const [x0, x1] = data.xDomain;
    const [y0, y1] = data.yDomain;
    const curves = markGroups(svg, 'band_boundaries').flatMap(paths);
    const ks = new Set(data.boundaries.map((v) => v.k));
    expect(curves).toHaveLength(ks.size);
    const odd: number[] = [];
    for (const curve of curves) {
      const vs = vertices(attr(curve, 'd')!);
      expect(vs.length).toBeGreaterThan(10);
      const products = vs.map(([px, py]) => {
        const u = x0 + (px / WIDTH) * (x1 - x0);
        const spin = y1 - (py / HEIGHT) * (y1 - y0);
        return (8 * u * spin) / G; // = 2k+1 on boundary k
      });
      const k2 = Math.round(products[0]);
      // vega rounds coordinates to 1e-3 px; relative error of u·spin stays below 2e-3 wherever u is above ~1 px
      for (const p of products) expect(Math.abs(p / k2 - 1)).toBeLessThan(2e-3);
      odd.push(k2);
    }
    expect(odd.sort((a, b) => a - b)).toEqual([...ks].map((k) => 2 * k + 1));
  });

  it('thins more than MAX_PLOT_POINTS tosses evenly and says how many it shows', async () => {
    const rows = Array.from({ length: 6200 }, (_, i) => ({
      toss_id: `t${i}`, tosser: 'T01', status: 'ok', launch_speed_m_s: 1.5 + (i % 97) / 60, spin_rev_s: 10 + (i % 89) / 3,
      same_side_predicted: i % 2 === 0,
    })) as unknown as TossRow[];
    const { svg, shown, total } = await bandPlanePlot(bandPlaneData(rows), 'p3');
    expect(total).toBe(6200);
    expect(shown).toBe(MAX_PLOT_POINTS);
    expect(paths(markGroup(svg, 'toss_points'))).toHaveLength(MAX_PLOT_POINTS);
  });
});
