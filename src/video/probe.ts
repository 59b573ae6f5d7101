/**
 * What a clip holds, read with ffprobe's JSON output: size, codec, pixel format,
 * the container's frame rate, the exact number of frames, duration and bytes.
 */
import { open } from 'node:fs/promises';
import { abortError, defaultTimeoutMs, lastLines, runChild } from './run.ts';
import { checkInputFile, fileUrl } from './inputFile.ts';
import { VideoError } from './errors.ts';
import { ffprobePath } from './paths.ts';

/** The facts of one clip's (first) video stream. */
export interface VideoInfo {
  /** The absolute path of the clip. */
  file: string;
  /** Stored frame width in px (rotation metadata is not applied; decode does not apply it either). */
  width: number;
  /** Stored frame height in px. */
  height: number;
  /** ffmpeg's codec name, e.g. `h264`, `ffv1`, `prores`, `mjpeg`. */
  codec: string;
  /** ffmpeg's pixel format name of the stream, e.g. `yuv420p`, `gray`. */
  pixFmt: string;
  /**
   * The frame rate the container states, in frames/s (avg_frame_rate, else
   * r_frame_rate; NaN when it states none). A high-speed camera often stores a
   * playback rate here, not the capture rate.
   */
  containerFps: number;
  /**
   * The number of frames: packets counted by reading the whole file (one frame
   * per packet in mp4/mov/mkv/avi), or frames decoded with `countFrames`.
   */
  frameCount: number;
  /** Duration in s (the stream's, else the container's, else frameCount / containerFps). */
  durationS: number;
  /** File size in bytes. */
  sizeBytes: number;
  /** The ffmpeg index of the stream described (decode maps this one). */
  streamIndex?: number;
}

/** Options of {@link probeVideo}. */
export interface ProbeOptions {
  /** Cancels the probe (the child is killed, the promise rejects with the signal's reason). */
  signal?: AbortSignal;
  /** Time limit in ms (default {@link defaultTimeoutMs} of the file size). */
  timeoutMs?: number;
  /**
   * Count frames by decoding them all (`-count_frames`: exact for any container,
   * as slow as a decode) instead of counting packets (default false).
   */
  countFrames?: boolean;
}

interface ProbeStream {
  index?: number;
  codec_type?: string;
  codec_name?: string;
  width?: number;
  height?: number;
  pix_fmt?: string;
  avg_frame_rate?: string;
  r_frame_rate?: string;
  nb_frames?: string;
  nb_read_packets?: string;
  nb_read_frames?: string;
  duration?: string;
  disposition?: { attached_pic?: number };
}

interface ProbeJson {
  streams?: ProbeStream[];
  format?: { format_name?: string; duration?: string };
}

/** Parses "30000/1001" (or "25") into a number; NaN when absent, zero or malformed. */
function parseRate(rate: string | undefined): number {
  if (rate === undefined) return NaN;
  const [n, d = '1'] = rate.split('/');
  const value = Number(n) / Number(d);
  return Number.isFinite(value) && value > 0 ? value : NaN;
}

function parseCount(value: string | undefined): number {
  if (value === undefined || value === 'N/A') return NaN;
  const n = Number(value);
  return Number.isInteger(n) && n >= 0 ? n : NaN;
}

function parseSeconds(value: string | undefined): number {
  const s = value === undefined ? NaN : Number(value);
  return Number.isFinite(s) && s >= 0 ? s : NaN;
}

const STILL_IMAGE_CODECS = new Set(['png', 'apng', 'bmp', 'tiff', 'webp', 'jpegls', 'jpeg2000', 'pam', 'ppm', 'pgm', 'pgmyuv', 'pbm', 'gif', 'sgi', 'exr', 'dpx', 'mjpeg', 'qoi']);

/** Messages of the demuxers when the data ends before the container said it would. */
const TRUNCATION_MESSAGES = /File ended prematurely|partial file/i;

/** True for ffmpeg's mov/mp4 demuxer, whose index (`stsz`) lists every frame. */
function isMovFamily(formatName: string): boolean {
  return /(^|,)(mov|mp4)(,|$)/.test(formatName);
}

/** True when the file begins like an ISO base media (mp4/mov) file: a known box type at bytes 4..8. */
async function startsLikeMp4(abs: string): Promise<boolean> {
  const fh = await open(abs, 'r');
  try {
    const head = Buffer.alloc(8);
    const { bytesRead } = await fh.read(head, 0, 8, 0);
    return bytesRead === 8 && /^(ftyp|moov|mdat|free|skip|wide|pnot|uuid)$/.test(head.toString('latin1', 4, 8));
  } finally {
    await fh.close();
  }
}

/** Names the problem in ffprobe's stderr when it exits with an error. */
function classifyFailure(file: string, stderrTail: string, looksLikeMp4: boolean): VideoError {
  const why = lastLines(stderrTail);
  if (looksLikeMp4 && /moov atom not found/i.test(stderrTail)) {
    return new VideoError(file, 'truncated', 'the file ends before its index (mp4/mov "moov" atom not found): cut short, or still being written', { stderrTail });
  }
  if (/Invalid data found when processing input|could not find codec parameters|Unknown input format/i.test(stderrTail)) {
    return new VideoError(file, 'not_video', `not a video ffmpeg can read (ffprobe: ${why})`, { stderrTail });
  }
  if (/Permission denied/i.test(stderrTail)) return new VideoError(file, 'unreadable', 'no permission to read it', { stderrTail });
  if (/No such file or directory/i.test(stderrTail)) return new VideoError(file, 'missing', 'no such file', { stderrTail });
  return new VideoError(file, 'ffmpeg_failed', `ffprobe failed (${why || 'no message'})`, { stderrTail });
}

/**
 * Reads what `file` holds with ffprobe (JSON output, input as `file:` + absolute
 * path, `-protocol_whitelist file`). The frame count reads the whole file (packets
 * counted, or frames decoded with `countFrames`), so it is exact for H.264 in mp4
 * and FFV1 in Matroska, where each packet is one frame.
 *
 * Throws a {@link VideoError}: `missing`, `unreadable`; `not_video` for an empty
 * file, unknown bytes, audio only or a still image; `truncated` for an mp4/mov
 * without its index; `no_frames`; `ffmpeg_failed`; `timeout`. Rejects with the
 * signal's reason when aborted.
 *
 * @param file - the clip (relative paths are resolved against the working folder)
 */
export async function probeVideo(file: string, opts: ProbeOptions = {}): Promise<VideoInfo> {
  const { abs, sizeBytes } = await checkInputFile(file);
  if (sizeBytes === 0) throw new VideoError(file, 'not_video', 'not a video (the file is empty, 0 bytes)');
  opts.signal?.throwIfAborted();
  const args = [
    '-hide_banner', '-v', 'error',
    '-protocol_whitelist', 'file',
    opts.countFrames === true ? '-count_frames' : '-count_packets',
    '-show_entries',
    'stream=index,codec_type,codec_name,width,height,pix_fmt,avg_frame_rate,r_frame_rate,nb_frames,nb_read_packets,nb_read_frames,duration' +
      ':stream_disposition=attached_pic:format=format_name,duration',
    '-of', 'json',
    '-i', fileUrl(abs),
  ];
  const timeoutMs = opts.timeoutMs ?? defaultTimeoutMs(sizeBytes, opts.countFrames === true ? sizeBytes * 100 : 0);
  const r = await runChild(ffprobePath(), args, { timeoutMs, signal: opts.signal });
  if (r.aborted) throw abortError(opts.signal);
  if (r.spawnError) throw new VideoError(file, 'ffmpeg_failed', `could not start ffprobe (${r.spawnError.message})`, { cause: r.spawnError });
  if (r.timedOut) throw new VideoError(file, 'timeout', `ffprobe ran past its time limit of ${Math.round(timeoutMs / 1000)} s and was stopped`, { stderrTail: r.stderrTail });
  if (r.code !== 0) throw classifyFailure(file, r.stderrTail, await startsLikeMp4(abs));

  let json: ProbeJson;
  try {
    json = JSON.parse(r.stdout.toString('utf8')) as ProbeJson;
  } catch (err) {
    throw new VideoError(file, 'ffmpeg_failed', 'ffprobe wrote output that is not JSON', { stderrTail: r.stderrTail, cause: err });
  }
  const streams = json.streams ?? [];
  const video = streams.find((s) => s.codec_type === 'video' && s.disposition?.attached_pic !== 1);
  if (video === undefined) {
    const hasAudio = streams.some((s) => s.codec_type === 'audio');
    const only = hasAudio ? ', only audio' : streams.some((s) => s.codec_type === 'video') ? ', only cover art' : '';
    throw new VideoError(file, 'not_video', `not a video (ffprobe found no video stream${only})`, { stderrTail: r.stderrTail });
  }
  const formatName = json.format?.format_name ?? '';
  const codec = video.codec_name ?? 'unknown';
  const width = video.width ?? 0;
  const height = video.height ?? 0;
  if (codec === 'unknown' || !(width > 0 && height > 0)) {
    if (isMovFamily(formatName) && (await startsLikeMp4(abs))) {
      throw new VideoError(file, 'truncated', 'the mp4/mov index is incomplete (cut short, or still being written)', { stderrTail: r.stderrTail });
    }
    throw new VideoError(file, 'not_video', `not a video ffmpeg can read (codec ${codec}, size ${width}x${height})`, { stderrTail: r.stderrTail });
  }
  const counted = parseCount(opts.countFrames === true ? video.nb_read_frames : video.nb_read_packets);
  const frameCount = Number.isNaN(counted) ? parseCount(video.nb_frames) : counted;
  const isImageFormat = /(^|,)image2(,|$)|_pipe(,|$)/.test(formatName);
  if (isImageFormat || (STILL_IMAGE_CODECS.has(codec) && frameCount <= 1 && formatName !== 'avi')) {
    throw new VideoError(file, 'not_video', `not a video (a still ${codec} image)`, { stderrTail: r.stderrTail });
  }
  if (!(frameCount > 0)) throw new VideoError(file, 'no_frames', 'the video stream holds no frames', { stderrTail: r.stderrTail });
  const listed = parseCount(video.nb_frames);
  if (isMovFamily(formatName) && listed > frameCount) {
    throw new VideoError(file, 'truncated', `cut short: its index lists ${listed} frames but only ${frameCount} could be read`, { stderrTail: r.stderrTail });
  }
  if (TRUNCATION_MESSAGES.test(r.stderrTail)) {
    throw new VideoError(file, 'truncated', `cut short: only ${frameCount} frames could be read (ffprobe: ${lastLines(r.stderrTail, 1)})`, { stderrTail: r.stderrTail });
  }
  const avg = parseRate(video.avg_frame_rate);
  const containerFps = Number.isNaN(avg) ? parseRate(video.r_frame_rate) : avg;
  let durationS = parseSeconds(video.duration);
  if (Number.isNaN(durationS)) durationS = parseSeconds(json.format?.duration);
  if (Number.isNaN(durationS)) durationS = frameCount / containerFps;
  return {
    file: abs,
    width,
    height,
    codec,
    pixFmt: video.pix_fmt ?? 'unknown',
    containerFps,
    frameCount,
    durationS,
    sizeBytes,
    streamIndex: video.index,
  };
}
