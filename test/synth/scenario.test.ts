import { describe, expect, it } from 'vitest';
import { sampleScenario, type ScenarioRanges } from '../../src/synth/scenario.ts';

const ranges: ScenarioRanges = {
  captureFps: 1000, width: 640, height: 480, coinDiameterM: 0.02426, coinThicknessM: 0.00175,
  launchSpeedMS: [1.5, 3.5], spinRevS: [15, 60], precessionDeg: [50, 90], tiltDeg: 'precession',
  rollDeg: [-5, 5], depthSpeedMS: [-0.1, 0.1], distanceM: 0.6, focalPx: 554.26, startFace: 'random', tosserCount: 3, hand: true,
};
const DEG = Math.PI / 180;

describe('sampleScenario', () => {
  it('is deterministic and depends only on (seed, clip index), not on the other clips', () => {
    expect(sampleScenario(ranges, 7, 3)).toEqual(sampleScenario(ranges, 7, 3));
    expect(sampleScenario(ranges, 7, 3)).not.toEqual(sampleScenario(ranges, 7, 4));
    expect(sampleScenario(ranges, 7, 3)).not.toEqual(sampleScenario(ranges, 8, 3));
  });

  it('draws every value inside its range, and the tilt equals ψ by default (the normal starts vertical)', () => {
    const faces = new Set<string>();
    for (let k = 0; k < 200; k++) {
      const s = sampleScenario(ranges, 1, k);
      expect(s.launchVelocityMS[2]).toBeGreaterThanOrEqual(1.5);
      expect(s.launchVelocityMS[2]).toBeLessThanOrEqual(3.5);
      expect(s.spinRevS).toBeGreaterThanOrEqual(15);
      expect(s.spinRevS).toBeLessThanOrEqual(60);
      expect(s.precessionRad).toBeGreaterThanOrEqual(50 * DEG);
      expect(s.precessionRad).toBeLessThanOrEqual(90 * DEG);
      expect(s.tiltRad).toBe(s.precessionRad);
      expect(Math.abs(s.cameraRollRad)).toBeLessThanOrEqual(5 * DEG);
      expect(Math.abs(s.launchVelocityMS[1])).toBeLessThanOrEqual(0.1);
      // the catch height is below the apex, so the centre comes back to it
      expect(s.catchDzM).toBeLessThan((s.launchVelocityMS[2] ** 2) / (2 * 9.80665));
      faces.add(s.startFace);
    }
    expect([...faces].sort()).toEqual(['heads', 'tails']);
  });

  it('assigns tossers T01..Tn in turn and names tosses toss-0001, ...', () => {
    expect([0, 1, 2, 3].map((k) => sampleScenario(ranges, 1, k).tosser)).toEqual(['T01', 'T02', 'T03', 'T01']);
    expect(sampleScenario(ranges, 1, 11).tossId).toBe('toss-0012');
  });

  it('puts the release in the lower part of the frame (74–80 % down)', () => {
    for (let k = 0; k < 20; k++) {
      const s = sampleScenario(ranges, 2, k);
      const v = 239.5 + (s.focalPx * s.cameraHeightM) / s.cameraDistanceM; // the release is level, at depth D
      expect(v / 479).toBeGreaterThanOrEqual(0.74 - 1e-12);
      expect(v / 479).toBeLessThanOrEqual(0.8 + 1e-12);
    }
  });

  it('honours a given tilt range, a fixed start face and no hand (no hold phase)', () => {
    const s = sampleScenario({ ...ranges, tiltDeg: [10, 10], startFace: 'tails', hand: false }, 1, 0);
    expect(s.tiltRad).toBeCloseTo(10 * DEG, 15);
    expect(s.startFace).toBe('tails');
    expect(s.restBeforeS).toBe(0);
    expect(s.holdRiseM).toBe(0);
  });
});
