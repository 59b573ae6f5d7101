import { describe, expect, it } from 'vitest';
import { normalAt } from '../../src/physics/precession.ts';
import { faceChangeTimes, faceChanges, upComponent } from '../../src/physics/upFace.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

// References: n·ẑ = cos ψ cos β + sin ψ sin β cos(Ωt+φ0) ("Dynamical bias in the coin toss", SIAM Review 49(2),
// 2007); the counts are checked against a brute-force dense sign count and hand-worked cases.

const rng = mulberry32;

/** Sign changes of f over (t0, t1] counted on a dense grid of n steps. */
function bruteCount(f: (t: number) => number, t0: number, t1: number, n: number): number {
  let count = 0;
  let prev = Math.sign(f(t0));
  for (let k = 1; k <= n; k++) {
    const s = Math.sign(f(t0 + ((t1 - t0) * k) / n));
    if (s !== 0 && prev !== 0 && s !== prev) count++;
    if (s !== 0) prev = s;
  }
  return count;
}

describe('upComponent', () => {
  it('is the z component of the precessing normal (normalAt with ℓ tilted by β)', () => {
    for (const [psi, beta] of [[0.3, 1.2], [1.5, 0.1], [2.2, 2.9], [1.0, Math.PI / 2]]) {
      const p = { lHat: [Math.sin(beta), 0, Math.cos(beta)] as const, psiRad: psi, omegaRadS: 300, phi0Rad: 0.8 };
      for (const t of [0, 0.001, 0.37, 1.9]) {
        expect(Math.abs(upComponent(psi, beta, 300, 0.8, t) - normalAt(p, t)[2])).toBeLessThan(1e-13);
      }
    }
  });
});

describe('faceChanges', () => {
  it('counts the zeros of cos(2πt) on hand-worked intervals (ψ = β = 90°, 1 rev/s)', () => {
    const w = 2 * Math.PI;
    // zeros at t = 0.25, 0.75, 1.25, ...
    expect(faceChanges(Math.PI / 2, Math.PI / 2, w, 0, 0, 1)).toBe(2);
    expect(faceChanges(Math.PI / 2, Math.PI / 2, w, 0, 0, 0.2)).toBe(0);
    expect(faceChanges(Math.PI / 2, Math.PI / 2, w, 0, 0.3, 0.7)).toBe(0);
    expect(faceChanges(Math.PI / 2, Math.PI / 2, w, 0, 0.2, 0.8)).toBe(2);
    expect(faceChanges(Math.PI / 2, Math.PI / 2, w, 0, 0, 10)).toBe(20);
  });
  it('counts a zero at t1 but not at t0, so adjacent intervals add up', () => {
    // the phase 0 zero at exactly representable times: Ω = π/2 rad/s, φ0 = −π/2 → zeros at t = 0, 2, 4, ...
    // (cos(πt/2 − π/2) = sin(πt/2)); with ψ = β = 90° A = 0 exactly
    const psi = Math.PI / 2;
    expect(faceChanges(psi, psi, Math.PI / 2, -Math.PI / 2, 0, 1)).toBe(0);
    expect(faceChanges(psi, psi, Math.PI / 2, -Math.PI / 2, 1, 2)).toBe(1);
    expect(faceChanges(psi, psi, Math.PI / 2, -Math.PI / 2, 2, 3)).toBe(0);
    // the same with Ω < 0: Ω = −π/2 rad/s, φ0 = π/2 → phase π/2 − πt/2, zeros at t = 0, 2, 4, ... exactly
    expect(faceChanges(psi, psi, -Math.PI / 2, Math.PI / 2, 0, 1)).toBe(0);
    expect(faceChanges(psi, psi, -Math.PI / 2, Math.PI / 2, 1, 2)).toBe(1);
    expect(faceChanges(psi, psi, -Math.PI / 2, Math.PI / 2, 2, 3)).toBe(0);
    expect(faceChanges(psi, psi, -Math.PI / 2, Math.PI / 2, 0, 4)).toBe(2);
    const r = rng(7);
    for (let i = 0; i < 200; i++) {
      const args = [r() * Math.PI, r() * Math.PI, (r() - 0.5) * 800, r() * 10 - 5] as const;
      const ts = [r(), r(), r(), r()].map((v) => v * 2).sort((a, b) => a - b);
      const whole = faceChanges(...args, ts[0], ts[3]);
      const parts = faceChanges(...args, ts[0], ts[1]) + faceChanges(...args, ts[1], ts[2]) + faceChanges(...args, ts[2], ts[3]);
      expect(parts).toBe(whole);
    }
  });
  it('gives no change when |cos ψ cos β| ≥ sin ψ sin β (e.g. a vertical start with ψ < 45°), for Ω = 0 and empty intervals', () => {
    expect(faceChanges(0.5, 0.5, 400, 0, 0, 1)).toBe(0); // ψ = β ≈ 28.6°, never turns over
    expect(faceChanges(Math.PI / 4, Math.PI / 4, 400, 0, 0, 1)).toBe(0); // tangent to the horizontal: a touch, no change
    expect(faceChanges(0, 1.0, 400, 0, 0, 1)).toBe(0); // normal along L
    expect(faceChanges(1.2, 0, 400, 0, 0, 1)).toBe(0); // L vertical: n·ẑ constant
    expect(faceChanges(1.2, 1.3, 0, 0.1, 0, 1)).toBe(0);
    expect(faceChanges(1.2, 1.3, 400, 0.1, 1, 1)).toBe(0);
    expect(faceChanges(1.2, 1.3, 400, 0.1, 1, 0.5)).toBe(0);
    expect(Number.isNaN(faceChanges(1.2, Number.NaN, 400, 0.1, 0, 1))).toBe(true);
  });
  it('is the same for −Ω as for Ω with the phase mirrored', () => {
    const r = rng(11);
    for (let i = 0; i < 200; i++) {
      const psi = r() * Math.PI;
      const beta = r() * Math.PI;
      const w = r() * 800;
      const phi = r() * 20 - 10;
      const t0 = r() - 0.3;
      const t1 = t0 + r();
      expect(faceChanges(psi, beta, -w, phi, t0, t1)).toBe(faceChanges(psi, beta, w, -phi, t0, t1));
    }
  });
  it('equals a brute-force dense sign count for random (ψ, β, Ω, φ0) and intervals, either sign of Ω', () => {
    const r = rng(2024);
    let compared = 0;
    for (let i = 0; i < 300; i++) {
      const psi = r() * Math.PI;
      const beta = r() * Math.PI;
      const w = (r() - 0.5) * 2 * 2 * Math.PI * 40; // up to ±40 rev/s
      const phi = r() * 2 * Math.PI;
      const t0 = r() * 0.5 - 0.25;
      const t1 = t0 + r() * 0.8;
      const n = 40_000; // phase step ≤ 250 rad · 0.8 / 4e4 = 5e-3 rad
      const a = Math.cos(psi) * Math.cos(beta);
      const b = Math.sin(psi) * Math.sin(beta);
      const f = (t: number) => upComponent(psi, beta, w, phi, t);
      // the dense grid cannot resolve two zeros closer than a few steps (near tangency) or a zero at an end
      if (Math.abs(b) > 0 && Math.abs(Math.abs(a / b) - 1) < 0.02) continue;
      if (Math.abs(f(t0)) < 1e-3 || Math.abs(f(t1)) < 1e-3) continue;
      expect(faceChanges(psi, beta, w, phi, t0, t1)).toBe(bruteCount(f, t0, t1, n));
      compared++;
    }
    expect(compared).toBeGreaterThan(250);
  });
  it('stays exact over long phase (a flip at 60 rev/s for 1 s: 120 changes)', () => {
    // ψ = β = 90°, φ0 = 0: zeros at Ωt = π/2 + kπ; over (0, 1] with Ω = 2π·60: 60 revolutions, 2 zeros each
    expect(faceChanges(Math.PI / 2, Math.PI / 2, 2 * Math.PI * 60, 0, 0, 1)).toBe(120);
    // zeros at t = (k + ½)/120 s: the last one before 1 s is at 0.99583 s, the next at 1.00417 s
    expect(faceChanges(Math.PI / 2, Math.PI / 2, 2 * Math.PI * 60, 0, 0, 1.004)).toBe(120);
    expect(faceChanges(Math.PI / 2, Math.PI / 2, 2 * Math.PI * 60, 0, 0, 1.0042)).toBe(121);
    expect(faceChanges(Math.PI / 2, Math.PI / 2, 2 * Math.PI * 60, 0, 0.9958, 1.0042)).toBe(2);
  });
});

describe('faceChangeTimes', () => {
  it('lists as many times as faceChanges counts, ascending, each a zero of n·ẑ where its sign changes', () => {
    const rand = mulberry32(17);
    for (let trial = 0; trial < 200; trial++) {
      const psi = 0.2 + 2.7 * rand(), beta = 0.2 + 2.7 * rand(), omega = (rand() < 0.5 ? -1 : 1) * 2 * Math.PI * (5 + 50 * rand());
      const phi = 6 * rand(), t0 = rand() * 0.1, t1 = t0 + 0.05 + 0.6 * rand();
      const z = faceChangeTimes(psi, beta, omega, phi, t0, t1);
      expect(z.length).toBe(faceChanges(psi, beta, omega, phi, t0, t1));
      for (let k = 0; k < z.length; k++) {
        expect(z[k]).toBeGreaterThan(t0);
        expect(z[k]).toBeLessThanOrEqual(t1);
        if (k > 0) expect(z[k]).toBeGreaterThan(z[k - 1]);
        expect(Math.abs(upComponent(psi, beta, omega, phi, z[k]))).toBeLessThan(1e-9);
        const h = 1e-7;
        expect(Math.sign(upComponent(psi, beta, omega, phi, z[k] - h))).toBe(-Math.sign(upComponent(psi, beta, omega, phi, z[k] + h)));
      }
    }
  });

  it('is empty when the face never changes or the interval is empty', () => {
    expect(faceChangeTimes(0.3, 0.3, 100, 0, 0, 1)).toEqual([]); // cos ψ cos β > sin ψ sin β: always heads up
    expect(faceChangeTimes(1.2, 1.0, 100, 0, 0.5, 0.5)).toEqual([]);
  });
});

