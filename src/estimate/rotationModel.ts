/**
 * The forward model of the rotation fit: from the torque-free precession parameters to the second-moment
 * matrix of the coin's image in each frame. Quadratic in the normal n, so it is blind to the three flips
 * of one view (n ↔ −n, the mirror through the image plane, their product), as the fit must be.
 *
 * Per frame: n(t) = cos ψ ℓ + sin ψ (cos(Ωt+φ0) e1 + sin(Ωt+φ0) e2) (torque-free symmetric top, DEVELOPERS.md);
 * r = |n·d| and p = (n·ex, n·ey) in the virtual camera along the ray d; the silhouette of the cylinder
 * (`silhouetteVariances`) scaled by the radius in px at the coin's depth; mapped into the image by J;
 * grown by the boundary bias δ (the foreground threshold moves the outline); smeared by motion blur.
 */
import { silhouetteVariancesInto, type SilhouetteVariances } from './silhouetteMoments.ts';

const lambdas: SilhouetteVariances = { lambdaMajor: 0, lambdaMinor: 0 };
import type { ViewGeometry } from './viewGeometry.ts';

/** Indices of the parameter vector. */
export const P = {
  radiusPx: 0, // G0: coin radius in px at the mean depth on the optical axis
  depthRate: 1, // k: Z(t) = Z̄ (1 + k (t − t̄)), 1/s
  alpha: 2, // polar angle of ℓ from the camera's +Z
  gamma: 3, // azimuth of ℓ about +Z from +X
  psi: 4, // precession angle ψ
  omega: 5, // Ω, rad/s
  phi0: 6, // phase at t = t̄
  deltaPx: 7, // outline growth, px
  blur: 8, // outline reach along the motion, as a share of the distance moved per frame
  rim: 9, // share of the rim's projected width that the outline includes (a dark rim may not stand out)
} as const;
export const PARAM_COUNT = 10;

/** One frame's observation as the rotation fit sees it. */
export interface RotationFrame {
  tS: number;
  /** Observed second-moment matrix of the coin's image, px²: [Σxx, Σxy, Σyy]. */
  sxx: number;
  sxy: number;
  syy: number;
  /** Image velocity, px per frame (for the motion-blur term). */
  vxPx: number;
  vyPx: number;
  geom: ViewGeometry;
}

/** Second moments of the ellipse `(major, minor, angleRad)` (full axes, px): a uniform ellipse's variances. */
export function ellipseMoments(major: number, minor: number, angleRad: number): [number, number, number] {
  const la = (major / 4) ** 2;
  const lb = (minor / 4) ** 2;
  const c = Math.cos(angleRad);
  const s = Math.sin(angleRad);
  return [la * c * c + lb * s * s, (la - lb) * c * s, la * s * s + lb * c * c];
}

/** The unit vector ℓ and its precession frame e1, e2 for polar angles (α, γ) in the camera frame. */
export function lFrame(alpha: number, gamma: number): { l: number[]; e1: number[]; e2: number[] } {
  const sa = Math.sin(alpha);
  const ca = Math.cos(alpha);
  const sg = Math.sin(gamma);
  const cg = Math.cos(gamma);
  return { l: [sa * cg, sa * sg, ca], e1: [ca * cg, ca * sg, -sa], e2: [-sg, cg, 0] };
}

/** The coin's normal at time `tS` (camera frame) for parameter vector `p`, measured from `tMidS`. */
export function normalAtCamera(p: ArrayLike<number>, tS: number, tMidS: number): [number, number, number] {
  const { l, e1, e2 } = lFrame(p[P.alpha], p[P.gamma]);
  const ph = p[P.omega] * (tS - tMidS) + p[P.phi0];
  const cp = Math.cos(p[P.psi]);
  const sp = Math.sin(p[P.psi]);
  const c = Math.cos(ph);
  const s = Math.sin(ph);
  return [
    cp * l[0] + sp * (c * e1[0] + s * e2[0]),
    cp * l[1] + sp * (c * e1[1] + s * e2[1]),
    cp * l[2] + sp * (c * e1[2] + s * e2[2]),
  ];
}

export interface ModelMoments {
  sxx: number;
  sxy: number;
  syy: number;
  /** Model axis ratio of the image (minor/major of the moment ellipse). */
  axisRatio: number;
  /** |n·d|. */
  r: number;
}

/** ℓ, e1, e2 of a parameter vector, computed once per evaluation of all frames. */
export type LBasis = { l: number[]; e1: number[]; e2: number[] };

/**
 * Predicted image moments of frame `f` for parameters `p` and thickness ratio `tau` = h / a.
 * `basis` may pass `lFrame(p[alpha], p[gamma])` precomputed (it depends on p only).
 */
export function modelMoments(p: ArrayLike<number>, f: RotationFrame, tau: number, tMidS: number, basis?: LBasis): ModelMoments {
  const { l, e1, e2 } = basis ?? lFrame(p[P.alpha], p[P.gamma]);
  const ph = p[P.omega] * (f.tS - tMidS) + p[P.phi0];
  const cp = Math.cos(p[P.psi]);
  const sp = Math.sin(p[P.psi]);
  const c = Math.cos(ph) * sp;
  const s = Math.sin(ph) * sp;
  const n0 = cp * l[0] + c * e1[0] + s * e2[0];
  const n1 = cp * l[1] + c * e1[1] + s * e2[1];
  const n2 = cp * l[2] + c * e1[2] + s * e2[2];
  const g = f.geom;
  const nd = n0 * g.d[0] + n1 * g.d[1] + n2 * g.d[2];
  const px = n0 * g.ex[0] + n1 * g.ex[1] + n2 * g.ex[2];
  const py = n0 * g.ey[0] + n1 * g.ey[1] + n2 * g.ey[2];
  const r = Math.abs(nd);
  const { lambdaMajor, lambdaMinor } = silhouetteVariancesInto(r, tau * p[P.rim], lambdas);
  const scalePx = (p[P.radiusPx] * g.d[2]) / (1 + p[P.depthRate] * (f.tS - tMidS));
  const s2 = scalePx * scalePx;
  // Σ_v = s² [λmaj I + (λmin − λmaj) p̂ p̂ᵀ] in the virtual image.
  const pp = px * px + py * py;
  let vxx = s2 * lambdaMajor;
  let vyy = vxx;
  let vxy = 0;
  if (pp > 1e-14) {
    const k = (s2 * (lambdaMinor - lambdaMajor)) / pp;
    vxx += k * px * px;
    vyy += k * py * py;
    vxy = k * px * py;
  }
  // Σ_img = J Σ_v Jᵀ.
  const [j00, j01, j10, j11] = g.jac;
  const a00 = j00 * vxx + j01 * vxy;
  const a01 = j00 * vxy + j01 * vyy;
  const a10 = j10 * vxx + j11 * vxy;
  const a11 = j10 * vxy + j11 * vyy;
  let sxx = a00 * j00 + a01 * j01;
  let sxy = a00 * j10 + a01 * j11;
  let syy = a10 * j10 + a11 * j11;
  // Outline growth: the foreground threshold moves the outline out by δ/2 on every side, and motion blur
  // smears it along the image velocity v: the thresholded mask of a blurred edge reaches out by a share b of
  // the blur length |v|·exposure, so the outline grows by (b/2)|v| along v. In terms of √Σ (the "semi-axis"
  // matrix, closed form for a 2×2 SPD matrix): (√Σ + δ/2 I + (b/2) v vᵀ/|v|)².
  const delta = p[P.deltaPx];
  const b = p[P.blur];
  const speed = Math.hypot(f.vxPx, f.vyPx);
  if (delta !== 0 || (b !== 0 && speed > 0)) {
    const det = Math.max(sxx * syy - sxy * sxy, 0);
    const sd = Math.sqrt(det);
    const tr = Math.sqrt(Math.max(sxx + syy + 2 * sd, 1e-300));
    let rxx = (sxx + sd) / tr + delta / 2;
    let ryy = (syy + sd) / tr + delta / 2;
    let rxy = sxy / tr;
    if (speed > 0) {
      const k = b / (2 * speed);
      rxx += k * f.vxPx * f.vxPx;
      ryy += k * f.vyPx * f.vyPx;
      rxy += k * f.vxPx * f.vyPx;
    }
    sxx = rxx * rxx + rxy * rxy;
    syy = ryy * ryy + rxy * rxy;
    sxy = rxy * (rxx + ryy);
  }
  const half = 0.5 * (sxx + syy);
  const diff = Math.sqrt(0.25 * (sxx - syy) ** 2 + sxy * sxy);
  const l1 = half + diff;
  const l2 = Math.max(half - diff, 0);
  return { sxx, sxy, syy, axisRatio: l1 > 0 ? Math.sqrt(l2 / l1) : Number.NaN, r };
}
