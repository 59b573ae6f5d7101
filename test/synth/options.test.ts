import { describe, expect, it } from 'vitest';
import { focalFromFov, resolveSynthOptions, SYNTH_DEFAULTS } from '../../src/synth/options.ts';

describe('resolveSynthOptions', () => {
  it('fills in the documented defaults, with the focal length of a 60° horizontal field of view', () => {
    const o = resolveSynthOptions({ outDir: 'out' });
    expect(o.captureFps).toBe(1000);
    expect(o.containerFps).toBe(30);
    expect([o.width, o.height]).toEqual([640, 480]);
    expect([o.coinDiameterMm, o.coinThicknessMm]).toEqual([24.26, 1.75]);
    expect(o.launchSpeedMS).toEqual([1.5, 3.5]);
    expect(o.spinRevS).toEqual([15, 60]);
    expect(o.precessionDeg).toEqual([50, 90]);
    expect(o.tiltDeg).toBe('precession');
    expect(o.exposureFraction).toBe(0.5);
    expect(o.noiseSigma).toBe(2);
    expect(o.hand).toBe(true);
    expect(o.distanceM).toBe(0.6);
    // pinhole: f = (W/2)/tan(hfov/2) (common practice); 320/tan 30° = 554.2562584...
    expect(o.focalPx).toBeCloseTo(554.2562584220407, 9);
    expect(focalFromFov(1280, 90)).toBeCloseTo(640, 12);
    expect(SYNTH_DEFAULTS.count).toBe(o.count);
  });

  it('names the CLI flag and what was expected in every error', () => {
    expect(() => resolveSynthOptions({ outDir: '' })).toThrow('Expected a folder name for --out but received ""');
    expect(() => resolveSynthOptions({ outDir: 'o', exposureFraction: 1.5 })).toThrow('Expected a fraction of the frame interval from 0 to 1 for --exposure but received "1.5"');
    expect(() => resolveSynthOptions({ outDir: 'o', precessionDeg: [10, 100] })).toThrow(/for --precession but received "10:100"/);
    expect(() => resolveSynthOptions({ outDir: 'o', width: 641 })).toThrow(/even width and height for H.264/);
    expect(resolveSynthOptions({ outDir: 'o', width: 641, lossless: true }).width).toBe(641);
    expect(() => resolveSynthOptions({ outDir: 'o', lossless: true, containerFps: 2000 })).toThrow(/--container-fps/);
    expect(() => resolveSynthOptions({ outDir: 'o', background: 'white' as never })).toThrow('Expected "textured" or "plain" for --background but received "white"');
  });
});
