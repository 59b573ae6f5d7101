/**
 * The one error class of the ffmpeg layer. Every failure that concerns a clip
 * (missing, unreadable, not a video, cut short, ffmpeg failed or hung) is a
 * `VideoError` whose `code` a pipeline can store as a clip's status and whose
 * message names the file and the problem in plain words.
 */

/**
 * Why a clip could not be probed, decoded or encoded.
 *
 * - `missing`: the file (or the output folder) does not exist.
 * - `unreadable`: it exists but cannot be read: a folder, a device, no permission.
 * - `not_video`: it is readable but holds no decodable video: empty, unknown bytes,
 *   audio only, a still image.
 * - `truncated`: the file ends early: no index (mp4 `moov` atom missing), fewer frames
 *   decoded than the container lists, or the decoder stopped part way.
 * - `no_frames`: a video stream is there but holds no frame.
 * - `ffmpeg_failed`: ffmpeg or ffprobe exited with an error we cannot put in a class above.
 * - `timeout`: the child ran past its time limit and was killed.
 */
export type VideoErrorCode =
  | 'missing'
  | 'unreadable'
  | 'not_video'
  | 'truncated'
  | 'no_frames'
  | 'ffmpeg_failed'
  | 'timeout';

/** The codes of {@link VideoErrorCode}, in a stable order (for docs and checks). */
export const VIDEO_ERROR_CODES: readonly VideoErrorCode[] = [
  'missing',
  'unreadable',
  'not_video',
  'truncated',
  'no_frames',
  'ffmpeg_failed',
  'timeout',
];

/** Options of {@link VideoError}. */
export interface VideoErrorOptions {
  /** The last lines ffmpeg/ffprobe wrote to stderr, if a child was involved. */
  stderrTail?: string;
  /** The underlying error (a file-system error, a spawn error). */
  cause?: unknown;
}

/**
 * A problem with one clip. The message reads `clip "<file>": <problem>`, e.g.
 * `clip "a b.mp4": not a video (ffprobe found no video stream)`.
 */
export class VideoError extends Error {
  override name = 'VideoError';
  /** The file as the caller named it. */
  readonly file: string;
  /** The class of problem. */
  readonly code: VideoErrorCode;
  /** The problem alone, without the `clip "<file>": ` prefix. */
  readonly problem: string;
  /** The tail of the child's stderr, '' when no child was involved. */
  readonly stderrTail: string;

  /**
   * @param file - the clip as the caller named it (used verbatim in the message)
   * @param code - the class of problem
   * @param problem - plain words, lower case, no trailing full stop
   */
  constructor(file: string, code: VideoErrorCode, problem: string, options: VideoErrorOptions = {}) {
    super(`clip ${JSON.stringify(file)}: ${problem}`, options.cause === undefined ? undefined : { cause: options.cause });
    this.file = file;
    this.code = code;
    this.problem = problem;
    this.stderrTail = options.stderrTail ?? '';
  }
}

/** True when `err` is a {@link VideoError}, optionally of the given code. */
export function isVideoError(err: unknown, code?: VideoErrorCode): err is VideoError {
  return err instanceof VideoError && (code === undefined || err.code === code);
}
