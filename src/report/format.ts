/**
 * Number formatting for the report's text: rates as percentages, intervals as ranges, measured values with a
 * fixed number of significant digits; `–` (an en dash) for an unknown value.
 */

/** Text shown for an unknown value. */
export const UNKNOWN = '–';

/** A rate in [0, 1] as a percentage with one decimal (`52.3 %`), or `–`. */
export function percent(rate: number | null | undefined): string {
  return rate === null || rate === undefined || !Number.isFinite(rate) ? UNKNOWN : `${(rate * 100).toFixed(1)} %`;
}

/** An interval of rates as `48.1–56.4 %`, or `–`. */
export function percentRange(interval: { readonly lower: number; readonly upper: number } | null | undefined): string {
  if (interval === null || interval === undefined) return UNKNOWN;
  return `${(interval.lower * 100).toFixed(1)}–${(interval.upper * 100).toFixed(1)} %`;
}

/** A measured value with `digits` significant digits (default 3; integers as they are), or `–`. */
export function measured(value: unknown, digits = 3): string {
  if (typeof value !== 'number' || !Number.isFinite(value)) return UNKNOWN;
  if (Number.isInteger(value) && Math.abs(value) < 1e6) return String(value);
  return Number(value.toPrecision(digits)).toString();
}
