import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { readFrames } from '../../src/video/frameReader.ts';

/** Bytes 0, 1, 2, … (mod 251, a prime, so no frame repeats another's bytes at the same offsets). */
function bytes(n: number, from = 0): Buffer {
  const b = Buffer.alloc(n);
  for (let i = 0; i < n; i++) b[i] = (from + i) % 251;
  return b;
}

async function drain(r: ReturnType<typeof readFrames>, copy: boolean): Promise<Uint8Array[]> {
  const out: Uint8Array[] = [];
  for (let f = await r.next(); f !== null; f = await r.next()) out.push(copy ? Uint8Array.from(f) : f);
  return out;
}

describe('readFrames', () => {
  it('cuts frames at exact boundaries whatever the chunk sizes', async () => {
    const frameBytes = 1000, frames = 7;
    const all = bytes(frameBytes * frames);
    const s = new PassThrough();
    const r = readFrames(s, frameBytes, false);
    // Chunks smaller than, equal to and spanning several frames.
    const sizes = [1, 999, 1000, 2501, 17, 2482];
    let at = 0;
    for (const n of sizes) { s.write(all.subarray(at, at + n)); at += n; }
    expect(at).toBe(all.length);
    s.end();
    const got = await drain(r, false);
    expect(got).toHaveLength(frames);
    got.forEach((f, k) => expect(Buffer.compare(f, all.subarray(k * frameBytes, (k + 1) * frameBytes))).toBe(0));
    expect(new Set(got.map((f) => f.buffer)).size).toBe(frames);
    expect(r.partialBytes).toBe(0);
  });

  it('pauses the stream while two whole frames wait, and goes on when they are taken', async () => {
    const frameBytes = 64;
    const s = new PassThrough({ highWaterMark: 16 });
    const r = readFrames(s, frameBytes, true);
    // One chunk of ten frames: two are assembled, the rest waits in the reader.
    s.write(bytes(10 * frameBytes));
    await new Promise((resolve) => setImmediate(resolve));
    expect(s.isPaused()).toBe(true);
    s.end(bytes(5, 10 * frameBytes));
    const got = await drain(r, true);
    expect(got).toHaveLength(10);
    got.forEach((f, k) => expect(Buffer.compare(f, bytes(frameBytes, k * frameBytes))).toBe(0));
    // The stream stopped 5 bytes into an eleventh frame.
    expect(r.partialBytes).toBe(5);
  });

  it('with reuse recycles at most four buffers over a long stream', async () => {
    const frameBytes = 32, frames = 200;
    const s = new PassThrough();
    const r = readFrames(s, frameBytes, true);
    const seen = new Set<ArrayBufferLike>();
    const writer = (async () => {
      for (let k = 0; k < frames; k++) if (!s.write(bytes(frameBytes, k * frameBytes))) await new Promise((res) => s.once('drain', res));
      s.end();
    })();
    let k = 0;
    for (let f = await r.next(); f !== null; f = await r.next(), k++) {
      expect(Buffer.compare(f, bytes(frameBytes, k * frameBytes))).toBe(0);
      seen.add(f.buffer);
    }
    await writer;
    expect(k).toBe(frames);
    expect(seen.size).toBeLessThanOrEqual(4);
  });

  it('ends the frames when the stream fails, keeping the whole ones read before', async () => {
    const s = new PassThrough();
    const r = readFrames(s, 10, false);
    s.write(bytes(25));
    s.destroy(new Error('pipe broke'));
    const got = await drain(r, false);
    expect(got).toHaveLength(2);
    expect(r.partialBytes).toBe(5);
  });

  it('rejects a frame size that is not a positive integer', () => {
    expect(() => readFrames(new PassThrough(), 0, false)).toThrow(/positive integer/);
    expect(() => readFrames(new PassThrough(), 2.5, false)).toThrow(/positive integer/);
  });
});
