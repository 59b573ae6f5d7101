import { describe, expect, it } from 'vitest';
import { odex } from './odexReference.ts';
import { apexHeight, ballisticPosition, ballisticVelocity, flightTime } from '../../src/physics/ballistic.ts';
import { STANDARD_GRAVITY as G } from '../../src/physics/gravity.ts';

// References: the kinematics of uniform acceleration (common practice, no source), checked against hand-worked
// numbers and against a general-purpose ODE integrator from npm (odex 2.0.4) integrating r'' = −g ẑ.

describe('ballisticPosition / ballisticVelocity', () => {
  it('match an ODE integration of r″ = −g ẑ (odex) to 1e-12 m over 0.6 s', () => {
    const r0 = [0.1, -0.2, 1.3] as const;
    const v0 = [0.4, 0.05, 2.5] as const;
    const solver = new odex.Solver(6);
    solver.absoluteTolerance = 1e-13;
    solver.relativeTolerance = 1e-13;
    const f = (_t: number, y: number[]) => [y[3], y[4], y[5], 0, 0, -G];
    for (const t of [0.05, 0.3, 0.6]) {
      const res = solver.solve(f, 0, [...r0, ...v0], t);
      const p = ballisticPosition(r0, v0, G, t);
      const v = ballisticVelocity(v0, G, t);
      for (let k = 0; k < 3; k++) {
        expect(Math.abs(p[k] - res.y[k])).toBeLessThan(1e-12);
        expect(Math.abs(v[k] - res.y[3 + k])).toBeLessThan(1e-12);
      }
    }
  });
  it('starts at (r0, v0) and moves horizontally at constant velocity', () => {
    expect(ballisticPosition([1, 2, 3], [4, 5, 6], G, 0)).toEqual([1, 2, 3]);
    expect(ballisticVelocity([4, 5, 6], G, 0)).toEqual([4, 5, 6]);
    const p = ballisticPosition([1, 2, 3], [4, 5, 6], G, 0.5);
    expect(p[0]).toBe(3);
    expect(p[1]).toBe(4.5);
  });
});

describe('apexHeight / flightTime', () => {
  it('hand-worked case: u = g/4 m/s gives a 0.5 s flight and an apex of g/32 = 0.306458 m', () => {
    const u = G / 4; // 2.4516625 m/s
    expect(Math.abs(flightTime(u, G) - 0.5)).toBeLessThan(1e-15);
    expect(Math.abs(apexHeight(u, G) - 0.30645781)).toBeLessThan(1e-8);
    // the apex is the height at t = u/g
    expect(Math.abs(ballisticPosition([0, 0, 0], [0, 0, u], G, u / G)[2] - apexHeight(u, G))).toBeLessThan(1e-15);
  });
  it('lands at the requested height dz on the way down (and dz < 0 below the launch point)', () => {
    const u = 3.1;
    for (const dz of [-0.4, -0.05, 0, 0.2, 0.48]) {
      const t = flightTime(u, G, dz);
      expect(Math.abs(ballisticPosition([0, 0, 0], [0, 0, u], G, t)[2] - dz)).toBeLessThan(1e-13);
      expect(ballisticVelocity([0, 0, u], G, t)[2]).toBeLessThanOrEqual(0); // descending
      expect(t).toBeGreaterThanOrEqual(u / G);
    }
  });
  it('is NaN when dz is above the apex', () => {
    expect(Number.isNaN(flightTime(2, G, apexHeight(2, G) + 1e-6))).toBe(true);
  });
});
