/**
 * One clip, end to end: probe → decode (one pass, gray frames) → track the coin frame by frame →
 * estimate the toss → one tidy toss row and one row per frame. A clip that cannot be measured gives a
 * `failed` row whose `error` says why; it never throws for bad input.
 */
import { STANDARD_GRAVITY } from '../physics/index.ts';
import { decodeFrames, probeFrameTimes, probeVideo, isVideoError, type VideoInfo } from '../video/index.ts';
import { createTracker, type FrameObservation } from '../vision/index.ts';
import { MEASURE_TRACKER_OPTIONS } from './trackerSettings.ts';
import { estimateToss, type Face, type TossEstimate } from '../estimate/index.ts';
import { FLAG_CODES, type FrameRow, type TossRow } from '../dataset/index.ts';

/** Everything one clip's measurement depends on, resolved before the work starts. */
export interface ClipJob {
  /** Absolute path of the clip. */
  file: string;
  /** The clip's path as the dataset shows it (relative to the input folder). */
  displayFile: string;
  tossId: string;
  tosser: string | null;
  /** Capture rate, frames/s; null: use the container's rate (and flag it). */
  captureFps: number | null;
  /** Where the rate came from; `gravity`: the study's median gravity rate (`--fps-from-gravity`), `calibration`: a calibration file. */
  fpsSource: 'manifest' | 'option' | 'container' | 'gravity' | 'calibration';
  coinDiameterMm: number;
  coinThicknessMm: number;
  scaleSource: 'manifest' | 'option' | 'default';
  focalPx: number | null;
  startFace: Face | null;
  observedFace: Face | null;
  landing: 'caught' | 'surface' | null;
  notes: string | null;
  /** Gravity, m/s². */
  gravity: number;
}

export interface ClipResult {
  toss: TossRow;
  frames: FrameRow[];
  /** Frames decoded per second of wall time (image work included). */
  framesPerSecond: number;
}

export interface ClipOptions {
  signal?: AbortSignal;
  /** ffmpeg decoder threads (default: ffmpeg's choice). */
  threads?: number;
}

const FLAG_SEVERITY = new Map<string, string>(FLAG_CODES.map((f) => [f.code, f.severity]));

/** The toss row's identity and context columns, shared by measured and failed rows. */
function baseRow(job: ClipJob, captureFps: number | null, fpsSource: string): TossRow {
  return {
    toss_id: job.tossId,
    file: job.displayFile,
    tosser: job.tosser,
    status: 'failed',
    flags: '',
    error: null,
    capture_fps: captureFps,
    fps_source: fpsSource,
    gravity_fps: null,
    px_per_m: null,
    scale_source: job.scaleSource,
    frames_total: null,
    frames_tracked: null,
    release_t_s: null,
    catch_t_s: null,
    flight_time_s: null,
    flight_time_se_s: null,
    launch_speed_m_s: null,
    apex_height_m: null,
    spin_rev_s: null,
    spin_rev_s_se: null,
    precession_deg: null,
    precession_deg_se: null,
    momentum_tilt_deg: null,
    face_changes: null,
    start_face: job.startFace,
    predicted_face: null,
    observed_face: job.observedFace,
    same_side_predicted: null,
    p_same_side: null,
    fit_rms: null,
    focal_px: job.focalPx,
    camera_roll_deg: null,
    gravity_fps_se: null,
    px_per_m_se: null,
    launch_speed_se_m_s: null,
    momentum_tilt_deg_se: null,
    p_same_side_se: null,
    coin_diameter_mm: job.coinDiameterMm,
    coin_thickness_mm: job.coinThicknessMm,
    landing: job.landing,
    notes: job.notes,
    container_fps: null,
    frames_dropped: null,
    depth_change_m: null,
    scale_change_ratio: null,
    predicted_face_p: null,
  };
}

/** A `failed` row for a clip that could not be measured. */
export function failedClipRow(job: ClipJob, message: string): TossRow {
  return { ...baseRow(job, job.captureFps, job.fpsSource), flags: 'not_measured', error: message };
}

function tossRow(job: ClipJob, info: VideoInfo, captureFps: number, est: TossEstimate, flags: string[], droppedFrames: number | null): TossRow {
  const flagged = flags.some((f) => FLAG_SEVERITY.get(f) === 'flag');
  return {
    ...baseRow(job, captureFps, job.fpsSource),
    status: flagged ? 'flagged' : 'ok',
    flags: flags.join(';'),
    gravity_fps: est.gravityFps,
    px_per_m: est.pxPerM,
    frames_total: info.frameCount,
    frames_tracked: est.framesTracked,
    release_t_s: est.releaseTS,
    catch_t_s: est.catchTS,
    flight_time_s: est.flightTimeS,
    flight_time_se_s: est.flightTimeSeS,
    launch_speed_m_s: est.launchSpeedMS,
    apex_height_m: est.apexHeightM,
    spin_rev_s: est.spinRevS,
    spin_rev_s_se: est.spinRevSSe,
    precession_deg: est.precessionDeg,
    precession_deg_se: est.precessionDegSe,
    momentum_tilt_deg: est.momentumTiltDeg,
    face_changes: est.faceChanges,
    predicted_face: est.predictedFace,
    same_side_predicted: est.sameSidePredicted,
    p_same_side: est.pSameSide,
    fit_rms: est.fitRms,
    camera_roll_deg: est.cameraRollDeg,
    gravity_fps_se: est.gravityFpsSe,
    px_per_m_se: est.pxPerMSe,
    launch_speed_se_m_s: est.launchSpeedSeMS,
    momentum_tilt_deg_se: est.momentumTiltDegSe,
    p_same_side_se: est.pSameSideSe,
    container_fps: Number.isFinite(info.containerFps) ? info.containerFps : null,
    frames_dropped: droppedFrames,
    depth_change_m: est.depthChangeM,
    scale_change_ratio: est.scaleChangeRatio,
    predicted_face_p: est.predictedFaceP,
  };
}

function frameRows(tossId: string, obs: FrameObservation[], times: number[], est: TossEstimate): FrameRow[] {
  const deg = 180 / Math.PI;
  const num = (v: number) => (Number.isFinite(v) ? v : null);
  return obs.map((o, i) => ({
    toss_id: tossId,
    frame: o.frame,
    t_s: times[i],
    detected: o.detected,
    cx_px: o.detected ? num(o.cx) : null,
    cy_px: o.detected ? num(o.cy) : null,
    major_px: o.detected ? num(o.major) : null,
    minor_px: o.detected ? num(o.minor) : null,
    angle_deg: o.detected ? num(o.angleRad * deg) : null,
    axis_ratio: o.detected && o.major > 0 ? num(o.minor / o.major) : null,
    face_visible: 'unknown',
    occluded: o.occluded,
    in_flight: est.inFlight[i],
    model_axis_ratio: est.modelAxisRatio[i],
    residual: est.residual[i],
    touching_edge: o.touchingEdge,
    method: o.method,
    outline_growth_px: o.detected ? num(o.outlineGrowthPx) : null,
    end_growth_px: o.detected ? num(o.endGrowthPx) : null,
    block_matched: o.detected && o.method === 'boundary' && !Number.isFinite(o.fitRms),
  }));
}

/** Frames far from the image centre without a focal length: perspective not corrected (a note). */
function offAxis(obs: FrameObservation[], width: number, height: number): boolean {
  const half = Math.hypot(width, height) / 2;
  return obs.some((o) => o.detected && Math.hypot(o.cx - (width - 1) / 2, o.cy - (height - 1) / 2) > 0.35 * half);
}

/**
 * Measures one clip. Never throws for a bad clip: the problem becomes a `failed` row naming the file.
 * Rethrows only an abort (`signal`), so a cancelled study stops.
 */
export async function measureClip(job: ClipJob, opts: ClipOptions = {}): Promise<ClipResult> {
  const started = performance.now();
  let info: VideoInfo;
  try {
    info = await probeVideo(job.file, { signal: opts.signal });
  } catch (err) {
    if (opts.signal?.aborted) throw err;
    return { toss: failedClipRow(job, describe(err, job)), frames: [], framesPerSecond: 0 };
  }
  const flags: string[] = [];
  let captureFps = job.captureFps;
  if (captureFps === null) {
    captureFps = info.containerFps;
    flags.push('fps_from_container');
    if (!(captureFps > 0)) {
      return { toss: failedClipRow(job, `clip "${job.displayFile}": no capture rate in the manifest or options, and the container states none`), frames: [], framesPerSecond: 0 };
    }
  }
  const tracker = createTracker(MEASURE_TRACKER_OPTIONS);
  const observations: FrameObservation[] = [];
  try {
    // One decode buffer for the whole clip: the tracker copies each frame into its ring inside push().
    // The tracker keeps the decoded buffers of the frames it holds (no copy) and gives each back when done with it.
    for await (const frame of decodeFrames(job.file, { pixFmt: 'gray', signal: opts.signal, threads: opts.threads, info, reuseBuffer: 'released' })) {
      const o = tracker.push({ data: frame.data, width: frame.width, height: frame.height }, frame.release);
      if (o) observations.push(o); // the tracker reports each frame with a short lag (it may revise frames it holds)
    }
    observations.push(...tracker.flush());
  } catch (err) {
    if (opts.signal?.aborted) throw err;
    return { toss: failedClipRow(job, describe(err, job)), frames: [], framesPerSecond: 0 };
  }
  if (observations.length === 0) {
    return { toss: failedClipRow(job, `clip "${job.displayFile}": no frames could be decoded`), frames: [], framesPerSecond: 0 };
  }
  // True capture times from the container's timestamps: a dropped frame leaves a slot empty, a repeated one
  // shares a slot (DESIGN §5). Without usable timestamps, frame / capture rate.
  let times = observations.map((o) => o.frame / captureFps!);
  let droppedFrames: number | null = null;
  const stamps = await probeFrameTimes(job.file, info.containerFps, { signal: opts.signal }).catch(() => null);
  if (stamps && stamps.slot.length === observations.length && info.containerFps > 0) {
    droppedFrames = stamps.dropped + stamps.repeated;
    if (stamps.dropped > 0 || stamps.repeated > 0) {
      flags.push('frames_dropped');
      times = Array.from(stamps.slot, (slot) => slot / captureFps!);
    }
  }
  const est = estimateToss(observations, {
    captureFps,
    frameTimesS: times,
    coinDiameterM: job.coinDiameterMm / 1000,
    coinThicknessM: job.coinThicknessMm / 1000,
    focalPx: job.focalPx,
    width: info.width,
    height: info.height,
    startFace: job.startFace,
    gravity: job.gravity ?? STANDARD_GRAVITY,
  });
  if (job.focalPx === null && offAxis(observations, info.width, info.height)) flags.push('off_axis_no_focal');
  const allFlags = [...new Set([...flags, ...est.flags])].sort();
  const toss = tossRow(job, { ...info, frameCount: observations.length }, captureFps, est, allFlags, droppedFrames);
  const seconds = (performance.now() - started) / 1000;
  return { toss, frames: frameRows(job.tossId, observations, times, est), framesPerSecond: observations.length / seconds };
}

function describe(err: unknown, job: ClipJob): string {
  if (isVideoError(err)) return `clip "${job.displayFile}": ${err.problem}`;
  const text = err instanceof Error ? err.message : String(err);
  return `clip "${job.displayFile}": ${text}`;
}
