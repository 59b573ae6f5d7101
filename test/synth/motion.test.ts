import { describe, expect, it } from 'vitest';
import { buildMotion } from '../../src/synth/motion.ts';
import { sampleScenario, type ScenarioRanges } from '../../src/synth/scenario.ts';
import { cross, dot, norm, STANDARD_GRAVITY } from '../../src/physics/index.ts';
import { odex } from './helpers.ts';

const ranges: ScenarioRanges = {
  captureFps: 1000, width: 640, height: 480, coinDiameterM: 0.02426, coinThicknessM: 0.00175,
  launchSpeedMS: [1.5, 3.5], spinRevS: [15, 60], precessionDeg: [50, 90], tiltDeg: 'precession',
  rollDeg: [0, 0], depthSpeedMS: [-0.2, 0.2], distanceM: 0.6, focalPx: 554.26, startFace: 'random', tosserCount: 3, hand: true,
};
const g = STANDARD_GRAVITY;

describe('buildMotion', () => {
  it('releases with the normal vertical, start face up, when the tilt equals ψ', () => {
    for (let k = 0; k < 10; k++) {
      const sc = sampleScenario(ranges, 5, k);
      const m = buildMotion(sc);
      const n = m.stateAt(m.releaseTS).normal;
      expect(Math.abs(n[2])).toBeCloseTo(1, 12);
      expect(n[2] > 0).toBe(sc.startFace === 'heads');
    }
  });

  it('catches exactly where the centre comes back to release height + catch offset: z(t) = u t − g t²/2', () => {
    // kinematics of uniform acceleration (common practice, no source)
    for (let k = 0; k < 10; k++) {
      const sc = sampleScenario(ranges, 6, k);
      const m = buildMotion(sc);
      const T = m.catchTS - m.releaseTS;
      const u = sc.launchVelocityMS[2];
      expect(u * T - 0.5 * g * T * T).toBeCloseTo(sc.catchDzM, 12);
      expect(T).toBeGreaterThan(u / g); // after the apex
      expect(m.catchWorld[2] - m.releaseWorld[2]).toBeCloseTo(sc.catchDzM, 12);
      expect(m.apexHeightM).toBeCloseTo((u * u) / (2 * g), 12);
    }
  });

  it('is continuous in position at the start of the throw, the release and the catch, and velocity-continuous at release', () => {
    const sc = sampleScenario(ranges, 3, 1);
    const m = buildMotion(sc);
    const eps = 1e-7;
    for (const t of [sc.restBeforeS, m.releaseTS, m.catchTS]) {
      const a = m.stateAt(t - eps).center;
      const b = m.stateAt(t + eps).center;
      expect(norm([a[0] - b[0], a[1] - b[1], a[2] - b[2]])).toBeLessThan(1e-5);
    }
    const h = 1e-6;
    const vBefore = (m.stateAt(m.releaseTS - h).center[2] - m.stateAt(m.releaseTS - 2 * h).center[2]) / h;
    expect(vBefore).toBeCloseTo(sc.launchVelocityMS[2], 3);
    // the hold phase starts from rest and accelerates uniformly
    const t0 = sc.restBeforeS;
    const z = (t: number) => m.stateAt(t).center[2];
    expect(z(t0 + 1e-4) - z(t0)).toBeLessThan(1e-6);
  });

  it('freezes the orientation from the catch on and moves the coin with the hand until it stops', () => {
    const sc = sampleScenario(ranges, 3, 2);
    const m = buildMotion(sc);
    const a = m.stateAt(m.catchTS);
    const b = m.stateAt(m.endTS);
    expect(b.attitude).toEqual(a.attitude);
    expect(b.center[2]).toBeLessThan(a.center[2]);
    expect(a.handContact && b.handContact).toBe(true);
    expect(m.stateAt((m.releaseTS + m.catchTS) / 2).inFlight).toBe(true);
    expect(m.stateAt((m.releaseTS + m.catchTS) / 2).handContact).toBe(false);
    expect(b.handAnchor).toEqual(b.center);
  });

  it('turns the normal as the torque-free top does: dn/dt = L × n / I1, integrated with odex', () => {
    // Euler's equations for a symmetric top ("Classical Mechanics", 3rd ed., Addison-Wesley, 2002, sec. 5.6;
    // from memory), here as the precession of n about the fixed L; reference integrator odex 2.0.4.
    const sc = sampleScenario({ ...ranges, spinRevS: [40, 40] }, 9, 0);
    const m = buildMotion(sc);
    const n0 = m.stateAt(m.releaseTS).normal;
    const L = m.lVec;
    const i1 = m.inertia.i1;
    const solver = new odex.Solver(3);
    solver.absoluteTolerance = 1e-12;
    solver.relativeTolerance = 1e-12;
    solver.maxSteps = 100000;
    const T = 0.2;
    const res = solver.solve((_t, y) => [...cross(L, [y[0], y[1], y[2]])].map((v) => v / i1), 0, [...n0], T);
    const n = m.stateAt(m.releaseTS + T).normal;
    for (let k = 0; k < 3; k++) expect(n[k]).toBeCloseTo(res.y[k], 8);
    // the angle between n and L stays ψ
    expect(Math.acos(dot(n, L) / norm(L))).toBeCloseTo(Math.acos(dot(n0, L) / norm(L)), 12);
  });

  it('without the hand starts at the release (t = 0) and has no hand contact', () => {
    const sc = sampleScenario({ ...ranges, hand: false }, 4, 0);
    const m = buildMotion(sc);
    expect(m.releaseTS).toBe(0);
    expect(m.stateAt(0).handContact).toBe(false);
    expect(Number.isNaN(m.stateAt(0).handAnchor[0])).toBe(true);
  });
});
