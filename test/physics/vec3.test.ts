import { describe, expect, it } from 'vitest';
import {
  add,
  cross,
  dot,
  identity3,
  matColumn,
  matFromColumns,
  matMul,
  matVec,
  norm,
  normalize,
  rotationAbout,
  scale,
  sub,
  transpose,
  type Mat3,
  type Vec3,
} from '../../src/physics/vec3.ts';

const close = (a: readonly number[], b: readonly number[], tol: number) =>
  a.every((v, k) => Math.abs(v - b[k]) <= tol);

/** Rotation by the unit quaternion (cos θ/2, sin θ/2 k), v' = q v q*, written out: an independent route to Rodrigues. */
function quatRotate(axis: Vec3, angle: number, v: Vec3): Vec3 {
  const k = normalize(axis);
  const w = Math.cos(angle / 2);
  const u = scale(k, Math.sin(angle / 2));
  // v' = v + 2w (u × v) + 2 u × (u × v)
  const uv = cross(u, v);
  return add(add(v, scale(uv, 2 * w)), scale(cross(u, uv), 2));
}

describe('vec3 basics', () => {
  it('cross is right-handed (x̂ × ŷ = ẑ) and orthogonal to both factors', () => {
    expect(cross([1, 0, 0], [0, 1, 0])).toEqual([0, 0, 1]);
    expect(cross([0, 1, 0], [0, 0, 1])).toEqual([1, 0, 0]);
    const a: Vec3 = [0.3, -1.2, 2.5];
    const b: Vec3 = [4, 0.5, -0.7];
    const c = cross(a, b);
    expect(Math.abs(dot(c, a))).toBeLessThan(1e-14);
    expect(Math.abs(dot(c, b))).toBeLessThan(1e-14);
    // |a × b|² = |a|²|b|² − (a·b)² (Lagrange's identity)
    expect(Math.abs(dot(c, c) - (dot(a, a) * dot(b, b) - dot(a, b) ** 2))).toBeLessThan(1e-12);
  });
  it('norm, normalize, add, sub, scale agree with hand-computed values', () => {
    expect(norm([3, 4, 12])).toBe(13);
    expect(normalize([3, 4, 12])).toEqual([3 / 13, 4 / 13, 12 / 13]);
    expect(add([1, 2, 3], [4, 5, 6])).toEqual([5, 7, 9]);
    expect(sub([1, 2, 3], [4, 5, 6])).toEqual([-3, -3, -3]);
    expect(scale([1, -2, 3], -2)).toEqual([-2, 4, -6]);
  });
  it('normalize of the zero vector is NaN, not a made-up direction', () => {
    expect(normalize([0, 0, 0]).every(Number.isNaN)).toBe(true);
  });
});

describe('rotationAbout (Rodrigues)', () => {
  it('turns x̂ to ŷ by a quarter turn about ẑ (right-hand rule)', () => {
    expect(close(matVec(rotationAbout([0, 0, 1], Math.PI / 2), [1, 0, 0]), [0, 1, 0], 1e-16)).toBe(true);
    expect(close(matVec(rotationAbout([1, 0, 0], Math.PI / 2), [0, 1, 0]), [0, 0, 1], 1e-16)).toBe(true);
  });
  it('matches quaternion rotation for arbitrary axes and angles, and is orthonormal with det +1', () => {
    const axes: Vec3[] = [[1, 2, 3], [-0.5, 0.1, 0.9], [0, 0, -4], [1e-3, 1, 0]];
    const v: Vec3 = [0.7, -0.2, 1.3];
    for (const ax of axes) {
      for (const ang of [-3, -0.4, 0, 0.01, 1.7, 6.2, 40]) {
        const R = rotationAbout(ax, ang);
        expect(close(matVec(R, v), quatRotate(ax, ang, v), 1e-14)).toBe(true);
        expect(close(matMul(transpose(R), R), identity3(), 1e-14)).toBe(true); // a few ulps of 1
        const det = dot(matColumn(R, 0), cross(matColumn(R, 1), matColumn(R, 2)));
        expect(Math.abs(det - 1)).toBeLessThan(1e-14);
        expect(close(matVec(R, normalize(ax)), normalize(ax), 1e-14)).toBe(true); // the axis is fixed
      }
    }
  });
  it('composes angles about one axis: R(a)·R(b) = R(a + b)', () => {
    const ax: Vec3 = [0.2, -0.3, 0.5];
    expect(close(matMul(rotationAbout(ax, 0.4), rotationAbout(ax, 1.1)), rotationAbout(ax, 1.5), 1e-15)).toBe(true);
  });
});

describe('matrices', () => {
  const A: Mat3 = [1, 2, 3, 4, 5, 6, 7, 8, 10];
  const B: Mat3 = [2, 0, 1, -1, 3, 0, 0, 1, 1];
  it('matMul and matVec agree with hand-computed products', () => {
    // row 0 of A·B: [1·2+2·(−1)+3·0, 1·0+2·3+3·1, 1·1+2·0+3·1] = [0, 9, 4]
    expect(matMul(A, B)).toEqual([0, 9, 4, 3, 21, 10, 6, 34, 17]);
    expect(matVec(A, [1, -1, 2])).toEqual([5, 11, 19]);
    expect(matMul(A, identity3())).toEqual(A);
  });
  it('transpose swaps rows and columns; (AB)ᵀ = BᵀAᵀ', () => {
    expect(transpose(A)).toEqual([1, 4, 7, 2, 5, 8, 3, 6, 10]);
    expect(transpose(matMul(A, B))).toEqual(matMul(transpose(B), transpose(A)));
  });
  it('matColumn and matFromColumns are inverse', () => {
    const m = matFromColumns(matColumn(A, 0), matColumn(A, 1), matColumn(A, 2));
    expect(m).toEqual(A);
    expect(matColumn(A, 1)).toEqual([2, 5, 8]);
  });
});
