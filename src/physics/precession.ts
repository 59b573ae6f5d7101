import type { DiscInertia } from './disc.ts';
import { add, cross, dot, matColumn, matMul, norm, normalize, rotationAbout, scale, type Mat3, type Vec3 } from './vec3.ts';

/**
 * Torque-free motion of a symmetric top (the coin in flight), in closed form.
 *
 * The angular momentum `L` is fixed in space. The coin's unit normal `n` (out of the heads face) turns about
 * `ℓ = L/|L|` at the constant angle ψ and the constant rate `Ω = |L|/I1` (dn/dt = L × n / I1):
 * `n(t) = cos ψ ℓ + sin ψ (cos(Ωt+φ0) e1 + sin(Ωt+φ0) e2)`. The body also turns about its own axis, relative to
 * that precessing frame, at `ω_r = (L·n)(1/I3 − 1/I1)`.
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007, DOI 10.1137/S0036144504446436 (the coin's
 *     precession about L and the angle ψ).
 * [2] "Classical Mechanics", 3rd ed., Addison-Wesley, 2002, sec. 5.6, force-free motion of a symmetric rigid body
 *     (from memory; the body-frame spin rate (I1 − I3)/I1 · ω3 follows from Euler's equations).
 */

/** The parameters of the precession of the normal about L (see the module doc). */
export interface PrecessionParams {
  /** Unit vector along the angular momentum, world frame. */
  readonly lHat: Vec3;
  /** Angle between the heads normal and ℓ, rad, in [0, π]. */
  readonly psiRad: number;
  /** Precession rate Ω = |L|/I1 of n about ℓ, rad/s (right-handed about ℓ; ≥ 0 from {@link precessionFromState}). */
  readonly omegaRadS: number;
  /** Phase of n about ℓ at t = 0, rad, measured from e1 towards e2 of {@link precessionFrame}. */
  readonly phi0Rad: number;
}

/** The orthonormal pair spanning the plane perpendicular to ℓ: `(e1, e2, ℓ)` is right-handed. */
export interface PrecessionFrame {
  readonly e1: Vec3;
  readonly e2: Vec3;
}

const Z_HAT: Vec3 = [0, 0, 1];
const X_HAT: Vec3 = [1, 0, 0];

/**
 * The reference frame of the precession phase: `e1 = unit(ẑ − (ẑ·ℓ)ℓ)` (the "uphill" direction perpendicular
 * to ℓ, so the phase Ωt+φ0 = 0 is where n is highest), `e2 = ℓ × e1`. When ℓ is (within 1e-12) parallel to ẑ,
 * the vertical has no perpendicular part and the same construction is applied to x̂ instead.
 * `lHat` is normalised here, so any non-zero vector along L may be passed.
 */
export function precessionFrame(lHat: Vec3): PrecessionFrame {
  const l = normalize(lHat);
  let p = add(Z_HAT, scale(l, -dot(Z_HAT, l)));
  if (norm(p) < 1e-12) p = add(X_HAT, scale(l, -dot(X_HAT, l)));
  const e1 = normalize(p);
  return { e1, e2: cross(l, e1) };
}

/**
 * The heads normal at time `tS` (s): `n(t) = cos ψ ℓ + sin ψ (cos(Ωt+φ0) e1 + sin(Ωt+φ0) e2)`,
 * eq. of the precession cone in [1] with the frame of {@link precessionFrame}.
 */
export function normalAt(p: PrecessionParams, tS: number): Vec3 {
  const l = normalize(p.lHat);
  const { e1, e2 } = precessionFrame(l);
  const ph = p.omegaRadS * tS + p.phi0Rad;
  const s = Math.sin(p.psiRad);
  const c = Math.cos(p.psiRad);
  const cp = Math.cos(ph);
  const sp = Math.sin(ph);
  return [
    c * l[0] + s * (cp * e1[0] + sp * e2[0]),
    c * l[1] + s * (cp * e1[1] + sp * e2[1]),
    c * l[2] + s * (cp * e1[2] + sp * e2[2]),
  ];
}

/**
 * The precession parameters from the state at t = 0: the heads normal `n0` (normalised here), the angular momentum
 * `lVec` (kg·m²/s, world frame, per the same mass as `inertia`) and the moments of inertia.
 * ψ = angle between n0 and ℓ, Ω = |L|/I1, φ0 = atan2(n0·e2, n0·e1).
 * With L = 0 the coin does not turn: ℓ is then taken along n0, ψ = 0, Ω = 0, φ0 = 0.
 */
export function precessionFromState(n0: Vec3, lVec: Vec3, inertia: DiscInertia): PrecessionParams {
  const n = normalize(n0);
  const lMag = norm(lVec);
  if (!(lMag > 0)) return { lHat: n, psiRad: 0, omegaRadS: 0, phi0Rad: 0 };
  const l = scale(lVec, 1 / lMag);
  const { e1, e2 } = precessionFrame(l);
  // atan2 of the along/across parts is accurate near 0 and π, where acos of the dot product is not.
  const along = dot(n, l);
  const across = norm(cross(n, l));
  return {
    lHat: l,
    psiRad: Math.atan2(across, along),
    omegaRadS: lMag / inertia.i1,
    phi0Rad: Math.atan2(dot(n, e2), dot(n, e1)),
  };
}

/** The spin rate of the body about its own axis relative to the precessing frame, ω_r = (L·n)(1/I3 − 1/I1), rad/s. */
function relativeSpin(n0: Vec3, lVec: Vec3, inertia: DiscInertia): number {
  return dot(lVec, n0) * (1 / inertia.i3 - 1 / inertia.i1);
}

/**
 * The attitude (body → world rotation matrix) at time `tS` (s) of a coin whose attitude at t = 0 is `R0`
 * (body → world; its third column is the heads normal n0) and whose angular momentum is `lVec` (kg·m²/s, world).
 * `R(t) = Rot(ℓ, Ωt) · R0 · Rot(ẑ_body, ω_r t)` with `Ω = |L|/I1` and `ω_r = (L·n0)(1/I3 − 1/I1)`;
 * the normal at t is the third column of R(t) and equals {@link normalAt} of {@link precessionFromState}.
 * The angular velocity this implies is Ωℓ + ω_r n, which is I⁻¹L for the symmetric top ([2]).
 */
export function attitudeAt(R0: Mat3, lVec: Vec3, inertia: DiscInertia, tS: number): Mat3 {
  const lMag = norm(lVec);
  if (!(lMag > 0)) return R0;
  const n0 = matColumn(R0, 2);
  const omega = lMag / inertia.i1;
  const omegaR = relativeSpin(n0, lVec, inertia);
  return matMul(matMul(rotationAbout(lVec, omega * tS), R0), rotationAbout(Z_HAT, omegaR * tS));
}

/**
 * The angular velocity (rad/s, world frame) at time `tS` (s) of the motion of {@link attitudeAt}:
 * `ω(t) = L/I1 + ω_r n(t)`, with n(t) the normal at t.
 */
export function angularVelocityAt(R0: Mat3, lVec: Vec3, inertia: DiscInertia, tS: number): Vec3 {
  const n0 = matColumn(R0, 2);
  const nT = matColumn(attitudeAt(R0, lVec, inertia, tS), 2);
  return add(scale(lVec, 1 / inertia.i1), scale(nT, relativeSpin(n0, lVec, inertia)));
}
