import { readdir, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decodeFrames } from '../../src/video/decode.ts';
import { encodeFrames } from '../../src/video/encode.ts';
import { probeVideo } from '../../src/video/probe.ts';
import { UsageError } from '../../src/errors.ts';
import { noiseFrame, smoothGrayFrame, tempDir } from './fixtures.ts';

let dir = '';
let cleanup: () => Promise<void> = async () => {};
beforeAll(async () => ({ dir, cleanup } = await tempDir()));
afterAll(() => cleanup());

async function decodeAll(file: string, pixFmt: 'gray' | 'rgb24'): Promise<Uint8Array[]> {
  const out: Uint8Array[] = [];
  for await (const f of decodeFrames(file, { pixFmt })) out.push(f.data);
  return out;
}

describe('encodeFrames', () => {
  it('ffv1 gray round trip is byte-identical (FFV1 is lossless: "FFV1 Video Coding Format Versions 0, 1, and 3", RFC 9043, IETF, 2021)', async () => {
    // 94x50: a frame of 4700 bytes, which no pipe chunk size divides.
    const w = 94, h = 50, n = 25;
    const frames = Array.from({ length: n }, (_, k) => noiseFrame(w * h, k + 1));
    const file = join(dir, 'noise gray.mkv');
    await encodeFrames(file, frames, { width: w, height: h, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
    const back = await decodeAll(file, 'gray');
    expect(back.length).toBe(n);
    for (let k = 0; k < n; k++) expect(Buffer.compare(back[k], frames[k])).toBe(0);
  });

  it('ffv1 rgb24 round trip is byte-identical (RFC 9043; RGB stored as bgr0, a permutation)', async () => {
    const w = 33, h = 21, n = 7;
    const frames = Array.from({ length: n }, (_, k) => noiseFrame(w * h * 3, 100 + k));
    const file = join(dir, 'noise rgb.mkv');
    await encodeFrames(file, frames, { width: w, height: h, pixFmt: 'rgb24', containerFps: 25, codec: 'ffv1' });
    const back = await decodeAll(file, 'rgb24');
    expect(back.length).toBe(n);
    for (let k = 0; k < n; k++) expect(Buffer.compare(back[k], frames[k])).toBe(0);
  });

  it('h264 (crf 18) round trip of a smooth pattern stays close: mean abs error below 2 gray levels, PSNR above 38 dB', async () => {
    // Tolerance: crf 18 is near "visually lossless" for x264 and such encodes usually land above
    // 40 dB PSNR (common practice, no source; from memory; measured here: 1.05 levels, 43.6 dB).
    // Gray -> limited-range yuv420p -> gray alone costs up to 1 level of rounding; the bounds leave
    // room for coding error on the disc's sharp edge and still catch a shifted, swapped or wrong frame.
    const w = 96, h = 64, n = 20;
    const frames = Array.from({ length: n }, (_, k) => smoothGrayFrame(w, h, k));
    const file = join(dir, 'smooth.mp4');
    await encodeFrames(file, frames, { width: w, height: h, pixFmt: 'gray', containerFps: 30, codec: 'h264', preset: 'veryfast' });
    const back = await decodeAll(file, 'gray');
    expect(back.length).toBe(n);
    let sum = 0;
    let sumSq = 0;
    for (let k = 0; k < n; k++) {
      for (let i = 0; i < w * h; i++) {
        const d = Math.abs(back[k][i] - frames[k][i]);
        sum += d;
        sumSq += d * d;
      }
    }
    expect(sum / (n * w * h)).toBeLessThan(2);
    const psnrDb = 10 * Math.log10((255 * 255) / (sumSq / (n * w * h)));
    expect(psnrDb).toBeGreaterThan(38);
    // Frames are in order: each decoded frame is nearer its own source than the next one.
    for (let k = 0; k + 1 < n; k++) {
      let own = 0, other = 0;
      for (let i = 0; i < w * h; i++) {
        own += Math.abs(back[k][i] - frames[k][i]);
        other += Math.abs(back[k][i] - frames[k + 1][i]);
      }
      expect(own).toBeLessThan(other);
    }
  });

  it('writes the container frame rate asked for, exact for 30000/1001 in mp4 and 240 in mkv', async () => {
    const w = 32, h = 32;
    const frames = Array.from({ length: 12 }, (_, k) => smoothGrayFrame(w, h, k));
    const mp4 = join(dir, 'ntsc.mp4');
    await encodeFrames(mp4, frames, { width: w, height: h, pixFmt: 'gray', containerFps: 30000 / 1001, codec: 'h264', preset: 'ultrafast' });
    const a = await probeVideo(mp4);
    expect(a.containerFps).toBeCloseTo(30000 / 1001, 9);
    expect(a.frameCount).toBe(12);
    expect(a.durationS).toBeCloseTo(12 / (30000 / 1001), 3);
    const mkv = join(dir, 'fast.mkv');
    await encodeFrames(mkv, frames, { width: w, height: h, pixFmt: 'gray', containerFps: 240, codec: 'ffv1' });
    const b = await probeVideo(mkv);
    expect(b.containerFps).toBe(240);
    expect(b.frameCount).toBe(12);
  });

  it('copies each frame, so a producer may reuse one buffer', async () => {
    const w = 40, h = 30, n = 10;
    const buf = new Uint8Array(w * h);
    function* reuse(): Generator<Uint8Array> {
      for (let k = 0; k < n; k++) {
        buf.set(noiseFrame(w * h, 500 + k));
        yield buf;
      }
    }
    const file = join(dir, 'reuse.mkv');
    await encodeFrames(file, reuse(), { width: w, height: h, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
    const back = await decodeAll(file, 'gray');
    expect(back.length).toBe(n);
    for (let k = 0; k < n; k++) expect(Buffer.compare(back[k], noiseFrame(w * h, 500 + k))).toBe(0);
  });

  it('takes an async iterable of many frames through a full pipe (backpressure) without losing any', async () => {
    // 150 frames of 320x240 = 11.5 MB, far beyond a 64 KiB pipe: writes must wait for drain.
    const w = 320, h = 240, n = 150;
    async function* produce(): AsyncGenerator<Uint8Array> {
      for (let k = 0; k < n; k++) {
        const f = new Uint8Array(w * h).fill(k % 256);
        yield f;
      }
    }
    const file = join(dir, 'many.mkv');
    await encodeFrames(file, produce(), { width: w, height: h, pixFmt: 'gray', containerFps: 50, codec: 'ffv1' });
    let k = 0;
    for await (const f of decodeFrames(file, { pixFmt: 'gray' })) {
      expect(f.data[0]).toBe(k % 256);
      expect(f.data[w * h - 1]).toBe(k % 256);
      k++;
    }
    expect(k).toBe(n);
  });

  it('leaves no file and no temporary behind when the producer throws', async () => {
    const sub = join(dir, 'fail');
    await import('node:fs/promises').then((fs) => fs.mkdir(sub));
    function* broken(): Generator<Uint8Array> {
      yield new Uint8Array(16 * 16);
      throw new Error('renderer crashed');
    }
    await expect(encodeFrames(join(sub, 'x.mkv'), broken(), { width: 16, height: 16, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' })).rejects.toThrow('renderer crashed');
    expect(await readdir(sub)).toEqual([]);
  });

  it('rejects a frame of the wrong length with a RangeError naming the frame and the expected size', async () => {
    const frames = [new Uint8Array(16 * 16), new Uint8Array(10)];
    const file = join(dir, 'short.mkv');
    await expect(encodeFrames(file, frames, { width: 16, height: 16, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' })).rejects.toThrow(
      new RangeError('Expected frame 1 to be a Uint8Array of 256 bytes (16x16 gray) but received 10 bytes'),
    );
    await expect(stat(file)).rejects.toThrow();
  });

  it('names a bad option in one shape (UsageError)', async () => {
    const base = { width: 64, height: 48, pixFmt: 'gray', containerFps: 30, codec: 'h264' } as const;
    const f = join(dir, 'bad.mp4');
    await expect(encodeFrames(f, [], { ...base, width: 63 })).rejects.toThrow(new UsageError('Expected an even integer from 2 to 16384 for width but received "63"'));
    await expect(encodeFrames(f, [], { ...base, crf: 60 })).rejects.toThrow(new UsageError('Expected a number from 0 to 51 for crf but received "60"'));
    await expect(encodeFrames(join(dir, 'x.mkv'), [], { ...base, codec: 'ffv1', containerFps: 2400 })).rejects.toThrow(
      new UsageError('Expected a frame rate above 0 and at most 1000 (Matroska timestamps are in ms) for containerFps but received "2400"'),
    );
    await expect(encodeFrames(join(dir, 'x.mp4'), [], { ...base, codec: 'ffv1' })).rejects.toThrow(
      new UsageError('Expected a name ending in .mkv for ffv1 for outFile but received "' + join(dir, 'x.mp4') + '"'),
    );
  });

  it('fails with no_frames for an empty frame list and missing for an absent folder', async () => {
    const opts = { width: 16, height: 16, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' } as const;
    await expect(encodeFrames(join(dir, 'empty.mkv'), [], opts)).rejects.toMatchObject({ name: 'VideoError', code: 'no_frames' });
    await expect(encodeFrames(join(dir, 'nope', 'a.mkv'), [new Uint8Array(256)], opts)).rejects.toMatchObject({ name: 'VideoError', code: 'missing' });
    expect((await readdir(dir)).filter((n) => n.includes('.partial'))).toEqual([]);
  });
});

describe('encodeFrames time limit', () => {
  it('kills ffmpeg past an explicit limit with a timeout error and leaves no file', async () => {
    const { dir: d, cleanup: c } = await tempDir();
    try {
      const frames = Array.from({ length: 60 }, (_, k) => smoothGrayFrame(640, 480, k));
      const file = join(d, 'slow.mp4');
      await expect(encodeFrames(file, frames, { width: 640, height: 480, pixFmt: 'gray', containerFps: 30, codec: 'h264', preset: 'veryslow', timeoutMs: 1 })).rejects.toMatchObject({ code: 'timeout' });
      expect(await readdir(d)).toEqual([]);
    } finally {
      await c();
    }
  });
});
