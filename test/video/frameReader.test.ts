import { existsSync, mkdirSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { createServer, type Server } from 'node:net';
import { dirname, join } from 'node:path';
import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { frameSocketPath, readFrames, readFramesFromSocket, type FrameReader } from '../../src/video/frameReader.ts';

/** Bytes 0, 1, 2, … (mod 251, a prime, so no frame repeats another's bytes at the same offsets). */
function bytes(n: number, from = 0): Buffer {
  const b = Buffer.alloc(n);
  for (let i = 0; i < n; i++) b[i] = (from + i) % 251;
  return b;
}

async function drain(r: FrameReader, copy: boolean): Promise<Uint8Array[]> {
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

/** A server on `path` that writes `data` in the pieces `sizes` (the rest at the end) to the first client, then closes. */
function serve(path: string, data: Buffer, sizes: number[] = []): Promise<Server> {
  const server = createServer((c) => {
    // A client that closes early resets the connection.
    c.on('error', () => {});
    let at = 0;
    for (const n of sizes) { c.write(data.subarray(at, at + n)); at += n; }
    c.end(data.subarray(at));
    server.close();
  });
  return new Promise((resolve) => server.listen(path, () => resolve(server)));
}

describe.skipIf(process.platform === 'win32')('frameSocketPath and readFramesFromSocket', () => {
  it('give a socket path in a private folder, which remove takes away', () => {
    const s = frameSocketPath();
    expect(s).not.toBeNull();
    const dir = dirname(s!.path);
    expect(statSync(dir).mode & 0o777).toBe(0o700);
    s!.remove();
    expect(existsSync(dir)).toBe(false);
  });

  it('give none where the temporary folder could not hold a socket address (too long, or odd characters)', () => {
    const saved = process.env.TMPDIR;
    const root = mkdtempSync(join(tmpdir(), 'frame-socket-'));
    // Both folders exist, so only the path itself can make the answer null.
    const long = join(root, 'x'.repeat(Math.max(1, 72 - root.length - 1)));
    const odd = join(root, 'with space');
    mkdirSync(long);
    mkdirSync(odd);
    try {
      // 72 characters: with the 29 of the folder and the file, over the 100 taken.
      process.env.TMPDIR = long;
      expect(long.length).toBe(72);
      expect(frameSocketPath()).toBeNull();
      process.env.TMPDIR = odd;
      expect(frameSocketPath()).toBeNull();
      // A short plain one is taken.
      process.env.TMPDIR = root;
      const s = frameSocketPath();
      expect(s?.path.startsWith(root)).toBe(true);
      s?.remove();
    } finally {
      if (saved === undefined) delete process.env.TMPDIR;
      else process.env.TMPDIR = saved;
      rmSync(root, { recursive: true, force: true });
    }
  });

  it('read whole frames to the end, whatever the pieces, and keep the bytes of a partial one', async () => {
    const s = frameSocketPath()!;
    const frameBytes = 100, frames = 6;
    const all = bytes(frameBytes * frames + 30);
    await serve(s.path, all, [1, 250, 99]);
    let connected = 0;
    const r = readFramesFromSocket(s.path, frameBytes, false, () => true, () => connected++);
    const got = await drain(r, false);
    expect(connected).toBe(1);
    s.remove();
    expect(got).toHaveLength(frames);
    got.forEach((f, k) => expect(Buffer.compare(f, all.subarray(k * frameBytes, (k + 1) * frameBytes))).toBe(0));
    expect(new Set(got.map((f) => f.buffer)).size).toBe(frames);
    // The stream ended 30 bytes into a seventh frame.
    expect(r.partialBytes).toBe(30);
  });

  it('keep trying to connect until the decoder listens, and with reuse hand out at most four buffers', async () => {
    const s = frameSocketPath()!;
    const frameBytes = 48, frames = 400;
    const r = readFramesFromSocket(s.path, frameBytes, true, () => true);
    // Nothing listens yet: the first attempts find no socket.
    await new Promise((resolve) => setTimeout(resolve, 30));
    await serve(s.path, bytes(frameBytes * frames));
    const seen = new Set<ArrayBufferLike>();
    let k = 0;
    for (let f = await r.next(); f !== null; f = await r.next(), k++) {
      expect(Buffer.compare(f, bytes(frameBytes, k * frameBytes))).toBe(0);
      seen.add(f.buffer);
    }
    s.remove();
    expect(k).toBe(frames);
    expect(seen.size).toBeLessThanOrEqual(4);
  });

  it('end with no frames once the decoder is gone without listening', async () => {
    const s = frameSocketPath()!;
    let tries = 0;
    const r = readFramesFromSocket(s.path, 10, false, () => ++tries < 5);
    expect(await r.next()).toBeNull();
    expect(tries).toBe(5);
    s.remove();
  });

  it('close stops the reading and ends the frames', async () => {
    const s = frameSocketPath()!;
    await serve(s.path, bytes(100_000));
    const r = readFramesFromSocket(s.path, 10, false, () => true);
    expect(await r.next()).not.toBeNull();
    r.close();
    expect(await r.next()).toBeNull();
    s.remove();
  });
});
