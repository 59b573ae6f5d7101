import { describe, expect, it } from 'vitest';
import { discInertia } from '../../src/physics/disc.ts';

// Reference: the handbook moments of a uniform solid cylinder (radius a, height h, mass m):
// about the axis m a²/2, about a diameter through the centre m (a²/4 + h²/12) (standard mechanics tables,
// common practice). Checked by hand-computed values and by an independent numerical quadrature of ∫ρ r⊥² dV.

/** ∫ρ (y² + z²) dV and ∫ρ (x² + y²) dV over the cylinder r ≤ a, |z| ≤ h/2 by a midpoint rule in (r, φ, z). */
function quadrature(a: number, h: number, m: number, nR = 400, nPhi = 64, nZ = 200) {
  const rho = m / (Math.PI * a * a * h);
  let iDiam = 0;
  let iAxis = 0;
  const dr = a / nR;
  const dphi = (2 * Math.PI) / nPhi;
  const dz = h / nZ;
  for (let i = 0; i < nR; i++) {
    const r = (i + 0.5) * dr;
    for (let j = 0; j < nPhi; j++) {
      const y = r * Math.sin((j + 0.5) * dphi);
      for (let k = 0; k < nZ; k++) {
        const z = -h / 2 + (k + 0.5) * dz;
        const dm = rho * r * dr * dphi * dz;
        iDiam += (y * y + z * z) * dm;
        iAxis += r * r * dm;
      }
    }
  }
  return { iDiam, iAxis };
}

describe('discInertia', () => {
  it('equals the handbook values for a 24 mm × 1.75 mm, 7.5 g coin (hand-computed)', () => {
    const { i1, i3 } = discInertia(0.012, 0.00175, 0.0075);
    // i3 = 0.0075 · 0.012² / 2 = 5.4e-7; i1 = 0.0075 · (0.012²/4 + 0.00175²/12) = 0.0075 · 3.62552083e-5
    expect(Math.abs(i3 - 5.4e-7) / 5.4e-7).toBeLessThan(1e-14);
    expect(Math.abs(i1 - 2.719140625e-7) / 2.719140625e-7).toBeLessThan(1e-12);
  });
  it('defaults to 1 kg and scales linearly with mass', () => {
    const one = discInertia(0.0125, 0.002);
    const two = discInertia(0.0125, 0.002, 2);
    expect(two.i1).toBeCloseTo(2 * one.i1, 18);
    expect(two.i3).toBeCloseTo(2 * one.i3, 18);
  });
  it('approaches i3 = 2 i1 in the thin-disc limit (h → 0), and i3 < 2 i1 for any thickness', () => {
    const thin = discInertia(0.01, 0);
    expect(thin.i3).toBe(2 * thin.i1);
    const thick = discInertia(0.01, 0.003);
    expect(thick.i3).toBeLessThan(2 * thick.i1);
    // relative deviation from the thin limit is (h²/12)/(a²/4 + h²/12)
    const dev = 1 - thick.i3 / (2 * thick.i1);
    expect(Math.abs(dev - (0.003 ** 2 / 12) / (0.01 ** 2 / 4 + 0.003 ** 2 / 12))).toBeLessThan(1e-12);
  });
  it('agrees with a numerical quadrature of the cylinder to 1e-4 relative (midpoint error ~1/(2N²) ≈ 1e-5)', () => {
    for (const [a, h] of [[0.012, 0.00175], [0.01, 0.02]]) {
      const q = quadrature(a, h, 1);
      const d = discInertia(a, h, 1);
      expect(Math.abs(q.iDiam - d.i1) / d.i1).toBeLessThan(1e-4);
      expect(Math.abs(q.iAxis - d.i3) / d.i3).toBeLessThan(1e-4);
    }
  });
  it('returns NaN for negative or non-finite dimensions', () => {
    expect(Number.isNaN(discInertia(-0.01, 0.002).i1)).toBe(true);
    expect(Number.isNaN(discInertia(0.01, Number.NaN).i3)).toBe(true);
  });
});
