import { describe, expect, it } from 'vitest';
import { summarizeStudy } from '../../src/stats/summarize.ts';
import { tosserRateRows, tosserRatesPlot } from '../../src/report/tosserRates.ts';
import { markGroups, paths } from './svgParse.ts';

const rows = Array.from({ length: 40 }, (_, i) => ({
  toss_id: `t${i}`, tosser: `T0${(i % 3) + 1}`, status: 'ok', start_face: 'heads', observed_face: i % 4 === 0 ? 'tails' : 'heads',
}));

describe('tosserRateRows', () => {
  it('takes the observed Wilson interval and the pooled interval from the summary, unchanged', () => {
    const s = summarizeStudy(rows, { seed: 1, bootstrap: 50 });
    const r = tosserRateRows(s);
    expect(r).toHaveLength(2 * s.tossers.length);
    for (const g of s.tossers) {
      const obs = r.find((x) => x.tosser === g.tosser && x.estimate.startsWith('observed'))!;
      expect(obs).toMatchObject({ rate: g.observedSameSide.rate, lower: g.observedSameSide.wilson!.lower, upper: g.observedSameSide.wilson!.upper });
      const pooled = r.find((x) => x.tosser === g.tosser && x.estimate.startsWith('pooled'))!;
      expect(pooled).toMatchObject(g.pooledSameSide!);
    }
  });
  it('draws one dot per row and gives null when no tosser has recorded faces', async () => {
    const s = summarizeStudy(rows, { seed: 1, bootstrap: 50 });
    const svg = (await tosserRatesPlot(s, 'r'))!;
    expect(markGroups(svg, 'rate_dots').flatMap(paths)).toHaveLength(6); // 3 tossers × (observed, pooled)
    expect(svg).toContain('T03');
    const empty = summarizeStudy(rows.map((x) => ({ ...x, observed_face: null })), { seed: 1, bootstrap: 50 });
    expect(await tosserRatesPlot(empty, 'e')).toBeNull();
  });
});
