/**
 * HTML by construction: every interpolated value is escaped unless it is already {@link SafeHtml}, so text
 * from a dataset (tosser names, notes, error messages) can never become markup.
 * Escaping follows the HTML Living Standard's serialisation rules for text and attribute values
 * (WHATWG, "HTML Living Standard", §13.3 Serialising HTML fragments): `&`, `<`, `>`, `"` and `'` are replaced
 * by character references, which is safe both in text and in quoted attribute values.
 */

/** A piece of markup that is already safe to insert (built by {@link html} or {@link trustedHtml}). */
export class SafeHtml {
  /** @param value - the markup text */
  constructor(readonly value: string) {}
  /** The markup text. */
  toString(): string {
    return this.value;
  }
}

/** What {@link html} accepts between `${…}`: arrays are joined, null/undefined/false are left out. */
export type HtmlValue = SafeHtml | string | number | boolean | null | undefined | readonly HtmlValue[];

const ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Escapes text for HTML text content and quoted attribute values: `& < > " '` become character references.
 * Returns a new string; everything else (including non-ASCII) is kept as is.
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ENTITIES[c]);
}

function render(value: HtmlValue): string {
  if (value === null || value === undefined || value === false) return '';
  if (value instanceof SafeHtml) return value.value;
  if (Array.isArray(value)) return value.map(render).join('');
  return escapeHtml(String(value));
}

/**
 * Tagged template that builds {@link SafeHtml}: the literal parts are kept, every `${value}` is escaped
 * (unless it is SafeHtml), arrays are joined, `null`/`undefined`/`false` give nothing.
 *
 * @example html`<td>${row.tosser}</td>` // a tosser named <b> shows as text
 */
export function html(strings: TemplateStringsArray, ...values: HtmlValue[]): SafeHtml {
  let out = strings[0];
  for (let i = 0; i < values.length; i++) out += render(values[i]) + strings[i + 1];
  return new SafeHtml(out);
}

/**
 * Marks markup produced by trusted code (our own SVG from vega, our own CSS) as safe, without escaping.
 * Never pass text that came from a dataset.
 */
export function trustedHtml(markup: string): SafeHtml {
  return new SafeHtml(markup);
}

/** Options of {@link htmlPage}. */
export interface PageOptions {
  /** Page title (text, escaped). */
  readonly title: string;
  /** Style sheet, inlined in a `<style>` element (trusted: our own CSS). */
  readonly css: string;
  /** The page body. */
  readonly body: SafeHtml;
}

/**
 * A complete, self-contained HTML document: UTF-8, the style sheet inline, a Content-Security-Policy that
 * forbids every network fetch (`default-src 'none'`; images only from `data:` URIs, styles only inline),
 * no scripts at all.
 */
export function htmlPage(options: PageOptions): string {
  const csp = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";
  return html`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${csp}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="tossmeter">
<title>${options.title}</title>
<style>${trustedHtml(options.css)}</style>
</head>
<body>
${options.body}
</body>
</html>
`.value;
}
