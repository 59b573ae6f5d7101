/**
 * How sure the predicted face is, given how well the release and the catch are timed.
 */
import { faceChangeTimes } from '../physics/index.ts';
import { normalCdf } from '../stats/normalCdf.ts';

/**
 * Probability that the face up at a time T ~ N(`tS`, `seS`²) is the face up at `tS`: that an even number of face
 * changes lies between them. The changes are those of n·ẑ = cos ψ cos β + sin ψ sin β cos(Ωt + φ0)
 * (`faceChangeTimes`, rotation taken as exact). They cut the time line into segments; the one holding `tS` and every
 * second one from it keep the face, and their normal probabilities are summed. 1 when `seS` is not positive.
 */
export function sameFaceProbability(psiRad: number, betaRad: number, omegaRadS: number, phi0Rad: number, tS: number, seS: number): number {
  if (!(seS > 0)) return 1;
  const reach = 8 * seS;
  const z = faceChangeTimes(psiRad, betaRad, omegaRadS, phi0Rad, tS - reach, tS + reach);
  const edges = [Number.NEGATIVE_INFINITY, ...z, Number.POSITIVE_INFINITY];
  const home = z.filter((c) => c < tS).length;
  let p = 0;
  for (let k = 0; k + 1 < edges.length; k++) {
    if ((k - home) % 2 !== 0) continue;
    p += normalCdf((edges[k + 1] - tS) / seS) - normalCdf((edges[k] - tS) / seS);
  }
  return Math.min(1, Math.max(0, p));
}
