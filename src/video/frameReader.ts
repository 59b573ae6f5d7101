/**
 * Cuts ffmpeg's rawvideo into whole frames, with one promise per frame rather than one per pipe chunk (an HD gray
 * frame is 14 chunks of 64 KiB). Two readers:
 *
 * - {@link readFramesFromSocket}, where ffmpeg writes to a Unix socket ({@link frameSocketPath}): each read lands
 *   in the frame's own buffer (the socket's `onread` buffer), so no chunk is allocated or copied.
 * - {@link readFrames}, on any byte stream (the child's stdout, where no socket can be used): each chunk is copied
 *   into the frame's buffer.
 *
 * Measured on four of the benchmark's 1280x720 clips, decoding only (two or three runs each, Node's CPU per frame):
 *
 * | reader | user CPU | system CPU | full collections |
 * | --- | --- | --- | --- |
 * | stdout pipe, chunks copied | 0.50–0.60 ms | 0.37–0.42 ms | 66 in 2384 frames |
 * | Unix socket, the frames' own buffers | 0.16–0.23 ms | 0.29–0.36 ms | 10–11 |
 *
 * The chunks' external memory (64 KiB each, outside the heap) had been setting off most of the full collections.
 * Before either reader, awaiting each chunk through the stream's async iterator cost 0.58 ms of user CPU per frame.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { connect, type OnReadOpts, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';

/** Frames assembled ahead of the consumer before the stream is paused (backpressure). */
const MAX_QUEUED = 2;

/**
 * How frame buffers are reused: `false`, a fresh buffer per frame; `true`, the frame handed out before is recycled by
 * the next call to `next`; `'released'`, a buffer is recycled only once the consumer gives it back with `recycle`
 * (a consumer that keeps some frames for a while, without copying them).
 */
export type BufferReuse = boolean | 'released';

/** Most buffers given back with `recycle` that are kept for later frames. */
const MAX_FREE = 64;

/** A reader of whole frames from a byte stream (see {@link readFrames}). */
export interface FrameReader {
  /**
   * The next whole frame, or null once the stream has ended (or failed: the caller learns why from the producer).
   * With `reuse` true, the frame handed out before is recycled by this call.
   */
  next(): Promise<Uint8Array | null>;
  /** Gives a frame's buffer back for later frames (with `reuse` `'released'`; ignored otherwise). */
  recycle(frame: Uint8Array): void;
  /** Bytes of a partial frame read after the last whole one (nonzero at the end: the stream stopped mid-frame). */
  readonly partialBytes: number;
  /** Stops reading and drops the queued frames. */
  close(): void;
}

function checkFrameBytes(frameBytes: number): void {
  if (!(Number.isInteger(frameBytes) && frameBytes > 0)) throw new RangeError(`frame size must be a positive integer of bytes, got ${frameBytes}`);
}

/**
 * The consumer's side of both readers: whole frames waiting, the recycled buffers (with `reuse`) and the wake-up of
 * a consumer waiting for a frame.
 */
class FrameQueue {
  readonly waiting: Uint8Array[] = [];
  ended = false;
  private readonly free: Uint8Array[] = [];
  private handed: Uint8Array | null = null;
  private wake: (() => void) | null = null;

  constructor(private readonly frameBytes: number, private readonly reuse: BufferReuse) {}

  /** A buffer for the next frame: a recycled one if there is one, else a fresh one. */
  take(): Uint8Array {
    return this.free.pop() ?? new Uint8Array(this.frameBytes);
  }

  /** A buffer the consumer is done with (`reuse` `'released'`). */
  recycle(frame: Uint8Array): void {
    if (this.reuse === 'released' && frame.length === this.frameBytes && this.free.length < MAX_FREE) this.free.push(frame);
  }

  /** True when {@link MAX_QUEUED} frames wait (the producer should pause). */
  get full(): boolean {
    return this.waiting.length >= MAX_QUEUED;
  }

  notify(): void {
    const w = this.wake;
    this.wake = null;
    w?.();
  }

  end(): void {
    this.ended = true;
    this.notify();
  }

  drop(): void {
    this.waiting.length = 0;
    this.end();
  }

  /** The next frame (see {@link FrameReader.next}); `refill` lets the producer go on once there is room. */
  async next(refill: () => void): Promise<Uint8Array | null> {
    if (this.handed !== null) {
      if (this.reuse === true) this.free.push(this.handed);
      this.handed = null;
    }
    for (;;) {
      if (this.waiting.length > 0) {
        const f = this.waiting.shift()!;
        refill();
        this.handed = f;
        return f;
      }
      refill();
      if (this.waiting.length > 0) continue;
      if (this.ended) return null;
      await new Promise<void>((resolve) => { this.wake = resolve; });
    }
  }
}

/**
 * Reads `stream` as frames of `frameBytes` bytes, cut at exact frame boundaries whatever the chunk sizes. At most
 * {@link MAX_QUEUED} whole frames wait for the consumer; then the stream is paused until it asks for more, so
 * memory does not grow with the stream's length. Each frame is a fresh buffer, or with `reuse` one of a few
 * recycled buffers, valid until the next call to `next`. A stream error ends the frames like the end does.
 */
export function readFrames(stream: Readable, frameBytes: number, reuse: BufferReuse): FrameReader {
  checkFrameBytes(frameBytes);
  const q = new FrameQueue(frameBytes, reuse);
  let cur: Uint8Array = q.take();
  let filled = 0;
  /** The rest of a chunk not yet copied (the queue filled up part way through it). */
  let leftover: Buffer | null = null;
  let leftoverAt = 0;
  let paused = false;
  /** Copies `chunk` from `at` into frames; stops (keeping the rest) once the queue is full. */
  const consume = (chunk: Buffer, at: number): void => {
    let offset = at;
    while (offset < chunk.length) {
      const n = Math.min(frameBytes - filled, chunk.length - offset);
      cur.set(chunk.subarray(offset, offset + n), filled);
      filled += n;
      offset += n;
      if (filled === frameBytes) {
        q.waiting.push(cur);
        cur = q.take();
        filled = 0;
        if (q.full && offset < chunk.length) {
          leftover = chunk;
          leftoverAt = offset;
          break;
        }
      }
    }
    if (q.full && !paused) {
      paused = true;
      stream.pause();
    }
  };
  const onData = (chunk: Buffer): void => {
    consume(chunk, 0);
    if (q.waiting.length > 0) q.notify();
  };
  const onEnd = (): void => q.end();
  stream.on('data', onData);
  stream.once('end', onEnd);
  stream.once('close', onEnd);
  stream.once('error', onEnd);

  /** Room in the queue again: the kept rest of a chunk first, then the stream. */
  const refill = (): void => {
    if (leftover !== null && !q.full) {
      const c = leftover;
      leftover = null;
      consume(c, leftoverAt);
    }
    if (leftover === null && !q.full && paused && !q.ended) {
      paused = false;
      stream.resume();
    }
  };

  return {
    next: () => q.next(refill),
    recycle: (frame: Uint8Array) => q.recycle(frame),
    get partialBytes() {
      return filled;
    },
    close() {
      stream.off('data', onData);
      leftover = null;
      q.drop();
    },
  };
}

/** Pause between attempts to connect to a decoder that is not listening yet, ms. */
const CONNECT_RETRY_MS = 2;

/**
 * Reads frames of `frameBytes` bytes from the Unix socket at `path`, where ffmpeg listens (its `unix:` output with
 * `-listen 1`), like {@link readFrames}, but every read lands in the frame's own buffer: the socket's `onread` buffer
 * is the unfilled rest of the frame being assembled, so no read crosses a frame's end and nothing is copied or
 * allocated per read. Until the decoder listens, connecting is retried every {@link CONNECT_RETRY_MS} ms while
 * `keepTrying()` holds (the decoder is still running); if it never listens, the frames end with none (the
 * decoder's exit status says why). `onConnect` runs once connected (the path is then no longer needed: the caller
 * can remove it, so a process killed mid-clip leaves nothing behind). At most {@link MAX_QUEUED} whole frames
 * wait; then the socket is paused.
 */
export function readFramesFromSocket(
  path: string, frameBytes: number, reuse: BufferReuse, keepTrying: () => boolean, onConnect: () => void = () => {},
): FrameReader {
  checkFrameBytes(frameBytes);
  const q = new FrameQueue(frameBytes, reuse);
  let cur: Uint8Array = q.take();
  let filled = 0;
  let paused = false;
  let socket: Socket | null = null;
  let retry: NodeJS.Timeout | undefined;
  const onread: OnReadOpts = {
    buffer: () => cur.subarray(filled),
    callback: (bytes: number): boolean => {
      filled += bytes;
      if (filled < frameBytes) return true;
      q.waiting.push(cur);
      cur = q.take();
      filled = 0;
      q.notify();
      // false pauses the socket until the consumer makes room.
      paused = q.full;
      return !paused;
    },
  };
  const attempt = (): void => {
    retry = undefined;
    if (q.ended) return;
    if (!keepTrying()) {
      q.end();
      return;
    }
    let connected = false;
    const s = connect({ path, onread });
    socket = s;
    s.once('connect', () => {
      connected = true;
      onConnect();
    });
    s.once('end', () => q.end());
    s.once('close', () => { if (connected) q.end(); });
    s.on('error', (err: NodeJS.ErrnoException) => {
      if (connected || q.ended) {
        q.end();
        return;
      }
      s.destroy();
      // Not listening yet (no socket file, or bound but not listening): try again shortly.
      if (err.code === 'ENOENT' || err.code === 'ECONNREFUSED') retry = setTimeout(attempt, CONNECT_RETRY_MS);
      else q.end();
    });
  };
  attempt();
  const refill = (): void => {
    if (paused && !q.full && !q.ended && socket !== null) {
      paused = false;
      socket.resume();
    }
  };
  return {
    next: () => q.next(refill),
    recycle: (frame: Uint8Array) => q.recycle(frame),
    get partialBytes() {
      return filled;
    },
    close() {
      if (retry !== undefined) clearTimeout(retry);
      socket?.destroy();
      q.drop();
    },
  };
}

/** Longest socket path taken: `sun_path` holds 108 bytes on Linux and 104 on macOS, with its terminating zero. */
const MAX_SOCKET_PATH = 100;

/**
 * A fresh path for the frames' socket ({@link readFramesFromSocket}) in a new private folder (mode 0700, so no
 * other user can connect first), and a function that removes the folder. Null where the socket cannot be used:
 * on Windows (no `unix:` output), or when the temporary folder's path is too long for a socket address or holds
 * characters other than letters, digits and `/._-` (ffmpeg takes the rest of its `unix:` URL as the path as it is).
 */
export function frameSocketPath(): { path: string; remove: () => void } | null {
  if (process.platform === 'win32') return null;
  const base = tmpdir();
  // The path is the base, "/tossmeter-" and six characters, then "/frames.sock": 29 more.
  if (!/^[\w/.-]+$/.test(base) || base.length + 29 > MAX_SOCKET_PATH) return null;
  let dir: string;
  try {
    dir = mkdtempSync(join(base, 'tossmeter-'));
  } catch {
    return null;
  }
  return { path: join(dir, 'frames.sock'), remove: () => rmSync(dir, { recursive: true, force: true }) };
}
