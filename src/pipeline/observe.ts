/**
 * One clip's per-frame observations as an async iterable: decode (gray, one pass) → the coin tracker.
 * For users who build their own analysis on the tracked ellipses; `measureClip` does the same and then fits.
 */
import { decodeFrames } from '../video/index.ts';
import { createTracker, type FrameObservation, type TrackerOptions } from '../vision/index.ts';
import { MEASURE_TRACKER_OPTIONS } from './trackerSettings.ts';

/** Options of {@link observeClip}; every field optional. */
export interface ObserveOptions {
  /** Stops the decode: ffmpeg is killed and the iteration rejects with the signal's reason. */
  signal?: AbortSignal;
  /** ffmpeg decoder threads, 1..64 (default: ffmpeg's choice, one per core). */
  threads?: number;
  /**
   * Tracker options (see `createTracker`). Default `MEASURE_TRACKER_OPTIONS`, the setting `measureClip` uses, so
   * the observations are those behind the dataset's frame rows.
   */
  tracker?: TrackerOptions;
}

/** What a tracker call may hand back: one observation, several (a tracker that lags), or none yet. */
type TrackerOutput = FrameObservation | readonly FrameObservation[] | null | undefined;

function* emit(out: TrackerOutput): Generator<FrameObservation> {
  if (out === null || out === undefined) return;
  if (Array.isArray(out)) yield* out as readonly FrameObservation[];
  else yield out as FrameObservation;
}

/**
 * The coin tracker's observation of every frame of a clip, in frame order, streamed: frames are decoded
 * and tracked as the consumer pulls, memory stays bounded, and breaking out of the loop stops ffmpeg.
 *
 * Each observation is `{ frame, detected, cx, cy, major, minor, angleRad, method, occluded, touchingEdge,
 * areaPx, meanGray, ... }`: pixels with x right, y down, origin at the centre of the top-left pixel; FULL axis
 * lengths in px; `angleRad` in [0, π) from +x towards +y; NaN for unknown numbers. Frame k was captured at
 * k / capture rate seconds (the capture rate is not in the file for most high-speed footage).
 *
 * Works with a tracker whose `push` returns one observation per frame and with one that holds frames back
 * (returns none or several per call and hands out the rest from `flush()` at the end of the clip).
 *
 * @param file - path of the clip (any container and codec the bundled ffmpeg decodes)
 * @param opts - abort signal, decoder threads, tracker options
 * @throws VideoError (from the decoder) naming the file when it is missing, unreadable or not a video
 */
export async function* observeClip(file: string, opts: ObserveOptions = {}): AsyncGenerator<FrameObservation, void, undefined> {
  const tracker = createTracker(opts.tracker ?? MEASURE_TRACKER_OPTIONS);
  const push = (frame: { data: Uint8Array; width: number; height: number }): TrackerOutput => tracker.push(frame) as TrackerOutput;
  for await (const frame of decodeFrames(file, { pixFmt: 'gray', signal: opts.signal, threads: opts.threads })) {
    yield* emit(push({ data: frame.data, width: frame.width, height: frame.height }));
  }
  const flush = (tracker as { flush?: () => TrackerOutput }).flush;
  if (typeof flush === 'function') yield* emit(flush.call(tracker));
}
