import { copyFile, mkdtemp, open, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decodeFrames } from '../../src/video/decode.ts';
import { encodeFrames } from '../../src/video/encode.ts';
import { ffmpegPath } from '../../src/video/paths.ts';
import { runChild } from '../../src/video/run.ts';
import { probeVideo } from '../../src/video/probe.ts';
import { bytesWritten, childPids, noiseFrame, sleep, smoothGrayFrame, tempDir } from './fixtures.ts';

let dir = '';
let cleanup: () => Promise<void> = async () => {};
// 320x240 gray = 76800 bytes a frame: more than one 64 KiB pipe chunk, and not a multiple of it.
const W = 320, H = 240, N = 120;
let big = '';
beforeAll(async () => {
  ({ dir, cleanup } = await tempDir());
  big = join(dir, 'big.mkv');
  await encodeFrames(big, Array.from({ length: N }, (_, k) => noiseFrame(W * H, k + 7)), { width: W, height: H, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
});
afterAll(() => cleanup());

describe('decodeFrames', () => {
  it.each(['socket', 'stdout'] as const)('cuts frames larger than a pipe chunk at exact boundaries, in order, each in its own buffer (%s)', async (transport) => {
    const kept = [];
    for await (const f of decodeFrames(big, { pixFmt: 'gray', transport })) kept.push(f);
    expect(kept.map((f) => f.index)).toEqual(Array.from({ length: N }, (_, k) => k));
    // Checked after the loop: had a buffer been reused, earlier frames would now hold later pixels.
    for (const f of kept) {
      expect(f.width).toBe(W);
      expect(f.height).toBe(H);
      expect(Buffer.compare(f.data, noiseFrame(W * H, f.index + 7))).toBe(0);
    }
    expect(new Set(kept.map((f) => f.data.buffer)).size).toBe(N);
  });

  it.each(['socket', 'stdout'] as const)('with reuseBuffer recycles a few buffers, each holding its frame exactly while it is current (%s)', async (transport) => {
    const buffers = new Set<ArrayBufferLike>();
    let n = 0;
    for await (const f of decodeFrames(big, { pixFmt: 'gray', reuseBuffer: true, transport })) {
      expect(f.index).toBe(n++);
      expect(Buffer.compare(f.data, noiseFrame(W * H, f.index + 7))).toBe(0);
      buffers.add(f.data.buffer);
    }
    expect(n).toBe(N);
    // The one handed out, at most two assembled ahead and the one being filled (frameReader.ts), not one per frame.
    expect(buffers.size).toBeLessThanOrEqual(4);
    expect(buffers.size).toBeLessThan(N);
  });

  it.each(['socket', 'stdout'] as const)("with reuseBuffer 'released' reuses a buffer only after its frame is released, and kept frames stay exact (%s)", async (transport) => {
    const kept: { index: number; data: Uint8Array; release: () => void }[] = [];
    const buffers = new Set<ArrayBufferLike>();
    let n = 0;
    for await (const f of decodeFrames(big, { pixFmt: 'gray', reuseBuffer: 'released', transport })) {
      expect(f.index).toBe(n++);
      expect(typeof f.release).toBe('function');
      buffers.add(f.data.buffer);
      kept.push({ index: f.index, data: f.data, release: f.release! });
      // Hold the last 10 frames, as the tracker holds its buffer; every held frame must still be its own.
      if (kept.length > 10) {
        const old = kept.shift()!;
        old.release();
        old.release(); // a second call is ignored
      }
      for (const k of kept) expect(Buffer.compare(k.data, noiseFrame(W * H, k.index + 7)), `frame ${k.index} held`).toBe(0);
    }
    expect(n).toBe(N);
    // The 10 held, at most two assembled ahead, the one being filled and one released but not yet taken.
    expect(buffers.size).toBeLessThanOrEqual(14);
    expect(buffers.size).toBeLessThan(N);
  });

  it('leaves nothing in the temporary folder once the frames flow, so a killed process leaves nothing behind', async () => {
    const saved = process.env.TMPDIR;
    const own = await mkdtemp(join(tmpdir(), 'decode-tmp-'));
    process.env.TMPDIR = own;
    try {
      let seen = 0;
      for await (const f of decodeFrames(big, { pixFmt: 'gray' })) {
        seen = f.index + 1;
        // Connected: the socket's private folder is already gone.
        expect(await readdir(own)).toEqual([]);
        if (seen === 2) break;
      }
      expect(seen).toBe(2);
    } finally {
      if (saved === undefined) delete process.env.TMPDIR;
      else process.env.TMPDIR = saved;
      await rm(own, { recursive: true, force: true });
    }
  });

  it('hands out rgb24 frames of width*height*3 bytes (gray input: R = G = B = the gray value)', async () => {
    const first = noiseFrame(W * H, 7);
    for await (const f of decodeFrames(big, { pixFmt: 'rgb24' })) {
      expect(f.data.length).toBe(W * H * 3);
      for (let i = 0; i < 1000; i++) {
        expect(f.data[3 * i]).toBe(first[i]);
        expect(f.data[3 * i + 1]).toBe(first[i]);
        expect(f.data[3 * i + 2]).toBe(first[i]);
      }
      break;
    }
  });

  it('kills the ffmpeg child when the consumer breaks out early', async () => {
    let seen = 0;
    let during: number[] = [];
    for await (const f of decodeFrames(big, { pixFmt: 'gray' })) {
      seen = f.index + 1;
      if (f.index === 2) {
        during = await childPids('ffmpeg');
        break;
      }
    }
    expect(seen).toBe(3);
    expect(during.length).toBe(1);
    expect(await childPids('ffmpeg')).toEqual([]);
  });

  it('kills the child when the consumer throws, and passes the error on', async () => {
    const run = async (): Promise<void> => {
      for await (const f of decodeFrames(big, { pixFmt: 'gray' })) {
        if (f.index === 1) throw new Error('tracker failed');
      }
    };
    await expect(run()).rejects.toThrow('tracker failed');
    expect(await childPids('ffmpeg')).toEqual([]);
  });

  it('stops on an AbortSignal with the signal\'s reason and no child left', async () => {
    const ac = new AbortController();
    const run = async (): Promise<number> => {
      let n = 0;
      for await (const f of decodeFrames(big, { pixFmt: 'gray', signal: ac.signal })) {
        n = f.index + 1;
        if (f.index === 4) ac.abort(new Error('user pressed ctrl-c'));
      }
      return n;
    };
    await expect(run()).rejects.toThrow('user pressed ctrl-c');
    expect(await childPids('ffmpeg')).toEqual([]);
  });

  it('holds ffmpeg back while the consumer is slow (backpressure: it writes a bounded amount ahead)', async () => {
    const total = W * H * N; // 9.2 MB of raw frames
    for await (const f of decodeFrames(big, { pixFmt: 'gray', threads: 1 })) {
      if (f.index === 0) {
        const [pid] = await childPids('ffmpeg');
        await sleep(400); // ffmpeg decodes this clip in well under 400 ms when unhindered
        const written = await bytesWritten(pid);
        // Pipe buffer (64 KiB) + the stream's read-ahead (64 KiB) + a frame in flight: far below 1 MB.
        expect(written).toBeLessThan(1_000_000);
        expect(written).toBeLessThan(total / 5);
        await sleep(100);
        expect(await bytesWritten(pid)).toBe(written);
        break;
      }
    }
  });

  it('reads names with spaces, unicode, a leading dash and a colon', async () => {
    const frames = Array.from({ length: 5 }, (_, k) => smoothGrayFrame(32, 24, k));
    for (const name of ['a b c.mkv', 'münze 硬币 ε.mkv', '-starts-with-dash.mkv', 'with:colon.mkv', 'file:looks-like-url.mkv']) {
      const file = join(dir, name);
      await encodeFrames(file, frames, { width: 32, height: 24, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
      const got = [];
      for await (const f of decodeFrames(file, { pixFmt: 'gray' })) got.push(f.data);
      expect(got.length, name).toBe(5);
      expect(Buffer.compare(got[4], frames[4]), name).toBe(0);
    }
  });

  it('raises truncated when the file was cut after the probe (fewer frames than counted)', async () => {
    const full = join(dir, 'tocut.mp4');
    const frames = Array.from({ length: 40 }, (_, k) => smoothGrayFrame(64, 48, k));
    await encodeFrames(full, frames, { width: 64, height: 48, pixFmt: 'gray', containerFps: 30, codec: 'h264', preset: 'ultrafast' });
    const info = await probeVideo(full);
    const cut = join(dir, 'cut.mp4');
    await copyFile(full, cut);
    const fh = await open(cut, 'r+');
    await fh.truncate(Math.floor((await stat(cut)).size / 2));
    await fh.close();
    let n = 0;
    const run = async (): Promise<void> => {
      for await (const _ of decodeFrames(cut, { pixFmt: 'gray', info: { ...info, file: cut } })) n++;
    };
    await expect(run()).rejects.toMatchObject({ name: 'VideoError', code: 'truncated', file: cut });
    expect(n).toBeGreaterThan(0);
    expect(n).toBeLessThan(40);
  });

  it('decodes a mov cut to its audio track, one frame short of its packet count (an edit list), without an error', async () => {
    // 150 frames of a sample clip (H.264 with B-frames, as cameras and phones write it), then a 3 s tone beside
    // its 5 s, muxed with -shortest: the container cuts the video track, and the last packet is not shown.
    const src = join(dir, 'editsrc.mp4');
    const mov = join(dir, 'edit.mov');
    const cut = await runChild(ffmpegPath(), ['-v', 'error', '-i', 'file:sample-clips/toss-0003.mp4', '-frames:v', '150', '-c', 'copy', '-y', `file:${src}`]);
    expect(cut.code).toBe(0);
    const r = await runChild(ffmpegPath(), ['-v', 'error', '-i', `file:${src}`, '-f', 'lavfi', '-i', 'sine=f=440:d=3', '-shortest', '-c:v', 'copy', '-c:a', 'aac', '-y', `file:${mov}`]);
    expect(r.code).toBe(0);
    const info = await probeVideo(mov);
    let n = 0;
    for await (const _ of decodeFrames(mov, { pixFmt: 'gray', info })) n++;
    expect(n).toBeGreaterThan(80);
    expect(info.frameCount - n).toBeGreaterThanOrEqual(0);
    expect(info.frameCount - n).toBeLessThanOrEqual(2);
  });

  it('raises the probe\'s error before any frame for a file that is not a video', async () => {
    const file = join(dir, 'noise.mp4');
    await writeFile(file, noiseFrame(4096, 3));
    const run = async (): Promise<void> => {
      for await (const _ of decodeFrames(file, { pixFmt: 'gray' })) { /* none */ }
    };
    await expect(run()).rejects.toMatchObject({ name: 'VideoError', code: 'not_video' });
  });

  it('kills a decode past its time limit with a timeout error', async () => {
    const run = async (): Promise<void> => {
      for await (const _ of decodeFrames(big, { pixFmt: 'gray', timeoutMs: 1 })) { /* drain */ }
    };
    await expect(run()).rejects.toMatchObject({ name: 'VideoError', code: 'timeout' });
    expect(await childPids('ffmpeg')).toEqual([]);
  });

  it('names a bad option in one shape', async () => {
    const it = decodeFrames(big, { pixFmt: 'yuv' as 'gray' });
    await expect(it.next()).rejects.toThrow('Expected "gray" or "rgb24" for pixFmt but received "yuv"');
    const pipe = decodeFrames(big, { pixFmt: 'gray', transport: 'fifo' as 'socket' });
    await expect(pipe.next()).rejects.toThrow('Expected "socket" or "stdout" for transport but received "fifo"');
  });
});
