/**
 * Streams a clip's frames into Node as raw gray or RGB images: one ffmpeg
 * process writing rawvideo to a pipe, read with backpressure, cut at exact
 * frame boundaries whatever the pipe's chunk sizes.
 */
import { optionError } from '../errors.ts';
import { VideoError } from './errors.ts';
import { fileUrl } from './inputFile.ts';
import { ffmpegPath } from './paths.ts';
import { frameSocketPath, readFrames, readFramesFromSocket, type BufferReuse, type FrameReader } from './frameReader.ts';
import { probeVideo, type VideoInfo } from './probe.ts';
import { abortError, defaultTimeoutMs, lastLines, runChild, startChild, type ChildHandle } from './run.ts';

/** Raw pixel layouts the decoder can hand out: 1 byte per pixel (`gray`) or 3 (`rgb24`, R G B). */
export type RawPixFmt = 'gray' | 'rgb24';

/** Bytes per pixel of a {@link RawPixFmt}. */
export function bytesPerPixel(pixFmt: RawPixFmt): number {
  return pixFmt === 'gray' ? 1 : 3;
}

/** One decoded frame. */
export interface DecodedFrame {
  /** Frame number from 0, in decode (= presentation) order. */
  index: number;
  /**
   * Pixels, row-major, no padding: width·height bytes (gray) or width·height·3 (rgb24). Owned by the consumer,
   * unless the decode was asked to `reuseBuffer` (`true`: valid only until the next frame is requested;
   * `'released'`: until `release` is called).
   */
  data: Uint8Array;
  /**
   * With `reuseBuffer: 'released'`: gives `data` back to the decode for a later frame (call it once, when done with
   * the pixels; a frame never released is simply collected). Absent otherwise.
   */
  release?: () => void;
  /** Width in px. */
  width: number;
  /** Height in px. */
  height: number;
}

/** Options of {@link decodeFrames}. */
export interface DecodeOptions {
  /** Pixel layout of `data`. */
  pixFmt: RawPixFmt;
  /** Stops the decode: the child is killed and the iteration rejects with the signal's reason. */
  signal?: AbortSignal;
  /**
   * Time limit in ms for the time spent waiting on ffmpeg (time the consumer
   * holds a frame does not count). Default: {@link defaultTimeoutMs} of the file
   * size and the pixel count.
   */
  timeoutMs?: number;
  /**
   * Hand out a few recycled buffers (at most four), each overwritten by a later frame (default false: a fresh buffer
   * per frame). For a consumer that is done with a frame (or has copied it) before it asks for the next one: no allocation per frame, so
   * no garbage of frame size for the collector (on a 640x480 clip about half of the full collections).
   * `'released'`: a buffer is reused once the consumer calls the frame's `release`, for a consumer that keeps
   * frames for a while without copying them (the tracker's frame buffer).
   */
  reuseBuffer?: BufferReuse;
  /**
   * How the frames reach Node: `socket` (the default where one can be used, see `frameSocketPath`) has ffmpeg
   * write to a Unix socket whose reads land in the frames' own buffers; `stdout` reads the child's stdout pipe in
   * chunks. The frames are the same either way.
   */
  transport?: 'socket' | 'stdout';
  /** Decoder threads (positive integer); default ffmpeg's choice (one per core). */
  threads?: number;
  /**
   * The clip's {@link probeVideo} result, when the caller has it (skips a probe).
   * Its `file` (absolute path) is what ffmpeg opens and its `frameCount` is what
   * the decode must reach; `file` (the argument) is only used in messages.
   */
  info?: VideoInfo;
}

function validate(opts: DecodeOptions): void {
  if (opts.pixFmt !== 'gray' && opts.pixFmt !== 'rgb24') throw optionError('pixFmt', '"gray" or "rgb24"', opts.pixFmt);
  if (opts.threads !== undefined && !(Number.isInteger(opts.threads) && opts.threads >= 1 && opts.threads <= 64)) {
    throw optionError('threads', 'an integer from 1 to 64', opts.threads);
  }
  if (opts.transport !== undefined && opts.transport !== 'socket' && opts.transport !== 'stdout') throw optionError('transport', '"socket" or "stdout"', opts.transport);
  if (opts.timeoutMs !== undefined && !(opts.timeoutMs > 0)) throw optionError('timeoutMs', 'a positive number of milliseconds', opts.timeoutMs);
}

let unixOutput: Promise<boolean> | null = null;

/**
 * Whether the bundled ffmpeg can write to a Unix socket (its `unix` protocol among the outputs of `-protocols`),
 * asked once per process: a build without it would fail every decode, so the stdout pipe is used instead.
 */
function writesUnixSockets(): Promise<boolean> {
  unixOutput ??= runChild(ffmpegPath(), ['-hide_banner', '-protocols'], { timeoutMs: 30_000 }).then((r) => {
    const text = r.stdout.toString('utf8');
    const outputs = text.slice(text.search(/^Output:/m));
    return r.code === 0 && /^\s*unix\s*$/m.test(outputs);
  }, () => false);
  return unixOutput;
}

/**
 * Decodes every frame of `file`, in order, as raw `gray` or `rgb24` pixels.
 *
 * One ffmpeg process (input `file:` + absolute path, `-protocol_whitelist file`,
 * `-noautorotate`, `-vsync 0` so no frame is duplicated or dropped) writes
 * rawvideo to a Unix socket in a private temporary folder (or to its stdout, see
 * `transport`); frames are cut at exact byte boundaries whatever the chunking,
 * and each yielded frame owns a fresh buffer (keep it as long as you like), or
 * with `reuseBuffer` they share a few recycled buffers, each valid until the next
 * frame is asked for. The frames are read only as fast as the consumer asks, so
 * memory does not grow with clip length. Breaking out of the loop, throwing in it, or the
 * signal firing kills the child (SIGKILL) and waits for it to exit.
 *
 * Probes first (unless `info` is given) and throws that probe's
 * {@link VideoError}s. After a full read it throws a `VideoError` `truncated`
 * when ffmpeg exited with an error after some frames or delivered fewer frames
 * than the probe counted, `no_frames` when it delivered none, `ffmpeg_failed`
 * when it failed before the first frame, `timeout` past the time limit.
 *
 * The iterable can be iterated once.
 */
export async function* decodeFrames(file: string, opts: DecodeOptions): AsyncGenerator<DecodedFrame, void, undefined> {
  validate(opts);
  const info = opts.info ?? (await probeVideo(file, { signal: opts.signal }));
  opts.signal?.throwIfAborted();
  const { width, height } = info;
  const frameBytes = width * height * bytesPerPixel(opts.pixFmt);
  const args = [
    '-hide_banner', '-nostdin', '-v', 'error',
    ...(opts.threads !== undefined ? ['-threads', String(opts.threads)] : []),
    '-protocol_whitelist', 'file',
    '-noautorotate',
    '-i', fileUrl(info.file),
    '-map', info.streamIndex !== undefined ? `0:${info.streamIndex}` : '0:v:0',
    '-an', '-sn', '-dn',
    '-vsync', '0',
    '-f', 'rawvideo', '-pix_fmt', opts.pixFmt,
  ];
  const timeoutMs = opts.timeoutMs ?? defaultTimeoutMs(info.sizeBytes, info.frameCount * width * height);
  const reuse: BufferReuse = opts.reuseBuffer ?? false;
  const socket = opts.transport === 'stdout' || !(await writesUnixSockets()) ? null : frameSocketPath();
  // ffmpeg listens on the socket and waits there for Node to connect (see readFramesFromSocket).
  const output = socket ? ['-listen', '1', `unix:${socket.path}`] : ['pipe:1'];
  let child: ChildHandle;
  try {
    child = startChild(ffmpegPath(), [...args, ...output], { timeoutMs, signal: opts.signal, stdout: socket ? 'ignore' : 'pipe' });
  } catch (err) {
    socket?.remove();
    throw err;
  }
  let index = 0;
  let filled = 0;
  let reader: FrameReader | null = null;
  try {
    // Connected, the socket's folder goes at once: a process killed mid-clip leaves nothing in the temporary folder.
    if (socket) reader = readFramesFromSocket(socket.path, frameBytes, reuse, () => !child.hasExited(), socket.remove);
    else {
      const stdout = child.stdout;
      if (stdout === null) throw new Error('internal: ffmpeg stdout is not piped');
      reader = readFrames(stdout, frameBytes, reuse);
    }
    for (;;) {
      child.resumeClock();
      let data: Uint8Array | null;
      try {
        data = await reader.next();
      } finally {
        child.pauseClock();
      }
      // null: the pipe ended or broke (the child was killed); the exit status below tells why.
      if (data === null) break;
      const out: DecodedFrame = { index, data, width, height };
      if (reuse === 'released') {
        const r = reader;
        const buf = data;
        let released = false;
        out.release = () => {
          if (released) return;
          released = true;
          r.recycle(buf);
        };
      }
      index += 1;
      yield out;
    }
    filled = reader.partialBytes;
    child.resumeClock();
    const exit = await child.exited;
    if (exit.aborted) throw abortError(opts.signal);
    const tail = exit.stderrTail;
    if (exit.spawnError) throw new VideoError(file, 'ffmpeg_failed', `could not start ffmpeg (${exit.spawnError.message})`, { cause: exit.spawnError });
    if (exit.timedOut) {
      throw new VideoError(file, 'timeout', `ffmpeg ran past its time limit of ${Math.round(timeoutMs / 1000)} s after ${index} frames and was stopped`, { stderrTail: tail });
    }
    if (exit.code !== 0) {
      const why = lastLines(tail) || `exit code ${exit.code ?? exit.signal}`;
      if (index > 0) throw new VideoError(file, 'truncated', `decoding stopped after ${index} of ${info.frameCount} frames (ffmpeg: ${why})`, { stderrTail: tail });
      throw new VideoError(file, 'ffmpeg_failed', `ffmpeg could not decode it (${why})`, { stderrTail: tail });
    }
    if (index === 0) throw new VideoError(file, 'no_frames', 'ffmpeg decoded no frames', { stderrTail: tail });
    // A clean exit one or two frames short of the packet count is the container's edit list (a mov/mp4 cut to
    // its audio, a pre-roll frame) or a frame the decoder discards, not a cut file: the frames decoded stand.
    const shortfall = info.frameCount - index;
    const editListShort = exit.code === 0 && filled === 0 && shortfall > 0 && shortfall <= Math.max(2, 0.005 * info.frameCount)
      && !/error|corrupt|invalid|prematurely|partial/i.test(tail);
    if (filled > 0 || (index < info.frameCount && !editListShort)) {
      const part = filled > 0 ? ' and part of one more' : '';
      throw new VideoError(file, 'truncated', `cut short: ffmpeg decoded ${index} frames${part}, the probe counted ${info.frameCount}`, { stderrTail: tail });
    }
  } finally {
    reader?.close();
    child.kill();
    child.stdout?.destroy();
    await child.exited;
    // When no connection was made (ffmpeg failed or was stopped first).
    socket?.remove();
  }
}
