import { describe, expect, it } from 'vitest';
import { odex } from './odexReference.ts';
import { discInertia } from '../../src/physics/disc.ts';
import {
  angularVelocityAt,
  attitudeAt,
  normalAt,
  precessionFrame,
  precessionFromState,
} from '../../src/physics/precession.ts';
import {
  cross,
  dot,
  matColumn,
  matFromColumns,
  matMul,
  matVec,
  norm,
  normalize,
  rotationAbout,
  transpose,
  type Mat3,
  type Vec3,
} from '../../src/physics/vec3.ts';

// Reference: a general-purpose extrapolation ODE integrator from npm (odex 2.0.4, a port of the Fortran ODEX,
// "Solving Ordinary Differential Equations I: Nonstiff Problems", Springer, 1993, from memory) integrating Euler's rigid-body
// equations in the body frame with quaternion kinematics; nothing of the closed form is used in the integration.

/** A 24 mm × 1.75 mm coin (a common small coin size), per kilogram. */
const COIN = discInertia(0.012, 0.00175);
const SPIN_REV_S = 60;
const FLIGHT_S = 1;

/** Rotation matrix (body → world) of the unit quaternion q = [w, x, y, z] (normalised here). */
function quatToMat(q: readonly number[]): Mat3 {
  const n = Math.hypot(q[0], q[1], q[2], q[3]);
  const [w, x, y, z] = [q[0] / n, q[1] / n, q[2] / n, q[3] / n];
  return [
    1 - 2 * (y * y + z * z), 2 * (x * y - w * z), 2 * (x * z + w * y),
    2 * (x * y + w * z), 1 - 2 * (x * x + z * z), 2 * (y * z - w * x),
    2 * (x * z - w * y), 2 * (y * z + w * x), 1 - 2 * (x * x + y * y),
  ];
}

/** Unit quaternion of a rotation matrix (Shepperd's branch choice). */
function matToQuat(m: Mat3): number[] {
  const tr = m[0] + m[4] + m[8];
  if (tr > 0) {
    const s = 2 * Math.sqrt(tr + 1);
    return [s / 4, (m[7] - m[5]) / s, (m[2] - m[6]) / s, (m[3] - m[1]) / s];
  }
  if (m[0] > m[4] && m[0] > m[8]) {
    const s = 2 * Math.sqrt(1 + m[0] - m[4] - m[8]);
    return [(m[7] - m[5]) / s, s / 4, (m[1] + m[3]) / s, (m[2] + m[6]) / s];
  }
  if (m[4] > m[8]) {
    const s = 2 * Math.sqrt(1 + m[4] - m[0] - m[8]);
    return [(m[2] - m[6]) / s, (m[1] + m[3]) / s, s / 4, (m[5] + m[7]) / s];
  }
  const s = 2 * Math.sqrt(1 + m[8] - m[0] - m[4]);
  return [(m[3] - m[1]) / s, (m[2] + m[6]) / s, (m[5] + m[7]) / s, s / 4];
}

/** Euler's equations (principal body axes, I = diag(i1, i1, i3)) and q̇ = ½ q ⊗ (0, ω_body); y = [ω1, ω2, ω3, qw, qx, qy, qz]. */
function rigidBody(i1: number, i3: number) {
  const i = [i1, i1, i3];
  return (_t: number, y: number[]): number[] => {
    const [w1, w2, w3, qw, qx, qy, qz] = y;
    return [
      ((i[1] - i[2]) * w2 * w3) / i[0],
      ((i[2] - i[0]) * w3 * w1) / i[1],
      ((i[0] - i[1]) * w1 * w2) / i[2],
      0.5 * (-qx * w1 - qy * w2 - qz * w3),
      0.5 * (qw * w1 + qy * w3 - qz * w2),
      0.5 * (qw * w2 + qz * w1 - qx * w3),
      0.5 * (qw * w3 + qx * w2 - qy * w1),
    ];
  };
}

interface Sample {
  tS: number;
  R: Mat3;
  omegaBody: Vec3;
}

/** Integrates from (R0, L) over [0, FLIGHT_S], sampling every dtS, segment by segment at tight tolerance. */
function integrate(R0: Mat3, lWorld: Vec3, dtS: number): Sample[] {
  const lBody = matVec(transpose(R0), lWorld);
  const w0: Vec3 = [lBody[0] / COIN.i1, lBody[1] / COIN.i1, lBody[2] / COIN.i3];
  const solver = new odex.Solver(7);
  solver.absoluteTolerance = 1e-13;
  solver.relativeTolerance = 1e-13;
  solver.maxSteps = 1e6;
  const f = rigidBody(COIN.i1, COIN.i3);
  let y = [...w0, ...matToQuat(R0)];
  const out: Sample[] = [{ tS: 0, R: quatToMat(y.slice(3)), omegaBody: w0 }];
  const n = Math.round(FLIGHT_S / dtS);
  for (let k = 1; k <= n; k++) {
    const res = solver.solve(f, (k - 1) * dtS, y, k * dtS);
    expect(res.outcome).toBe(odex.Outcome.Converged);
    y = res.y;
    out.push({ tS: k * dtS, R: quatToMat(y.slice(3)), omegaBody: [y[0], y[1], y[2]] });
  }
  return out;
}

/** An initial attitude whose heads normal is at angle psi from ℓ (L tilted by beta from the vertical). */
function setup(psiRad: number, betaRad: number, azimuthRad: number) {
  const lHat: Vec3 = [Math.sin(betaRad), 0, Math.cos(betaRad)];
  const lVec: Vec3 = [lHat[0] * COIN.i1 * 2 * Math.PI * SPIN_REV_S, 0, lHat[2] * COIN.i1 * 2 * Math.PI * SPIN_REV_S];
  const { e1, e2 } = precessionFrame(lHat);
  const n0 = normalize([
    Math.cos(psiRad) * lHat[0] + Math.sin(psiRad) * (Math.cos(azimuthRad) * e1[0] + Math.sin(azimuthRad) * e2[0]),
    Math.cos(psiRad) * lHat[1] + Math.sin(psiRad) * (Math.cos(azimuthRad) * e1[1] + Math.sin(azimuthRad) * e2[1]),
    Math.cos(psiRad) * lHat[2] + Math.sin(psiRad) * (Math.cos(azimuthRad) * e1[2] + Math.sin(azimuthRad) * e2[2]),
  ]);
  // any body x axis in the coin's plane; turn it by an arbitrary angle so R0 is not special
  const x0 = matVec(rotationAbout(n0, 0.7), normalize(cross([0.3, 1, 0.2], n0)));
  const R0 = matFromColumns(x0, cross(n0, x0), n0);
  return { lVec, n0, R0 };
}

const maxDiff = (a: Vec3, b: Vec3) => Math.max(Math.abs(a[0] - b[0]), Math.abs(a[1] - b[1]), Math.abs(a[2] - b[2]));

describe('precessionFrame', () => {
  it('gives e1 ⟂ ℓ uphill, e2 = ℓ × e1, right-handed and orthonormal', () => {
    for (const l of [[0.3, -0.4, 0.8], [1, 0, 0], [0, -1, -1], [0.2, 0.1, -0.9]] as Vec3[]) {
      const lh = normalize(l);
      const { e1, e2 } = precessionFrame(l);
      expect(Math.abs(dot(e1, lh))).toBeLessThan(1e-15);
      expect(Math.abs(norm(e1) - 1)).toBeLessThan(1e-15);
      expect(Math.abs(dot(e2, e1))).toBeLessThan(1e-15);
      expect(maxDiff(cross(e1, e2), lh)).toBeLessThan(1e-15);
      expect(e1[2]).toBeGreaterThan(0); // uphill: ẑ has a positive part along e1
    }
  });
  it('falls back to x̂ when ℓ is vertical (up or down)', () => {
    expect(precessionFrame([0, 0, 1]).e1).toEqual([1, 0, 0]);
    expect(precessionFrame([0, 0, 1]).e2).toEqual([0, 1, 0]);
    expect(precessionFrame([0, 0, -2]).e1).toEqual([1, 0, 0]);
    expect(maxDiff(precessionFrame([0, 0, -2]).e2, [0, -1, 0])).toBe(0);
  });
});

describe('precessionFromState and normalAt', () => {
  it('round-trips the state: normalAt(p, 0) = n0, ψ = angle(n0, ℓ), Ω = |L|/I1', () => {
    for (const psiDeg of [0, 5, 30, 60, 89, 90, 120, 179]) {
      const psi = (psiDeg * Math.PI) / 180;
      const { lVec, n0 } = setup(psi, 0.4, 1.1);
      const p = precessionFromState(n0, lVec, COIN);
      expect(Math.abs(p.psiRad - psi)).toBeLessThan(1e-12);
      expect(Math.abs(p.omegaRadS - norm(lVec) / COIN.i1)).toBeLessThan(1e-9);
      expect(maxDiff(normalAt(p, 0), n0)).toBeLessThan(1e-14);
    }
  });
  it('takes L = 0 as no motion: ψ = 0, Ω = 0', () => {
    const p = precessionFromState([0, 0.6, 0.8], [0, 0, 0], COIN);
    expect(p.omegaRadS).toBe(0);
    expect(p.psiRad).toBe(0);
    expect(maxDiff(normalAt(p, 0.3), [0, 0.6, 0.8])).toBeLessThan(1e-15);
  });
  it('satisfies dn/dt = L × n / I1 (central difference)', () => {
    const { lVec, n0 } = setup(1.0, 0.5, 0.2);
    const p = precessionFromState(n0, lVec, COIN);
    const h = 1e-6;
    for (const t of [0, 0.013, 0.4]) {
      const a = normalAt(p, t + h);
      const b = normalAt(p, t - h);
      const d: Vec3 = [(a[0] - b[0]) / (2 * h), (a[1] - b[1]) / (2 * h), (a[2] - b[2]) / (2 * h)];
      const expected = cross(lVec, normalAt(p, t)).map((v) => v / COIN.i1) as unknown as Vec3;
      expect(maxDiff(d, expected) / norm(expected)).toBeLessThan(1e-7);
    }
  });
});

describe('closed form against an ODE integration of Euler\'s equations (odex), 24 mm × 1.75 mm coin, 60 rev/s, 1 s', () => {
  for (const psiDeg of [90, 80, 60, 30, 5]) {
    it(`ψ = ${psiDeg}°: |L| and kinetic energy conserved to 1e-9, normal and body x axis match to 1e-6`, () => {
      const psi = (psiDeg * Math.PI) / 180;
      const { lVec, n0, R0 } = setup(psi, 0.35, 2.0);
      const p = precessionFromState(n0, lVec, COIN);
      const samples = integrate(R0, lVec, 1 / 60);
      const l0 = norm(lVec);
      const ke = (w: Vec3) => 0.5 * (COIN.i1 * w[0] * w[0] + COIN.i1 * w[1] * w[1] + COIN.i3 * w[2] * w[2]);
      const ke0 = ke(samples[0].omegaBody);
      let worstN = 0;
      let worstX = 0;
      let worstW = 0;
      for (const s of samples) {
        const w = s.omegaBody;
        const lWorld = matVec(s.R, [COIN.i1 * w[0], COIN.i1 * w[1], COIN.i3 * w[2]]);
        expect(Math.abs(norm(lWorld) - l0) / l0).toBeLessThan(1e-9);
        expect(maxDiff(lWorld, lVec) / l0).toBeLessThan(1e-8); // L fixed in space, not only its length
        expect(Math.abs(ke(w) - ke0) / ke0).toBeLessThan(1e-9);
        const Rc = attitudeAt(R0, lVec, COIN, s.tS);
        worstN = Math.max(worstN, maxDiff(matColumn(s.R, 2), normalAt(p, s.tS)));
        worstN = Math.max(worstN, maxDiff(matColumn(s.R, 2), matColumn(Rc, 2)));
        worstX = Math.max(worstX, maxDiff(matColumn(s.R, 0), matColumn(Rc, 0)));
        const wWorld = matVec(s.R, w);
        worstW = Math.max(worstW, maxDiff(wWorld, angularVelocityAt(R0, lVec, COIN, s.tS)) / norm(wWorld));
      }
      expect(samples.length).toBe(61);
      expect(worstN).toBeLessThan(1e-6);
      expect(worstX).toBeLessThan(1e-6);
      expect(worstW).toBeLessThan(1e-6);
    });
  }
});

describe('attitudeAt', () => {
  it('stays a rotation (RᵀR = I, det = +1) and starts at R0', () => {
    const { lVec, R0 } = setup(1.2, 0.9, 0.3);
    expect(Math.max(...attitudeAt(R0, lVec, COIN, 0).map((v, k) => Math.abs(v - R0[k])))).toBeLessThan(1e-15);
    for (const t of [0.1, 0.77, 3.3]) {
      const R = attitudeAt(R0, lVec, COIN, t);
      const I = matMul(transpose(R), R);
      expect(Math.max(...I.map((v, k) => Math.abs(v - (k % 4 === 0 ? 1 : 0))))).toBeLessThan(1e-13);
      const det = dot(matColumn(R, 0), cross(matColumn(R, 1), matColumn(R, 2)));
      expect(Math.abs(det - 1)).toBeLessThan(1e-13);
    }
  });
});
