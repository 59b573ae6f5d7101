/**
 * Frame timestamps from the container (`probeFrameTimes`) on a Matroska file, whose time base is 1 ms (Matroska
 * specification, TimestampScale default 1,000,000 ns; from memory): at 30 frames/s the steps are 33 and 34 ms, so
 * a grid taken from the rounded step drifts. Clips are made here with the bundled ffmpeg: frames written at a
 * known rate, then some removed by ffmpeg's `select` filter with variable-rate output, which leaves their slots
 * empty.
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encodeFrames, ffmpegPath, probeFrameTimes, runChild } from '../../src/video/index.ts';
import { smoothGrayFrame, tempDir } from './fixtures.ts';

let dir = '';
let cleanup: () => Promise<void> = async () => {};

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('tossmeter-frametimes-'));
  const frames = Array.from({ length: 150 }, (_, k) => smoothGrayFrame(96, 64, k));
  await encodeFrames(join(dir, 'src.mp4'), frames, { width: 96, height: 64, pixFmt: 'gray', containerFps: 30, codec: 'h264', preset: 'ultrafast' });
  const remux = async (out: string, extra: string[]) => {
    const r = await runChild(ffmpegPath(), ['-v', 'error', '-i', `file:${join(dir, 'src.mp4')}`, ...extra, '-c:v', 'mpeg4', '-q:v', '5', '-y', `file:${join(dir, out)}`]);
    expect(r.code).toBe(0);
  };
  await remux('whole.mkv', []);
  await remux('gaps.mkv', ['-vf', "select='not(eq(n\\,40)+eq(n\\,41)+eq(n\\,100))'", '-vsync', 'vfr']);
}, 120_000);

afterAll(async () => {
  await cleanup();
});

describe('probeFrameTimes on a container with millisecond timestamps', () => {
  it('finds no frame dropped in a whole 30 frames/s clip (steps of 33 and 34 ms)', async () => {
    const t = await probeFrameTimes(join(dir, 'whole.mkv'), 30);
    expect(t.ptsS.length).toBe(150);
    const steps = new Set(Array.from(t.ptsS.slice(1), (v, i) => Math.round((v - t.ptsS[i]) * 1000)));
    expect([...steps].sort()).toEqual([33, 34]);
    expect(t.dropped).toBe(0);
    expect(t.repeated).toBe(0);
    expect(Array.from(t.slot)).toEqual(Array.from({ length: 150 }, (_, i) => i));
  });

  it('finds exactly the 3 frames removed, in their slots', async () => {
    const t = await probeFrameTimes(join(dir, 'gaps.mkv'), 30);
    expect(t.ptsS.length).toBe(147);
    expect(t.dropped).toBe(3);
    const slots = Array.from(t.slot);
    expect(slots.includes(40) || slots.includes(41) || slots.includes(100)).toBe(false);
    expect(slots[slots.length - 1]).toBe(149);
  });
});
