/**
 * The study summary: counts, same-side rates with intervals, the model's predicted rate, face-call agreement,
 * motion quantiles and pooled per-tosser rates, for the whole study and for each tosser. Pure: rows in, a plain
 * record out, deterministic for a seed.
 *
 * Which rows feed which number:
 * - counts: every row (status ok | flagged | failed; other statuses only count towards `tosses`);
 * - observed same-side: every row whose start_face and observed_face are both heads/tails (whatever the status:
 *   those faces are recorded by people, not measured from video);
 * - measured quantities (p_same_side, predicted_face, spin, precession, launch speed, flight time, face changes):
 *   rows with status ok, plus flagged rows unless `includeFlagged` is false; failed rows never.
 *
 * Methods and their sources are in the modules used: `wilson.ts`, `clopperPearson.ts`, `bootstrap.ts`,
 * `quantiles.ts`, `betaBinomial.ts`.
 */
import { bootstrapMeanInterval } from './bootstrap.ts';
import { poolRates } from './betaBinomial.ts';
import { clopperPearsonInterval } from './clopperPearson.ts';
import { quantiles } from './quantiles.ts';
import { wilsonInterval, type ProportionInterval } from './wilson.ts';

/** One dataset row as the summary reads it: column name → value, null for empty. Extra columns are ignored. */
export type SummaryInputRow = Readonly<Record<string, unknown>>;

/** The motion quantities summarised by quantiles (dataset column names, units in the names). */
export const QUANTITY_COLUMNS = ['spin_rev_s', 'precession_deg', 'launch_speed_m_s', 'flight_time_s'] as const;
/** One of {@link QUANTITY_COLUMNS}. */
export type QuantityColumn = (typeof QUANTITY_COLUMNS)[number];
/** The probabilities of the reported quantiles. */
export const QUANTILE_PROBS = [0.05, 0.25, 0.5, 0.75, 0.95] as const;

/** A count out of a total with its rate and intervals (rate and intervals null when the total is 0). */
export interface RateSummary {
  readonly count: number;
  readonly n: number;
  readonly rate: number | null;
  readonly wilson: ProportionInterval | null;
  readonly clopperPearson: ProportionInterval | null;
}

/** Quantiles of one quantity (null when no value). */
export interface QuantileSummary {
  readonly n: number;
  readonly p05: number | null;
  readonly p25: number | null;
  readonly p50: number | null;
  readonly p75: number | null;
  readonly p95: number | null;
}

/** The summary of one group: the whole study or one tosser. */
export interface GroupSummary {
  /** 'study' for all rows, 'tosser' for one tosser. */
  readonly kind: 'study' | 'tosser';
  /** The tosser id ('' for rows without one); null for the study. */
  readonly tosser: string | null;
  readonly tosses: number;
  readonly ok: number;
  readonly flagged: number;
  readonly failed: number;
  /** Landed on the face it started on, among rows with both faces. */
  readonly observedSameSide: RateSummary;
  /** Mean p_same_side (the model's predicted same-side rate) with a seeded percentile-bootstrap interval. */
  readonly predictedSameSide: {
    readonly n: number;
    readonly mean: number | null;
    readonly bootstrap: ProportionInterval | null;
  };
  /** predicted_face equal to observed_face, among rows with both. */
  readonly faceAgreement: RateSummary;
  /** Tosses that never turned over (face_changes = 0), among rows with face_changes. */
  readonly neverTurned: RateSummary;
  /** Quantiles of the motion quantities. */
  readonly quantiles: Readonly<Record<QuantityColumn, QuantileSummary>>;
  /** Partially pooled same-side rate (tossers only; null for the study or when pooling failed). */
  readonly pooledSameSide: { readonly rate: number; readonly lower: number; readonly upper: number } | null;
}

/** The pooling fit across tossers. */
export interface PoolingSummary {
  readonly method: 'beta-binomial marginal maximum likelihood';
  /** Prior mean μ: the pooled same-side rate. */
  readonly meanRate: number;
  /** Prior precision α + β (null under complete pooling, i.e. infinite). */
  readonly precision: number | null;
  /** Between-tosser sd of true same-side rates implied by the fit. */
  readonly betweenTosserSd: number;
  readonly completePooling: boolean;
}

/** The result of {@link summarizeStudy}. */
export interface StudySummary {
  readonly confidence: number;
  readonly seed: number;
  readonly bootstrapResamples: number;
  readonly includeFlagged: boolean;
  readonly study: GroupSummary;
  /** One per tosser, sorted by tosser id (numeric-aware). */
  readonly tossers: GroupSummary[];
  /** Null when fewer than one tosser has same-side data. */
  readonly pooling: PoolingSummary | null;
}

/** Options of {@link summarizeStudy}. */
export interface SummarizeOptions {
  /** Seed of the bootstrap (reduced to 32 bits); tosser streams are derived from it and the tosser id. */
  readonly seed: number;
  /** Bootstrap resamples; default 2000. */
  readonly bootstrap?: number;
  /** Interval coverage, in (0, 1); default 0.95. */
  readonly confidence?: number;
  /** Whether flagged rows feed the measured quantities; default true. */
  readonly includeFlagged?: boolean;
}

type Face = 'heads' | 'tails';

function face(value: unknown): Face | null {
  if (typeof value !== 'string') return null;
  const v = value.trim().toLowerCase();
  return v === 'heads' || v === 'tails' ? v : null;
}

function finite(value: unknown): number | null {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (typeof value === 'string' && value.trim() !== '') {
    const v = Number(value);
    return Number.isFinite(v) ? v : null;
  }
  return null;
}

function rateSummary(count: number, n: number, confidence: number): RateSummary {
  return {
    count,
    n,
    rate: n > 0 ? count / n : null,
    wilson: wilsonInterval(count, n, confidence),
    clopperPearson: clopperPearsonInterval(count, n, confidence),
  };
}

/** FNV-1a over the tosser id mixed with the seed: an independent, order-free stream per tosser. */
function groupSeed(seed: number, key: string): number {
  let h = (0x811c9dc5 ^ (seed >>> 0)) >>> 0;
  for (let i = 0; i < key.length; i++) {
    h ^= key.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

function summarizeGroup(
  rows: readonly SummaryInputRow[],
  kind: 'study' | 'tosser',
  tosser: string | null,
  seed: number,
  resamples: number,
  confidence: number,
  includeFlagged: boolean,
): Omit<GroupSummary, 'pooledSameSide'> {
  let ok = 0;
  let flagged = 0;
  let failed = 0;
  let sameCount = 0;
  let sameN = 0;
  let agreeCount = 0;
  let agreeN = 0;
  let neverCount = 0;
  let neverN = 0;
  const predicted: number[] = [];
  const values: Record<QuantityColumn, number[]> = {
    spin_rev_s: [],
    precession_deg: [],
    launch_speed_m_s: [],
    flight_time_s: [],
  };
  for (const row of rows) {
    const status = row.status;
    if (status === 'ok') ok++;
    else if (status === 'flagged') flagged++;
    else if (status === 'failed') failed++;
    const start = face(row.start_face);
    const observed = face(row.observed_face);
    if (start !== null && observed !== null) {
      sameN++;
      if (start === observed) sameCount++;
    }
    const measured = status === 'ok' || (includeFlagged && status === 'flagged');
    if (!measured) continue;
    const p = finite(row.p_same_side);
    if (p !== null && p >= 0 && p <= 1) predicted.push(p);
    const call = face(row.predicted_face);
    if (call !== null && observed !== null) {
      agreeN++;
      if (call === observed) agreeCount++;
    }
    const changes = finite(row.face_changes);
    if (changes !== null) {
      neverN++;
      if (changes === 0) neverCount++;
    }
    for (const column of QUANTITY_COLUMNS) {
      const v = finite(row[column]);
      if (v !== null) values[column].push(v);
    }
  }
  // sorted first, so the bootstrap (and the mean's rounding) do not depend on row order
  predicted.sort((a, b) => a - b);
  const boot = bootstrapMeanInterval(predicted, { seed, resamples, confidence });
  const quantileRecord = {} as Record<QuantityColumn, QuantileSummary>;
  for (const column of QUANTITY_COLUMNS) {
    const q = quantiles(values[column], QUANTILE_PROBS);
    quantileRecord[column] = {
      n: values[column].length,
      p05: q ? q[0] : null,
      p25: q ? q[1] : null,
      p50: q ? q[2] : null,
      p75: q ? q[3] : null,
      p95: q ? q[4] : null,
    };
  }
  return {
    kind,
    tosser,
    tosses: rows.length,
    ok,
    flagged,
    failed,
    observedSameSide: rateSummary(sameCount, sameN, confidence),
    predictedSameSide: {
      n: predicted.length,
      mean: boot ? boot.mean : null,
      bootstrap: boot ? { lower: boot.lower, upper: boot.upper } : null,
    },
    faceAgreement: rateSummary(agreeCount, agreeN, confidence),
    neverTurned: rateSummary(neverCount, neverN, confidence),
    quantiles: quantileRecord,
  };
}

/**
 * Summarises a study's toss rows (the dataset's tosses table). Does not mutate the rows.
 * @param rows - one record per toss, keyed by dataset column names, null for empty cells
 * @param options - seed (required), bootstrap resamples (default 2000), confidence (default 0.95),
 *   includeFlagged (default true)
 * @throws RangeError for invalid options (the CLI validates them first)
 */
export function summarizeStudy(rows: readonly SummaryInputRow[], options: SummarizeOptions): StudySummary {
  const resamples = options.bootstrap ?? 2000;
  const confidence = options.confidence ?? 0.95;
  const includeFlagged = options.includeFlagged ?? true;
  const seed = options.seed >>> 0;
  if (!Number.isInteger(resamples) || resamples < 1) throw new RangeError('bootstrap must be a positive integer');
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must be in (0, 1)');

  const byTosser = new Map<string, SummaryInputRow[]>();
  for (const row of rows) {
    const id = row.tosser === null || row.tosser === undefined ? '' : String(row.tosser).trim();
    let list = byTosser.get(id);
    if (!list) byTosser.set(id, (list = []));
    list.push(row);
  }
  const ids = [...byTosser.keys()].sort((a, b) =>
    a.localeCompare(b, 'en', { numeric: true }) || (a < b ? -1 : a > b ? 1 : 0),
  );
  const groups = ids.map((id) =>
    summarizeGroup(byTosser.get(id)!, 'tosser', id, groupSeed(seed, id), resamples, confidence, includeFlagged),
  );
  const fit = poolRates(
    groups.map((g) => ({ successes: g.observedSameSide.count, trials: g.observedSameSide.n })),
    { confidence },
  );
  const tossers: GroupSummary[] = groups.map((g, i) => ({
    ...g,
    pooledSameSide:
      fit.ok && g.observedSameSide.n > 0
        ? { rate: fit.rates[i].rate, lower: fit.rates[i].lower, upper: fit.rates[i].upper }
        : null,
  }));
  const study: GroupSummary = {
    ...summarizeGroup(rows, 'study', null, seed, resamples, confidence, includeFlagged),
    pooledSameSide: null,
  };
  const pooling: PoolingSummary | null = fit.ok
    ? {
        method: 'beta-binomial marginal maximum likelihood',
        meanRate: fit.meanRate,
        precision: fit.completePooling ? null : fit.precision,
        betweenTosserSd: fit.betweenSd,
        completePooling: fit.completePooling,
      }
    : null;
  return { confidence, seed, bootstrapResamples: resamples, includeFlagged, study, tossers, pooling };
}
