/**
 * One toss's quality-control card: identity and status, its flags with their meaning, the error of a failed
 * clip, the key measured values (labels from the field list), the per-toss plots and the frame strip.
 */
import { FLAG_CODES, type TossFieldName, type TossRow } from '../dataset/index.ts';
import { measured } from './format.ts';
import type { StripImage } from './frameStrip.ts';
import { html, trustedHtml, type SafeHtml } from './html.ts';
import { columnDescription, columnLabel } from './labels.ts';

const FLAG_MEANING = new Map<string, string>(FLAG_CODES.map((f) => [f.code, f.meaning]));

/** The toss columns shown as key values on each card. */
export const DETAIL_COLUMNS = [
  'launch_speed_m_s', 'spin_rev_s', 'precession_deg', 'momentum_tilt_deg', 'flight_time_s', 'apex_height_m',
  'face_changes', 'p_same_side', 'capture_fps', 'gravity_fps', 'px_per_m', 'fit_rms',
] as const satisfies readonly TossFieldName[];

/** What the card shows below the values. */
export interface TossDetailContent {
  /** Inline SVG of the per-toss plots (trusted: rendered by vega from our spec), or null when there are no frames. */
  readonly plotsSvg: readonly string[] | null;
  /** The frame strip, or a sentence saying why there is none. */
  readonly strip: readonly StripImage[] | { readonly note: string };
}

const text = (v: unknown): string => (v === null || v === undefined ? '–' : String(v));

/** The card of one toss; `anchor` is its element id (letters, digits, `-`). */
export function tossDetail(toss: TossRow, anchor: string, content: TossDetailContent): SafeHtml {
  const status = typeof toss.status === 'string' ? toss.status : 'unknown';
  const flags = typeof toss.flags === 'string' && toss.flags !== '' ? toss.flags.split(';').filter((f) => f !== '') : [];
  const who = [toss.tosser === null ? null : `tosser ${toss.tosser}`, `clip ${text(toss.file)}`].filter((s) => s !== null).join(' · ');
  const faces = html`${text(toss.start_face)} → predicted ${text(toss.predicted_face)}${toss.observed_face === null ? '' : html`, recorded ${text(toss.observed_face)}`}`;
  const values = DETAIL_COLUMNS.map(
    (c) => html`<div title="${columnDescription(c)}"><dt>${columnLabel(c)}</dt><dd>${measured(toss[c], 4)}</dd></div>`,
  );
  const strip = 'note' in content.strip
    ? html`<p class="note">${content.strip.note}</p>`
    : html`<div class="strip">${content.strip.map(
        (img) => html`<figure><img src="${img.dataUri}" width="${img.displayPx}" height="${img.displayPx}" alt="${`frame ${img.frame} with the fitted ellipse`}"><figcaption>frame ${img.frame}${img.tS === null ? '' : ` · ${img.tS.toFixed(4)} s`}${img.inFlight ? '' : ' · not in flight'}</figcaption></figure>`,
      )}</div>`;
  return html`<section class="toss ${status}" id="${anchor}">
<div class="toss-head"><h3>${text(toss.toss_id)}</h3><span class="badge ${status}">${status}</span><span class="who">${who}</span></div>
${flags.length === 0 ? '' : html`<ul class="flags">${flags.map((f) => html`<li><code>${f}</code> ${FLAG_MEANING.get(f) ?? ''}</li>`)}</ul>`}
${status === 'failed' ? html`<p class="error">${text(toss.error)}</p>` : ''}
${status === 'failed' ? '' : html`<dl class="values"><div class="faces"><dt>start face → landing</dt><dd>${faces}</dd></div>${values}</dl>`}
${content.plotsSvg === null ? '' : html`<div class="plots">${content.plotsSvg.map((svg) => html`<figure>${trustedHtml(svg)}</figure>`)}</div>`}
${status === 'failed' && 'note' in content.strip ? '' : strip}
</section>`;
}
