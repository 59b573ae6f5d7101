/**
 * The options of a synthetic study, their defaults, and their validation: checked once and resolved
 * into a read-only object. Every error is built by `optionError` and names the CLI flag.
 */
import { optionError } from '../errors.ts';
import type { BackgroundKind } from './background.ts';
import type { Range, StartFaceChoice } from './scenario.ts';
import { X264_PRESETS, type X264Preset } from '../video/index.ts';

/** Options of a synthetic study as a caller gives them (all but `outDir` optional). */
export interface SynthOptions {
  /** Folder for the clips, the truth files and manifest.csv (created if missing). */
  outDir: string;
  /** Number of clips (default 8). */
  count?: number;
  /** Index of the first clip (default 0): clip k of the study is toss `startIndex + k` of the seed's sequence. */
  startIndex?: number;
  /** Study seed, an integer (default 1). */
  seed?: number;
  /** Capture rate, frames/s (default 1000). */
  captureFps?: number;
  /** Frame rate written into the container, frames/s (default 30). */
  containerFps?: number;
  /** Image width and height, px (default 640×480; even for H.264). */
  width?: number;
  height?: number;
  /** Coin diameter, mm (default 24.26). */
  coinDiameterMm?: number;
  /** Coin thickness, mm (default 1.75). */
  coinThicknessMm?: number;
  /** Vertical launch speed range, m/s (default 1.5–3.5). */
  launchSpeedMS?: Range;
  /** Spin rate range, rev/s (default 15–60). */
  spinRevS?: Range;
  /** Precession angle range (coin axis to L), deg within 0..90 (default 50–90). */
  precessionDeg?: Range;
  /** Tilt of L from the vertical, deg within 0..90; default `'precession'` (β = ψ: the normal starts vertical). */
  tiltDeg?: Range | 'precession';
  /** Exposure, fraction of the frame interval, 0..1 (default 0.5). */
  exposureFraction?: number;
  /** Sensor noise σ, gray levels (default 2). */
  noiseSigma?: number;
  /** Background (default `textured`). */
  background?: BackgroundKind;
  /** Draw the hand (default true). */
  hand?: boolean;
  /** Camera distance (depth of the release point), m (default 0.6). */
  distanceM?: number;
  /** Focal length, px (default from a 60° horizontal field of view: (W/2)/tan 30°). */
  focalPx?: number;
  /** Camera roll range, deg (default 0). */
  rollDeg?: Range;
  /** Launch speed along the optical axis, m/s (default 0). */
  depthSpeedMS?: Range;
  /** Number of tossers T01.. (default 3). */
  tosserCount?: number;
  /** Lossless FFV1 in .mkv instead of H.264 in .mp4 (default false). */
  lossless?: boolean;
  /** libx264 constant rate factor, 0..51 (default 20). */
  crf?: number;
  /** libx264 speed preset (default `veryfast`: here both faster and smaller than `medium` on noisy frames). */
  x264Preset?: X264Preset;
  /** Face up before the toss (default `random`). */
  startFace?: StartFaceChoice;
  /** Sub-exposures averaged for motion blur (default 4). */
  subExposures?: number;
  /** Supersampling per pixel, 1 or 4 (default 4). */
  supersampling?: 1 | 4;
  /** Called after each clip is written. */
  onClip?: (clip: { index: number; file: string; framesTotal: number }) => void;
}

/** Options after defaults and validation. */
export type ResolvedSynthOptions = Readonly<Required<Omit<SynthOptions, 'onClip'>>> & Pick<SynthOptions, 'onClip'>;

/** The defaults (also shown by `tossmeter synth --help`). */
export const SYNTH_DEFAULTS = {
  count: 8,
  startIndex: 0,
  seed: 1,
  captureFps: 1000,
  containerFps: 30,
  width: 640,
  height: 480,
  coinDiameterMm: 24.26,
  coinThicknessMm: 1.75,
  launchSpeedMS: [1.5, 3.5] as Range,
  spinRevS: [15, 60] as Range,
  precessionDeg: [50, 90] as Range,
  tiltDeg: 'precession' as const,
  exposureFraction: 0.5,
  noiseSigma: 2,
  background: 'textured' as BackgroundKind,
  hand: true,
  distanceM: 0.6,
  rollDeg: [0, 0] as Range,
  depthSpeedMS: [0, 0] as Range,
  tosserCount: 3,
  lossless: false,
  crf: 20,
  x264Preset: 'veryfast' as X264Preset,
  startFace: 'random' as StartFaceChoice,
  subExposures: 4,
  supersampling: 4 as const,
} as const;

/** The focal length (px) of a horizontal field of view `fovDeg` across `width` px: (W/2)/tan(fov/2). */
export function focalFromFov(width: number, fovDeg = 60): number {
  return width / 2 / Math.tan(((fovDeg / 2) * Math.PI) / 180);
}

function int(flag: string, v: number, lo: number, hi: number): number {
  if (!(Number.isInteger(v) && v >= lo && v <= hi)) throw optionError(flag, `an integer from ${lo} to ${hi}`, v);
  return v;
}
function real(flag: string, v: number, lo: number, hi: number, what = 'a number'): number {
  if (!(Number.isFinite(v) && v >= lo && v <= hi)) throw optionError(flag, `${what} from ${lo} to ${hi}`, v);
  return v;
}
function positive(flag: string, v: number, unit: string): number {
  if (!(Number.isFinite(v) && v > 0)) throw optionError(flag, `a positive number (${unit})`, v);
  return v;
}
function range(flag: string, r: Range, lo: number, hi: number, unit: string): Range {
  if (!(Array.isArray(r) && r.length === 2 && r.every(Number.isFinite) && r[0] <= r[1] && r[0] >= lo && r[1] <= hi)) {
    throw optionError(flag, `a range min:max with ${lo} <= min <= max <= ${hi} (${unit})`, Array.isArray(r) ? r.join(':') : r);
  }
  return [r[0], r[1]];
}

/**
 * Applies the defaults and checks every option; throws a UsageError (`Expected ... for --flag but received "..."`)
 * for the first bad one.
 */
export function resolveSynthOptions(opts: SynthOptions): ResolvedSynthOptions {
  const d = SYNTH_DEFAULTS;
  if (typeof opts.outDir !== 'string' || opts.outDir.trim() === '') throw optionError('--out', 'a folder name', opts.outDir);
  const lossless = opts.lossless ?? d.lossless;
  const width = int('--size', opts.width ?? d.width, 16, 8192);
  const height = int('--size', opts.height ?? d.height, 16, 8192);
  if (!lossless && (width % 2 !== 0 || height % 2 !== 0)) throw optionError('--size', 'an even width and height for H.264 (or --lossless)', `${width}x${height}`);
  const containerFps = real('--container-fps', opts.containerFps ?? d.containerFps, 1, lossless ? 1000 : 10000, 'a frame rate');
  const background = opts.background ?? d.background;
  if (background !== 'textured' && background !== 'plain') throw optionError('--background', '"textured" or "plain"', background);
  const startFace = opts.startFace ?? d.startFace;
  if (!['heads', 'tails', 'random'].includes(startFace)) throw optionError('--start-face', '"heads", "tails" or "random"', startFace);
  const tilt = opts.tiltDeg ?? d.tiltDeg;
  const x264Preset = opts.x264Preset ?? d.x264Preset;
  if (!X264_PRESETS.includes(x264Preset)) throw optionError('--x264-preset', `one of ${X264_PRESETS.join(', ')}`, x264Preset);
  const supersampling = opts.supersampling ?? d.supersampling;
  if (supersampling !== 1 && supersampling !== 4) throw optionError('supersampling', '1 or 4', supersampling);
  return {
    outDir: opts.outDir,
    count: int('--count', opts.count ?? d.count, 1, 100000),
    startIndex: int('startIndex', opts.startIndex ?? d.startIndex, 0, 1e9),
    seed: int('--seed', opts.seed ?? d.seed, 0, 2 ** 31 - 1),
    captureFps: real('--fps', opts.captureFps ?? d.captureFps, 1, 100000, 'a frame rate'),
    containerFps,
    width,
    height,
    coinDiameterMm: real('--coin-mm', opts.coinDiameterMm ?? d.coinDiameterMm, 1, 200, 'a diameter in mm'),
    coinThicknessMm: real('--coin-thickness-mm', opts.coinThicknessMm ?? d.coinThicknessMm, 0.001, 20, 'a thickness in mm'),
    launchSpeedMS: range('--launch-speed', opts.launchSpeedMS ?? d.launchSpeedMS, 0.1, 20, 'm/s'),
    spinRevS: range('--spin', opts.spinRevS ?? d.spinRevS, 0, 1000, 'rev/s'),
    precessionDeg: range('--precession', opts.precessionDeg ?? d.precessionDeg, 0, 90, 'deg'),
    tiltDeg: tilt === 'precession' ? 'precession' : range('--tilt', tilt, 0, 90, 'deg'),
    exposureFraction: real('--exposure', opts.exposureFraction ?? d.exposureFraction, 0, 1, 'a fraction of the frame interval'),
    noiseSigma: real('--noise', opts.noiseSigma ?? d.noiseSigma, 0, 100, 'a gray-level sigma'),
    background,
    hand: opts.hand ?? d.hand,
    distanceM: positive('--distance', opts.distanceM ?? d.distanceM, 'm'),
    focalPx: positive('--focal-px', opts.focalPx ?? focalFromFov(width), 'px'),
    rollDeg: range('--roll', opts.rollDeg ?? d.rollDeg, -180, 180, 'deg'),
    depthSpeedMS: range('--depth-speed', opts.depthSpeedMS ?? d.depthSpeedMS, -5, 5, 'm/s'),
    tosserCount: int('--tosser-count', opts.tosserCount ?? d.tosserCount, 1, 99),
    lossless,
    crf: real('--crf', opts.crf ?? d.crf, 0, 51, 'a constant rate factor'),
    x264Preset,
    startFace,
    subExposures: int('--sub-exposures', opts.subExposures ?? d.subExposures, 1, 64),
    supersampling,
    onClip: opts.onClip,
  };
}
