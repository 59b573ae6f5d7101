/**
 * The viewing geometry of one frame: the unit ray from the camera to the coin, a basis of the plane
 * perpendicular to it (a virtual camera whose optical axis is the ray), and the 2×2 Jacobian that maps
 * offsets in that virtual image to offsets in the real image (both in px).
 *
 * Near the ray the coin is seen orthographically along d, so its axis ratio is |n·d|; the real image
 * is the virtual one seen through a rotation of the camera, locally the affine map J.
 * References: [1] "Three-dimensional location estimation of circular features for machine vision",
 * IEEE Transactions on Robotics and Automation 8(5), 1992 (the perspective image of a circle). DOI 10.1109/70.163786
 */
import { hypot3 } from '../hypot.ts';

export interface ViewGeometry {
  /** Unit ray from the camera to the coin centre, camera frame (X right, Y down, Z forward). */
  d: [number, number, number];
  /** Unit vectors spanning the virtual image plane (⊥ d), close to the camera's X and Y. */
  ex: [number, number, number];
  ey: [number, number, number];
  /** Row-major J: [∂u/∂x', ∂u/∂y', ∂v/∂x', ∂v/∂y'] with x', y' in virtual px at the same focal length. */
  jac: [number, number, number, number];
}

const ON_AXIS: ViewGeometry = { d: [0, 0, 1], ex: [1, 0, 0], ey: [0, 1, 0], jac: [1, 0, 0, 1] };

/**
 * Geometry at image point (u, v) for focal length `focalPx` and principal point (u0, v0).
 * With no focal length the optical axis is used for every frame (orthographic view, J = identity).
 */
export function viewGeometry(u: number, v: number, focalPx: number | null, u0: number, v0: number): ViewGeometry {
  if (focalPx === null || !(focalPx > 0)) return ON_AXIS;
  const x = (u - u0) / focalPx;
  const y = (v - v0) / focalPx;
  const len = hypot3(x, y, 1);
  const d: [number, number, number] = [x / len, y / len, 1 / len];
  // ex: camera X made perpendicular to d; ey = d × ex.
  let ex: [number, number, number] = [1 - d[0] * d[0], -d[0] * d[1], -d[0] * d[2]];
  const exLen = hypot3(ex[0], ex[1], ex[2]);
  ex = [ex[0] / exLen, ex[1] / exLen, ex[2] / exLen];
  const ey: [number, number, number] = [
    d[1] * ex[2] - d[2] * ex[1],
    d[2] * ex[0] - d[0] * ex[2],
    d[0] * ex[1] - d[1] * ex[0],
  ];
  // A virtual image point (x', y') (normalised) is the camera direction D = x' ex + y' ey + d;
  // u = f D_x / D_z + u0. Differentiate at x' = y' = 0 (D = d) and scale x' by 1/f (virtual px).
  const dz2 = d[2] * d[2];
  const jac: [number, number, number, number] = [
    (ex[0] * d[2] - d[0] * ex[2]) / dz2,
    (ey[0] * d[2] - d[0] * ey[2]) / dz2,
    (ex[1] * d[2] - d[1] * ex[2]) / dz2,
    (ey[1] * d[2] - d[1] * ey[2]) / dz2,
  ];
  return { d, ex, ey, jac };
}

/**
 * Full major axis (px) of the image of a circle of radius `radius` centred at `c` (camera frame, same units)
 * with unit normal `n`, seen by a pinhole of focal length `focalPx`: locally, along the ray to its centre, an
 * ellipse of semi-axes f·radius/|c| and that times |n·d| in the virtual image (orthographic along the ray), mapped
 * to the real image by the Jacobian of {@link viewGeometry}. First order in the circle's angular size.
 */
export function circleImageMajor(c: readonly number[], n: readonly number[], radius: number, focalPx: number): number {
  const g = viewGeometry((focalPx * c[0]) / c[2], (focalPx * c[1]) / c[2], focalPx, 0, 0);
  const s = (focalPx * radius) / hypot3(c[0], c[1], c[2]);
  const r = Math.abs(n[0] * g.d[0] + n[1] * g.d[1] + n[2] * g.d[2]);
  const px = n[0] * g.ex[0] + n[1] * g.ex[1] + n[2] * g.ex[2];
  const py = n[0] * g.ey[0] + n[1] * g.ey[1] + n[2] * g.ey[2];
  // Semi-axis matrix² in the virtual image: s² [I − (1 − r²) p̂ p̂ᵀ], p̂ the projected normal (the minor direction).
  const pp = px * px + py * py;
  const k = pp > 1e-14 ? (1 - r * r) / pp : 0;
  const vxx = s * s * (1 - k * px * px), vyy = s * s * (1 - k * py * py), vxy = -s * s * k * px * py;
  // J V Jᵀ.
  const [j00, j01, j10, j11] = g.jac;
  const a00 = j00 * vxx + j01 * vxy, a01 = j00 * vxy + j01 * vyy;
  const a10 = j10 * vxx + j11 * vxy, a11 = j10 * vxy + j11 * vyy;
  const sxx = a00 * j00 + a01 * j01, sxy = a00 * j10 + a01 * j11, syy = a10 * j10 + a11 * j11;
  const big = 0.5 * (sxx + syy) + Math.sqrt(0.25 * (sxx - syy) ** 2 + sxy * sxy);
  return 2 * Math.sqrt(big);
}

/**
 * How much longer the major axis of the face nearer the camera is than that of the coin's mid-plane circle:
 * a coin's silhouette is the hull of its two faces, and its extent along the major axis is the near face's,
 * h/2 nearer than the centre along the normal. `n`: the normal (camera frame), `d`: the unit ray to the centre,
 * `angularRadius`: the radius over the distance (a / |c|), `tau`: the thickness over the radius (h / a). On a coin
 * 1.75 mm thick 34 cm from the lens, face-on on the optical axis, 1.0026 (h/2 / Z): px_per_m is the scale at the
 * centre's depth. Off the axis the face's sideways shift changes the perspective stretch as much as its depth
 * does. (Pinhole projection, first order in the coin's angular size; common geometry, no source.)
 */
export function nearFaceMagnification(
  n: readonly number[], d: readonly number[], angularRadius: number, tau: number, focalPx: number,
): number {
  if (!(tau > 0) || !(angularRadius > 0) || !(focalPx > 0)) return 1;
  const nd = n[0] * d[0] + n[1] * d[1] + n[2] * d[2];
  const half = (0.5 * tau * angularRadius) * (nd > 0 ? -1 : 1);
  const near = [d[0] + half * n[0], d[1] + half * n[1], d[2] + half * n[2]];
  const mid = circleImageMajor(d, n, angularRadius, focalPx);
  return mid > 0 ? circleImageMajor(near, n, angularRadius, focalPx) / mid : 1;
}
