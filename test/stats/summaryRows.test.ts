import { describe, expect, it } from 'vitest';
import { summarizeStudy } from '../../src/stats/summarize.ts';
import { summaryRows } from '../../src/stats/summaryRows.ts';

describe('summaryRows', () => {
  const rows = [
    { tosser: 'T01', status: 'ok', start_face: 'heads', observed_face: 'heads', spin_rev_s: 30, p_same_side: 0.51 },
    { tosser: 'T01', status: 'ok', start_face: 'tails', observed_face: 'heads', spin_rev_s: 40, p_same_side: 0.52 },
    { tosser: 'T02', status: 'failed', start_face: 'tails', observed_face: 'tails' },
  ];
  const summary = summarizeStudy(rows, { seed: 1, bootstrap: 200 });
  const flat = summaryRows(summary);

  it('gives one row per group, study first, all with the same columns in the same order', () => {
    expect(flat.map((r) => [r.group, r.tosser])).toEqual([['study', null], ['tosser', 'T01'], ['tosser', 'T02']]);
    const columns = Object.keys(flat[0]);
    for (const r of flat) expect(Object.keys(r)).toEqual(columns);
  });

  it('carries the numbers of the summary, with units in the quantity column names', () => {
    expect(flat[0].tosses_total).toBe(3);
    expect(flat[0].same_side_count).toBe(2);
    expect(flat[0].same_side_wilson_low).toBe(summary.study.observedSameSide.wilson!.lower);
    expect(flat[1].spin_rev_s_p50).toBe(35);
    expect(flat[2].model_same_side_mean).toBeNull();
    expect(Object.keys(flat[0])).toContain('launch_speed_m_s_p95');
  });
});
