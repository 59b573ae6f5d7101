/**
 * Small fixed-size linear algebra for the physics core: 3-vectors and 3×3 matrices
 * as plain readonly tuples. Every function returns a new value and never mutates its inputs.
 */
import { hypot3 } from '../hypot.ts';

/** A 3-vector `[x, y, z]` (units are the caller's; world frame is metres, z up). */
export type Vec3 = readonly [number, number, number];

/**
 * A 3×3 matrix stored row-major as 9 numbers: `[m00, m01, m02, m10, m11, m12, m20, m21, m22]`.
 * An attitude matrix maps body coordinates to world coordinates; its columns are the body axes in the world frame.
 */
export type Mat3 = readonly [number, number, number, number, number, number, number, number, number];

/** Dot product `a·b`. */
export function dot(a: Vec3, b: Vec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

/** Cross product `a × b` (right-handed: x̂ × ŷ = ẑ). */
export function cross(a: Vec3, b: Vec3): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/** Euclidean length `|a|`: `Math.hypot`'s value, safe against overflow, computed without its allocation (`src/hypot.ts`). */
export function norm(a: Vec3): number {
  return hypot3(a[0], a[1], a[2]);
}

/**
 * The unit vector along `a`. A zero (or non-finite-length) vector has no direction:
 * the result is then `[NaN, NaN, NaN]`, so a caller's mistake cannot pass silently as a valid direction.
 */
export function normalize(a: Vec3): Vec3 {
  const n = norm(a);
  if (!(n > 0) || !Number.isFinite(n)) return [NaN, NaN, NaN];
  return [a[0] / n, a[1] / n, a[2] / n];
}

/** Sum `a + b`. */
export function add(a: Vec3, b: Vec3): Vec3 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}

/** Difference `a − b`. */
export function sub(a: Vec3, b: Vec3): Vec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}

/** Scalar multiple `s·a`. */
export function scale(a: Vec3, s: number): Vec3 {
  return [a[0] * s, a[1] * s, a[2] * s];
}

/** The 3×3 identity matrix. */
export function identity3(): Mat3 {
  return [1, 0, 0, 0, 1, 0, 0, 0, 1];
}

/**
 * The rotation matrix that turns vectors by `angleRad` about `axis`, right-handed
 * (positive angles turn counter-clockwise seen from the tip of the axis; a quarter turn about ẑ takes x̂ to ŷ).
 * Rodrigues' formula `R = I + sin θ K + (1 − cos θ) K²` with `K` the cross-product matrix of the unit axis.
 * The axis need not be unit length; a zero axis gives NaN entries.
 */
export function rotationAbout(axis: Vec3, angleRad: number): Mat3 {
  const [x, y, z] = normalize(axis);
  const s = Math.sin(angleRad);
  const c = Math.cos(angleRad);
  const t = 1 - c;
  return [
    c + t * x * x, t * x * y - s * z, t * x * z + s * y,
    t * y * x + s * z, c + t * y * y, t * y * z - s * x,
    t * z * x - s * y, t * z * y + s * x, c + t * z * z,
  ];
}

/** Matrix product `a · b`. */
export function matMul(a: Mat3, b: Mat3): Mat3 {
  const r = new Array<number>(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      r[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
    }
  }
  return r as unknown as Mat3;
}

/** Matrix–vector product `m · v`. */
export function matVec(m: Mat3, v: Vec3): Vec3 {
  return [
    m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
    m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
    m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
  ];
}

/** Transpose `mᵀ` (the inverse of a rotation matrix). */
export function transpose(m: Mat3): Mat3 {
  return [m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]];
}

/** Column `j` (0, 1 or 2) of `m`; for an attitude matrix, body axis `j` expressed in the world frame. */
export function matColumn(m: Mat3, j: 0 | 1 | 2): Vec3 {
  return [m[j], m[3 + j], m[6 + j]];
}

/** The matrix whose columns are `c0`, `c1`, `c2` (for an attitude: the body x, y, z axes in world coordinates). */
export function matFromColumns(c0: Vec3, c1: Vec3, c2: Vec3): Mat3 {
  return [c0[0], c1[0], c2[0], c0[1], c1[1], c2[1], c0[2], c1[2], c2[2]];
}
