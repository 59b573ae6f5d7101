/**
 * The pinhole camera of the renderer, in the project's conventions (DEVELOPERS.md):
 * world right-handed, metres, z up; camera X right, Y down, Z forward; a level camera
 * looking horizontally has X = x, Y = −z, Z = y; `rollRad` turns the camera about its
 * optical axis (positive: image content turns clockwise); `u = f·X/Z + u0`, `v = f·Y/Z + v0`.
 *
 * The coin's mid-plane circle projects to a conic: with the circle's centre c, radius a and
 * an orthonormal pair (p, q) in its plane, the homography from the unit circle's plane to the
 * image is `H = K [a·R p, a·R q, R (c − C)]` and the image conic is `C = H⁻ᵀ diag(1, 1, −1) H⁻¹`.
 *
 * References:
 * [1] "Three-dimensional location estimation of circular features for machine vision",
 *     IEEE Transactions on Robotics and Automation 8(5), 1992. DOI 10.1109/70.163786
 *     (the perspective image of a circle is a conic; its equation from the circle's pose).
 * [2] "Multiple View Geometry in Computer Vision", 2nd ed., Cambridge University Press, 2004,
 *     sec. 2.2.3 (transformation of conics under a homography, C' = H⁻ᵀ C H⁻¹; from memory).
 */
import { cross, dot, matVec, normalize, sub, type Mat3, type Vec3 } from '../physics/index.ts';

/** A pinhole camera: intrinsics, pose and image size. Plain data, read-only. */
export interface PinholeCamera {
  /** Focal length, px. */
  readonly focalPx: number;
  /** Principal point x, px (default (W − 1)/2). */
  readonly u0: number;
  /** Principal point y, px (default (H − 1)/2). */
  readonly v0: number;
  /** Image width, px. */
  readonly width: number;
  /** Image height, px. */
  readonly height: number;
  /** Camera centre in the world frame, m. */
  readonly centerWorld: Vec3;
  /** World → camera rotation (row-major); its rows are the camera X, Y, Z axes in world coordinates. */
  readonly worldToCam: Mat3;
  /** Roll about the optical axis, rad (positive: image content turns clockwise). */
  readonly rollRad: number;
}

/** An ellipse in the image (same shape as `Ellipse` of src/vision): full axes, major ≥ minor, angle in [0, π). */
export interface ImageEllipse {
  /** Centre x, px. */
  cx: number;
  /** Centre y, px. */
  cy: number;
  /** Full major axis, px. */
  major: number;
  /** Full minor axis, px. */
  minor: number;
  /** Direction of the major axis from +x towards +y, rad, in [0, π). */
  angleRad: number;
}

/** Options of {@link createCamera}. */
export interface CameraOptions {
  /** Focal length, px. */
  focalPx: number;
  /** Image width, px. */
  width: number;
  /** Image height, px. */
  height: number;
  /** Camera centre in the world frame, m. */
  centerWorld: Vec3;
  /** Roll about the optical axis, rad (default 0; positive turns the image content clockwise). */
  rollRad?: number;
  /** Principal point, px (default the image centre ((W − 1)/2, (H − 1)/2)). */
  principalPoint?: readonly [number, number];
}

/**
 * A level camera (optical axis along world +y) at `centerWorld`, rolled by `rollRad` about its optical axis.
 * Throws a RangeError for a non-positive focal length or image size.
 */
export function createCamera(opts: CameraOptions): PinholeCamera {
  if (!(opts.focalPx > 0) || !(opts.width >= 1) || !(opts.height >= 1)) {
    throw new RangeError(`camera needs focalPx > 0 and a non-empty image (got f=${opts.focalPx}, ${opts.width}x${opts.height})`);
  }
  const roll = opts.rollRad ?? 0;
  const c = Math.cos(roll);
  const s = Math.sin(roll);
  // Level: X = x, Y = −z, Z = y. Roll turns image coordinates clockwise on screen (y down):
  // X' = cX − sY, Y' = sX + cY.
  const worldToCam: Mat3 = [c, 0, s, s, 0, -c, 0, 1, 0];
  return {
    focalPx: opts.focalPx,
    u0: opts.principalPoint?.[0] ?? (opts.width - 1) / 2,
    v0: opts.principalPoint?.[1] ?? (opts.height - 1) / 2,
    width: opts.width,
    height: opts.height,
    centerWorld: opts.centerWorld,
    worldToCam,
    rollRad: roll,
  };
}

/** Camera-frame coordinates (m) of the world point `p` (m). */
export function worldToCamera(cam: PinholeCamera, p: Vec3): Vec3 {
  return matVec(cam.worldToCam, sub(p, cam.centerWorld));
}

/** Pixel coordinates `[u, v]` of the world point `p`; `[NaN, NaN]` for a point at or behind the camera plane. */
export function projectPoint(cam: PinholeCamera, p: Vec3): [number, number] {
  const [x, y, z] = worldToCamera(cam, p);
  if (!(z > 0)) return [NaN, NaN];
  return [cam.focalPx * (x / z) + cam.u0, cam.focalPx * (y / z) + cam.v0];
}

/** Unit direction (world frame) of the ray from the camera centre through pixel `(u, v)`. */
export function pixelRay(cam: PinholeCamera, u: number, v: number): Vec3 {
  const d: Vec3 = [(u - cam.u0) / cam.focalPx, (v - cam.v0) / cam.focalPx, 1];
  const m = cam.worldToCam; // rows are camera axes in world: world dir = Mᵀ d
  return normalize([
    m[0] * d[0] + m[3] * d[1] + m[6] * d[2],
    m[1] * d[0] + m[4] * d[1] + m[7] * d[2],
    m[2] * d[0] + m[5] * d[1] + m[8] * d[2],
  ]);
}

type M3 = [number, number, number, number, number, number, number, number, number];

function inverse3(m: M3): M3 | null {
  const [a, b, c, d, e, f, g, h, i] = m;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  if (!(Math.abs(det) > 0) || !Number.isFinite(det)) return null;
  const k = 1 / det;
  return [
    A * k, -(b * i - c * h) * k, (b * f - c * e) * k,
    B * k, (a * i - c * g) * k, -(a * f - c * d) * k,
    C * k, -(a * h - b * g) * k, (a * e - b * d) * k,
  ];
}

/**
 * The image conic of a circle (centre `centerWorld`, unit normal `normalWorld`, radius `radiusM`, world frame):
 * the symmetric matrix `Cm` (row-major 3×3) with `[u v 1] Cm [u v 1]ᵀ = 0` on the image of the circle, eq. of [1]
 * in the homography form of [2]. Scale is arbitrary. `null` when the circle's plane passes through the camera centre.
 */
export function circleConic(cam: PinholeCamera, centerWorld: Vec3, normalWorld: Vec3, radiusM: number): number[] | null {
  const n = normalize(normalWorld);
  // An in-plane orthonormal pair (p, q): p ⟂ n from the world axis least aligned with n.
  const ax: Vec3 = Math.abs(n[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const p = normalize(cross(n, ax));
  const q = cross(n, p);
  const rp = matVec(cam.worldToCam, p);
  const rq = matVec(cam.worldToCam, q);
  const rc = worldToCamera(cam, centerWorld);
  const f = cam.focalPx;
  // H = K [a R p, a R q, R (c − C)], K = [[f, 0, u0], [0, f, v0], [0, 0, 1]]
  const col = (v: Vec3, s: number): Vec3 => [s * (f * v[0] + cam.u0 * v[2]), s * (f * v[1] + cam.v0 * v[2]), s * v[2]];
  const h1 = col(rp, radiusM);
  const h2 = col(rq, radiusM);
  const h3 = col(rc, 1);
  const H: M3 = [h1[0], h2[0], h3[0], h1[1], h2[1], h3[1], h1[2], h2[2], h3[2]];
  const Hi = inverse3(H);
  if (Hi === null) return null;
  // C = H⁻ᵀ diag(1, 1, −1) H⁻¹: C_jk = Σ_i s_i Hi[i][j] Hi[i][k]
  const s = [1, 1, -1];
  const out = new Array<number>(9).fill(0);
  for (let j = 0; j < 3; j++) {
    for (let k = 0; k < 3; k++) {
      let acc = 0;
      for (let i = 0; i < 3; i++) acc += s[i] * Hi[3 * i + j] * Hi[3 * i + k];
      out[3 * j + k] = acc;
    }
  }
  return out;
}

/**
 * The ellipse of a conic matrix `[A, B/2, D/2; B/2, C, E/2; D/2, E/2, F]` (row-major), or `null`
 * when the conic is not a real ellipse (a hyperbola, parabola, or empty). Full axes, major ≥ minor,
 * angle of the major axis in [0, π).
 */
export function conicToEllipse(m: readonly number[]): ImageEllipse | null {
  let [a, b, d, , c, e, , , f] = m; // a = A, b = B/2, d = D/2, c = C, e = E/2, f = F
  const det = a * c - b * b;
  if (!(det > 0)) return null;
  if (a + c < 0) {
    a = -a; b = -b; c = -c; d = -d; e = -e; f = -f;
  }
  // centre: [a b; b c] [x y]ᵀ = −[d e]ᵀ
  const cx = (b * e - c * d) / det;
  const cy = (b * d - a * e) / det;
  const fc = f + d * cx + e * cy; // the conic's value at the centre
  if (!(fc < 0)) return null;
  const mean = (a + c) / 2;
  const rad = Math.hypot((a - c) / 2, b);
  const lBig = mean + rad;
  const lSmall = mean - rad;
  if (!(lSmall > 0)) return null;
  const major = 2 * Math.sqrt(-fc / lSmall);
  const minor = 2 * Math.sqrt(-fc / lBig);
  // (cos θ, sin θ) with θ = ½ atan2(2b, a − c) is the eigenvector of the larger eigenvalue (the minor axis).
  let angle = 0.5 * Math.atan2(2 * b, a - c) + Math.PI / 2;
  angle = ((angle % Math.PI) + Math.PI) % Math.PI;
  if (angle >= Math.PI) angle -= Math.PI;
  return { cx, cy, major, minor, angleRad: angle };
}

/**
 * The exact perspective image of a circle (the coin's mid-plane rim) as an ellipse, via {@link circleConic}
 * and {@link conicToEllipse}; `null` when the image is not an ellipse (the circle reaches the camera plane).
 */
export function projectCircle(cam: PinholeCamera, centerWorld: Vec3, normalWorld: Vec3, radiusM: number): ImageEllipse | null {
  const conic = circleConic(cam, centerWorld, normalWorld, radiusM);
  return conic === null ? null : conicToEllipse(conic);
}

/** `|n·d|` with `d` the unit ray from the camera centre to `pointWorld` (the orthographic axis ratio at that point). */
export function viewCosine(cam: PinholeCamera, pointWorld: Vec3, normalWorld: Vec3): number {
  return Math.abs(dot(normalize(normalWorld), normalize(sub(pointWorld, cam.centerWorld))));
}
