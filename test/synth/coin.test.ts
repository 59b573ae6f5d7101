import { describe, expect, it } from 'vitest';
import { castCoinSample, headsAlbedo, prepareCoinPose, tailsAlbedo } from '../../src/synth/coin.ts';
import { createCamera, projectCircle } from '../../src/synth/camera.ts';
import { cross, matFromColumns, normalize, type Vec3 } from '../../src/physics/index.ts';

const cam = createCamera({ focalPx: 900, width: 640, height: 480, centerWorld: [0, -0.6, 0.1] });

function attitude(n: Vec3) {
  const z = normalize(n);
  const x = normalize(cross(z, Math.abs(z[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0]));
  return matFromColumns(x, cross(z, x), z);
}

describe('castCoinSample', () => {
  it('hits a thin coin exactly inside its perspective ellipse (points 0.2 px inside hit, 0.2 px outside miss)', () => {
    // the ellipse is the conic of "Three-dimensional location estimation of circular features for machine
    // vision", IEEE Transactions on Robotics and Automation 8(5), 1992
    for (const n of [[0, -1, 0.3], [0.5, -0.7, 0.6], [0, -0.2, 1], [-0.8, -0.3, -0.5]] as Vec3[]) {
      const center: Vec3 = [0.05, 0.02, 0.15];
      const pose = prepareCoinPose(cam, center, attitude(n), 0.012, 1e-6);
      const e = projectCircle(cam, center, n, 0.012)!;
      for (let k = 0; k < 36; k++) {
        const th = (2 * Math.PI * k) / 36;
        // boundary point of the ellipse in direction th (parametric), then 0.2 px in/out along the radius
        const ca = Math.cos(e.angleRad);
        const sa = Math.sin(e.angleRad);
        const px = (e.major / 2) * Math.cos(th);
        const py = (e.minor / 2) * Math.sin(th);
        const bx = e.cx + px * ca - py * sa;
        const by = e.cy + px * sa + py * ca;
        const rx = bx - e.cx;
        const ry = by - e.cy;
        const len = Math.hypot(rx, ry);
        const at = (s: number) => castCoinSample(pose, (bx + (s * rx) / len - cam.u0) / cam.focalPx, (by + (s * ry) / len - cam.v0) / cam.focalPx);
        expect(at(-0.2)).toBeGreaterThanOrEqual(0);
        expect(at(0.2)).toBe(-1);
      }
      // and the bounding box contains the ellipse
      expect(pose.bbox[0]).toBeLessThanOrEqual(e.cx - e.major / 2);
      expect(pose.bbox[2]).toBeGreaterThanOrEqual(e.cx + e.major / 2);
    }
  });

  it('shows the rim of a thick coin seen edge-on, and the face towards the camera otherwise', () => {
    const center: Vec3 = [0, 0, 0.1]; // level with the camera: the ray to the centre is along +y
    const edgeOn = prepareCoinPose(cam, center, attitude([0, 0, 1]), 0.012, 0.002);
    const g = castCoinSample(edgeOn, 0, 0);
    expect(g).toBeGreaterThan(0);
    const faceOn = prepareCoinPose(cam, center, attitude([0, -1, 0]), 0.012, 0.002); // heads towards the camera
    const backOn = prepareCoinPose(cam, center, attitude([0, 1, 0]), 0.012, 0.002); // tails towards the camera
    // off the bar and the rings' bright phase, at body radius 0.3: heads brighter than tails there
    const xn = (0.3 * 0.012) / 0.6;
    expect(castCoinSample(faceOn, xn * 0.7, xn * 0.7)).toBeGreaterThan(castCoinSample(backOn, xn * 0.7, xn * 0.7));
  });

  it('has face textures in [0, 1] with heads brighter on average than tails', () => {
    let h = 0;
    let t = 0;
    let n = 0;
    for (let i = -20; i <= 20; i++) {
      for (let j = -20; j <= 20; j++) {
        const x = i / 20;
        const y = j / 20;
        if (x * x + y * y > 1) continue;
        const a = headsAlbedo(x, y);
        const b = tailsAlbedo(x, y);
        expect(a >= 0 && a <= 1 && b >= 0 && b <= 1).toBe(true);
        h += a;
        t += b;
        n += 1;
      }
    }
    expect(h / n - t / n).toBeGreaterThan(0.2);
  });
});
