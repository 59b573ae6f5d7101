/**
 * Which face is up during the flight, and how often it changes, in closed form.
 *
 * With ψ the angle between the heads normal and L, β the angle between L and the vertical, and the precession
 * phase Ωt + φ0 of `precessionFrame` (phase 0 is where n is highest),
 * `n·ẑ(t) = cos ψ cos β + sin ψ sin β cos(Ωt + φ0)`; heads is up when it is positive.
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007, DOI 10.1137/S0036144504446436.
 */

const TWO_PI = 2 * Math.PI;

/**
 * The vertical component n·ẑ of the heads normal at time `tS` (s):
 * `cos ψ cos β + sin ψ sin β cos(Ωt + φ0)` (angles in rad, Ω in rad/s). Positive: heads up.
 */
export function upComponent(psiRad: number, betaRad: number, omegaRadS: number, phi0Rad: number, tS: number): number {
  return Math.cos(psiRad) * Math.cos(betaRad) + Math.sin(psiRad) * Math.sin(betaRad) * Math.cos(omegaRadS * tS + phi0Rad);
}

/**
 * The times in (t0S, t1S] at which n·ẑ changes sign (the face changes of {@link faceChanges}), ascending: the
 * phases Ωt + φ0 = ±α + 2πk, α = arccos(−cot ψ cot β), solved for t. Empty when the face never changes.
 */
export function faceChangeTimes(
  psiRad: number, betaRad: number, omegaRadS: number, phi0Rad: number, t0S: number, t1S: number,
): number[] {
  if (![psiRad, betaRad, omegaRadS, phi0Rad, t0S, t1S].every(Number.isFinite) || !(t1S > t0S) || omegaRadS === 0) return [];
  const a = Math.cos(psiRad) * Math.cos(betaRad);
  const b = Math.sin(psiRad) * Math.sin(betaRad);
  if (Math.abs(a) >= Math.abs(b)) return [];
  const alpha = Math.acos(-a / b);
  const th0 = omegaRadS * t0S + phi0Rad, th1 = omegaRadS * t1S + phi0Rad;
  const lo = Math.min(th0, th1), hi = Math.max(th0, th1);
  const out: number[] = [];
  for (const r of [alpha, -alpha]) {
    for (let k = Math.ceil((lo - r) / TWO_PI); r + TWO_PI * k <= hi; k++) {
      const t = (r + TWO_PI * k - phi0Rad) / omegaRadS;
      if (t > t0S && t <= t1S) out.push(t);
    }
  }
  return out.sort((x, y) => x - y);
}

/** How many numbers r + 2πk (k any integer) lie in (lo, hi]. */
function countInLeftOpen(r: number, lo: number, hi: number): number {
  return Math.floor((hi - r) / TWO_PI) - Math.floor((lo - r) / TWO_PI);
}

/** How many numbers r + 2πk (k any integer) lie in [lo, hi). */
function countInRightOpen(r: number, lo: number, hi: number): number {
  return Math.ceil((hi - r) / TWO_PI) - Math.ceil((lo - r) / TWO_PI);
}

/**
 * The exact number of sign changes of n·ẑ (face changes) for t in the half-open interval (t0S, t1S], s.
 * Found analytically: the zeros are the phases θ = Ωt + φ0 with cos θ = −cot ψ cot β, i.e. θ = ±α + 2πk with
 * α = arccos(−A/B), A = cos ψ cos β, B = sin ψ sin β; each is a simple zero, so each is one change.
 *
 * - Any sign of Ω works (the phase then runs backwards); Ω = 0 gives 0.
 * - No change when |A| ≥ |B| (the normal never crosses the horizontal, or only touches it: a touch is not a change).
 * - A zero exactly at t1S counts, one exactly at t0S does not, so counts over adjacent intervals add up.
 * - `t1S ≤ t0S` (an empty interval) gives 0; any non-finite input gives NaN.
 */
export function faceChanges(
  psiRad: number,
  betaRad: number,
  omegaRadS: number,
  phi0Rad: number,
  t0S: number,
  t1S: number,
): number {
  if (![psiRad, betaRad, omegaRadS, phi0Rad, t0S, t1S].every(Number.isFinite)) return NaN;
  if (!(t1S > t0S) || omegaRadS === 0) return 0;
  const a = Math.cos(psiRad) * Math.cos(betaRad);
  const b = Math.sin(psiRad) * Math.sin(betaRad);
  if (Math.abs(a) >= Math.abs(b)) return 0;
  const alpha = Math.acos(-a / b); // eq. for the crossing phase, n·ẑ = 0, of [1]; in (0, π)
  const th0 = omegaRadS * t0S + phi0Rad;
  const th1 = omegaRadS * t1S + phi0Rad;
  if (omegaRadS > 0) {
    // t in (t0, t1] is θ in (th0, th1]
    return countInLeftOpen(alpha, th0, th1) + countInLeftOpen(-alpha, th0, th1);
  }
  // Ω < 0: t in (t0, t1] is θ in [th1, th0)
  return countInRightOpen(alpha, th1, th0) + countInRightOpen(-alpha, th1, th0);
}
