import { describe, expect, it } from 'vitest';
import { parseTruth, serializeTruth, TruthSchema, type Truth } from '../../src/synth/truth.ts';
import { computeTruth } from '../../src/synth/clipTruth.ts';
import { buildMotion } from '../../src/synth/motion.ts';
import { sampleScenario } from '../../src/synth/scenario.ts';
import { resolveSynthOptions } from '../../src/synth/options.ts';
import { scenarioCamera, scenarioRanges } from '../../src/synth/study.ts';
import { frameCount } from '../../src/synth/render.ts';

function truthOf(seed: number): Truth {
  const o = resolveSynthOptions({ outDir: 'x', seed, captureFps: 240 });
  const sc = sampleScenario(scenarioRanges(o), seed, 0);
  const m = buildMotion(sc);
  return computeTruth(m, scenarioCamera(sc), {
    file: 'toss-0001.mp4', containerFps: 30, framesTotal: frameCount(m), background: 'textured',
    exposureFraction: 0.5, noiseSigma: 2, codec: 'h264', seed,
  });
}

describe('serializeTruth', () => {
  it('round-trips through parseTruth with every number within 10 significant digits', () => {
    const t = truthOf(2);
    const back = parseTruth(serializeTruth(t));
    expect(back.frames).toHaveLength(t.frames.length);
    const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(5e-10 * Math.abs(b) + 1e-300);
    close(back.flight_time_s, t.flight_time_s);
    close(back.px_per_m, t.px_per_m);
    const k = Math.floor(t.frames.length / 2);
    for (let i = 0; i < 3; i++) close(back.frames[k].normal_world[i], t.frames[k].normal_world[i]);
    close(back.frames[k].ellipse!.major, t.frames[k].ellipse!.major);
  });

  it('writes the keys in the schema order whatever the order of the record, and the same bytes each time', () => {
    const t = truthOf(3);
    const shuffled = Object.fromEntries(Object.entries(t).reverse()) as Truth;
    const a = serializeTruth(t);
    expect(serializeTruth(shuffled)).toBe(a);
    expect(Object.keys(JSON.parse(a))).toEqual(Object.keys(TruthSchema.shape));
    expect(a.endsWith('\n')).toBe(true);
    expect(a.split('\n').filter((l) => l.startsWith('    {"frame":'))).toHaveLength(t.frames.length);
  });

  it('rejects a record that breaks the schema (naming the field)', () => {
    const t = truthOf(4);
    expect(() => serializeTruth({ ...t, start_face: 'edge' as never })).toThrow(/start_face/);
    expect(() => parseTruth('{"toss_id": 3}')).toThrow(/toss_id/);
  });

  it('folds the precession into 0..90 and keeps the unfolded ψ of the heads normal', () => {
    for (let seed = 10; seed < 16; seed++) {
      const t = truthOf(seed);
      expect(t.precession_deg).toBeGreaterThanOrEqual(0);
      expect(t.precession_deg).toBeLessThanOrEqual(90);
      expect(Math.min(t.heads_psi_deg, 180 - t.heads_psi_deg)).toBeCloseTo(t.precession_deg, 9);
      expect(t.heads_psi_deg > 90).toBe(t.start_face === 'tails'); // the start face's normal is within 90° of L
    }
  });
});
