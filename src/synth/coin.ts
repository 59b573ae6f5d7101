/**
 * Ray casting of the coin, a solid cylinder (two textured faces and a knurled rim), with
 * Lambert plus Blinn–Phong shading under one fixed directional light.
 * A pose is prepared once per sub-exposure; each sample is then a ray–cylinder intersection
 * in the coin's body frame (z along the heads normal, faces at z = ±h/2).
 *
 * References:
 * [1] "Models of light reflection for computer synthesized pictures", SIGGRAPH Computer
 *     Graphics 11(2), 1977. DOI 10.1145/965141.563893 (the half-vector specular term).
 */
import { matVec, normalize, sub, transpose, type Mat3, type Vec3 } from '../physics/index.ts';
import type { PinholeCamera } from './camera.ts';

/** Direction towards the light, world (upper left, towards the camera's side). */
export const LIGHT_DIR_WORLD: Vec3 = normalize([-0.35, -0.8, 0.5]);

const AMBIENT = 0.5;
const DIFFUSE = 0.5;
const SPECULAR = 0.25;
const SHININESS = 24;

/** Albedo of the heads face at body coordinates (x, y) / radius: concentric rings, a bright border and a bar. */
export function headsAlbedo(x: number, y: number): number {
  const r2 = x * x + y * y;
  if (r2 > 0.81) return 0.97; // raised border
  if (Math.abs(y) < 0.1 && Math.abs(x) < 0.55) return 0.98; // a bar: shows the turn about the axis
  const r = Math.sqrt(r2);
  const ring = Math.cos(2 * Math.PI * 4 * r);
  return 0.86 + 0.08 * ring;
}

/** Albedo of the tails face at body coordinates (x, y) / radius: twelve radial spokes around a disc. */
export function tailsAlbedo(x: number, y: number): number {
  const r2 = x * x + y * y;
  if (r2 > 0.81) return 0.62;
  if (r2 < 0.09) return 0.64;
  const spokes = Math.cos(12 * Math.atan2(y, x));
  return 0.54 + 0.07 * spokes;
}

/** Albedo of the knurled rim at angle φ (rad) around it: dark with fine ridges. */
export function rimAlbedo(phi: number): number {
  return Math.sin(120 * phi) > 0 ? 0.42 : 0.3;
}

/** A coin pose prepared for ray casting (one sub-exposure). */
export interface CoinPose {
  /** Camera-ray direction (X/Z, Y/Z, 1) → body-frame direction. */
  m: Mat3;
  /** Camera centre in the body frame, m. */
  o: Vec3;
  radiusM: number;
  halfThicknessM: number;
  /** Shade factor (ambient + diffuse) and specular level of the heads and tails faces. */
  headsShade: number;
  headsSpec: number;
  tailsShade: number;
  tailsSpec: number;
  /** Light and half vector in the body frame (for the rim). */
  lightB: Vec3;
  halfB: Vec3;
  /** Conservative pixel bounding box [x0, y0, x1, y1] (may lie outside the image). */
  bbox: [number, number, number, number];
}

/** Prepares the coin at `center` (m) with attitude `attitude` (body → world) for {@link castCoinSample}. */
export function prepareCoinPose(
  cam: PinholeCamera,
  center: Vec3,
  attitude: Mat3,
  radiusM: number,
  thicknessM: number,
): CoinPose {
  const rt = transpose(attitude); // world → body
  const camToWorld = transpose(cam.worldToCam);
  const m = mul(rt, camToWorld);
  const o = matVec(rt, sub(cam.centerWorld, center));
  const lightB = matVec(rt, LIGHT_DIR_WORLD);
  const viewB = normalize(o); // towards the camera (constant over the small coin)
  const halfB = normalize([lightB[0] + viewB[0], lightB[1] + viewB[1], lightB[2] + viewB[2]]);
  const spec = (c: number): number => (c > 0 ? SPECULAR * Math.pow(c, SHININESS) : 0);
  const shade = (c: number): number => AMBIENT + DIFFUSE * Math.max(0, c);
  // bounding box of the projected bounding sphere
  const cc = matVec(cam.worldToCam, sub(center, cam.centerWorld));
  const rb = Math.hypot(radiusM, thicknessM / 2);
  let bbox: [number, number, number, number] = [1, 1, 0, 0]; // empty
  if (cc[2] > rb * 1.01) {
    const u = (cam.focalPx * cc[0]) / cc[2] + cam.u0;
    const v = (cam.focalPx * cc[1]) / cc[2] + cam.v0;
    const off = Math.hypot(cc[0], cc[1]) / cc[2];
    const half = ((cam.focalPx * rb) / (cc[2] - rb)) * (1 + off * off) + 2;
    bbox = [Math.floor(u - half), Math.floor(v - half), Math.ceil(u + half), Math.ceil(v + half)];
  }
  return {
    m,
    o,
    radiusM,
    halfThicknessM: thicknessM / 2,
    headsShade: shade(lightB[2]),
    headsSpec: spec(halfB[2]),
    tailsShade: shade(-lightB[2]),
    tailsSpec: spec(-halfB[2]),
    lightB,
    halfB,
    bbox,
  };
}

function mul(a: Mat3, b: Mat3): Mat3 {
  const r = new Array<number>(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) r[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  }
  return r as unknown as Mat3;
}

/**
 * Casts the camera ray through normalised image coordinates `(xn, yn)` = ((u − u0)/f, (v − v0)/f)
 * at the coin; returns the gray level (0..255, not clamped) of the hit, or −1 for a miss.
 */
export function castCoinSample(pose: CoinPose, xn: number, yn: number): number {
  const m = pose.m;
  const dx = m[0] * xn + m[1] * yn + m[2];
  const dy = m[3] * xn + m[4] * yn + m[5];
  const dz = m[6] * xn + m[7] * yn + m[8];
  const [ox, oy, oz] = pose.o;
  const a = pose.radiusM;
  const h = pose.halfThicknessM;
  let tBest = Infinity;
  let kind = 0; // 1 heads, 2 tails, 3 rim
  let hx = 0;
  let hy = 0;
  // the face towards the camera
  if (oz > h && dz < 0) {
    const t = (h - oz) / dz;
    const x = ox + t * dx;
    const y = oy + t * dy;
    if (x * x + y * y <= a * a) {
      tBest = t;
      kind = 1;
      hx = x;
      hy = y;
    }
  } else if (oz < -h && dz > 0) {
    const t = (-h - oz) / dz;
    const x = ox + t * dx;
    const y = oy + t * dy;
    if (x * x + y * y <= a * a) {
      tBest = t;
      kind = 2;
      hx = x;
      hy = y;
    }
  }
  // the rim: |o_xy + t d_xy| = a, first root, |z| ≤ h
  const A = dx * dx + dy * dy;
  if (A > 0 && h > 0) {
    const B = ox * dx + oy * dy;
    const C = ox * ox + oy * oy - a * a;
    const disc = B * B - A * C;
    if (disc >= 0) {
      const t = (-B - Math.sqrt(disc)) / A;
      if (t > 0 && t < tBest) {
        const z = oz + t * dz;
        if (z <= h && z >= -h) {
          tBest = t;
          kind = 3;
          hx = ox + t * dx;
          hy = oy + t * dy;
        }
      }
    }
  }
  if (kind === 0) return -1;
  if (kind === 1) return 255 * (headsAlbedo(hx / a, hy / a) * pose.headsShade + pose.headsSpec);
  if (kind === 2) return 255 * (tailsAlbedo(hx / a, -hy / a) * pose.tailsShade + pose.tailsSpec);
  const nx = hx / a;
  const ny = hy / a;
  const l = pose.lightB;
  const hb = pose.halfB;
  const diff = nx * l[0] + ny * l[1];
  const sp = nx * hb[0] + ny * hb[1];
  const shade = 0.35 + 0.65 * Math.max(0, diff); // the rim sits in its own shadow more than the faces
  return 255 * (rimAlbedo(Math.atan2(ny, nx)) * shade + (sp > 0 ? 0.5 * SPECULAR * Math.pow(sp, SHININESS) : 0));
}

