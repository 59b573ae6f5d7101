/**
 * The metric flight fit: the coin's centre in metres in the plane of the image, from the pixel track and
 * the scale at the coin's depth in each frame, fitted robustly as ballistic motion (a quadratic in time on
 * each axis). Gives the image direction of gravity (the camera roll), the launch speed along the vertical,
 * the apex height, and the capture rate that makes the fitted acceleration equal g.
 *
 * Pinhole: X = (u − u0) Z / f, so with the scale s(t) = f / Z(t) read off the coin itself the metric position
 * needs no focal length (DESIGN §5). Air drag is below measurement noise for a flight under a second and is
 * not modelled (common practice, no source).
 */
import { robustLinearFit } from './robustLinearFit.ts';
import { hypot2 } from '../hypot.ts';

export interface FlightInput {
  tS: number[];
  uPx: number[];
  vPx: number[];
  /** Scale at the coin's depth in each frame, px per m. */
  pxPerM: number[];
  /** Principal point, px. */
  u0: number;
  v0: number;
  releaseTS: number;
  catchTS: number;
  /** The rate the time base assumes, frames/s (for gravity_fps). */
  captureFps: number;
  /** Gravity, m/s² (standard gravity unless the study gives local g). */
  gravity: number;
  /** Relative standard error of the scale, for the error budget. */
  pxPerMRelSe: number;
}

export type FlightFit =
  | {
      ok: true;
      /** Acceleration in the image plane, m/s² (x right, y down). */
      accel: [number, number];
      accelSe: number;
      /** Unit vector of gravity in the image (pointing down the scene). */
      down: [number, number];
      /** Camera roll, rad: the angle from the image's +y to gravity, positive when the scene turns clockwise. */
      rollRad: number;
      launchSpeedMS: number;
      launchSpeedSeMS: number;
      apexHeightM: number;
      gravityFps: number;
      gravityFpsSe: number;
      /** Robust scale of the metric residuals, m. */
      sigmaM: number;
      /** Position and velocity coefficients per axis: [c0, c1, c2] in m, m/s, m/s² (about `t0S`). */
      coefX: number[];
      coefY: number[];
      t0S: number;
    }
  | { ok: false; reason: string };

/** Fits the flight; needs at least 6 in-flight frames. Does not mutate its input. */
export function fitFlight(input: FlightInput): FlightFit {
  const n = input.tS.length;
  if (n < 6) return { ok: false, reason: `only ${n} in-flight frames (need 6)` };
  const t0 = input.releaseTS;
  const rows = input.tS.map((t) => [1, t - t0, 0.5 * (t - t0) ** 2]);
  const xm = input.uPx.map((u, i) => (u - input.u0) / input.pxPerM[i]);
  const ym = input.vPx.map((v, i) => (v - input.v0) / input.pxPerM[i]);
  const fx = robustLinearFit(rows, xm, { minScale: 1e-6 });
  const fy = robustLinearFit(rows, ym, { minScale: 1e-6 });
  if (!fx.ok || !fy.ok) return { ok: false, reason: 'the flight fit is degenerate' };
  const ax = fx.coef[2];
  const ay = fy.coef[2];
  const amag = hypot2(ax, ay);
  if (!(amag > 0)) return { ok: false, reason: 'no acceleration in the track' };
  const down: [number, number] = [ax / amag, ay / amag];
  // Roll: gravity would point along +y in a level camera; a clockwise roll of the scene by ρ moves it to (−sin ρ, cos ρ).
  const rollRad = Math.atan2(-down[0], down[1]);
  // Velocity at release, projected on "up" = −down.
  const launch = -(fx.coef[1] * down[0] + fy.coef[1] * down[1]);
  const accelSe = hypot2(fx.se[2] * down[0], fy.se[2] * down[1]);
  const launchSe0 = hypot2(fx.se[1] * down[0], fy.se[1] * down[1]);
  const launchSe = hypot2(launchSe0, Math.abs(launch) * input.pxPerMRelSe);
  const apex = launch > 0 ? (launch * launch) / (2 * amag) : 0;
  // gravity_fps = f · sqrt(g / a) (DESIGN §5); a scales with 1/px_per_m, so both errors enter at half weight.
  const gravityFps = input.captureFps * Math.sqrt(input.gravity / amag);
  const gravityFpsSe = gravityFps * 0.5 * hypot2(accelSe / amag, input.pxPerMRelSe);
  return {
    ok: true,
    accel: [ax, ay],
    accelSe,
    down,
    rollRad,
    launchSpeedMS: launch,
    launchSpeedSeMS: launchSe,
    apexHeightM: apex,
    gravityFps,
    gravityFpsSe,
    sigmaM: hypot2(fx.sigma, fy.sigma),
    coefX: fx.coef,
    coefY: fy.coef,
    t0S: t0,
  };
}
