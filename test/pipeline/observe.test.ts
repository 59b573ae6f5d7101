/**
 * observeClip: the per-frame observations of a rendered clip are the ones behind measureClip's frame rows,
 * stopping early ends the decode, a missing file is a VideoError naming it, and a tracker that holds frames
 * back (returns none or several per push and the rest from flush()) still yields every frame once, in order.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { measureClip, type ClipJob } from '../../src/pipeline/clip.ts';
import { observeClip } from '../../src/pipeline/observe.ts';
import { renderStudy, type StudyClip } from '../../src/synth/index.ts';
import { isVideoError } from '../../src/video/index.ts';
import type { FrameObservation } from '../../src/vision/index.ts';

/** When set, createTracker returns a tracker that lags by `lag` frames and hands them out in pairs. */
const lagging = vi.hoisted(() => ({ lag: 0 }));
vi.mock('../../src/vision/index.ts', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/vision/index.ts')>();
  return {
    ...real,
    createTracker: (opts?: Parameters<typeof real.createTracker>[0]) => {
      const inner = real.createTracker(opts);
      if (lagging.lag === 0) return inner;
      // Works over either tracker API: push → observation, or push → observation | null plus flush().
      const base = inner as unknown as { push(f: unknown): FrameObservation | null; flush?: () => FrameObservation[] };
      const held: FrameObservation[] = [];
      return {
        push(frame: unknown) {
          const o = base.push(frame);
          if (o) held.push(o);
          return held.length > lagging.lag ? held.splice(0, held.length % 2 === 0 ? 2 : 1) : null;
        },
        flush: () => [...held.splice(0), ...(base.flush?.() ?? [])],
      };
    },
  };
});

let root = '';
let clip: StudyClip;

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tossmeter-observe-'));
  ({ clips: [clip] } = await renderStudy({ outDir: root, count: 1, seed: 5, width: 320, height: 240, captureFps: 500, launchSpeedMS: [1.4, 1.4], supersampling: 1, subExposures: 2 }));
}, 60_000);
afterAll(() => rm(root, { recursive: true, force: true }));

async function collect(iter: AsyncIterable<FrameObservation>): Promise<FrameObservation[]> {
  const out: FrameObservation[] = [];
  for await (const o of iter) out.push(o);
  return out;
}

describe('observeClip', () => {
  it('yields one observation per frame, 0..n-1, the same ellipses measureClip writes into its frame rows', async () => {
    const obs = await collect(observeClip(clip.file));
    expect(obs.map((o) => o.frame)).toEqual(Array.from({ length: clip.truth.frames_total }, (_, i) => i)); // the renderer's frame count
    expect(obs.filter((o) => o.detected).length).toBeGreaterThan(obs.length / 2);
    const job: ClipJob = {
      file: clip.file, displayFile: basename(clip.file), tossId: clip.truth.toss_id, tosser: null, captureFps: 500, fpsSource: 'option',
      coinDiameterMm: 24.26, coinThicknessMm: 1.75, scaleSource: 'option', focalPx: null, startFace: null, observedFace: null,
      landing: null, notes: null, gravity: 9.80665,
    };
    const { frames } = await measureClip(job);
    expect(frames).toHaveLength(obs.length);
    frames.forEach((row, i) => {
      expect(row.detected).toBe(obs[i].detected);
      expect(row.cx_px).toBe(obs[i].detected ? obs[i].cx : null);
      expect(row.major_px).toBe(obs[i].detected ? obs[i].major : null);
      expect(row.method).toBe(obs[i].method);
    });
  });

  it('stopping after 5 frames ends the iteration (ffmpeg is stopped, no hang)', async () => {
    const first: number[] = [];
    for await (const o of observeClip(clip.file)) {
      first.push(o.frame);
      if (first.length === 5) break;
    }
    expect(first).toEqual([0, 1, 2, 3, 4]);
  });

  it('a missing file is a VideoError that names it', async () => {
    const missing = join(root, 'nope.mp4');
    const err = await collect(observeClip(missing)).then(() => null, (e: unknown) => e);
    expect(isVideoError(err)).toBe(true);
    expect((err as Error).message).toContain(missing);
  });

  it('with a tracker that lags 3 frames and returns pairs, every frame still comes out once and in order (flush at the end)', async () => {
    const direct = await collect(observeClip(clip.file));
    lagging.lag = 3;
    try {
      const lagged = await collect(observeClip(clip.file));
      expect(lagged.map((o) => o.frame)).toEqual(direct.map((o) => o.frame));
      expect(lagged.map((o) => o.cx)).toEqual(direct.map((o) => o.cx));
    } finally {
      lagging.lag = 0;
    }
  });
});
