import { copyFile, mkdir, open, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encodeFrames } from '../../src/video/encode.ts';
import { ffmpegPath } from '../../src/video/paths.ts';
import { probeVideo } from '../../src/video/probe.ts';
import { fileUrl } from '../../src/video/inputFile.ts';
import { runChild } from '../../src/video/run.ts';
import { VideoError } from '../../src/video/errors.ts';
import { noiseFrame, smoothGrayFrame, tempDir } from './fixtures.ts';

let dir = '';
let cleanup: () => Promise<void> = async () => {};
let mp4 = '';
beforeAll(async () => {
  ({ dir, cleanup } = await tempDir());
  mp4 = join(dir, 'toss.mp4');
  // 61 frames (odd, not a multiple of the GOP) at a container rate of 25 fps, B-frames on (preset medium).
  await encodeFrames(mp4, Array.from({ length: 61 }, (_, k) => smoothGrayFrame(80, 60, k)), { width: 80, height: 60, pixFmt: 'gray', containerFps: 25, codec: 'h264' });
});
afterAll(() => cleanup());

async function cutInHalf(src: string, dst: string): Promise<void> {
  await copyFile(src, dst);
  const fh = await open(dst, 'r+');
  await fh.truncate(Math.floor((await stat(dst)).size / 2));
  await fh.close();
}

async function probeError(file: string): Promise<VideoError> {
  try {
    await probeVideo(file);
  } catch (err) {
    if (err instanceof VideoError) return err;
    throw err;
  }
  throw new Error(`probeVideo(${file}) did not fail`);
}

describe('probeVideo', () => {
  it('reads size, codec, pixel format, container rate, exact frame count and duration of an H.264 mp4', async () => {
    const info = await probeVideo(mp4);
    expect(info).toMatchObject({ file: mp4, width: 80, height: 60, codec: 'h264', pixFmt: 'yuv420p', containerFps: 25, frameCount: 61 });
    expect(info.durationS).toBeCloseTo(61 / 25, 6);
    expect(info.sizeBytes).toBe((await stat(mp4)).size);
    // Counting by decoding every frame agrees with counting packets.
    expect((await probeVideo(mp4, { countFrames: true })).frameCount).toBe(61);
  });

  it('reads an FFV1 mkv (no frame count in the container) with the exact frame count', async () => {
    const mkv = join(dir, 'lossless.mkv');
    await encodeFrames(mkv, Array.from({ length: 37 }, (_, k) => noiseFrame(50 * 30, k)), { width: 50, height: 30, pixFmt: 'gray', containerFps: 120, codec: 'ffv1' });
    const info = await probeVideo(mkv);
    expect(info).toMatchObject({ width: 50, height: 30, codec: 'ffv1', pixFmt: 'gray', containerFps: 120, frameCount: 37 });
  });

  it('resolves a relative path to the absolute one in `file`', async () => {
    const rel = join('.', 'relative-probe-' + process.pid + '.mkv');
    await encodeFrames(rel, [noiseFrame(16 * 16, 1), noiseFrame(16 * 16, 2)], { width: 16, height: 16, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
    try {
      const info = await probeVideo(rel);
      expect(info.file).toBe(join(process.cwd(), rel));
      expect(info.frameCount).toBe(2);
    } finally {
      await import('node:fs/promises').then((fs) => fs.rm(rel, { force: true }));
    }
  });

  it('missing file: code missing, the message names the file', async () => {
    const file = join(dir, 'no such clip.mp4');
    const err = await probeError(file);
    expect(err.code).toBe('missing');
    expect(err.file).toBe(file);
    expect(err.message).toBe(`clip ${JSON.stringify(file)}: no such file`);
  });

  it('a folder: code unreadable', async () => {
    const sub = join(dir, 'folder.mp4');
    await mkdir(sub);
    expect((await probeError(sub)).code).toBe('unreadable');
  });

  it('zero-byte file: not_video, "the file is empty"', async () => {
    const file = join(dir, 'empty.mp4');
    await writeFile(file, new Uint8Array(0));
    const err = await probeError(file);
    expect(err.code).toBe('not_video');
    expect(err.message).toContain('the file is empty, 0 bytes');
  });

  it('random bytes named .mp4: not_video', async () => {
    const file = join(dir, 'random.mp4');
    await writeFile(file, noiseFrame(20_000, 42));
    const err = await probeError(file);
    expect(err.code).toBe('not_video');
    expect(err.message).toMatch(/^clip ".*random\.mp4": not a video ffmpeg can read/);
  });

  it('an mp4 cut at 50%: truncated (its index lists more frames than can be read)', async () => {
    const file = join(dir, 'half.mp4');
    await cutInHalf(mp4, file);
    const err = await probeError(file);
    expect(err.code).toBe('truncated');
    expect(err.message).toMatch(/index lists 61 frames but only \d+ could be read/);
  });

  it('an mp4 cut at 50% with its index at the end (no faststart): truncated ("moov" atom not found)', async () => {
    const full = join(dir, 'index-at-end.mp4');
    const r = await runChild(ffmpegPath(), [
      '-hide_banner', '-v', 'error', '-f', 'lavfi', '-i', 'testsrc=size=64x48:rate=30', '-frames:v', '30',
      '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', '-f', 'mp4', fileUrl(full),
    ]);
    expect(r.code, r.stderrTail).toBe(0);
    const file = join(dir, 'index-at-end-half.mp4');
    await cutInHalf(full, file);
    const err = await probeError(file);
    expect(err.code).toBe('truncated');
    expect(err.message).toContain('"moov" atom not found');
  });

  it('an FFV1 mkv cut at 50%: truncated (the demuxer reports the early end)', async () => {
    const full = join(dir, 'tocut.mkv');
    await encodeFrames(full, Array.from({ length: 30 }, (_, k) => noiseFrame(64 * 48, k)), { width: 64, height: 48, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
    const file = join(dir, 'tocut-half.mkv');
    await cutInHalf(full, file);
    expect((await probeError(file)).code).toBe('truncated');
  });

  it('a PNG renamed .mov: not_video, "a still png image"', async () => {
    const file = join(dir, 'photo.mov');
    const png = await sharp(Buffer.from(noiseFrame(64 * 48, 9)), { raw: { width: 64, height: 48, channels: 1 } }).png().toBuffer();
    await writeFile(file, png);
    const err = await probeError(file);
    expect(err.code).toBe('not_video');
    expect(err.message).toBe(`clip ${JSON.stringify(file)}: not a video (a still png image)`);
  });

  it('an audio-only file (a sine tone) named .mp4: not_video, "found no video stream"', async () => {
    const file = join(dir, 'tone.mp4');
    const r = await runChild(ffmpegPath(), [
      '-hide_banner', '-v', 'error', '-f', 'lavfi', '-i', 'sine=frequency=440:duration=0.5', '-c:a', 'aac', '-f', 'mp4', fileUrl(file),
    ]);
    expect(r.code, r.stderrTail).toBe(0);
    const err = await probeError(file);
    expect(err.code).toBe('not_video');
    expect(err.message).toBe(`clip ${JSON.stringify(file)}: not a video (ffprobe found no video stream, only audio)`);
  });

  it('rejects with the signal\'s reason when aborted', async () => {
    const ac = new AbortController();
    ac.abort(new Error('stop'));
    await expect(probeVideo(mp4, { signal: ac.signal })).rejects.toThrow('stop');
  });
});
