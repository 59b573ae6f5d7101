/**
 * Presentation timestamps of every frame of a clip, from ffprobe's packet list (no decode), sorted into
 * presentation order. With the container's rate they reveal dropped frames (a step of two or more frame
 * intervals) and repeated ones (a step of zero), against the rate the container states.
 */
import { abortError, defaultTimeoutMs, lastLines, runChild } from './run.ts';
import { checkInputFile, fileUrl } from './inputFile.ts';
import { ffprobePath } from './paths.ts';
import { VideoError } from './errors.ts';

export interface FrameTimes {
  /** Presentation time of each frame, s on the container's clock, from the first frame at 0, ascending. */
  ptsS: Float64Array;
  /**
   * Frame slot of each frame on the container's frame grid: round(pts / step), step the median timestamp step. Consecutive frames
   * differ by 1; by k > 1 where k − 1 frames were dropped; by 0 for a repeated frame.
   */
  slot: Int32Array;
  /** Frames missing between the first and the last (sum of k − 1 over steps k > 1). */
  dropped: number;
  /** Frames sharing a slot with the one before. */
  repeated: number;
}

/**
 * Reads the timestamps of `file`'s video stream `streamIndex` (default the first video stream) and
 * places them on the grid of `containerFps`. Throws `VideoError` when ffprobe fails.
 */
export async function probeFrameTimes(file: string, containerFps: number, opts: { signal?: AbortSignal; streamIndex?: number } = {}): Promise<FrameTimes> {
  const { abs, sizeBytes } = await checkInputFile(file);
  const select = opts.streamIndex === undefined ? 'v:0' : String(opts.streamIndex);
  const args = ['-hide_banner', '-v', 'error', '-protocol_whitelist', 'file', '-select_streams', select,
    '-show_entries', 'packet=pts_time', '-of', 'csv=p=0', '-i', fileUrl(abs)];
  const r = await runChild(ffprobePath(), args, { timeoutMs: defaultTimeoutMs(sizeBytes), signal: opts.signal });
  if (r.aborted) throw abortError(opts.signal);
  if (r.timedOut) throw new VideoError(file, 'timeout', 'ffprobe ran past its time limit while reading timestamps');
  if (r.code !== 0) throw new VideoError(file, 'ffmpeg_failed', `ffprobe could not read the timestamps (${lastLines(r.stderrTail, 1)})`);
  const values = r.stdout
    .toString('utf8')
    .split(/\r?\n/)
    .map((l) => Number.parseFloat(l.split(',')[0]))
    .filter((v) => Number.isFinite(v))
    .sort((a, b) => a - b);
  // The grid: the mean of the single steps (those within 25% of the median step), which is the container's nominal
  // frame interval even when its stated average rate is skewed by the gaps themselves; the stated rate otherwise.
  // The mean, not the median: timestamps are rounded to the container's time base (1 ms in Matroska: a 30 frames/s
  // clip steps 33 and 34 ms), and a grid of the rounded step would drift by a frame every 30 or so and report
  // frames dropped that were not. The rounding errors of consecutive steps cancel in their sum.
  const steps = values.slice(1).map((v, i) => v - values[i]).filter((d) => d > 0).sort((a, b) => a - b);
  const median = steps.length > 0 ? steps[steps.length >> 1] : Number.NaN;
  const singles = steps.filter((d) => d >= 0.75 * median && d <= 1.25 * median);
  const step = singles.length > 0 ? singles.reduce((a, b) => a + b, 0) / singles.length : 1 / containerFps;
  const ptsS = new Float64Array(values.length);
  const slot = new Int32Array(values.length);
  let dropped = 0;
  let repeated = 0;
  for (let i = 0; i < values.length; i++) {
    ptsS[i] = values[i] - values[0];
    slot[i] = Math.round(ptsS[i] / step);
    if (i > 0) {
      const step = slot[i] - slot[i - 1];
      if (step > 1) dropped += step - 1;
      if (step === 0) repeated++;
    }
  }
  return { ptsS, slot, dropped, repeated };
}
