/**
 * Vega-Lite specifications to inline SVG strings, rendered in Node without a canvas
 * (`vega.View(…, { renderer: 'none' }).toSVG()`), plus the shared look of every plot.
 *
 * The SVG is made fit for inlining many plots into one HTML page: the `xmlns` attributes are dropped
 * (HTML parses inline `<svg>` into the SVG namespace itself, and the page then holds no URL at all), and the
 * ids vega writes (`clip1`, gradients, …) are prefixed so that two plots never share an id.
 */
import * as vega from 'vega';
import * as vl from 'vega-lite';

/** A Vega-Lite top-level specification (kept loose: vega-lite's own types are very wide). */
export type VegaLiteSpec = Record<string, unknown>;

/** Colours of the two predicted sides, from the Color Universal Design palette (colour-blind safe; common practice, no source). */
export const SIDE_COLOURS = { same: '#0072B2', other: '#E69F00' } as const;
/** Point shapes of the two predicted sides (shape differs as well as colour). */
export const SIDE_SHAPES = { same: 'circle', other: 'triangle-up' } as const;
/** Labels of the two predicted sides, as shown in legends. */
export const SIDE_LABELS = { same: 'lands on its start face', other: 'lands on the other face' } as const;
/** Most points a plot draws; larger series are thinned evenly (see {@link thinEvenly}). */
export const MAX_PLOT_POINTS = 5000;

/** The look shared by every plot (fonts, axes); our own. */
export const PLOT_CONFIG = {
  font: 'system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif',
  background: 'transparent',
  view: { stroke: '#d9dde3' },
  axis: { labelColor: '#3b4250', titleColor: '#1f2430', titleFontWeight: 600, gridColor: '#eceff3', domainColor: '#9aa3af', tickColor: '#9aa3af', labelFontSize: 11, titleFontSize: 12 },
  legend: { labelColor: '#3b4250', titleColor: '#1f2430', labelFontSize: 11, titleFontSize: 12, labelLimit: 0, orient: 'bottom', direction: 'horizontal' },
  title: { color: '#1f2430', fontSize: 13, fontWeight: 600, anchor: 'start' },
} as const;

/**
 * Keeps at most `max` items, evenly spread over the array (always the first; a fixed stride, so the result is
 * deterministic). Returns the same array when it is short enough, else a new one.
 *
 * @param items - the series
 * @param max - the most items kept; default {@link MAX_PLOT_POINTS}
 */
export function thinEvenly<T>(items: readonly T[], max: number = MAX_PLOT_POINTS): readonly T[] {
  if (items.length <= max) return items;
  const out: T[] = [];
  for (let i = 0; i < max; i++) out.push(items[Math.floor((i * items.length) / max)]);
  return out;
}

/** Throws when any object in the spec has a `url` (data by URL, images): every plot's data is inline. */
function refuseUrls(node: unknown): void {
  if (Array.isArray(node)) for (const item of node) refuseUrls(item);
  else if (typeof node === 'object' && node !== null) {
    for (const [key, value] of Object.entries(node)) {
      if (key === 'url') throw new Error(`renderPlot: data must be inline, refused to load ${String(value)}`);
      refuseUrls(value);
    }
  }
}

/**
 * Renders a Vega-Lite spec to an SVG string for inlining into HTML. `PLOT_CONFIG` is merged under the
 * spec's own `config`. The result has no `xmlns` attributes and its ids start with `idPrefix`.
 *
 * @param spec - a Vega-Lite specification with inline data (`data.values`); a `url` anywhere throws
 * @param idPrefix - prefix for the ids in the SVG (letters, digits, `-`), unique within the page
 * @returns the `<svg>…</svg>` markup (trusted: built by vega from our spec; vega escapes data text)
 */
export async function renderPlot(spec: VegaLiteSpec, idPrefix: string): Promise<string> {
  if (!/^[A-Za-z][\w-]*$/.test(idPrefix)) throw new RangeError(`renderPlot: idPrefix must be letters, digits, - or _, got ${JSON.stringify(idPrefix)}`);
  refuseUrls(spec);
  const full = { ...spec, config: { ...PLOT_CONFIG, ...((spec.config as object | undefined) ?? {}) } };
  const compiled = vl.compile(full as unknown as vl.TopLevelSpec).spec;
  // A loader that refuses every fetch: a spec with a URL is a bug, never a network request.
  const loader = vega.loader();
  loader.load = async (uri: string) => {
    throw new Error(`renderPlot: data must be inline, refused to load ${uri}`);
  };
  const view = new vega.View(vega.parse(compiled), { renderer: 'none', loader });
  try {
    const svg = await view.toSVG();
    return svg
      .replace(/ xmlns(:xlink)?="[^"]*"/g, '')
      .replace(/\bid="([^"]+)"/g, (_m, id: string) => `id="${idPrefix}-${id}"`)
      .replace(/url\(#([^)]+)\)/g, (_m, id: string) => `url(#${idPrefix}-${id})`)
      .replace(/href="#([^"]+)"/g, (_m, id: string) => `href="#${idPrefix}-${id}"`);
  } finally {
    view.finalize();
  }
}
