/**
 * Flattens a {@link StudySummary} into tidy rows: one row per group (the study, then each tosser), one column
 * per number, units in the column names (`_rev_s`, `_deg`, `_m_s`, `_s`), null for unknown. The rows feed
 * `summary.csv`. Tidy layout as in "Tidy data", Journal of Statistical Software 59(10), 2014,
 * DOI 10.18637/jss.v059.i10.
 */
import { QUANTITY_COLUMNS, type GroupSummary, type StudySummary } from './summarize.ts';

/** One flat summary row: column name → number, string or null. */
export type SummaryRow = Record<string, string | number | boolean | null>;

function groupRow(g: GroupSummary): SummaryRow {
  const row: SummaryRow = {
    group: g.kind === 'study' ? 'study' : 'tosser',
    tosser: g.tosser,
    tosses_total: g.tosses,
    tosses_ok: g.ok,
    tosses_flagged: g.flagged,
    tosses_failed: g.failed,
    same_side_n: g.observedSameSide.n,
    same_side_count: g.observedSameSide.count,
    same_side_rate: g.observedSameSide.rate,
    same_side_wilson_low: g.observedSameSide.wilson?.lower ?? null,
    same_side_wilson_high: g.observedSameSide.wilson?.upper ?? null,
    same_side_exact_low: g.observedSameSide.clopperPearson?.lower ?? null,
    same_side_exact_high: g.observedSameSide.clopperPearson?.upper ?? null,
    same_side_pooled_rate: g.pooledSameSide?.rate ?? null,
    same_side_pooled_low: g.pooledSameSide?.lower ?? null,
    same_side_pooled_high: g.pooledSameSide?.upper ?? null,
    model_same_side_n: g.predictedSameSide.n,
    model_same_side_mean: g.predictedSameSide.mean,
    model_same_side_boot_low: g.predictedSameSide.bootstrap?.lower ?? null,
    model_same_side_boot_high: g.predictedSameSide.bootstrap?.upper ?? null,
    face_call_n: g.faceAgreement.n,
    face_call_agree: g.faceAgreement.count,
    face_call_rate: g.faceAgreement.rate,
    never_turned_n: g.neverTurned.n,
    never_turned_count: g.neverTurned.count,
    never_turned_share: g.neverTurned.rate,
  };
  for (const column of QUANTITY_COLUMNS) {
    const q = g.quantiles[column];
    row[`${column}_n`] = q.n;
    row[`${column}_p05`] = q.p05;
    row[`${column}_p25`] = q.p25;
    row[`${column}_p50`] = q.p50;
    row[`${column}_p75`] = q.p75;
    row[`${column}_p95`] = q.p95;
  }
  return row;
}

/**
 * The summary as flat rows (study first, then tossers in the summary's order), every row with the same columns
 * in the same order. Returns new objects; the summary is not mutated.
 */
export function summaryRows(summary: StudySummary): SummaryRow[] {
  return [groupRow(summary.study), ...summary.tossers.map(groupRow)];
}
