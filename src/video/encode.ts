/**
 * Writes raw frames to a video file: H.264 (libx264, yuv420p) or lossless FFV1,
 * through one ffmpeg process fed by a pipe, at a container frame rate of the
 * caller's choice. The file appears under its name only when complete.
 */
import { randomBytes } from 'node:crypto';
import { rename, stat, unlink } from 'node:fs/promises';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { optionError } from '../errors.ts';
import { bytesPerPixel, type RawPixFmt } from './decode.ts';
import { VideoError } from './errors.ts';
import { fileUrl } from './inputFile.ts';
import { ffmpegPath } from './paths.ts';
import { abortError, lastLines, startChild, type ChildHandle } from './run.ts';

/** libx264's speed presets, fastest first. */
export const X264_PRESETS = ['ultrafast', 'superfast', 'veryfast', 'faster', 'fast', 'medium', 'slow', 'slower', 'veryslow'] as const;
/** One of {@link X264_PRESETS}. */
export type X264Preset = (typeof X264_PRESETS)[number];

/** Options of {@link encodeFrames}. */
export interface EncodeOptions {
  /** Frame width in px (even for h264). */
  width: number;
  /** Frame height in px (even for h264). */
  height: number;
  /** Layout of each input frame: `gray` (1 byte/px) or `rgb24` (3 bytes/px, R G B). */
  pixFmt: RawPixFmt;
  /**
   * The frame rate written into the container, frames/s (it need not be the
   * capture rate; at most 1000 in Matroska, whose timestamps are milliseconds).
   */
  containerFps: number;
  /** `h264` (libx264, yuv420p; .mp4, .mov or .mkv) or `ffv1` (lossless; .mkv). */
  codec: 'h264' | 'ffv1';
  /** libx264 constant rate factor, 0 (best) to 51; default 18. Ignored for ffv1. */
  crf?: number;
  /** libx264 speed preset; default 'medium'. Ignored for ffv1. */
  preset?: X264Preset;
  /** Encoder threads (positive integer); default ffmpeg's choice. */
  threads?: number;
  /** Stops the encode: the child is killed, the partial file removed, the promise rejects with the signal's reason. */
  signal?: AbortSignal;
  /**
   * Time limit in ms for the time spent waiting on ffmpeg (time spent producing
   * frames does not count). Default: 60 s plus 1 s per MB of raw frames written.
   */
  timeoutMs?: number;
}

const MUXERS: Record<string, string> = { '.mp4': 'mp4', '.m4v': 'mp4', '.mov': 'mov', '.mkv': 'matroska' };

/** "30000/1001" for 29.97..., "240/1" for 240: the container rate as an exact rational where it is one. */
function fpsRational(fps: number): string {
  if (Number.isInteger(fps)) return `${fps}/1`;
  for (const den of [1001, 1000, 100, 10]) {
    const num = Math.round(fps * den);
    if (Math.abs(num / den - fps) < 1e-9 * fps) return `${num}/${den}`;
  }
  return `${Math.round(fps * 1e6)}/1000000`;
}

interface Resolved extends Required<Omit<EncodeOptions, 'signal' | 'timeoutMs' | 'threads'>> {
  muxer: string;
  frameBytes: number;
  threads?: number;
  signal?: AbortSignal;
  timeoutMs?: number;
}

function resolveOptions(outFile: string, opts: EncodeOptions): Resolved {
  const { width, height, pixFmt, containerFps, codec } = opts;
  if (codec !== 'h264' && codec !== 'ffv1') throw optionError('codec', '"h264" or "ffv1"', codec);
  if (pixFmt !== 'gray' && pixFmt !== 'rgb24') throw optionError('pixFmt', '"gray" or "rgb24"', pixFmt);
  const even = codec === 'h264' ? 'an even integer from 2 to 16384' : 'an integer from 1 to 16384';
  for (const [name, v] of [['width', width], ['height', height]] as const) {
    if (!(Number.isInteger(v) && v >= 1 && v <= 16384) || (codec === 'h264' && v % 2 !== 0)) throw optionError(name, even, v);
  }
  const ext = extname(outFile).toLowerCase();
  const muxer = MUXERS[ext];
  if (muxer === undefined || (codec === 'ffv1' && muxer !== 'matroska')) {
    throw optionError('outFile', codec === 'ffv1' ? 'a name ending in .mkv for ffv1' : 'a name ending in .mp4, .m4v, .mov or .mkv', outFile);
  }
  const maxFps = muxer === 'matroska' ? 1000 : 1e6;
  if (!(Number.isFinite(containerFps) && containerFps > 0 && containerFps <= maxFps)) {
    throw optionError('containerFps', `a frame rate above 0 and at most ${maxFps}${muxer === 'matroska' ? ' (Matroska timestamps are in ms)' : ''}`, containerFps);
  }
  const crf = opts.crf ?? 18;
  if (!(Number.isFinite(crf) && crf >= 0 && crf <= 51)) throw optionError('crf', 'a number from 0 to 51', crf);
  const preset = opts.preset ?? 'medium';
  if (!X264_PRESETS.includes(preset)) throw optionError('preset', `one of ${X264_PRESETS.join(', ')}`, preset);
  if (opts.threads !== undefined && !(Number.isInteger(opts.threads) && opts.threads >= 1 && opts.threads <= 64)) {
    throw optionError('threads', 'an integer from 1 to 64', opts.threads);
  }
  if (opts.timeoutMs !== undefined && !(opts.timeoutMs > 0)) throw optionError('timeoutMs', 'a positive number of milliseconds', opts.timeoutMs);
  return {
    width, height, pixFmt, containerFps, codec, crf, preset, muxer,
    frameBytes: width * height * bytesPerPixel(pixFmt),
    threads: opts.threads, signal: opts.signal, timeoutMs: opts.timeoutMs,
  };
}

function buildArgs(o: Resolved, tmpAbs: string): string[] {
  const codecArgs =
    o.codec === 'h264'
      ? ['-c:v', 'libx264', '-preset', o.preset, '-crf', String(o.crf), '-pix_fmt', 'yuv420p']
      : ['-c:v', 'ffv1', '-level', '3', '-g', '1', '-slicecrc', '1', ...(o.pixFmt === 'gray' ? ['-pix_fmt', 'gray'] : ['-pix_fmt', 'bgr0'])];
  return [
    '-hide_banner', '-nostdin', '-v', 'error', '-y',
    '-f', 'rawvideo', '-pix_fmt', o.pixFmt, '-s:v', `${o.width}x${o.height}`, '-framerate', fpsRational(o.containerFps),
    '-i', 'pipe:0',
    '-an', '-vsync', '0',
    ...codecArgs,
    ...(o.threads !== undefined ? ['-threads', String(o.threads)] : []),
    ...(o.muxer === 'mp4' || o.muxer === 'mov' ? ['-movflags', '+faststart'] : []),
    '-f', o.muxer,
    fileUrl(tmpAbs),
  ];
}

/** Waits until `stdin` can take more, or the child is gone (then resolves false). */
function drained(child: ChildHandle): Promise<boolean> {
  const stdin = child.stdin;
  if (stdin === null || child.hasExited()) return Promise.resolve(false);
  return new Promise((resolveDrain) => {
    const done = (ok: boolean) => (): void => {
      stdin.off('drain', onDrain);
      stdin.off('close', onGone);
      stdin.off('error', onGone);
      resolveDrain(ok);
    };
    const onDrain = done(true);
    const onGone = done(false);
    stdin.once('drain', onDrain);
    stdin.once('close', onGone);
    stdin.once('error', onGone);
    void child.exited.then(onGone);
  });
}

/**
 * Encodes `frames` (each exactly width·height bytes for `gray`, ·3 for `rgb24`,
 * row-major) into `outFile` with ffmpeg: H.264 (libx264, yuv420p, crf 18 and
 * preset medium unless given; mp4/mov get `+faststart`) or lossless FFV1
 * (level 3, intra only, slice CRCs; gray stays gray, RGB is stored as bgr0).
 * The container's frame rate is `containerFps`, exact for integer and
 * NTSC-style (n/1001) rates.
 *
 * Frames are piped in with backpressure (the next frame is not pulled while
 * ffmpeg's stdin is full) and copied, so the producer may reuse its buffer.
 * ffmpeg writes a temporary hidden file in the same folder, renamed to
 * `outFile` on success and removed on any failure.
 *
 * Throws a UsageError (`Expected ... for <option> but received "..."`) for a bad
 * option, a RangeError for a frame of the wrong length, a {@link VideoError}
 * `missing` when the folder does not exist, `no_frames` for no frame,
 * `ffmpeg_failed` or `timeout` when ffmpeg fails; rejects with the signal's
 * reason when aborted.
 */
export async function encodeFrames(
  outFile: string,
  frames: AsyncIterable<Uint8Array> | Iterable<Uint8Array>,
  opts: EncodeOptions,
): Promise<void> {
  const o = resolveOptions(outFile, opts);
  const abs = resolve(outFile);
  const dir = dirname(abs);
  try {
    if (!(await stat(dir)).isDirectory()) throw new Error('not a folder');
  } catch (err) {
    throw new VideoError(outFile, 'missing', `cannot be written: the folder ${JSON.stringify(dir)} does not exist`, { cause: err });
  }
  o.signal?.throwIfAborted();
  const tmpAbs = join(dir, `.${basename(abs, extname(abs))}.${process.pid}-${randomBytes(4).toString('hex')}.partial${extname(abs)}`);
  const timeoutMs = o.timeoutMs ?? 60_000;
  const child = startChild(ffmpegPath(), buildArgs(o, tmpAbs), { stdin: 'pipe', stdout: 'ignore', signal: o.signal, timeoutMs });
  child.pauseClock();
  const perFrameMs = o.timeoutMs === undefined ? o.frameBytes / 1e3 : 0; // 1 s per MB
  let count = 0;
  let renamed = false;
  try {
    const stdin = child.stdin;
    if (stdin === null) throw new Error('internal: ffmpeg stdin is not piped');
    for await (const frame of frames) {
      if (!(frame instanceof Uint8Array) || frame.length !== o.frameBytes) {
        const len = frame instanceof Uint8Array ? `${frame.length} bytes` : typeof frame;
        throw new RangeError(`Expected frame ${count} to be a Uint8Array of ${o.frameBytes} bytes (${o.width}x${o.height} ${o.pixFmt}) but received ${len}`);
      }
      if (child.hasExited()) break;
      count += 1;
      child.extendClock(perFrameMs);
      if (!stdin.write(Buffer.from(frame))) {
        child.resumeClock();
        const ok = await drained(child);
        child.pauseClock();
        if (!ok) break;
      }
    }
    if (count === 0 && !child.hasExited()) throw new VideoError(outFile, 'no_frames', 'nothing to encode: no frames were given');
    stdin.end();
    child.resumeClock();
    const exit = await child.exited;
    if (exit.aborted) throw abortError(o.signal);
    if (exit.spawnError) throw new VideoError(outFile, 'ffmpeg_failed', `could not start ffmpeg (${exit.spawnError.message})`, { cause: exit.spawnError });
    if (exit.timedOut) throw new VideoError(outFile, 'timeout', `ffmpeg ran past its time limit of ${Math.round((timeoutMs + count * perFrameMs) / 1000)} s and was stopped`, { stderrTail: exit.stderrTail });
    if (exit.code !== 0) {
      throw new VideoError(outFile, 'ffmpeg_failed', `ffmpeg could not encode it after ${count} frames (${lastLines(exit.stderrTail) || `exit code ${exit.code ?? exit.signal}`})`, { stderrTail: exit.stderrTail });
    }
    await rename(tmpAbs, abs);
    renamed = true;
  } finally {
    child.kill();
    await child.exited;
    if (!renamed) await unlink(tmpAbs).catch(() => {});
  }
}
