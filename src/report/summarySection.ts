/**
 * The study summary as HTML: headline cards, the same-side table (observed rate with Wilson and exact
 * Clopper–Pearson intervals, the model's predicted rate with its bootstrap interval, face-call agreement),
 * the motion quantiles and the per-tosser table with pooled rates. Every number comes from `summarizeStudy`.
 */
import { QUANTITY_COLUMNS, type GroupSummary, type StudySummary } from '../stats/summarize.ts';
import { measured, percent, percentRange } from './format.ts';
import { html, type SafeHtml } from './html.ts';
import { columnDescription, columnLabel } from './labels.ts';

const tosserName = (g: GroupSummary): string => (g.tosser === null ? 'all' : g.tosser === '' ? '(no tosser)' : g.tosser);
const countOf = (r: { count: number; n: number }): string => (r.n === 0 ? '–' : `${r.count} / ${r.n}`);

/** Headline cards: tosses, their status, and the three same-side numbers. */
export function summaryCards(summary: StudySummary): SafeHtml {
  const s = summary.study;
  const pct = Math.round(summary.confidence * 100);
  const card = (label: string, value: string, sub: string): SafeHtml =>
    html`<div class="card"><div class="label">${label}</div><div class="value">${value}</div><div class="sub">${sub}</div></div>`;
  return html`<div class="cards">
${card('Tosses in the study', String(s.tosses), `${s.ok} ok · ${s.flagged} flagged · ${s.failed} failed`)}
${card('Measured', String(s.ok + s.flagged), s.tosses === 0 ? '' : `${percent((s.ok + s.flagged) / s.tosses)} of all clips`)}
${card('Landed on the start face', percent(s.observedSameSide.rate), `${countOf(s.observedSameSide)} · Wilson ${pct} %: ${percentRange(s.observedSameSide.wilson)}`)}
${card('Model: start face expected', percent(s.predictedSameSide.mean), `mean p_same_side · bootstrap ${pct} %: ${percentRange(s.predictedSameSide.bootstrap)}`)}
${card('Face calls confirmed', percent(s.faceAgreement.rate), `${countOf(s.faceAgreement)} predicted = observed`)}
</div>`;
}

/** The same-side table of the whole study. */
export function sameSideTable(summary: StudySummary): SafeHtml {
  const s = summary.study;
  const pct = Math.round(summary.confidence * 100);
  return html`<table>
<thead><tr><th>quantity</th><th>count</th><th>rate</th><th>Wilson score ${pct} %</th><th>exact (Clopper–Pearson) ${pct} %</th><th>bootstrap ${pct} %</th></tr></thead>
<tbody>
<tr><td>landed on the start face (recorded faces)</td><td>${countOf(s.observedSameSide)}</td><td>${percent(s.observedSameSide.rate)}</td><td>${percentRange(s.observedSameSide.wilson)}</td><td>${percentRange(s.observedSameSide.clopperPearson)}</td><td>–</td></tr>
<tr><td>model: mean same-side probability (p_same_side)</td><td>${s.predictedSameSide.n === 0 ? '–' : `n = ${s.predictedSameSide.n}`}</td><td>${percent(s.predictedSameSide.mean)}</td><td>–</td><td>–</td><td>${percentRange(s.predictedSameSide.bootstrap)}</td></tr>
<tr><td>predicted face = recorded face</td><td>${countOf(s.faceAgreement)}</td><td>${percent(s.faceAgreement.rate)}</td><td>${percentRange(s.faceAgreement.wilson)}</td><td>${percentRange(s.faceAgreement.clopperPearson)}</td><td>–</td></tr>
<tr><td>never turned over (face_changes = 0)</td><td>${countOf(s.neverTurned)}</td><td>${percent(s.neverTurned.rate)}</td><td>${percentRange(s.neverTurned.wilson)}</td><td>${percentRange(s.neverTurned.clopperPearson)}</td><td>–</td></tr>
</tbody></table>`;
}

/** Quantiles (5, 25, 50, 75, 95 %) of the motion quantities of the whole study; labels from the field list. */
export function quantileTable(summary: StudySummary): SafeHtml {
  const rows = QUANTITY_COLUMNS.map((c) => {
    const q = summary.study.quantiles[c];
    return html`<tr><td title="${columnDescription(c)}">${columnLabel(c)}</td><td>${q.n}</td><td>${measured(q.p05)}</td><td>${measured(q.p25)}</td><td><strong>${measured(q.p50)}</strong></td><td>${measured(q.p75)}</td><td>${measured(q.p95)}</td></tr>`;
  });
  return html`<table>
<thead><tr><th>column</th><th>tosses</th><th>5 %</th><th>25 %</th><th>median</th><th>75 %</th><th>95 %</th></tr></thead>
<tbody>${rows}</tbody></table>`;
}

/** One row per tosser (then the whole study): counts, observed and pooled same-side rates, the model, face calls. */
export function tosserTable(summary: StudySummary): SafeHtml {
  const pct = Math.round(summary.confidence * 100);
  const row = (g: GroupSummary): SafeHtml => html`<tr>
<td>${g.kind === 'study' ? html`<strong>all tossers</strong>` : tosserName(g)}</td><td>${g.tosses}</td><td>${g.ok}</td><td>${g.flagged}</td><td>${g.failed}</td>
<td>${countOf(g.observedSameSide)}</td><td>${percent(g.observedSameSide.rate)}</td><td>${percentRange(g.observedSameSide.wilson)}</td>
<td>${g.pooledSameSide === null ? '–' : percent(g.pooledSameSide.rate)}</td><td>${percentRange(g.pooledSameSide)}</td>
<td>${percent(g.predictedSameSide.mean)}</td><td>${percentRange(g.predictedSameSide.bootstrap)}</td>
<td>${countOf(g.faceAgreement)}</td><td>${measured(g.quantiles.spin_rev_s.p50)}</td><td>${measured(g.quantiles.precession_deg.p50)}</td></tr>`;
  return html`<table class="compact">
<thead><tr><th>tosser</th><th>tosses</th><th>ok</th><th>flagged</th><th>failed</th><th>start face</th><th>rate</th><th>Wilson ${pct} %</th>
<th>pooled rate</th><th>pooled ${pct} %</th><th>model mean</th><th>bootstrap ${pct} %</th><th>face calls</th>
<th>median<br>${columnLabel('spin_rev_s')}</th><th>median<br>${columnLabel('precession_deg')}</th></tr></thead>
<tbody>${summary.tossers.map(row)}${row(summary.study)}</tbody></table>`;
}

/** One sentence on the pooling fit across tossers. */
export function poolingSentence(summary: StudySummary): string {
  const p = summary.pooling;
  if (p === null) return 'Pooling across tossers: not enough recorded faces to fit.';
  if (p.completePooling) return `Pooling across tossers (${p.method}): the tossers differ no more than chance allows, so every tosser gets the pooled rate ${percent(p.meanRate)}.`;
  return `Pooling across tossers (${p.method}): pooled rate ${percent(p.meanRate)}, spread of true rates between tossers (sd) ${percent(p.betweenTosserSd)}, prior weight ${measured(p.precision, 3)} tosses.`;
}
