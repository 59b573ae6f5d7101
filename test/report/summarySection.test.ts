import { describe, expect, it } from 'vitest';
import { percent, percentRange } from '../../src/report/format.ts';
import { poolingSentence, quantileTable, sameSideTable, summaryCards, tosserTable } from '../../src/report/summarySection.ts';
import { summarizeStudy } from '../../src/stats/summarize.ts';

const rows = Array.from({ length: 30 }, (_, i) => ({
  toss_id: `t${i}`, tosser: i === 0 ? '<b>T00</b>' : `T0${(i % 2) + 1}`, status: i === 4 ? 'failed' : 'ok',
  start_face: 'heads', observed_face: i % 3 === 0 ? 'tails' : 'heads', predicted_face: 'heads', p_same_side: 0.5 + (i % 5) / 20,
  spin_rev_s: 20 + i, precession_deg: 40 + i, launch_speed_m_s: 2 + i / 100, flight_time_s: 0.4 + i / 1000, face_changes: i % 4,
}));

describe('summary section', () => {
  const s = summarizeStudy(rows, { seed: 3, bootstrap: 200 });
  it('shows the summary numbers as they are, with both intervals', () => {
    const text = sameSideTable(s).value;
    expect(text).toContain(`${s.study.observedSameSide.count} / ${s.study.observedSameSide.n}`);
    expect(text).toContain(percentRange(s.study.observedSameSide.wilson));
    expect(text).toContain(percentRange(s.study.observedSameSide.clopperPearson));
    expect(text).toContain(percentRange(s.study.predictedSameSide.bootstrap));
    expect(summaryCards(s).value).toContain(percent(s.study.observedSameSide.rate));
    expect(quantileTable(s).value).toContain('precession_deg (deg)');
  });
  it('lists every tosser, escaped, then the whole study', () => {
    const text = tosserTable(s).value;
    expect(text).toContain('&lt;b&gt;T00&lt;/b&gt;');
    expect(text).not.toContain('<b>T00');
    expect(text.indexOf('T01')).toBeLessThan(text.indexOf('all tossers'));
    expect(poolingSentence(s)).toMatch(/^Pooling across tossers/);
  });
});
