/**
 * The same-side probability of one toss: the fraction of one precession cycle in which the start face is up.
 *
 * Over one cycle the phase θ = Ωt + φ0 runs uniformly through 2π and `n·ẑ = A + B cos θ` with
 * `A = cos ψ cos β`, `B = sin ψ sin β`. Heads is up on the arc cos θ > −A/B, a fraction arccos(−A/|B|)/π of the
 * cycle when |A| < |B|; with the normal starting vertical (β = ψ) this is 1/2 + arcsin(cot² ψ)/π.
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007, DOI 10.1137/S0036144504446436
 *     (the same-side probability for a vertical start, in closed form).
 */

/**
 * Fraction of one precession cycle, in [0, 1], in which the start face is up.
 * `psiRad` is the angle between the HEADS normal and L, `betaRad` the angle between L and +ẑ (both rad, any real,
 * usually in [0, π]); `startHeadsUp` says which face was up at release.
 *
 * - Heads fraction: 1 when A ≥ |B| (heads always up), 0 when A ≤ −|B|, else arccos(−A/|B|)/π; the start face's
 *   fraction is that or its complement. This is the same-side probability of a catch at a time uniform over the
 *   cycle (long flights), eq. of the vertical-start case in [1] generalised to any tilt of L.
 * - If the parameters say the start face is never up during the cycle (e.g. heads start with A ≤ −|B|), they
 *   contradict the start; the result is then the literal fraction, 0, not an error, so the function stays
 *   continuous in its inputs (a fitted ψ, β with errors). Check {@link upComponent} at release to detect this.
 * - The coin permanently edge-on (|A|, |B| < 1e-12: ψ = 90° with L vertical, or ψ = 0 with L
 *   horizontal) gives 1/2.
 * - Symmetry: the value for (ψ, β, heads) equals the value for (π − ψ, β, tails); non-finite input gives NaN.
 */
export function sameSideFraction(psiRad: number, betaRad: number, startHeadsUp: boolean): number {
  if (!Number.isFinite(psiRad) || !Number.isFinite(betaRad)) return NaN;
  const a = Math.cos(psiRad) * Math.cos(betaRad);
  const b = Math.abs(Math.sin(psiRad) * Math.sin(betaRad));
  let heads: number;
  // 1e-12: cos(π/2) is 6e-17, not 0, so the edge-on case is recognised within rounding of the angles
  if (Math.abs(a) < 1e-12 && b < 1e-12) heads = 0.5;
  else if (a >= b) heads = 1;
  else if (a <= -b) heads = 0;
  else heads = Math.acos(-a / b) / Math.PI;
  return startHeadsUp ? heads : 1 - heads;
}

/**
 * Same-side probability for a coin whose normal starts vertical (β = ψ):
 * `1/2 + arcsin(cot² ψ)/π` for ψ ≥ 45° (as a line angle), and 1 below, where the coin never turns over
 * (eq. for the vertical start in [1]). `psiRad` in rad; ψ and π − ψ give the same value. Non-finite gives NaN.
 */
export function sameSideVertical(psiRad: number): number {
  if (!Number.isFinite(psiRad)) return NaN;
  const s = Math.sin(psiRad);
  const c = Math.cos(psiRad);
  const cot2 = (c * c) / (s * s); // Infinity at ψ = 0
  if (!(cot2 < 1)) return 1;
  return 0.5 + Math.asin(cot2) / Math.PI;
}
