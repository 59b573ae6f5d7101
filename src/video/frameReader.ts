/**
 * Cuts a byte stream (ffmpeg's rawvideo on a pipe) into whole frames, with one promise per frame rather than one
 * per pipe chunk: an HD gray frame is 14 chunks of 64 KiB. On the benchmark's 1280x720 clips Node's user CPU to
 * receive a frame went from 0.58 ms (awaiting each chunk through the stream's async iterator) to 0.45 ms (median
 * of five runs each); the system time of the pipe reads, about 0.4 ms, is the same either way.
 */
import type { Readable } from 'node:stream';

/** Frames assembled ahead of the consumer before the stream is paused (backpressure). */
const MAX_QUEUED = 2;

/** A reader of whole frames from a byte stream (see {@link readFrames}). */
export interface FrameReader {
  /**
   * The next whole frame, or null once the stream has ended (or failed: the caller learns why from the producer).
   * With `reuse`, the frame handed out before is recycled by this call.
   */
  next(): Promise<Uint8Array | null>;
  /** Bytes of a partial frame read after the last whole one (nonzero at the end: the stream stopped mid-frame). */
  readonly partialBytes: number;
  /** Stops reading and drops the queued frames. */
  close(): void;
}

/**
 * Reads `stream` as frames of `frameBytes` bytes, cut at exact frame boundaries whatever the chunk sizes. At most
 * {@link MAX_QUEUED} whole frames wait for the consumer; then the stream is paused until it asks for more, so
 * memory does not grow with the stream's length. Each frame is a fresh buffer, or with `reuse` one of a few
 * recycled buffers, valid until the next call to `next`. A stream error ends the frames like the end does.
 */
export function readFrames(stream: Readable, frameBytes: number, reuse: boolean): FrameReader {
  if (!(Number.isInteger(frameBytes) && frameBytes > 0)) throw new RangeError(`frame size must be a positive integer of bytes, got ${frameBytes}`);
  const queue: Uint8Array[] = [];
  const free: Uint8Array[] = [];
  let handed: Uint8Array | null = null;
  let cur: Uint8Array = new Uint8Array(frameBytes);
  let filled = 0;
  /** The rest of a chunk not yet copied (the queue filled up part way through it). */
  let leftover: Buffer | null = null;
  let leftoverAt = 0;
  let ended = false;
  let paused = false;
  let wake: (() => void) | null = null;

  const take = (): Uint8Array => (reuse ? free.pop() : undefined) ?? new Uint8Array(frameBytes);
  const notify = (): void => {
    const w = wake;
    wake = null;
    w?.();
  };
  /** Copies `chunk` from `at` into frames; stops (keeping the rest) once the queue is full. */
  const consume = (chunk: Buffer, at: number): void => {
    let offset = at;
    while (offset < chunk.length) {
      const n = Math.min(frameBytes - filled, chunk.length - offset);
      cur.set(chunk.subarray(offset, offset + n), filled);
      filled += n;
      offset += n;
      if (filled === frameBytes) {
        queue.push(cur);
        cur = take();
        filled = 0;
        if (queue.length >= MAX_QUEUED && offset < chunk.length) {
          leftover = chunk;
          leftoverAt = offset;
          break;
        }
      }
    }
    if (queue.length >= MAX_QUEUED && !paused) {
      paused = true;
      stream.pause();
    }
  };
  const onData = (chunk: Buffer): void => {
    consume(chunk, 0);
    if (queue.length > 0) notify();
  };
  const onEnd = (): void => {
    ended = true;
    notify();
  };
  stream.on('data', onData);
  stream.once('end', onEnd);
  stream.once('close', onEnd);
  stream.once('error', onEnd);

  /** Room in the queue again: the kept rest of a chunk first, then the stream. */
  const refill = (): void => {
    if (leftover !== null && queue.length < MAX_QUEUED) {
      const c = leftover;
      leftover = null;
      consume(c, leftoverAt);
    }
    if (leftover === null && queue.length < MAX_QUEUED && paused && !ended) {
      paused = false;
      stream.resume();
    }
  };

  return {
    async next() {
      if (handed !== null) {
        if (reuse) free.push(handed);
        handed = null;
      }
      for (;;) {
        if (queue.length > 0) {
          const f = queue.shift()!;
          refill();
          handed = f;
          return f;
        }
        refill();
        if (queue.length > 0) continue;
        if (ended) return null;
        await new Promise<void>((resolve) => { wake = resolve; });
      }
    },
    get partialBytes() {
      return filled;
    },
    close() {
      stream.off('data', onData);
      ended = true;
      queue.length = 0;
      leftover = null;
      notify();
    },
  };
}
