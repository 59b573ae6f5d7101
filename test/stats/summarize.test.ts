import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { clopperPearsonInterval } from '../../src/stats/clopperPearson.ts';
import { createRng } from '../../src/stats/rng.ts';
import { summarizeStudy, type SummaryInputRow } from '../../src/stats/summarize.ts';
import { wilsonInterval } from '../../src/stats/wilson.ts';

// reference library (dev only): jstat 1.9.6 (definition-7 quantiles with alphap = betap = 1)
const { jStat } = createRequire(import.meta.url)('jstat') as {
  jStat: { quantiles(arr: number[], ps: number[], alphap: number, betap: number): number[] };
};

/** An invented academy study: trainees T01..T03 tossing, some flagged or failed clips. */
function studyRows(): SummaryInputRow[] {
  const rng = createRng(77);
  const rows: SummaryInputRow[] = [];
  const rates = { T01: 0.5, T02: 0.6, T03: 0.55 } as const;
  for (let i = 0; i < 90; i++) {
    const tosser = (['T01', 'T02', 'T03'] as const)[i % 3];
    const status = i % 10 === 9 ? 'failed' : i % 10 === 4 ? 'flagged' : 'ok';
    const start = rng.next() < 0.5 ? 'heads' : 'tails';
    const same = rng.next() < rates[tosser];
    const observed = same ? start : start === 'heads' ? 'tails' : 'heads';
    const measured = status !== 'failed';
    rows.push({
      toss_id: `toss-${i}`,
      tosser,
      status,
      start_face: start,
      observed_face: i === 0 ? null : observed,
      predicted_face: measured ? (rng.next() < 0.8 ? observed : start) : null,
      p_same_side: measured ? 0.5 + 0.04 * rng.next() : null,
      spin_rev_s: measured ? 30 + 15 * rng.next() : null,
      precession_deg: measured ? 60 * rng.next() : null,
      launch_speed_m_s: measured ? 2 + rng.next() : null,
      flight_time_s: measured ? 0.4 + 0.2 * rng.next() : null,
      face_changes: measured ? (i % 7 === 0 ? 0 : 4) : null,
    });
  }
  return rows;
}

describe('summarizeStudy', () => {
  const rows = studyRows();
  const summary = summarizeStudy(rows, { seed: 5, bootstrap: 500 });

  it('counts tosses by status for the study and each tosser', () => {
    expect(summary.study.tosses).toBe(90);
    expect(summary.study.failed).toBe(9);
    expect(summary.study.flagged).toBe(9);
    expect(summary.study.ok).toBe(72);
    expect(summary.tossers.map((t) => t.tosser)).toEqual(['T01', 'T02', 'T03']);
    expect(summary.tossers.reduce((s, t) => s + t.tosses, 0)).toBe(90);
  });

  it('counts same-side outcomes from start and observed faces with Wilson and exact intervals', () => {
    const both = rows.filter((r) => r.start_face !== null && r.observed_face !== null);
    const same = both.filter((r) => r.start_face === r.observed_face).length;
    const s = summary.study.observedSameSide;
    expect(s.n).toBe(89); // one row has no observed face; failed rows still count (faces are recorded by people)
    expect(s.count).toBe(same);
    expect(s.rate).toBe(same / 89);
    expect(s.wilson).toEqual(wilsonInterval(same, 89));
    expect(s.clopperPearson).toEqual(clopperPearsonInterval(same, 89));
  });

  it('averages p_same_side over measured rows and bootstraps it reproducibly by seed', () => {
    const ps = rows.filter((r) => r.status !== 'failed').map((r) => r.p_same_side as number);
    const p = summary.study.predictedSameSide;
    expect(p.n).toBe(81);
    expect(p.mean).toBeCloseTo(ps.reduce((s, v) => s + v, 0) / ps.length, 14);
    expect(p.bootstrap!.lower).toBeLessThan(p.mean!);
    expect(p.bootstrap!.upper).toBeGreaterThan(p.mean!);
    expect(summarizeStudy(rows, { seed: 5, bootstrap: 500 })).toEqual(summary);
    expect(summarizeStudy(rows, { seed: 6, bootstrap: 500 }).study.predictedSameSide.bootstrap).not.toEqual(p.bootstrap);
  });

  it('does not depend on row order', () => {
    const shuffled = [...rows].reverse();
    expect(summarizeStudy(shuffled, { seed: 5, bootstrap: 500 })).toEqual(summary);
  });

  it('reports motion quantiles (definition 7, jstat) and the share that never turned over', () => {
    const spins = rows.filter((r) => r.status !== 'failed').map((r) => r.spin_rev_s as number);
    const ref = jStat.quantiles(spins, [0.05, 0.25, 0.5, 0.75, 0.95], 1, 1);
    const q = summary.study.quantiles.spin_rev_s;
    expect(q.n).toBe(81);
    expect([q.p05, q.p25, q.p50, q.p75, q.p95].map((v) => v!)).toEqual(ref.map((v) => expect.closeTo(v, 10)));
    const measured = rows.filter((r) => r.status !== 'failed');
    expect(summary.study.neverTurned.n).toBe(81);
    expect(summary.study.neverTurned.count).toBe(measured.filter((r) => r.face_changes === 0).length);
  });

  it('counts face-call agreement where predicted and observed faces are both present', () => {
    const pairs = rows.filter((r) => r.status !== 'failed' && r.predicted_face !== null && r.observed_face !== null);
    expect(summary.study.faceAgreement.n).toBe(pairs.length);
    expect(summary.study.faceAgreement.count).toBe(pairs.filter((r) => r.predicted_face === r.observed_face).length);
  });

  it('leaves flagged rows out of the measured quantities on request, not out of the outcome counts', () => {
    const strict = summarizeStudy(rows, { seed: 5, bootstrap: 500, includeFlagged: false });
    expect(strict.study.predictedSameSide.n).toBe(72);
    expect(strict.study.observedSameSide).toEqual(summary.study.observedSameSide);
  });

  it('pools per-tosser same-side rates: each between its raw rate and the pooled mean', () => {
    expect(summary.pooling).not.toBeNull();
    for (const t of summary.tossers) {
      const raw = t.observedSameSide.rate!;
      const mu = summary.pooling!.meanRate;
      expect(t.pooledSameSide!.rate).toBeGreaterThanOrEqual(Math.min(raw, mu) - 1e-12);
      expect(t.pooledSameSide!.rate).toBeLessThanOrEqual(Math.max(raw, mu) + 1e-12);
    }
    expect(summary.study.pooledSameSide).toBeNull();
  });

  it('handles an empty study and rows without a tosser', () => {
    const empty = summarizeStudy([], { seed: 1 });
    expect(empty.study.tosses).toBe(0);
    expect(empty.study.observedSameSide.rate).toBeNull();
    expect(empty.study.quantiles.flight_time_s.p50).toBeNull();
    expect(empty.pooling).toBeNull();
    const anonymous = summarizeStudy([{ status: 'ok', start_face: 'heads', observed_face: 'heads', tosser: null }], { seed: 1 });
    expect(anonymous.tossers.map((t) => t.tosser)).toEqual(['']);
  });
});
