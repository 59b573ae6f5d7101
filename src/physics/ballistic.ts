import { add, scale, type Vec3 } from './vec3.ts';

/**
 * Ballistic flight of the centre of mass in the world frame (metres, z up, gravity −z); air drag is not modelled
 * (for a half-second toss it is below the measurement noise).
 *
 * References: the kinematics of uniform acceleration (common practice, no source).
 */

/** Position (m) at `tS` (s) of a point launched from `r0` (m) with velocity `v0` (m/s): `r0 + v0 t − ½ g t² ẑ`. */
export function ballisticPosition(r0: Vec3, v0: Vec3, g: number, tS: number): Vec3 {
  return add(add(r0, scale(v0, tS)), [0, 0, -0.5 * g * tS * tS]);
}

/** Velocity (m/s) at `tS` (s) of a point launched with velocity `v0` (m/s): `v0 − g t ẑ`. */
export function ballisticVelocity(v0: Vec3, g: number, tS: number): Vec3 {
  return [v0[0], v0[1], v0[2] - g * tS];
}

/** Height (m) of the apex above the launch point for an upward launch speed `uMS` (m/s): `u²/(2g)`, reached at t = u/g. */
export function apexHeight(uMS: number, g: number): number {
  return (uMS * uMS) / (2 * g);
}

/**
 * Time (s) from launch at upward speed `uMS` (m/s) until the point comes down to height `dzM` (m, default 0)
 * relative to the launch point: the later root of `u t − ½ g t² = dz`, `(u + √(u² − 2 g dz))/g`.
 * NaN when the point never reaches that height (dz above the apex). `flightTime(u, g)` is 2u/g.
 */
export function flightTime(uMS: number, g: number, dzM = 0): number {
  const disc = uMS * uMS - 2 * g * dzM;
  if (!(disc >= 0)) return NaN;
  return (uMS + Math.sqrt(disc)) / g;
}
