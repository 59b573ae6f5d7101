/**
 * The two-parameter picture of the toss: a coin launched heads up with vertical speed u and spin ω about a
 * horizontal diameter, caught at launch height, turns through the angle 2uω/g in its flight time 2u/g. The face
 * changes each time the angle passes π/2 + kπ, so the (u, ω) plane is cut into heads and tails bands by the
 * hyperbolas u·ω = (2k+1)πg/4, k = 0, 1, 2, …
 *
 * References:
 * [1] "The probability of heads", American Mathematical Monthly 93(3), 1986, DOI 10.2307/2323340.
 */

/** A face of the coin. */
export type Face = 'heads' | 'tails';

/**
 * The angle the coin turns through between launch and a catch at launch height, in half turns (units of π):
 * `2uω/(πg)` for vertical launch speed `uMS` (m/s), spin `omegaRadS` (rad/s) and gravity `g` (m/s²).
 * Real-valued (negative for negative ω); the face changes `round(|halfTurns|)` times, boundaries at k + ½.
 */
export function halfTurns(uMS: number, omegaRadS: number, g: number): number {
  return (2 * uMS * omegaRadS) / (Math.PI * g); // turning angle 2uω/g of [1]
}

/**
 * The spin (rad/s) on the k-th band boundary (k = 0, 1, 2, …) at vertical launch speed `uMS` (m/s):
 * `ω = (2k+1)πg/(4u)`, from u·ω = (2k+1)πg/4 of [1]. NaN for a negative or non-integer k.
 */
export function bandBoundaryOmega(k: number, uMS: number, g: number): number {
  if (!Number.isInteger(k) || k < 0) return NaN;
  return ((2 * k + 1) * Math.PI * g) / (4 * uMS);
}

/**
 * The face up at the catch in the two-parameter model, for launch speed `uMS` (m/s), spin `omegaRadS` (rad/s),
 * gravity `g` (m/s²) and the face up at launch. The face changes floor(|halfTurns| + ½) times; on a boundary
 * (within 1e-12 relative; the coin edge-on at the catch) it counts as changed, as a zero at the end of the
 * interval does in `faceChanges`. A non-finite turning angle (a caller's
 * bug, not a measurement outcome) throws a RangeError.
 */
export function bandFace(uMS: number, omegaRadS: number, g: number, startHeadsUp: boolean): Face {
  const h = Math.abs(halfTurns(uMS, omegaRadS, g));
  if (!Number.isFinite(h)) throw new RangeError(`bandFace: non-finite turning angle from u=${uMS}, omega=${omegaRadS}, g=${g}`);
  // A value within 1e-12 (relative) of a boundary k + ½ is on it: rounding of ω from bandBoundaryOmega must not
  // decide the face.
  const changes = Math.floor(h + 0.5 + 1e-12 * Math.max(1, h));
  const headsUp = changes % 2 === 0 ? startHeadsUp : !startHeadsUp;
  return headsUp ? 'heads' : 'tails';
}
