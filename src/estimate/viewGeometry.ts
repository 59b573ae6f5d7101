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
  const len = Math.hypot(x, y, 1);
  const d: [number, number, number] = [x / len, y / len, 1 / len];
  // ex: camera X made perpendicular to d; ey = d × ex.
  let ex: [number, number, number] = [1 - d[0] * d[0], -d[0] * d[1], -d[0] * d[2]];
  const exLen = Math.hypot(ex[0], ex[1], ex[2]);
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
