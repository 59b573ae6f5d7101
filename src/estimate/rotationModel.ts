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
import {
  silhouetteVariancePartialsInto,
  silhouetteVariancesInto,
  type SilhouetteVariancePartials,
  type SilhouetteVariances,
} from './silhouetteMoments.ts';
import type { ViewGeometry } from './viewGeometry.ts';

const lambdas: SilhouetteVariances = { lambdaMajor: 0, lambdaMinor: 0 };

/** Indices of the parameter vector. */
/** Scratch for Σ_img in the model functions (single-threaded; no allocation per call). */
const sigmaImg = new Float64Array(3);

/**
 * The congruence J V Jᵀ of the symmetric 2×2 matrix V = [[vxx, vxy], [vxy, vyy]] by J = [[j0, j1], [j2, j3]]
 * (row-major `jac`), written as its xx, xy and yy entries into `out` at `oxx`, `oxy`, `oyy`.
 */
function congruenceInto(
  jac: ArrayLike<number>, vxx: number, vxy: number, vyy: number, out: Float64Array, oxx: number, oxy: number, oyy: number,
): void {
  const j00 = jac[0], j01 = jac[1], j10 = jac[2], j11 = jac[3];
  const a00 = j00 * vxx + j01 * vxy;
  const a01 = j00 * vxy + j01 * vyy;
  const a10 = j10 * vxx + j11 * vxy;
  const a11 = j10 * vxy + j11 * vyy;
  out[oxx] = a00 * j00 + a01 * j01;
  out[oxy] = a00 * j10 + a01 * j11;
  out[oyy] = a10 * j10 + a11 * j11;
}

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
  congruenceInto(g.jac, vxx, vxy, vyy, sigmaImg, 0, 1, 2);
  let sxx = sigmaImg[0];
  let sxy = sigmaImg[1];
  let syy = sigmaImg[2];
  // Outline growth: the foreground threshold moves the outline out by δ/2 on every side, and motion blur
  // smears it along the image velocity v: the thresholded mask of a blurred edge reaches out by a share b of
  // the blur length |v|·exposure, so the outline grows by (b/2)|v| along v. In terms of √Σ (the "semi-axis"
  // matrix, closed form for a 2×2 SPD matrix): (√Σ + δ/2 I + (b/2) v vᵀ/|v|)².
  const delta = p[P.deltaPx];
  const b = p[P.blur];
  const speed = Math.sqrt(f.vxPx * f.vxPx + f.vyPx * f.vyPx);
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

/** ℓ, e1, e2 with their partial derivatives in α and γ (∂e2/∂α = 0), for {@link modelMomentsGradInto}. */
export interface LBasisPartials extends LBasis {
  dlDa: number[];
  dlDg: number[];
  de1Da: number[];
  de1Dg: number[];
  de2Dg: number[];
}

/** {@link lFrame} and its partial derivatives in the polar angles (α, γ), camera frame. */
export function lFramePartials(alpha: number, gamma: number): LBasisPartials {
  const sa = Math.sin(alpha);
  const ca = Math.cos(alpha);
  const sg = Math.sin(gamma);
  const cg = Math.cos(gamma);
  return {
    l: [sa * cg, sa * sg, ca],
    e1: [ca * cg, ca * sg, -sa],
    e2: [-sg, cg, 0],
    dlDa: [ca * cg, ca * sg, -sa],
    dlDg: [-sa * sg, sa * cg, 0],
    de1Da: [-sa * cg, -sa * sg, -ca],
    de1Dg: [-ca * sg, ca * cg, 0],
    de2Dg: [-cg, -sg, 0],
  };
}

const NP = PARAM_COUNT;
const partials: SilhouetteVariancePartials = { lambdaMajor: 0, lambdaMinor: 0, dMajorDr: 0, dMinorDr: 0, dMajorDTau: 0, dMinorDTau: 0 };
// Per-parameter derivative scratch of the intermediate quantities (one entry per parameter).
const dNd = new Float64Array(NP);
const dPx = new Float64Array(NP);
const dPy = new Float64Array(NP);
const dLMaj = new Float64Array(NP);
const dLMin = new Float64Array(NP);
const dS2 = new Float64Array(NP);
const dVxx = new Float64Array(NP);
const dVxy = new Float64Array(NP);
const dVyy = new Float64Array(NP);
const dMxx = new Float64Array(NP);
const dMxy = new Float64Array(NP);
const dMyy = new Float64Array(NP);

/**
 * The moments of {@link modelMoments} (px², same operations, so the values are bit-identical) and their exact
 * partial derivatives in every parameter, by the chain rule through n(t), the silhouette variances, J Σ Jᵀ, the
 * outline growth (through the 2×2 matrix square root) — forward-mode differentiation written out by hand.
 * `out` (length 3 + 3·PARAM_COUNT) receives [Σxx, Σxy, Σyy], then ∂Σxx/∂p (PARAM_COUNT entries), ∂Σxy/∂p, ∂Σyy/∂p.
 * Where the model is not differentiable (n ⊥ d, a singular Σ under the outline growth) the one-sided derivative
 * or 0 is returned. `basis` is `lFramePartials(p[alpha], p[gamma])`.
 */
export function modelMomentsGradInto(p: ArrayLike<number>, f: RotationFrame, tau: number, tMidS: number, basis: LBasisPartials, out: Float64Array): void {
  const { l, e1, e2, dlDa, dlDg, de1Da, de1Dg, de2Dg } = basis;
  const dt = f.tS - tMidS;
  const ph = p[P.omega] * dt + p[P.phi0];
  const cp = Math.cos(p[P.psi]);
  const sp = Math.sin(p[P.psi]);
  const cph = Math.cos(ph);
  const sph = Math.sin(ph);
  const c = cph * sp;
  const s = sph * sp;
  const n0 = cp * l[0] + c * e1[0] + s * e2[0];
  const n1 = cp * l[1] + c * e1[1] + s * e2[1];
  const n2 = cp * l[2] + c * e1[2] + s * e2[2];
  const g = f.geom;
  const d = g.d;
  const ex = g.ex;
  const ey = g.ey;
  const nd = n0 * d[0] + n1 * d[1] + n2 * d[2];
  const px = n0 * ex[0] + n1 * ex[1] + n2 * ex[2];
  const py = n0 * ey[0] + n1 * ey[1] + n2 * ey[2];
  dNd.fill(0);
  dPx.fill(0);
  dPy.fill(0);
  // ∂n/∂θ for θ = α, γ, ψ, φ0 (n(t) of DEVELOPERS.md differentiated), projected on d, ex, ey; ∂/∂Ω = (t − t̄) ∂/∂φ0.
  for (let q = 0; q < 4; q++) {
    let a0: number;
    let a1: number;
    let a2: number;
    let j: number;
    if (q === 0) {
      j = P.alpha;
      a0 = cp * dlDa[0] + c * de1Da[0];
      a1 = cp * dlDa[1] + c * de1Da[1];
      a2 = cp * dlDa[2] + c * de1Da[2];
    } else if (q === 1) {
      j = P.gamma;
      a0 = cp * dlDg[0] + c * de1Dg[0] + s * de2Dg[0];
      a1 = cp * dlDg[1] + c * de1Dg[1] + s * de2Dg[1];
      a2 = cp * dlDg[2] + c * de1Dg[2] + s * de2Dg[2];
    } else if (q === 2) {
      j = P.psi;
      a0 = -sp * l[0] + cp * (cph * e1[0] + sph * e2[0]);
      a1 = -sp * l[1] + cp * (cph * e1[1] + sph * e2[1]);
      a2 = -sp * l[2] + cp * (cph * e1[2] + sph * e2[2]);
    } else {
      j = P.phi0;
      a0 = -s * e1[0] + c * e2[0];
      a1 = -s * e1[1] + c * e2[1];
      a2 = -s * e1[2] + c * e2[2];
    }
    dNd[j] = a0 * d[0] + a1 * d[1] + a2 * d[2];
    dPx[j] = a0 * ex[0] + a1 * ex[1] + a2 * ex[2];
    dPy[j] = a0 * ey[0] + a1 * ey[1] + a2 * ey[2];
  }
  dNd[P.omega] = dt * dNd[P.phi0];
  dPx[P.omega] = dt * dPx[P.phi0];
  dPy[P.omega] = dt * dPy[P.phi0];
  const r = Math.abs(nd);
  const sgn = nd < 0 ? -1 : 1;
  const sil = silhouetteVariancePartialsInto(r, tau * p[P.rim], partials);
  const lambdaMajor = sil.lambdaMajor;
  const lambdaMinor = sil.lambdaMinor;
  for (let j = 0; j < NP; j++) {
    const dr = sgn * dNd[j];
    dLMaj[j] = sil.dMajorDr * dr;
    dLMin[j] = sil.dMinorDr * dr;
  }
  dLMaj[P.rim] = sil.dMajorDTau * tau;
  dLMin[P.rim] = sil.dMinorDTau * tau;
  const den = 1 + p[P.depthRate] * dt;
  const scalePx = (p[P.radiusPx] * d[2]) / den;
  const s2 = scalePx * scalePx;
  dS2.fill(0);
  dS2[P.radiusPx] = (2 * scalePx * d[2]) / den;
  dS2[P.depthRate] = (-2 * scalePx * scalePx * dt) / den;
  const pp = px * px + py * py;
  let vxx = s2 * lambdaMajor;
  let vyy = vxx;
  let vxy = 0;
  if (pp > 1e-14) {
    const dl = lambdaMinor - lambdaMajor;
    const k = (s2 * dl) / pp;
    vxx += k * px * px;
    vyy += k * py * py;
    vxy = k * px * py;
    for (let j = 0; j < NP; j++) {
      const dpp = 2 * (px * dPx[j] + py * dPy[j]);
      const dk = (dS2[j] * dl + s2 * (dLMin[j] - dLMaj[j]) - k * dpp) / pp;
      const base = dS2[j] * lambdaMajor + s2 * dLMaj[j];
      dVxx[j] = base + dk * px * px + 2 * k * px * dPx[j];
      dVyy[j] = base + dk * py * py + 2 * k * py * dPy[j];
      dVxy[j] = dk * px * py + k * (dPx[j] * py + px * dPy[j]);
    }
  } else {
    for (let j = 0; j < NP; j++) {
      const base = dS2[j] * lambdaMajor + s2 * dLMaj[j];
      dVxx[j] = base;
      dVyy[j] = base;
      dVxy[j] = 0;
    }
  }
  // Σ_img = J Σ_v Jᵀ (linear: the derivatives map the same way).
  congruenceInto(g.jac, vxx, vxy, vyy, sigmaImg, 0, 1, 2);
  let sxx = sigmaImg[0];
  let sxy = sigmaImg[1];
  let syy = sigmaImg[2];
  const oxx = 3;
  const oxy = 3 + NP;
  const oyy = 3 + 2 * NP;
  for (let j = 0; j < NP; j++) congruenceInto(g.jac, dVxx[j], dVxy[j], dVyy[j], out, oxx + j, oxy + j, oyy + j);
  // Outline growth (see modelMoments): Σ' = M², M = √Σ + δ/2 I + (b/2) v vᵀ/|v|.
  const delta = p[P.deltaPx];
  const b = p[P.blur];
  const speed = Math.sqrt(f.vxPx * f.vxPx + f.vyPx * f.vyPx);
  const det = Math.max(sxx * syy - sxy * sxy, 0);
  const sd = Math.sqrt(det);
  const trArg = sxx + syy + 2 * sd;
  const tr = Math.sqrt(Math.max(trArg, 1e-300));
  const rxx0 = (sxx + sd) / tr;
  const ryy0 = (syy + sd) / tr;
  const rxy0 = sxy / tr;
  const kb = speed > 0 ? 1 / (2 * speed) : 0;
  if (delta !== 0 || (b !== 0 && speed > 0)) {
    // dM = d√Σ for the parameters of Σ (derivative of the closed-form square root), plus the δ and b columns.
    for (let j = 0; j < NP; j++) {
      const dxx = out[oxx + j];
      const dxy = out[oxy + j];
      const dyy = out[oyy + j];
      const ddet = sxx * dyy + syy * dxx - 2 * sxy * dxy;
      const dsd = det > 0 && sd > 0 ? ddet / (2 * sd) : 0;
      const dtr = trArg > 1e-300 ? (dxx + dyy + 2 * dsd) / (2 * tr) : 0;
      dMxx[j] = (dxx + dsd - rxx0 * dtr) / tr;
      dMyy[j] = (dyy + dsd - ryy0 * dtr) / tr;
      dMxy[j] = (dxy - rxy0 * dtr) / tr;
    }
    let rxx = rxx0 + delta / 2;
    let ryy = ryy0 + delta / 2;
    let rxy = rxy0;
    if (speed > 0) {
      const k = b / (2 * speed);
      rxx += k * f.vxPx * f.vxPx;
      ryy += k * f.vyPx * f.vyPx;
      rxy += k * f.vxPx * f.vyPx;
    }
    dMxx[P.deltaPx] += 0.5;
    dMyy[P.deltaPx] += 0.5;
    dMxx[P.blur] += kb * f.vxPx * f.vxPx;
    dMyy[P.blur] += kb * f.vyPx * f.vyPx;
    dMxy[P.blur] += kb * f.vxPx * f.vyPx;
    sxx = rxx * rxx + rxy * rxy;
    syy = ryy * ryy + rxy * rxy;
    sxy = rxy * (rxx + ryy);
    for (let j = 0; j < NP; j++) {
      out[oxx + j] = 2 * (rxx * dMxx[j] + rxy * dMxy[j]);
      out[oyy + j] = 2 * (ryy * dMyy[j] + rxy * dMxy[j]);
      out[oxy + j] = dMxy[j] * (rxx + ryy) + rxy * (dMxx[j] + dMyy[j]);
    }
  } else {
    // No growth at this point: Σ' = Σ, but its derivatives in δ and b are those of M² at M = √Σ.
    const mxxD = 0.5;
    const myyD = 0.5;
    out[oxx + P.deltaPx] = 2 * rxx0 * mxxD;
    out[oyy + P.deltaPx] = 2 * ryy0 * myyD;
    out[oxy + P.deltaPx] = rxy0 * (mxxD + myyD);
    const bxx = kb * f.vxPx * f.vxPx;
    const byy = kb * f.vyPx * f.vyPx;
    const bxy = kb * f.vxPx * f.vyPx;
    out[oxx + P.blur] = 2 * (rxx0 * bxx + rxy0 * bxy);
    out[oyy + P.blur] = 2 * (ryy0 * byy + rxy0 * bxy);
    out[oxy + P.blur] = bxy * (rxx0 + ryy0) + rxy0 * (bxx + byy);
  }
  out[0] = sxx;
  out[1] = sxy;
  out[2] = syy;
}

/**
 * The matrix square root of the model moments, √Σ' = [qxx, qxy, qyy] (px; closed form for a 2×2 SPD matrix,
 * the observable the rotation fit compares), with its partial derivatives in every parameter. `out`
 * (length 3 + 3·PARAM_COUNT) receives [qxx, qxy, qyy], then ∂qxx/∂p, ∂qxy/∂p, ∂qyy/∂p (PARAM_COUNT entries each).
 * Derivatives of √ are taken as 0 where Σ' is singular. `basis` is `lFramePartials(p[alpha], p[gamma])`.
 */
export function sqrtModelMomentsGradInto(p: ArrayLike<number>, f: RotationFrame, tau: number, tMidS: number, basis: LBasisPartials, out: Float64Array): void {
  modelMomentsGradInto(p, f, tau, tMidS, basis, out);
  const xx = out[0];
  const xy = out[1];
  const yy = out[2];
  const det = xx * yy - xy * xy;
  const sd = Math.sqrt(Math.max(det, 0));
  const tArg = xx + yy + 2 * sd;
  const t = Math.sqrt(Math.max(tArg, 1e-300));
  const qxx = (xx + sd) / t;
  const qxy = xy / t;
  const qyy = (yy + sd) / t;
  const oxx = 3;
  const oxy = 3 + NP;
  const oyy = 3 + 2 * NP;
  for (let j = 0; j < NP; j++) {
    const dxx = out[oxx + j];
    const dxy = out[oxy + j];
    const dyy = out[oyy + j];
    const dsd = det > 0 && sd > 0 ? (xx * dyy + yy * dxx - 2 * xy * dxy) / (2 * sd) : 0;
    const dt = tArg > 1e-300 ? (dxx + dyy + 2 * dsd) / (2 * t) : 0;
    out[oxx + j] = (dxx + dsd - qxx * dt) / t;
    out[oxy + j] = (dxy - qxy * dt) / t;
    out[oyy + j] = (dyy + dsd - qyy * dt) / t;
  }
  out[0] = qxx;
  out[1] = qxy;
  out[2] = qyy;
}
