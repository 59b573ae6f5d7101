/**
 * tossmeter as a library: measure tossed coins from high-speed video, render clips of known motion, summarise
 * a study, or take the per-frame coin ellipses and build your own analysis. Re-exports only; every function is
 * documented where it is defined (meaning, units, defaults).
 *
 * @example
 * ```ts
 * import { measureStudy, observeClip, readTosses, summarizeStudy } from 'tossmeter';
 *
 * const study = await measureStudy({ input: 'academy/clips', out: 'academy/dataset', fps: 1000 });
 * console.log(study.counts); // { ok, flagged, failed, unusable }
 * const summary = summarizeStudy(await readTosses('academy/dataset'), { seed: 1 });
 * console.log(summary.study.observedSameSide.rate, summary.study.observedSameSide.wilson);
 * for await (const o of observeClip('academy/clips/T01-001.mp4'))
 *   if (o.detected) console.log(o.frame, o.cx, o.cy, o.minor / o.major);
 * ```
 *
 * Conventions (shared by every value here): SI units and radians inside, degrees only in the dataset's `_deg`
 * columns; pixels x right, y down, origin at the centre of the top-left pixel; frames count from 0 and
 * `t_s = frame / capture_fps`; the coin's normal points out of the heads face; the world frame has z up.
 *
 * @packageDocumentation
 */

// ── Measuring: a folder of clips, one clip, per-frame observations, and shard merging ──────────────────────
export {
  measureStudy,
  shardOf,
  CLIP_EXTENSIONS,
  DEFAULT_COIN,
  type StudyOptions,
  type StudyProgress,
  type StudyResult,
} from './pipeline/study.ts';
export { measureClip, failedClipRow, type ClipJob, type ClipOptions, type ClipResult } from './pipeline/clip.ts';
export { observeClip, type ObserveOptions } from './pipeline/observe.ts';
export { mergeDatasets, type MergeResult, type MergedShard } from './pipeline/merge.ts';

// ── Per-toss estimation from observations ───────────────────────────────────────────────────────────────
export { estimateToss, type Face, type ObservedFrame, type TossContext, type TossEstimate } from './estimate/index.ts';

// ── The tracker and the video layer, for your own pipelines ───────────────────────────────────────────────
export { createTracker, type FrameObservation, type Tracker, type TrackerOptions, type GrayImage, type Ellipse } from './vision/index.ts';
export { probeVideo, decodeFrames, VideoError, isVideoError, type VideoInfo, type DecodedFrame, type DecodeOptions, type VideoErrorCode } from './video/index.ts';

// ── Clips of known motion (ground truth) ─────────────────────────────────────────────────────────────────
export { renderStudy, SYNTH_DEFAULTS, parseTruth, type SynthOptions, type StudyClip, type Truth, type TruthFrame } from './synth/index.ts';

// ── The study summary ────────────────────────────────────────────────────────────────────────────────────
export {
  summarizeStudy,
  QUANTITY_COLUMNS,
  QUANTILE_PROBS,
  type SummarizeOptions,
  type StudySummary,
  type GroupSummary,
  type RateSummary,
  type QuantileSummary,
  type PoolingSummary,
  type SummaryInputRow,
} from './stats/summarize.ts';

// ── The dataset: field lists, readers and writers, the Data Package descriptor, the manifest ───────────────
export {
  TOSS_FIELDS,
  FRAME_FIELDS,
  FLAG_CODES,
  fieldDescription,
  fieldLabel,
  readTosses,
  readFrames,
  writeDataset,
  readManifest,
  parseManifest,
  dataPackage,
  tableSchema,
  DatasetError,
  ManifestError,
  type TossRow,
  type FrameRow,
  type CellValue,
  type Field,
  type FieldType,
  type FlagCode,
  type DatasetContent,
  type Manifest,
  type ManifestRow,
  type TableSchemaField,
} from './dataset/index.ts';

// ── Closed-form physics of the flight and the torque-free rotation (radians, SI units) ──────────────────────
export {
  STANDARD_GRAVITY,
  discInertia,
  precessionFrame,
  normalAt,
  precessionFromState,
  attitudeAt,
  angularVelocityAt,
  upComponent,
  faceChanges,
  sameSideFraction,
  sameSideVertical,
  ballisticPosition,
  ballisticVelocity,
  apexHeight,
  flightTime,
  halfTurns,
  bandBoundaryOmega,
  bandFace,
  type DiscInertia,
  type PrecessionParams,
  type PrecessionFrame,
  type Vec3,
  type Mat3,
} from './physics/index.ts';

// ── Errors ───────────────────────────────────────────────────────────────────────────────────────────────
export { UsageError, optionError } from './errors.ts';
