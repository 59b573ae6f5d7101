/**
 * The ellipse record and its conversion to and from the general conic.
 *
 * `Ellipse = { cx, cy, major, minor, angleRad }`: centre in px (origin at the centre
 * of the top-left pixel, x right, y down), `major ≥ minor` FULL axis lengths in px,
 * `angleRad` the direction of the major axis from +x towards +y, in [0, π).
 *
 * A conic is `[A, B, C, D, E, F]` for `A x² + B x y + C y² + D x + E y + F = 0`.
 *
 * References:
 * [1] "Numerically stable direct least squares fitting of ellipses", WSCG 1998
 *     (the conic parametrisation used by the direct fit).
 * The conic ↔ centre/axes algebra itself is common practice, no source.
 */
import { hypot2 } from '../hypot.ts';

/** An ellipse with FULL axis lengths in px and the major axis direction in [0, π). */
export interface Ellipse {
  readonly cx: number;
  readonly cy: number;
  readonly major: number;
  readonly minor: number;
  readonly angleRad: number;
}

/** `[A, B, C, D, E, F]` of `A x² + B x y + C y² + D x + E y + F = 0`. */
export type Conic = readonly [number, number, number, number, number, number];

/** Folds any angle (rad) of an axis (a line, period π) into [0, π). */
export function canonicalAxisAngle(angleRad: number): number {
  let a = angleRad % Math.PI;
  if (a < 0) a += Math.PI;
  return a >= Math.PI ? 0 : a;
}

/**
 * The conic of an ellipse, normalised so that the value at the centre is −1
 * (positive outside, negative inside). Does not mutate its input.
 */
export function ellipseToConic(e: Ellipse): Conic {
  const a = e.major / 2;
  const b = e.minor / 2;
  const c = Math.cos(e.angleRad);
  const s = Math.sin(e.angleRad);
  const ia = 1 / (a * a);
  const ib = 1 / (b * b);
  const A = c * c * ia + s * s * ib;
  const B = 2 * c * s * (ia - ib);
  const C = s * s * ia + c * c * ib;
  const D = -2 * A * e.cx - B * e.cy;
  const E = -B * e.cx - 2 * C * e.cy;
  const F = A * e.cx * e.cx + B * e.cx * e.cy + C * e.cy * e.cy - 1;
  return [A, B, C, D, E, F];
}

/** Result of {@link conicToEllipse}. */
export type ConicToEllipseResult =
  | { readonly ok: true; readonly ellipse: Ellipse }
  | { readonly ok: false; readonly reason: 'not_an_ellipse' | 'imaginary' };

/**
 * The centre, full axes and canonical major-axis angle of a conic, if it is a real
 * ellipse (`4AC − B² > 0` and a point set that is not empty). Scale-free: any non-zero
 * multiple of the conic gives the same ellipse.
 */
export function conicToEllipse(q: Conic): ConicToEllipseResult {
  let [A, B, C, D, E, F] = q;
  const det = 4 * A * C - B * B;
  if (!(det > 0) || !Number.isFinite(det)) return { ok: false, reason: 'not_an_ellipse' };
  if (A + C < 0) {
    A = -A; B = -B; C = -C; D = -D; E = -E; F = -F;
  }
  const cx = (B * E - 2 * C * D) / det;
  const cy = (B * D - 2 * A * E) / det;
  const f0 = F + (D * cx + E * cy) / 2; // value of the conic at the centre
  const mid = (A + C) / 2;
  const rad = hypot2((A - C) / 2, B / 2);
  const lSmall = mid - rad;
  const lLarge = mid + rad;
  if (!(f0 < 0) || !(lSmall > 0)) return { ok: false, reason: 'imaginary' };
  const major = 2 * Math.sqrt(-f0 / lSmall);
  const minor = 2 * Math.sqrt(-f0 / lLarge);
  const angleRad = rad === 0 ? 0 : canonicalAxisAngle(0.5 * Math.atan2(-B, C - A));
  if (![cx, cy, major, minor].every(Number.isFinite)) return { ok: false, reason: 'not_an_ellipse' };
  return { ok: true, ellipse: { cx, cy, major, minor, angleRad } };
}
