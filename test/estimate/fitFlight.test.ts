import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY } from '../../src/physics/index.ts';
import { fitFlight } from '../../src/estimate/fitFlight.ts';

/**
 * The metric flight fit against the closed forms of ballistic flight and the gravity-implied frame rate
 * f · sqrt(g / a) (DESIGN §5): a track rendered with a wrong time base (stated 960 frames/s, true 1000) must give
 * back the true rate; a camera rolled by 5° must be reported as such.
 */
function flight(trueFps: number, statedFps: number, rollDeg: number) {
  const u = 2.5;
  const pxPerM = 1500;
  const roll = (rollDeg * Math.PI) / 180;
  const tS: number[] = [];
  const uPx: number[] = [];
  const vPx: number[] = [];
  for (let k = 0; k < 450; k++) {
    const tTrue = k / trueFps;
    const z = u * tTrue - 0.5 * STANDARD_GRAVITY * tTrue * tTrue; // height above release, m
    const x = 0.05 * tTrue;
    // Image (x right, y down) of a scene turned clockwise by the roll: down (0, 1) becomes (−sin ρ, cos ρ).
    const dx = x;
    const dy = -z;
    tS.push(k / statedFps);
    uPx.push(320 + pxPerM * (dx * Math.cos(roll) - dy * Math.sin(roll)));
    vPx.push(240 + pxPerM * (dx * Math.sin(roll) + dy * Math.cos(roll)));
  }
  return fitFlight({ tS, uPx, vPx, pxPerM: tS.map(() => pxPerM), u0: 320, v0: 240, releaseTS: 0, catchTS: tS[tS.length - 1], captureFps: statedFps, gravity: STANDARD_GRAVITY, pxPerMRelSe: 0 });
}

describe('fitFlight', () => {
  it('recovers the launch speed, the apex u²/2g and the true frame rate from gravity (stated 960, true 1000)', () => {
    const f = flight(1000, 960, 0);
    expect(f.ok).toBe(true);
    if (!f.ok) return;
    expect(f.gravityFps).toBeCloseTo(1000, 6);
    // With the stated (wrong) time base, speeds scale by 1000/960: the launch speed in that base is 2.5·960/1000.
    expect(f.launchSpeedMS).toBeCloseTo((2.5 * 960) / 1000, 6);
    expect(Math.abs(f.rollRad)).toBeLessThan(1e-9);
  });

  it('reports a camera rolled by 5° and measures the same launch speed as a level one', () => {
    const level = flight(1000, 1000, 0);
    const rolled = flight(1000, 1000, 5);
    expect(level.ok && rolled.ok).toBe(true);
    if (!level.ok || !rolled.ok) return;
    expect((rolled.rollRad * 180) / Math.PI).toBeCloseTo(5, 6);
    expect(rolled.launchSpeedMS).toBeCloseTo(level.launchSpeedMS, 9);
    expect(level.apexHeightM).toBeCloseTo((2.5 * 2.5) / (2 * STANDARD_GRAVITY), 6);
  });
});
