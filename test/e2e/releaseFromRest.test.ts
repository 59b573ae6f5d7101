/**
 * A coin that rests in a still hand until it is lifted and thrown is part of the background model until then: the
 * release is found by following it back from its flight, by block matching, into the hand that carries it. Two
 * rendered clips of the benchmark's kind (the renderer's truth is the reference): a coin carried over the fingers
 * it rested against, of about its own gray, which it no longer differs from (1280x720 at 1000 frames/s), and a
 * small coin merged with the fingertips for 7 frames after the release (640x480 at 2000 frames/s). Both were
 * `release_unseen` before the back-fill took a coin that moved rigidly for a carried one, and coasted for as long
 * as the coin takes to move half its diameter rather than for 6 frames.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { measureStudy } from '../../src/pipeline/study.ts';
import { renderStudy } from '../../src/synth/index.ts';
import { compareWithTruth } from '../helpers/compareTruth.ts';

let dir = '';
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('release from a coin at rest in the hand', () => {
  const cases = [
    { name: 'hd1000', width: 1280, height: 720, captureFps: 1000, seed: 101, startIndex: 0 },
    { name: 'vga2000', width: 640, height: 480, captureFps: 2000, seed: 202, startIndex: 5 },
  ];
  it.each(cases)('places the release within a frame and measures the toss ($name)', async (c) => {
    dir = dir || (await mkdtemp(join(tmpdir(), 'tossmeter-rest-')));
    const clips = join(dir, c.name);
    await renderStudy({
      outDir: clips, count: 1, startIndex: c.startIndex, seed: c.seed, width: c.width, height: c.height,
      captureFps: c.captureFps, launchSpeedMS: [2.4, 2.6],
    });
    await measureStudy({ input: clips, out: join(dir, `${c.name}-results`) });
    const [row] = await compareWithTruth(join(dir, `${c.name}-results`), clips);
    expect(row.flags).not.toContain('release_unseen');
    expect(row.status).toBe('ok');
    // The measure issue's tolerances: release and flight time within 1 frame.
    expect(Math.abs(row.releaseFrames ?? Infinity)).toBeLessThan(1);
    expect(Math.abs(row.flightTimeFrames ?? Infinity)).toBeLessThan(1);
    expect(row.faceChangesOk).toBe(true);
  }, 180_000);
});
