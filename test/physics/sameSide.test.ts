import { describe, expect, it } from 'vitest';
import { sameSideFraction, sameSideVertical } from '../../src/physics/sameSide.ts';
import { cross, normalize, type Vec3 } from '../../src/physics/vec3.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

// Reference: "Dynamical bias in the coin toss", SIAM Review 49(2), 2007, DOI 10.1137/S0036144504446436 —
// the same-side probability 1/2 + arcsin(cot² ψ)/π (ψ ≥ 45°, else 1) for a normal starting vertical; the check
// values below are that closed form evaluated and rounded to 4 decimals (0.5000 at 90°, 0.5024 at 85°, ...).

const deg = (d: number) => (d * Math.PI) / 180;

const rng = mulberry32;

/**
 * Brute force: sample one precession cycle of the 3-D normal n = cos ψ ℓ + sin ψ (cos θ u + sin θ v) at N evenly
 * spaced phases, with ℓ at angle β from ẑ and (u, v) an arbitrary orthonormal pair ⟂ ℓ (not the library's frame),
 * and count where the start face is up.
 */
function bruteFraction(psi: number, beta: number, startHeadsUp: boolean, nSamples = 200_000): number {
  const l: Vec3 = [Math.sin(beta) * Math.cos(0.9), Math.sin(beta) * Math.sin(0.9), Math.cos(beta)];
  const u = normalize(cross(l, [0.3, -0.8, 0.5]));
  const v = cross(l, u);
  let up = 0;
  for (let k = 0; k < nSamples; k++) {
    const th = (2 * Math.PI * (k + 0.5)) / nSamples;
    const nz = Math.cos(psi) * l[2] + Math.sin(psi) * (Math.cos(th) * u[2] + Math.sin(th) * v[2]);
    if (startHeadsUp ? nz > 0 : nz < 0) up++;
  }
  return up / nSamples;
}

describe('sameSideVertical', () => {
  it('matches the 2007 closed form check values (vertical start)', () => {
    const cases: Array<[number, number]> = [[90, 0.5], [85, 0.5024], [80, 0.5099], [75, 0.5229], [60, 0.6082]];
    for (const [psiDeg, p] of cases) expect(Math.abs(sameSideVertical(deg(psiDeg)) - p)).toBeLessThan(5e-5);
  });
  it('is 1 at 45° and below (the coin never turns over), and symmetric in ψ ↔ π − ψ', () => {
    for (const d of [45, 44.9, 30, 10, 0]) expect(sameSideVertical(deg(d))).toBe(1);
    for (const d of [50, 63, 80, 90]) {
      expect(Math.abs(sameSideVertical(deg(d)) - sameSideVertical(deg(180 - d)))).toBeLessThan(1e-12);
    }
  });
  it('decreases monotonically from 1 at 45° to 1/2 at 90°', () => {
    let prev = 1;
    for (let d = 45; d <= 90; d += 0.5) {
      const p = sameSideVertical(deg(d));
      expect(p).toBeLessThanOrEqual(prev + 1e-15);
      prev = p;
    }
    expect(Math.abs(prev - 0.5)).toBeLessThan(1e-15);
  });
});

describe('sameSideFraction', () => {
  it('equals the vertical-start closed form when β = ψ, for either start face', () => {
    for (let d = 1; d < 180; d += 1) {
      const psi = deg(d);
      // at the tangency ψ = 45°, 135° the fraction has a square-root singularity (arccos near −1), so rounding of
      // cot²ψ by 1 ulp moves it by ~1e-8: a looser tolerance there only
      const tol = d === 45 || d === 135 ? 1e-7 : 1e-12;
      expect(Math.abs(sameSideFraction(psi, psi, true) - sameSideVertical(psi))).toBeLessThan(tol);
      // tails start, tails normal −n vertical: the heads normal is at π − ψ from L and L at ψ from ẑ; the same
      // geometry seen from the other face, so the same probability
      expect(Math.abs(sameSideFraction(Math.PI - psi, psi, false) - sameSideVertical(psi))).toBeLessThan(tol);
    }
  });
  it('matches a brute-force sampling of the cycle for random (ψ, β) to 1e-4', () => {
    const r = rng(99);
    for (let i = 0; i < 40; i++) {
      const psi = r() * Math.PI;
      const beta = r() * Math.PI;
      const heads = r() < 0.5;
      expect(Math.abs(sameSideFraction(psi, beta, heads) - bruteFraction(psi, beta, heads))).toBeLessThan(1e-4);
    }
  });
  it('gives complementary fractions for the two start faces, and (ψ, β, heads) = (π − ψ, β, tails)', () => {
    const r = rng(5);
    for (let i = 0; i < 100; i++) {
      const psi = r() * Math.PI;
      const beta = r() * Math.PI;
      expect(Math.abs(sameSideFraction(psi, beta, true) + sameSideFraction(psi, beta, false) - 1)).toBeLessThan(1e-15);
      expect(Math.abs(sameSideFraction(psi, beta, true) - sameSideFraction(Math.PI - psi, beta, false))).toBeLessThan(1e-12);
    }
  });
  it('is the literal 0 when the start face is never up (parameters contradicting the start), and 1/2 for a coin always edge-on', () => {
    // heads normal 150° from an L tilted 30°: n·ẑ ≤ cos 150° cos 30° + sin 150° sin 30° = −0.5 < 0 always
    expect(sameSideFraction(deg(150), deg(30), true)).toBe(0);
    expect(sameSideFraction(deg(150), deg(30), false)).toBe(1);
    expect(sameSideFraction(Math.PI / 2, 0, true)).toBe(0.5);
    expect(Number.isNaN(sameSideFraction(Number.NaN, 0.3, true))).toBe(true);
  });
  it('is 1/2 for a horizontal L (β = 90°) at any ψ: the cycle is symmetric about the horizontal', () => {
    for (const d of [10, 45, 80, 90, 120]) expect(Math.abs(sameSideFraction(deg(d), Math.PI / 2, true) - 0.5)).toBeLessThan(1e-15);
  });
});
