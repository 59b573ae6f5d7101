import { createBackgroundModel, type BackgroundOptions } from './background.ts';
import { ellipseToConic, type Ellipse } from './ellipse.ts';
import { ellipseFromMoments } from './ellipseFromMoments.ts';
import { estimateGain } from './estimateGain.ts';
import { fitEllipseFixedMajor } from './fitEllipseFixedMajor.ts';
import { fitEllipseTrimmed } from './fitEllipseTrimmed.ts';
import { foregroundMask } from './foreground.ts';
import { measureEndGrowth, measureOutlineGrowth } from './outlineGrowth.ts';
import { matchTranslation } from './matchTranslation.ts';
import type { GrayImage, PixelWindow } from './image.ts';
import { labelComponents, type ComponentLabels } from './labelComponents.ts';
import { createRegionScratch, measureRegion, type RegionMeasure } from './measureRegion.ts';
import { estimateNoiseSigma } from './noise.ts';
import { hypot2 } from '../hypot.ts';

/** Options of {@link createTracker}; every field optional. */
export interface TrackerOptions {
  /** Frames whose per-pixel median starts the background model (default 5, at least 3). No coin is reported before the last of them. */
  readonly initFrames?: number;
  /** Foreground threshold in noise σ (default 4). */
  readonly thresholdSigmas?: number;
  /** Lowest foreground threshold, gray levels (default 8; compressed video has little visible noise but blocky errors). */
  readonly thresholdFloorGray?: number;
  /**
   * Smallest coin major axis accepted when searching, px (default max(12, 0.025 × the shorter
   * image side): 12 px at 640×480, 18 px at 1280×720; a whole flight in view can leave a coin 15–25 px across).
   */
  readonly minMajorPx?: number;
  /** Largest coin major axis accepted when searching, px (default 0.6 × the shorter image side). */
  readonly maxMajorPx?: number;
  /** Expected major axis (coin diameter in px) if known; searching then accepts only 0.7–1.4 × this. */
  readonly diameterHintPx?: number;
  /** Frames without a detection before the whole frame is searched again (default 3). */
  readonly maxLostFrames?: number;
  /** Background model options (rate, static absorption). */
  readonly background?: BackgroundOptions;
  /**
   * Frames kept for back-filling, K (default min(48, ⌊64 MiB / frame size⌋), with `carryBackfill` min(96, …): 96 at 640×480, 72 at 1280×720; at least 4; 1 turns
   * back-filling off). The tracker's output lags K − 1 frames behind its input, see {@link Tracker}.
   */
  readonly bufferFrames?: number;
  /**
   * Second back-fill pass across the release (default false): coasts over up to 6 frames where the
   * coin, edge-on between the fingertips, is not found, and follows it into the hand by block
   * matching (see {@link createTracker}). Raises the default K to min(96, ⌊64 MiB / frame size⌋).
   * Off by default here; `measure` turns it on (`MEASURE_TRACKER_OPTIONS`).
   */
  readonly carryBackfill?: boolean;
  /**
   * Follow the coin into the catching hand (default true): when the track step finds no coin in a frame right
   * after a detection, block match the coin of the previous frame into this one, for up to FOLLOW_FRAMES frames
   * in a row (see {@link createTracker}), so that the flight window sees where free flight stops.
   */
  readonly followIntoHand?: boolean;
  /**
   * Follow the coin held in the hand after the catch (default true): where the track step finds no coin, or only
   * an outline fit merged with the hand, right after a detection, block match the previous frame's coin and the
   * foreground around it as one rigid patch; accepted only when it matches to the noise (the coin has stopped
   * turning and moves with the hand). See {@link createTracker}.
   */
  readonly followHeld?: boolean;
}

/** What the tracker reports for one frame; NaN for unknown numbers. */
export interface FrameObservation {
  /** Frame index (0-based count of pushed frames). */
  readonly frame: number;
  readonly detected: boolean;
  /** Ellipse centre, px (origin at the centre of the top-left pixel). */
  readonly cx: number;
  readonly cy: number;
  /** FULL axis lengths, px, major ≥ minor. */
  readonly major: number;
  readonly minor: number;
  /** Major-axis direction from +x towards +y, [0, π). */
  readonly angleRad: number;
  /** 'moments' for a clean blob, 'boundary' for a fit to the visible outline, 'none' when not detected. */
  readonly method: 'moments' | 'boundary' | 'none';
  /** The coin's blob touched another foreground region (the hand). */
  readonly occluded: boolean;
  /** The coin's blob touched the frame border. */
  readonly touchingEdge: boolean;
  /** Coin pixels: the hole-filled blob (moments) or the blob pixels inside the fitted ellipse (boundary). */
  readonly areaPx: number;
  /** Mean gray level over those pixels (a cue to the visible face). */
  readonly meanGray: number;
  /** RMS Sampson distance of the blob's visible outline to the reported ellipse, px. */
  readonly fitRms: number;
  /** Blob area / (π/4 · major · minor) for 'moments' (≈ 1 for an ellipse); NaN otherwise. */
  readonly fillRatio: number;
  /** Foreground threshold used on this frame, gray levels. */
  readonly thresholdGray: number;
  /**
   * How much larger the reported ellipse is than the coin, on the full axes, px, from the gray levels of its
   * edge (`measureOutlineGrowth`); measured on clean frames of the forward track, NaN elsewhere.
   */
  readonly outlineGrowthPx: number;
  /**
   * How far the reported major axis's ends lie beyond the coin's edge there, on the full axis, px
   * (`measureEndGrowth`); measured on the same frames as `outlineGrowthPx`, and on thinner views too.
   */
  readonly endGrowthPx: number;
  /** The whole frame was searched (the coin was not being tracked). */
  readonly searching: boolean;
  /**
   * Placed by block matching the coin of the previous frame with the foreground around it as one rigid patch
   * (`followHeld`): the coin had stopped turning and moved with the hand holding it. Its centre is the previous
   * frame's centre moved by the match, so a run of such frames shares that frame's error; `method: 'boundary'`,
   * `occluded`, `fitRms` NaN, the previous frame's shape.
   */
  readonly heldInHand: boolean;
  /**
   * Measured afterwards, stepping backwards from a track acquired later (the coin before it was
   * picked up: still in the hand, or near it); such frames are mostly 'boundary' and occluded.
   */
  readonly backfilled: boolean;
}

/**
 * The tracker. Its output lags its input by `lagFrames` (K − 1) frames, so that a track
 * acquired late can still be extended backwards over the buffered frames:
 *
 * ```ts
 * const tracker = createTracker();
 * const obs: FrameObservation[] = [];
 * for (const frame of frames) { const o = tracker.push(frame); if (o) obs.push(o); }
 * obs.push(...tracker.flush());
 * // obs[i].frame === i for every pushed frame
 * ```
 */
export interface Tracker {
  /**
   * Processes the next frame (frames in order, all of one size) and returns the final
   * observation of frame `pushed − 1 − lagFrames`, or null while the first `lagFrames` frames fill the buffer.
   * Throws on a frame of another size, or after `flush`.
   * With `release`, the tracker keeps `frame.data` as it is instead of copying it (the caller must not change it)
   * and calls `release` once it no longer reads it: when the frame leaves the buffer, or at `flush`. A frame refused
   * for its size (or pushed after `flush`) stays the caller's.
   */
  push(frame: GrayImage, release?: () => void): FrameObservation | null;
  /** Returns the observations not yet returned by `push` (the last `lagFrames` frames), in order; ends the tracker. */
  flush(): FrameObservation[];
  /** Output lag in frames (K − 1); known after the first frame (before it: from the options, or NaN). */
  readonly lagFrames: number;
}

/** The reference of a carried run (see `measureBack`): the frame its patch is taken from and the patch centre there. */
interface CarryRef { f: number; cx: number; cy: number }

interface Found {
  ellipse: Ellipse;
  method: 'moments' | 'boundary';
  occluded: boolean;
  touchingEdge: boolean;
  areaPx: number;
  meanGray: number;
  fitRms: number;
  fillRatio: number;
  /** Clean enough to update the running diameter. */
  clean: boolean;
  /** Placed by the held-coin match (see `FrameObservation.heldInHand`), from the patch centred at (fromX, fromY). */
  held?: boolean;
  fromX?: number;
  fromY?: number;
}

const HISTORY = 8;
const MAJOR_HISTORY = 15;
const MAX_TENTATIVE = 16;
/** A lost track shorter than this (detections) was probably not the coin. */
const MIN_TRUSTED_TRACK = 8;
/** A block-matched coin that moved at least this far between two frames is not one standing still in the background, px. */
const MOVED_PX = 0.3;
/** Least fraction of a searched candidate's pixels that changed since the previous frame. */
const MIN_CHANGED = 0.03;
/** While searching, the background is updated on every 4th row per frame (rotating). */
const SEARCH_ROW_STEP = 4;
/** Default frames kept for back-filling, and the memory cap of that buffer (bytes). */
const DEFAULT_BUFFER_FRAMES = 48;
const DEFAULT_BUFFER_FRAMES_CARRY = 96;
const BUFFER_BYTES = 64 * 1024 * 1024;
/** Detections of a new track before it is extended backwards (its motion and size are known by then). */
const BACKFILL_AFTER = 6;
/** Back-filling stops after this many consecutive frames without the coin. */
const BACKFILL_MISSES = 3;
/** Most frames in a row that the forward track follows the coin by block matching alone (into the catching hand). */
const FOLLOW_FRAMES = 40;
/** Frames without the coin after which the held-coin match is still tried (from the predicted place). */
const HELD_AFTER_LOST = 3;
/** Clean detections kept for the held-coin patch's placement after a loss. */
const CLEAN_HISTORY = 12;
/** In the second pass, the least misses coasted over on the flight parabola (the coin edge-on at the release, merged with the fingertips). */
const BACKFILL_COAST = 6;
/** Most misses a coasting back-fill pass may cross (see `backfill`). */
const BACKFILL_COAST_MAX = 16;
const BACKFILL_PRED = 6;
/** Second back-fill pass, after this many detections: coasts over misses on the flight parabola. */
const BACKFILL_COAST_AFTER = 32;
/** Least clean (free-flight) points for the coasting parabola. */
const BACKFILL_COAST_POINTS = 12;

/**
 * Creates a streaming coin tracker for a fixed camera, causal up to its output lag of K − 1
 * frames (see {@link Tracker}). Memory is bounded (K frames, at most ~64 MiB by default, plus
 * a few frame-sized buffers), independent of clip length.
 *
 * Per frame: background difference (the model is the median of the first frames,
 * then updated away from the coin; foreground that stops changing is absorbed, which
 * clears the ghost of the coin and hand that were in the first frames), a threshold
 * of max(thresholdSigmas·σ, floor) with σ from frame differences, a global gain
 * against flicker, 8-connected components inside a window around the position
 * predicted from the recent track (constant acceleration), or in the whole frame
 * while searching. The coin is the union of the blobs near the prediction that do not
 * run out of the window; its holes are filled and its ellipse taken from moments
 * (thin edge-on slivers included). When the blob is merged with another region
 * (the hand), does not look like an ellipse, or is cut by the frame border, the
 * visible outline near the prediction is fitted by a trimmed direct least-squares
 * ellipse fit instead (`method: 'boundary'`), accepted only if its major axis agrees
 * with the running robust (median) diameter. Searching accepts an ellipse-shaped blob
 * (fill ratio near 1, outline close to an ellipse) that is found again, moved or
 * changed shape, in the next frame, and has nothing sizeable running out of its window
 * beside it (a fingertip or a piece of the moving hand); a ghost is static, a hand is not an ellipse.
 *
 * Back-filling: the last K frames are kept (`bufferFrames`), and output lags K − 1 frames.
 * Once a new track has 6 detections, the frames before its acquisition are measured
 * backwards, one by one: the centre predicted from the nearest later points (constant
 * acceleration), refined by block matching the coin of the later frame into this one (the
 * coin carried by the hand moves rigidly; the background model plays no part, so the ghost
 * of its old place cannot attract it); then a clean moving blob by moments, or the moving
 * part of the foreground outline near the expected ellipse by a trimmed free fit (major
 * within 5 % of the running diameter) or a fit with the major axis held at the diameter
 * (short arcs between the fingers; `method: 'boundary'`, mostly `occluded`). The
 * back-fill stops at an earlier detection, the end of the buffer, or after 3 frames in a
 * row without the coin; a coin standing still since the background was made does not
 * differ from it, so the back-fill ends where the throw starts. (In the second pass a block match alone is
 * also taken where the place hardly differs from the background if the coin moved by 0.3 px or more and matched
 * to the noise: a coin carried over the fingers it rested against, of about its own gray.)
 *
 * With `carryBackfill`, a second back-fill pass, once the track has 32 detections, goes on from the earliest frame
 * the first reached, across the release: the coin is held nearly edge-on between the fingers
 * and turns through edge-on as it leaves them, so for a few frames its sliver merges with
 * the fingertips and no fit holds. Over such misses, as many as the coin takes to move half its diameter (at
 * least 6, at most 16: at 2000 frames/s a small coin was merged for 7 frames), the pass coasts on a quadratic
 * through all clean (not occluded) points of the track (the free flight, a parabola in the
 * image to first order), and tries at each missed frame j to block match the patch of frame
 * j + 1 at the coasted centre (the last good shape) into frame j. Once such a match holds
 * (the coin and the fingers holding it move rigidly), the pass follows the coin in the hand by
 * block matching alone (fits of the outline merged with the fingers are not trusted there) until
 * the match fails for 3 frames, the coin no longer differs from the background, or the buffer
 * ends. These frames are reported as detected, `method: 'boundary'`, `occluded`, `fitRms` NaN, with
 * the matched centre and the last good shape (a documented choice: the shape in the hand is
 * not measured). Their centre carries the coasted position's error (about 1 px on rendered clips).
 *
 * Following into the catching hand (`followIntoHand`, on by default): when the track step finds no coin in the
 * frame right after a detection (the coin merged with the fingers that reach for it, or turned to the gray of the
 * background), the frame is measured as the back-fill measures one: the moving part of the outline near the
 * expected ellipse (the fingers, slower, are mostly left out), else the block match of the previous frame's coin
 * (allowed twice the threshold, as the coin turns between frames) where the place still differs from the
 * background by its mask or its mean gray difference. At most FOLLOW_FRAMES such frames in a row; reported as
 * 'boundary' and occluded. They let the flight window see where the catch stops the free flight.
 *
 * Throws only on a frame whose size differs from the first one's.
 *
 * References:
 * [1] "Numerically stable direct least squares fitting of ellipses", Proc. WSCG 1998 (outline fit).
 * [2] "Image analysis via the general theory of moments", J. Optical Society of America 70(8), 1980 (moment ellipse).
 * [3] see fitEllipseFixedMajor.ts (fixed-major fit) and matchTranslation.ts (block matching).
 * Background subtraction, component labelling and the track logic are common practice, no source.
 */
export function createTracker(opts: TrackerOptions = {}): Tracker {
  const initFrames = Math.max(3, Math.round(opts.initFrames ?? 5));
  const kSigma = opts.thresholdSigmas ?? 4;
  const floorGray = opts.thresholdFloorGray ?? 8;
  const maxLost = opts.maxLostFrames ?? 3;
  const carry = opts.carryBackfill ?? false;
  const follow = opts.followIntoHand ?? true;
  const followHeldOn = opts.followHeld ?? true;
  /** Shift of the previous frame's held-coin match, px (NaN: that frame was not placed by it). */
  let heldDx = Number.NaN, heldDy = Number.NaN;
  /** The held run's reference: the frame it started from, the patch centre there, the shift to the last frame. */
  const heldRef = { data: new Uint8Array(0), cx: Number.NaN, cy: Number.NaN, sx: 0, sy: 0 };
  /** A trusted track was lost: the held match is tried from its clean flight (see processFrame). */
  let coastHeld = false;
  /** Frames in a row found by the forward block match alone. */
  let followN = 0;
  let minMajor = 0;
  const hint = opts.diameterHintPx;
  // Ring of the last K frames and their not yet returned observations.
  let K = 0;
  const ring: Uint8Array[] = [];
  /** For a frame kept in the ring without a copy (pushed with `release`): how to give it back; else null. */
  const ringRelease: ((() => void) | null)[] = [];
  let pending: FrameObservation[] = [];
  let prevSolo: Uint8Array | null = null;
  /** With K = 1: the previous frame when it was kept without a copy, and its release. */
  let soloKept: Uint8Array | null = null;
  let soloRelease: (() => void) | null = null;
  let flushed = false;
  /** Frame of the current track's acquisition; back-filling waits for BACKFILL_AFTER detections. */
  let acqFrame = -1;
  /** Earliest frame the current track reached (its acquisition, or the first back-fill's end). */
  let trackFirst = -1;
  let backfillDue = false;
  /** The second back-fill pass (coasting over the edge-on frames at the release) is due. */
  let coastDue = false;
  /**
   * Acquisition frame of the track the second pass starts from, and detections since then. The pass waits for
   * BACKFILL_COAST_AFTER detections, over later tracks too: a coin that turns to the background's gray once a
   * revolution is lost and found again every few dozen frames, and the frames at the release must not wait for
   * one unbroken track.
   */
  let coastAcq = -1;
  let coastCount = 0;
  /** Earliest frame the first back-fill of that track reached. */
  let coastFrom = -1;
  /** Last reported ellipse of the track (start of the fixed-major fit). */
  let lastE: Ellipse | null = null;

  let width = 0;
  let height = 0;
  let maxMajor = 0;
  let frameIndex = 0;
  const init: Uint8Array[] = [];
  let bg: ReturnType<typeof createBackgroundModel> | null = null;
  let prev: Uint8Array = new Uint8Array(0);
  let cur: Uint8Array = new Uint8Array(0);
  let mask: Uint8Array = new Uint8Array(0);
  let comps: ComponentLabels | undefined;
  let scratch: ReturnType<typeof createRegionScratch> | null = null;
  let accept: Uint8Array = new Uint8Array(4097);
  let sigma = Number.NaN;
  let wLo = 0, hLo = 0, decim = 2;
  let maskLo: Uint8Array = new Uint8Array(0);
  let compsLo: ComponentLabels | undefined;
  const nx = new Float64Array(MAX_TENTATIVE), ny = new Float64Array(MAX_TENTATIVE);
  /** Outline points selected for a fit (selectNear, movingOutline): reused, grown on demand. */
  const sel = { xs: new Float64Array(1024), ys: new Float64Array(1024), n: 0 };
  const selFor = (count: number): typeof sel => {
    if (sel.xs.length < count) { sel.xs = new Float64Array(2 * count); sel.ys = new Float64Array(2 * count); }
    sel.n = 0;
    return sel;
  };
  const nMaj = new Float64Array(MAX_TENTATIVE), nMin = new Float64Array(MAX_TENTATIVE);

  // Track state.
  let tracking = false;
  let lost = 0;
  /** Detections since the track was acquired; a short track's size and motion are forgotten when it is lost. */
  let trackLen = 0;
  let lastSeen = -1;
  const hf = new Float64Array(HISTORY);
  const hx = new Float64Array(HISTORY);
  const hy = new Float64Array(HISTORY);
  let hn = 0;
  const cf = new Float64Array(CLEAN_HISTORY);
  const cxh = new Float64Array(CLEAN_HISTORY);
  const cyh = new Float64Array(CLEAN_HISTORY);
  let cn = 0;
  const majors = new Float64Array(MAJOR_HISTORY);
  let mn = 0;
  let mHead = 0;
  let diameter = Number.NaN;
  /** Predicted image speed of the last track step, px per frame (the reach of motion blur). */
  let stepSpeed = 0;
  // Candidates of the previous searched frame.
  let tentN = 0;
  const tx = new Float64Array(MAX_TENTATIVE), ty = new Float64Array(MAX_TENTATIVE);
  const tMajor = new Float64Array(MAX_TENTATIVE), tMinor = new Float64Array(MAX_TENTATIVE);
  let tFrame = -1;
  /** Position in the previous frame of the candidate that confirmed the acquisition. */
  let seed = { x: NaN, y: NaN };

  const none = (frame: number, thr: number, searching: boolean): FrameObservation => ({
    frame, detected: false, cx: NaN, cy: NaN, major: NaN, minor: NaN, angleRad: NaN, method: 'none',
    occluded: false, touchingEdge: false, areaPx: NaN, meanGray: NaN, fitRms: NaN, fillRatio: NaN,
    thresholdGray: thr, searching, backfilled: false, outlineGrowthPx: NaN, endGrowthPx: NaN, heldInHand: false,
  });

  const observe = (
    t: number, found: Found, thr: number, searching: boolean, backfilled: boolean, outlineGrowthPx = NaN, endGrowthPx = NaN,
  ): FrameObservation => {
    const e = found.ellipse;
    return {
      frame: t, detected: true, cx: e.cx, cy: e.cy, major: e.major, minor: e.minor, angleRad: e.angleRad,
      method: found.method, occluded: found.occluded, touchingEdge: found.touchingEdge,
      areaPx: found.areaPx, meanGray: found.meanGray, fitRms: found.fitRms, fillRatio: found.fillRatio,
      thresholdGray: thr, searching, backfilled, outlineGrowthPx, endGrowthPx, heldInHand: found.held === true,
    };
  };

  function setup(f: GrayImage): void {
    width = f.width;
    height = f.height;
    maxMajor = opts.maxMajorPx ?? 0.6 * Math.min(width, height);
    minMajor = opts.minMajorPx ?? Math.max(12, 0.025 * Math.min(width, height));
    K = opts.bufferFrames !== undefined
      ? Math.max(1, Math.round(opts.bufferFrames))
      : Math.max(4, Math.min(carry ? DEFAULT_BUFFER_FRAMES_CARRY : DEFAULT_BUFFER_FRAMES, Math.floor(BUFFER_BYTES / Math.max(1, width * height))));
    pending = new Array<FrameObservation>(K);
    if (K === 1) prevSolo = new Uint8Array(width * height);
    bg = createBackgroundModel(width, height, opts.background);
    mask = new Uint8Array(width * height);
    scratch = createRegionScratch(width, height);
    // The search grid: as coarse as keeps the smallest coin sought (minMajor) at least 6 cells across.
    decim = Math.max(2, Math.min(4, Math.floor(minMajor / 6)));
    wLo = Math.ceil(width / decim);
    hLo = Math.ceil(height / decim);
    maskLo = new Uint8Array(wLo * hLo);
  }

  function pushHistory(t: number, e: Ellipse): void {
    if (hn === HISTORY) {
      hf.copyWithin(0, 1); hx.copyWithin(0, 1); hy.copyWithin(0, 1);
      hn--;
    }
    hf[hn] = t; hx[hn] = e.cx; hy[hn] = e.cy; hn++;
  }

  /** Clean detections of the track (isolated blobs), the last CLEAN_HISTORY of them. */
  function pushClean(t: number, e: Ellipse): void {
    if (cn === CLEAN_HISTORY) {
      cf.copyWithin(0, 1); cxh.copyWithin(0, 1); cyh.copyWithin(0, 1);
      cn--;
    }
    cf[cn] = t; cxh[cn] = e.cx; cyh[cn] = e.cy; cn++;
  }

  /**
   * The free flight's place at frame t from the track's last clean detections (a quadratic in time through at least
   * 6 of them spanning 5 frames, the latest within 24 frames of t); null without them. Outline fits merged with the
   * fingers that take the coin drift by px and are left out.
   */
  function predictClean(t: number): { x: number; y: number } | null {
    if (cn < 6 || cf[cn - 1] < t - 24 || cf[cn - 1] - cf[0] < 5) return null;
    return { x: quadFit(cf, cxh, 0, cn, t)[0], y: quadFit(cf, cyh, 0, cn, t)[0] };
  }

  function pushMajor(m: number): void {
    majors[mHead] = m;
    mHead = (mHead + 1) % MAJOR_HISTORY;
    if (mn < MAJOR_HISTORY) mn++;
    const s = majors.slice(0, mn).sort();
    diameter = mn % 2 ? s[(mn - 1) >> 1] : 0.5 * (s[mn / 2 - 1] + s[mn / 2]);
  }

  /** Predicted centre and velocity (px, px/frame) at frame t from the recent history. */
  function predict(t: number): { x: number; y: number; vx: number; vy: number } {
    // Use points of the last 12 frames only; constant acceleration when ≥ 4 such points.
    let start = 0;
    while (start < hn - 1 && hf[start] < t - 12) start++;
    const n = hn - start;
    if (n >= 4 && hf[hn - 1] - hf[start] >= 3) {
      const px = quadFit(hf, hx, start, hn, t);
      const py = quadFit(hf, hy, start, hn, t);
      return { x: px[0], y: py[0], vx: px[1], vy: py[1] };
    }
    if (n >= 2) {
      const dt = hf[hn - 1] - hf[hn - 2];
      const vx = (hx[hn - 1] - hx[hn - 2]) / dt;
      const vy = (hy[hn - 1] - hy[hn - 2]) / dt;
      const g = t - hf[hn - 1];
      return { x: hx[hn - 1] + vx * g, y: hy[hn - 1] + vy * g, vx, vy };
    }
    return { x: hx[hn - 1], y: hy[hn - 1], vx: 0, vy: 0 };
  }

  function clipWindow(x0: number, y0: number, x1: number, y1: number): PixelWindow {
    return {
      x0: Math.max(0, Math.floor(x0)), y0: Math.max(0, Math.floor(y0)),
      x1: Math.min(width, Math.ceil(x1)), y1: Math.min(height, Math.ceil(y1)),
    };
  }

  /** Mean |frame − gain · background| over the pixels inside ellipse `e` shrunk by 1 px (NaN when none). */
  function meanBackgroundDifference(frame: Uint8Array, e: Ellipse, gain: number): number {
    const a = Math.max(0.5, e.major / 2 - 1);
    const b = Math.max(0.5, e.minor / 2 - 1);
    const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
    const r = e.major / 2;
    const x0 = Math.max(0, Math.floor(e.cx - r)), x1 = Math.min(width, Math.ceil(e.cx + r) + 1);
    const y0 = Math.max(0, Math.floor(e.cy - r)), y1 = Math.min(height, Math.ceil(e.cy + r) + 1);
    const data = bg!.data;
    let n = 0, sum = 0;
    for (let y = y0; y < y1; y++) {
      for (let x = x0; x < x1; x++) {
        const dx = x - e.cx, dy = y - e.cy;
        const u = (dx * c + dy * s) / a, v = (-dx * s + dy * c) / b;
        if (u * u + v * v > 1) continue;
        const i = y * width + x;
        sum += Math.abs(frame[i] - gain * data[i]);
        n++;
      }
    }
    return n > 0 ? sum / n : Number.NaN;
  }

  /** Mean gray and count of blob pixels inside an ellipse (shrunk by 1 px). */
  function insideStats(frame: Uint8Array, e: Ellipse, win: PixelWindow): { area: number; mean: number } {
    const a = Math.max(0.5, e.major / 2 - 1);
    const b = Math.max(0.5, e.minor / 2 - 1);
    const c = Math.cos(e.angleRad), s = Math.sin(e.angleRad);
    const r = e.major / 2;
    const x0 = Math.max(win.x0, Math.floor(e.cx - r)), x1 = Math.min(win.x1, Math.ceil(e.cx + r) + 1);
    const y0 = Math.max(win.y0, Math.floor(e.cy - r)), y1 = Math.min(win.y1, Math.ceil(e.cy + r) + 1);
    let n = 0, sum = 0;
    for (let y = y0; y < y1; y++) {
      for (let x = x0; x < x1; x++) {
        const dx = x - e.cx, dy = y - e.cy;
        const u = (dx * c + dy * s) / a, v = (-dx * s + dy * c) / b;
        if (u * u + v * v <= 1 && mask[y * width + x] !== 0) {
          n++;
          sum += frame[y * width + x];
        }
      }
    }
    return { area: n, mean: n > 0 ? sum / n : NaN };
  }

  /** RMS Sampson distance of the first n outline points to an ellipse. */
  function outlineRms(e: Ellipse, n: number, keepNear?: { x: number; y: number; r: number }): number {
    const [A, B, C, D, E, F] = ellipseToConic(e);
    const xs = scratch!.xs, ys = scratch!.ys;
    let s = 0, m = 0;
    for (let i = 0; i < n; i++) {
      const x = xs[i], y = ys[i];
      if (keepNear && (x - keepNear.x) ** 2 + (y - keepNear.y) ** 2 > keepNear.r * keepNear.r) continue;
      const val = A * x * x + B * x * y + C * y * y + D * x + E * y + F;
      const gx = 2 * A * x + B * y + D, gy = B * x + 2 * C * y + E;
      const g2 = gx * gx + gy * gy;
      if (g2 > 0) { s += (val * val) / g2; m++; }
    }
    return m > 0 ? Math.sqrt(s / m) : NaN;
  }

  /**
   * Boundary fit of a measured region's outline near (px, py) within radius r; the
   * major axis must agree with `expect` (if finite) within [0.85, 1.18] (a short arc
   * that fits a smaller ellipse is rejected rather than reported).
   */
  function boundaryFit(
    frame: Uint8Array, meas: RegionMeasure, win: PixelWindow, px: number, py: number, r: number, expect: number,
  ): Found | null {
    const xs = scratch!.xs, ys = scratch!.ys;
    let cx = px, cy = py;
    let result: Ellipse | null = null;
    let rms = NaN;
    for (let pass = 0; pass < 2; pass++) {
      const sel = selectNear(xs, ys, meas.outlineCount, cx, cy, r, selFor(meas.outlineCount));
      if (sel.n < 12) return null;
      const fit = fitEllipseTrimmed(sel.xs, sel.ys, sel.n);
      if (!fit.ok) return null;
      result = fit.ellipse;
      rms = fit.rms;
      cx = result.cx;
      cy = result.cy;
    }
    if (!result) return null;
    if (Number.isFinite(expect) && (result.major < 0.85 * expect || result.major > 1.18 * expect)) return null;
    if (!(result.minor > 0.5) || result.major > maxMajor * 1.5) return null;
    const st = insideStats(frame, result, win);
    return {
      ellipse: result, method: 'boundary', occluded: false, touchingEdge: meas.touchesFrame,
      areaPx: st.area, meanGray: st.mean, fitRms: rms, fillRatio: NaN, clean: false,
    };
  }

  /** Moments of a clean blob, or the outline fit when it is cut or not elliptical. */
  function measureCoin(
    frame: Uint8Array, meas: RegionMeasure, win: PixelWindow, px: number, py: number, expect: number,
  ): Found | null {
    const mom = ellipseFromMoments(meas, true);
    if (!mom.ok) return null;
    const e = mom.ellipse;
    const sizeOk = !Number.isFinite(expect) || (e.major >= 0.8 * expect && e.major <= 1.25 * expect);
    const shapeOk = mom.fillRatio >= 0.82 && mom.fillRatio <= 1.2;
    if (!meas.touchesFrame && !meas.touchesWindow && sizeOk && shapeOk) {
      const rms = outlineRms(e, meas.outlineCount);
      return {
        ellipse: e, method: 'moments', occluded: false, touchingEdge: false, areaPx: meas.area,
        meanGray: meas.meanGray, fitRms: rms, fillRatio: mom.fillRatio, clean: true,
      };
    }
    const r = 0.5 * (Number.isFinite(expect) ? expect : e.major) + 3;
    const f = boundaryFit(frame, meas, win, px, py, r, Number.isFinite(expect) ? expect : NaN);
    if (f) f.touchingEdge = meas.touchesFrame;
    return f;
  }

  /** Track step inside a window around the prediction. */
  function trackStep(frame: Uint8Array, t: number, thr: number, gain: number): { found: Found | null; win: PixelWindow } {
    const p = predict(t);
    const d = diameter;
    const speed = hypot2(p.vx, p.vy);
    stepSpeed = speed;
    const half = 0.6 * d + 8 + 0.25 * speed + lost * (0.5 * d + 0.5 * speed);
    const win = clipWindow(p.x - half, p.y - half, p.x + half + 1, p.y + half + 1);
    if (win.x1 - win.x0 < 3 || win.y1 - win.y0 < 3) return { found: null, win };
    foregroundMask(frame, bg!.data, width, win, thr, mask, gain);
    comps = labelComponents(mask, width, height, win, comps);
    const c = comps;
    const bigArea = 1.6 * (Math.PI / 4) * d * d;
    const gate = 0.5 * d + 0.5 * speed + 3 + lost * 0.5 * d;
    // Main part: the largest blob near the prediction that stays inside the window.
    const main = largestBlobNear(c, p.x, p.y, gate, bigArea);
    if (accept.length < c.capacity + 1) accept = new Uint8Array(c.capacity + 1);
    accept.fill(0, 0, c.count + 1);
    if (main >= 0) {
      const mx = c.m10[main] / c.area[main], my = c.m01[main] / c.area[main];
      const minFrag = Math.max(4, 0.05 * c.area[main]);
      let bx0 = c.minX[main], by0 = c.minY[main], bx1 = c.maxX[main], by1 = c.maxY[main];
      accept[main + 1] = 1;
      for (let k = 0; k < c.count; k++) {
        if (k === main || c.area[k] < minFrag || c.touchesWindow[k]) continue;
        const dx = c.m10[k] / c.area[k] - mx, dy = c.m01[k] / c.area[k] - my;
        if (dx * dx + dy * dy > (0.55 * d) ** 2) continue;
        accept[k + 1] = 1;
        bx0 = Math.min(bx0, c.minX[k]); by0 = Math.min(by0, c.minY[k]);
        bx1 = Math.max(bx1, c.maxX[k]); by1 = Math.max(by1, c.maxY[k]);
      }
      const meas = measureRegion(c, accept, { x0: bx0, y0: by0, x1: bx1 + 1, y1: by1 + 1 }, frame, scratch!);
      return { found: measureCoin(frame, meas, win, p.x, p.y, d), win };
    }
    // Merged with something that runs out of the window (the hand) or too large: the
    // blob that covers the predicted centre area most; fit its outline near the prediction.
    let merged = -1;
    let bestOverlap = 0;
    const r = 0.5 * d;
    for (let k = 0; k < c.count; k++) {
      if (c.area[k] < 12) continue;
      const ox = Math.min(c.maxX[k] + 1, p.x + r) - Math.max(c.minX[k], p.x - r);
      const oy = Math.min(c.maxY[k] + 1, p.y + r) - Math.max(c.minY[k], p.y - r);
      if (ox <= 0 || oy <= 0) continue;
      if (ox * oy > bestOverlap) { bestOverlap = ox * oy; merged = k; }
    }
    if (merged < 0) return { found: null, win };
    accept[merged + 1] = 1;
    const meas = measureRegion(c, accept, { x0: c.minX[merged], y0: c.minY[merged], x1: c.maxX[merged] + 1, y1: c.maxY[merged] + 1 }, frame, scratch!);
    const f = boundaryFit(frame, meas, win, p.x, p.y, r + 3, d);
    if (!f) return { found: null, win };
    const dc = hypot2(f.ellipse.cx - p.x, f.ellipse.cy - p.y);
    if (dc > 0.35 * d + 0.5 * speed + lost * 0.25 * d) return { found: null, win };
    f.occluded = meas.touchesWindow || meas.area > bigArea;
    f.touchingEdge = meas.touchesFrame;
    return { found: f, win };
  }

  /**
   * Search step over the whole frame: foreground on a coarse grid (every `decim`-th pixel, 2–4: see setup), components
   * there, then each plausible one measured at full resolution in a window around it.
   * Returns the coin if a candidate is confirmed.
   */
  function searchStep(frame: Uint8Array, t: number, thr: number, gain: number): { found: Found | null; win: PixelWindow } {
    const full: PixelWindow = { x0: 0, y0: 0, x1: width, y1: height };
    decimatedForeground(frame, bg!.data, width, height, thr, gain, maskLo, decim);
    compsLo = labelComponents(maskLo, wLo, hLo, undefined, compsLo);
    const cl = compsLo;
    const expect = Number.isFinite(diameter) ? diameter : hint ?? NaN;
    const lo = Number.isFinite(expect) ? 0.7 * expect : minMajor;
    const hi = Number.isFinite(expect) ? 1.4 * expect : maxMajor;
    const pred = hn > 0 ? predict(t) : null;
    let nNew = 0;
    let best: Found | null = null;
    let bestSeedX = NaN, bestSeedY = NaN;
    let bestScore = Number.POSITIVE_INFINITY;
    for (let q = 0; q < cl.count; q++) {
      if (cl.area[q] < 3) continue;
      const ext = decim * hypot2(cl.maxX[q] - cl.minX[q] + 1, cl.maxY[q] - cl.minY[q] + 1);
      if (ext < 0.7 * lo || ext > 1.7 * hi) continue;
      if (cl.touchesFrame[q] && !Number.isFinite(expect)) continue;
      // Full-resolution window around the low-resolution blob.
      const m = 0.25 * ext + 4;
      const win = clipWindow(decim * cl.minX[q] - m, decim * cl.minY[q] - m, decim * (cl.maxX[q] + 1) + m, decim * (cl.maxY[q] + 1) + m);
      foregroundMask(frame, bg!.data, width, win, thr, mask, gain);
      comps = labelComponents(mask, width, height, win, comps);
      const c = comps;
      let k = -1;
      for (let j = 0; j < c.count; j++) if (k < 0 || c.area[j] > c.area[k]) k = j;
      if (k < 0 || c.area[k] < 12 || c.touchesWindow[k]) continue;
      // Alone: nothing sizeable that runs out of the window (a hand, an arm) beside it. A
      // fingertip or a piece of a moving hand is often ellipse-shaped; the coin near the hand
      // is picked up once it is clear of it, and the frames before are back-filled.
      let crowded = false;
      for (let j = 0; j < c.count; j++) {
        if (j !== k && c.touchesWindow[j] && c.area[j] >= Math.max(8, 0.05 * c.area[k])) { crowded = true; break; }
      }
      if (crowded) continue;
      if (accept.length < c.capacity + 1) accept = new Uint8Array(c.capacity + 1);
      accept.fill(0, 0, c.count + 1);
      accept[k + 1] = 1;
      const meas = measureRegion(c, accept, { x0: c.minX[k], y0: c.minY[k], x1: c.maxX[k] + 1, y1: c.maxY[k] + 1 }, frame, scratch!);
      const mom = ellipseFromMoments(meas, true);
      if (!mom.ok) continue;
      // A ghost (a place the hand or coin left, still in an old model) does not change
      // between frames; the coin does (it moves, turns, or both).
      if (changedFraction(frame, prev, mask, width, c.minX[k], c.minY[k], c.maxX[k] + 1, c.maxY[k] + 1, thr) < MIN_CHANGED) continue;
      let f: Found | null;
      if (meas.touchesFrame) {
        f = boundaryFit(frame, meas, win, mom.ellipse.cx, mom.ellipse.cy, 0.5 * expect + 3, expect);
      } else {
        if (mom.fillRatio < 0.85 || mom.fillRatio > 1.15) continue;
        const e = mom.ellipse;
        f = {
          ellipse: e, method: 'moments', occluded: false, touchingEdge: false, areaPx: meas.area,
          meanGray: meas.meanGray, fitRms: outlineRms(e, meas.outlineCount), fillRatio: mom.fillRatio, clean: true,
        };
      }
      if (!f) continue;
      const e = f.ellipse;
      if (e.major < lo || e.major > hi) continue;
      // Outline close to an ellipse: a hand is not.
      if (!(f.fitRms <= 1.0 + 0.02 * e.major)) continue;
      let score = f.fitRms / e.major + (Number.isFinite(f.fillRatio) ? 0.5 * Math.abs(f.fillRatio - 1) : 0.1);
      // Confirmed by the previous searched frame: same size, moved or changed shape.
      let confirmed = false;
      let seedX = NaN, seedY = NaN;
      if (tFrame === t - 1) {
        for (let j = 0; j < tentN; j++) {
          const dist = hypot2(e.cx - tx[j], e.cy - ty[j]);
          const sizeMatch = Math.abs(e.major - tMajor[j]) <= 0.2 * Math.max(e.major, tMajor[j]);
          const changed = dist >= 0.3 || Math.abs(e.minor - tMinor[j]) >= 0.02 * e.major;
          if (sizeMatch && changed && dist <= e.major + 10) { confirmed = true; seedX = tx[j]; seedY = ty[j]; break; }
        }
      }
      // Re-acquisition close to the predicted track soon after a loss needs no confirmation.
      if (pred && Number.isFinite(diameter)) {
        const dp = hypot2(e.cx - pred.x, e.cy - pred.y);
        const gap = t - lastSeen;
        if (gap <= 10 && dp <= diameter + 2 * hypot2(pred.vx, pred.vy)) confirmed = true;
        score += dp / (10 * diameter);
      }
      if (f.method === 'boundary' && !(f.fitRms <= 0.6 + 0.01 * e.major)) continue;
      if (nNew < MAX_TENTATIVE) {
        nx[nNew] = e.cx; ny[nNew] = e.cy; nMaj[nNew] = e.major; nMin[nNew] = e.minor; nNew++;
      }
      if (confirmed && score < bestScore) { bestScore = score; best = f; bestSeedX = seedX; bestSeedY = seedY; }
    }
    tentN = nNew;
    tx.set(nx); ty.set(ny); tMajor.set(nMaj); tMinor.set(nMin);
    tFrame = t;
    seed = { x: bestSeedX, y: bestSeedY };
    return { found: best, win: full };
  }

  /**
   * Outline points of the current `scratch` (first `count`) within `band` px (Sampson distance)
   * of the expected ellipse `ex` that lie on an edge that moved: one of the two pixels beside the crack changed by more than `thr`
   * against a neighbouring frame (`nbA`, `nbB` or null). A ghost (a static place the coin left,
   * still in the background model) has a static outline; the coin moving with the hand does not.
   */
  function movingOutline(
    frame: Uint8Array, nbA: Uint8Array | null, nbB: Uint8Array | null, count: number, ex: Ellipse, band: number, thr: number,
  ): { xs: Float64Array; ys: Float64Array; n: number } {
    const xs = scratch!.xs, ys = scratch!.ys;
    const out = selFor(count);
    const ox = out.xs, oy = out.ys;
    let m = 0;
    const ia2 = 4 / (ex.major * ex.major), ib2 = 4 / (Math.max(2, ex.minor) ** 2);
    const ca = Math.cos(ex.angleRad), sa = Math.sin(ex.angleRad);
    const changed = (i: number): boolean =>
      (nbA !== null && Math.abs(frame[i] - nbA[i]) > thr) || (nbB !== null && Math.abs(frame[i] - nbB[i]) > thr);
    for (let k = 0; k < count; k++) {
      const x = xs[k], y = ys[k];
      const dx = x - ex.cx, dy = y - ex.cy;
      const u = ca * dx + sa * dy, v = -sa * dx + ca * dy;
      const g = 2 * hypot2(u * ia2, v * ib2);
      if (!(g > 0) || Math.abs(u * u * ia2 + v * v * ib2 - 1) > band * g) continue;
      // Crack midpoint: half-integer in x (horizontal neighbours) or in y (vertical ones).
      const hx = x !== Math.floor(x);
      const x0 = hx ? Math.floor(x) : x, y0 = hx ? y : Math.floor(y);
      const x1 = hx ? x0 + 1 : x0, y1 = hx ? y0 : y0 + 1;
      if (x0 < 0 || y0 < 0 || x1 >= width || y1 >= height) continue;
      if (changed(y0 * width + x0) || changed(y1 * width + x1)) { ox[m] = x; oy[m] = y; m++; }
    }
    return { xs: ox, ys: oy, n: m };
  }

  /**
   * Measures the coin in buffered frame `j` near the predicted centre (px, py), for back-filling:
   * a clean, moving blob by moments, else the moving outline of the foreground near the
   * prediction by a trimmed free fit (if its major axis agrees with the diameter) or by a fit
   * with the major axis held at the diameter (short arcs: the coin between the fingers).
   * After misses, `pNext` (the coasted centre in frame j + 1) places the patch that is block matched
   * into frame j (none: no match after misses); `matchedOnly` skips the fits and keeps the match alone.
   */
  function measureBack(
    j: number, p: { x: number; y: number; vx: number; vy: number }, prevE: Ellipse, minorPred: number, minorRate: number, misses: number, thr: number,
    pNext: { x: number; y: number } | null = null, matchedOnly = false, forward = false, carrying = false,
    ref: CarryRef | null = null,
  ): Found | null {
    const frame = ring[j % K];
    // Frames held: max(0, frameIndex − K) … frameIndex − 1. Forward (the newest frame j, measured from the
    // previous one) the neighbours are the two frames before it; backwards, the frames after and before.
    const nbA = forward ? ring[(j - 1) % K] : ring[(j + 1) % K];
    const nbB = forward ? (j - 2 >= Math.max(0, frameIndex - K) ? ring[(j - 2) % K] : null)
      : j - 1 >= Math.max(0, frameIndex - K) ? ring[(j - 1) % K] : null;
    const d = diameter;
    const speed = hypot2(p.vx, p.vy);
    // Block match of the coin of frame j + 1 (just measured) into frame j: the coin carried by the
    // hand moves rigidly, so this places it better than the extrapolated track (and ignores ghosts).
    let matched: Ellipse | null = null;
    /** How far the matched coin lies from its place in frame j + 1, px, and the match's sub-pixel RMS residual. */
    let moved = 0;
    let matchRms = Number.POSITIVE_INFINITY;
    // After misses, frame j + 1 had no coin found: its patch is taken at the predicted place there
    // (the last good shape), so the match carries the coin (and the fingers holding it) across.
    const from: Ellipse | null = misses === 0 ? prevE : pNext ? { ...prevE, cx: pNext.x, cy: pNext.y } : null;
    if (from) {
      // Carrying the coin in the hand: the patch is the foreground (coin and fingers, which move together) in a
      // disc around the coin, a larger and steadier pattern than the coin's thin sliver alone, whose shading and
      // blur change as the hand speeds up.
      const bgd = bg!.data;
      const carryPatch = carrying && nbA !== null;
      const region = carryPatch ? { ...from, major: 1.5 * d, minor: 1.5 * d } : from;
      const keep = carryPatch ? (i: number) => Math.abs(nbA[i] - bgd[i]) > thr : undefined;
      // The sub-pixel refinement serves chains of rigid matches (carrying), whose errors add up; a coin that turns
      // between the frames has no exact shift, and there the parabola's estimate stays.
      // The match must agree with the track's own prediction (a periodic face texture can alias).
      const gateP = 2 + 0.08 * d + 0.2 * speed;
      // Carrying, the run's reference frame is tried first (the patch of the first frame the run was matched from):
      // the carried path then does not add up the steps' sub-pixel errors. It fails once the hand's motion blur or
      // the light on the fingers has changed the look; the previous frame then becomes the reference.
      if (carryPatch && ref && ref.f >= Math.max(0, frameIndex - K) && ref.f > j) {
        const R = ring[ref.f % K];
        const rr = { ...region, cx: ref.cx, cy: ref.cy };
        const mr = matchTranslation(R, frame, width, height, rr, 1, p.x - ref.cx, p.y - ref.cy, 2 + 0.3 * speed,
          (i: number) => Math.abs(R[i] - bgd[i]) > thr, { refine: true });
        if (mr.ok && mr.rmsSubpixel <= thr && hypot2(ref.cx + mr.dx - p.x, ref.cy + mr.dy - p.y) <= gateP) {
          matched = { ...prevE, cx: ref.cx + mr.dx, cy: ref.cy + mr.dy };
          moved = hypot2(matched.cx - from.cx, matched.cy - from.cy);
          matchRms = mr.rmsSubpixel;
          p = { x: matched.cx, y: matched.cy, vx: p.vx, vy: p.vy };
        }
      }
      const m = matched ? null
        : matchTranslation(nbA, frame, width, height, region, 1, p.x - from.cx, p.y - from.cy, 2 + 0.3 * speed, keep, { refine: carryPatch });
      // Backwards the pattern is judged at its sub-pixel shift: at the integer one a motion with a fraction near one
      // half leaves tens of gray levels at every sharp edge. Forward (into the catching hand, the fingers closing
      // round the coin) the stricter integer residual keeps the match off the fingers.
      if (m && m.ok && (forward ? m.rms : m.rmsSubpixel) <= thr && hypot2(from.cx + m.dx - p.x, from.cy + m.dy - p.y) <= gateP) {
        matched = { ...prevE, cx: from.cx + m.dx, cy: from.cy + m.dy };
        moved = hypot2(m.dx, m.dy);
        matchRms = m.rmsSubpixel;
        p = { x: matched.cx, y: matched.cy, vx: p.vx, vy: p.vy };
        if (carryPatch && ref) { ref.f = j + 1; ref.cx = from.cx; ref.cy = from.cy; }
      }
    }
    const half = 0.6 * d + 8 + 0.25 * speed + misses * 0.25 * d;
    const win = clipWindow(p.x - half, p.y - half, p.x + half + 1, p.y + half + 1);
    if (win.x1 - win.x0 < 3 || win.y1 - win.y0 < 3) return null;
    const gain = estimateGain(frame, bg!.data, width, height);
    foregroundMask(frame, bg!.data, width, win, thr, mask, gain);
    comps = labelComponents(mask, width, height, win, comps);
    const c = comps;
    if (accept.length < c.capacity + 1) accept = new Uint8Array(c.capacity + 1);
    const bigArea = 1.6 * (Math.PI / 4) * d * d;
    // The prediction from the nearest later points is good to a pixel or two; a wide gate lets one bad
    // frame bend the prediction of all earlier ones.
    const gate = matched ? 1 + 0.04 * d : 2 + 0.08 * d + 0.2 * speed + misses * 0.15 * d;
    // A clean blob at the prediction that moved since the next frame.
    const main = largestBlobNear(c, p.x, p.y, gate, bigArea);
    if (main >= 0) {
      accept.fill(0, 0, c.count + 1);
      accept[main + 1] = 1;
      const meas = measureRegion(c, accept, { x0: c.minX[main], y0: c.minY[main], x1: c.maxX[main] + 1, y1: c.maxY[main] + 1 }, frame, scratch!);
      const mom = ellipseFromMoments(meas, true);
      if (mom.ok && !meas.touchesFrame && mom.fillRatio >= 0.82 && mom.fillRatio <= 1.2
        && mom.ellipse.major >= 0.85 * d && mom.ellipse.major <= 1.18 * d
        && changedFraction(frame, nbA, mask, width, c.minX[main], c.minY[main], c.maxX[main] + 1, c.maxY[main] + 1, thr) >= 0.1) {
        const e = mom.ellipse;
        return {
          ellipse: e, method: 'moments', occluded: false, touchingEdge: false, areaPx: meas.area,
          meanGray: meas.meanGray, fitRms: outlineRms(e, meas.outlineCount), fillRatio: mom.fillRatio, clean: true,
        };
      }
    }
    // Merged with the hand (or cut, or not elliptical): every blob reaching the disc at the prediction.
    const r = 0.5 * d + 2;
    accept.fill(0, 0, c.count + 1);
    let any = false;
    let bx0 = width, by0 = height, bx1 = -1, by1 = -1;
    for (let k = 0; k < c.count; k++) {
      if (c.area[k] < 3) continue;
      if (c.maxX[k] < p.x - r || c.minX[k] > p.x + r || c.maxY[k] < p.y - r || c.minY[k] > p.y + r) continue;
      accept[k + 1] = 1;
      any = true;
      bx0 = Math.min(bx0, c.minX[k]); by0 = Math.min(by0, c.minY[k]);
      bx1 = Math.max(bx1, c.maxX[k]); by1 = Math.max(by1, c.maxY[k]);
    }
    const matchOnly = (): Found | null => {
      if (!matched) return null;
      const st = insideStats(frame, matched, win);
      // The coin must still differ from the background, or have moved rigidly from frame j + 1: where it stood still
      // since the model was made (before the throw) it does neither, and the back-fill stops there. A coin the hand
      // carries over a background of about its own gray (the fingers it rested against) differs from it little, but
      // it moves, and it matches to the noise (half the foreground threshold: a coin still turning does not).
      const inner = (Math.PI / 4) * Math.max(1, matched.major - 2) * Math.max(1, matched.minor - 2);
      const carriedRigidly = matchedOnly && moved >= MOVED_PX && matchRms <= 0.5 * thr;
      if (!(st.area >= 0.5 * inner) && !carriedRigidly) return null;
      return {
        ellipse: matched, method: 'boundary', occluded: true, touchingEdge: false,
        areaPx: st.area, meanGray: st.mean, fitRms: NaN, fillRatio: NaN, clean: false,
      };
    };
    if (!any || matchedOnly) return matchOnly();
    const meas = measureRegion(c, accept, { x0: bx0, y0: by0, x1: bx1 + 1, y1: by1 + 1 }, frame, scratch!);
    // Only the outline near the expected ellipse (the later frame's, moved to the prediction): the
    // fingers' outline beside it is left out. The band allows for the turn of the coin since then.
    // A coin's silhouette is never thinner than its rim (thickness/diameter ≈ 0.07 for common coins) plus blur.
    const minMinor = Math.max(1, 0.1 * d);
    const ePred: Ellipse = matched
      ? { ...matched, major: d, minor: Math.min(Math.max(minMinor, matched.minor), d) }
      : { cx: p.x, cy: p.y, major: d, minor: Math.min(Math.max(minMinor, minorPred), d), angleRad: prevE.angleRad };
    const band = 1.5 + 0.75 * minorRate + 0.1 * speed + 0.05 * d + misses * 0.1 * d;
    const sel = movingOutline(frame, nbA, nbB, meas.outlineCount, ePred, band, thr);
    if (sel.n < Math.max(10, 0.5 * d)) return matchOnly();
    const rmsMax = 0.5 + 0.01 * d;
    let e: Ellipse | null = null;
    let rms = NaN;
    const free = fitEllipseTrimmed(sel.xs, sel.ys, sel.n);
    if (free.ok && free.ellipse.major >= 0.95 * d && free.ellipse.major <= 1.05 * d && free.ellipse.minor > 0.5
      && hypot2(free.ellipse.cx - p.x, free.ellipse.cy - p.y) <= gate && free.rms <= rmsMax) {
      e = free.ellipse;
      rms = free.rms;
    } else {
      const alt = free.ok && hypot2(free.ellipse.cx - p.x, free.ellipse.cy - p.y) <= gate ? [free.ellipse] : [];
      const fix = fitEllipseFixedMajor(sel.xs, sel.ys, sel.n, d, {
        start: ePred, altStarts: alt, minMinorPx: minMinor,
        centreSigmaPx: matched ? 0.75 : Math.max(1, 0.1 * d) + misses * 0.2 * d,
        minorSigmaPx: matched ? 1 : 1 + 0.5 * minorRate + misses * 0.1 * d,
      });
      if (!fix.ok || fix.coverage < 0.4 || fix.inliers < 10 || fix.rms > rmsMax) return matchOnly();
      if (hypot2(fix.ellipse.cx - p.x, fix.ellipse.cy - p.y) > gate) return matchOnly();
      // Collapsed onto one edge (the minor axis at its floor): the other side was not seen.
      if (fix.ellipse.minor <= 1.05 * minMinor) return matchOnly();
      e = fix.ellipse;
      rms = fix.rms;
    }
    const st = insideStats(frame, e, win);
    return {
      ellipse: e, method: 'boundary', occluded: meas.touchesWindow || meas.area > bigArea, touchingEdge: meas.touchesFrame,
      areaPx: st.area, meanGray: st.mean, fitRms: rms, fillRatio: NaN, clean: false,
    };
  }

  /**
   * The earliest frame, not before `oldest`, of the run of detections reaching back from frame `from` (back-filled,
   * or an earlier track's that the back-fill stopped at), across gaps of up to BACKFILL_MISSES frames onto a clean
   * detection, or onto one where the run's own motion (a straight line through its two earliest frames) puts the
   * coin, within the back-fill's gate (beyond a gap, a merged outline fit may be a short misfit track).
   */
  function earliestOfChain(from: number, oldest: number): number {
    // Frames held: max(0, t − K + 1) … t; `oldest` may reach before the clip's first frame.
    oldest = Math.max(0, oldest);
    const held = (j: number) => j >= oldest && pending[j % K].detected && pending[j % K].frame === j;
    const clean = (j: number) => held(j) && pending[j % K].method === 'moments' && !pending[j % K].occluded && !pending[j % K].touchingEdge;
    const onRun = (first: number, j: number): boolean => {
      if (!held(j) || !held(first + 1) || !Number.isFinite(diameter)) return false;
      const a = pending[first % K], b = pending[(first + 1) % K];
      const vx = a.cx - b.cx, vy = a.cy - b.cy;
      const g = first - j;
      const o = pending[j % K];
      return hypot2(o.cx - (a.cx + vx * g), o.cy - (a.cy + vy * g)) <= 2 + 0.08 * diameter + 0.2 * hypot2(vx, vy);
    };
    let first = from;
    for (;;) {
      if (held(first - 1)) { first--; continue; }
      let g = 2;
      while (g <= BACKFILL_MISSES + 1 && first - g >= oldest && !held(first - g)) g++;
      if (g <= BACKFILL_MISSES + 1 && (clean(first - g) || onRun(first, first - g))) { first -= g; continue; }
      return first;
    }
  }

  /**
   * Extends the track acquired at `acqFrame` backwards over the buffered frames (called at
   * frame `t`, once the track has BACKFILL_AFTER detections): predicts each earlier frame from
   * the nearest later points (constant acceleration, the forward track first, then the
   * back-filled points), measures the coin there, and stops at an earlier detection, the end of
   * the buffer, or after BACKFILL_MISSES consecutive misses. Revises `pending` only.
   * With `coast` (the second pass, `carryBackfill`): starts before the earliest back-filled frame,
   * coasts over up to BACKFILL_COAST misses on the parabola through the clean points while block
   * matching the coasted patch of frame j + 1 into frame j, and after such a match goes on by block
   * matching alone (the coin in the hand).
   */
  function backfill(t: number, coast: boolean): void {
    if (!Number.isFinite(diameter)) return;
    const oldest = Math.max(0, t - K + 1);
    // The second pass starts before the earliest frame the first one reached.
    let start = coast ? coastAcq : acqFrame;
    if (coast) start = earliestOfChain(start, oldest);
    const fs: number[] = [], xs: number[] = [], ys: number[] = [], ms: number[] = [];
    /** The same, clean points only (not occluded, not cut by the border): the free flight. */
    const cf: number[] = [], cxs: number[] = [], cys: number[] = [];
    for (let f = t; f >= start; f--) {
      const o = pending[f % K];
      if (!o.detected) continue;
      fs.push(f); xs.push(o.cx); ys.push(o.cy); ms.push(o.minor);
      if (!o.occluded && !o.touchingEdge) { cf.push(f); cxs.push(o.cx); cys.push(o.cy); }
    }
    // fs descending: the nearest later points to the frame being filled come last.
    let prevE: Ellipse | null = null;
    const first = pending[start % K];
    if (first.detected) prevE = { cx: first.cx, cy: first.cy, major: first.major, minor: first.minor, angleRad: first.angleRad };
    if (!prevE) return;
    const thr = pending[t % K].thresholdGray;
    const bf = new Float64Array(BACKFILL_PRED), bx = new Float64Array(BACKFILL_PRED), by = new Float64Array(BACKFILL_PRED);
    /** Centre and velocity at frame j from the nearest (up to) `np` later points, constant acceleration. */
    const predictBack = (np: number, j: number): { x: number; y: number; vx: number; vy: number } => {
      const n = Math.min(np, fs.length);
      for (let q = 0; q < n; q++) {
        const src = fs.length - n + q;
        bf[q] = fs[src]; bx[q] = xs[src]; by[q] = ys[src];
      }
      if (n >= 4 && bf[0] - bf[n - 1] >= 3) {
        const qx = quadFit(bf, bx, 0, n, j), qy = quadFit(bf, by, 0, n, j);
        return { x: qx[0], y: qy[0], vx: qx[1], vy: qy[1] };
      }
      if (n >= 2) {
        const dt = bf[n - 2] - bf[n - 1];
        const vx = (bx[n - 2] - bx[n - 1]) / dt, vy = (by[n - 2] - by[n - 1]) / dt;
        const g = j - bf[n - 1];
        return { x: bx[n - 1] + vx * g, y: by[n - 1] + vy * g, vx, vy };
      }
      return { x: bx[0], y: by[0], vx: 0, vy: 0 };
    };
    /**
     * Centre at frame j from a quadratic through all clean points (free flight: a parabola in the image, to first
     * order), or a straight line when the points span less than twice the extrapolation: over a short span the
     * fitted curvature is mostly noise (gravity moves the image by a few thousandths of a px per frame² at high
     * rates), and extrapolated it throws the prediction off by many px.
     */
    const fF = Float64Array.from(cf), fX = Float64Array.from(cxs), fY = Float64Array.from(cys);
    const predictFlight = (j: number): { x: number; y: number; vx: number; vy: number } => {
      const n = fF.length;
      const span = n > 0 ? fF[0] - fF[n - 1] : 0;
      const fit = span >= 2 * Math.abs(fF[n - 1] - j) ? quadFit : lineFit;
      const qx = fit(fF, fX, 0, n, j), qy = fit(fF, fY, 0, n, j);
      return { x: qx[0], y: qy[0], vx: qx[1], vy: qy[1] };
    };
    let misses = 0;
    /** A coin was found again by the block match alone after misses: fits are not trusted beyond (the coin is in the hand). */
    let coasted = false;
    /**
     * Carrying: the centre from the carried points alone (the outline fits just after the release, merged with the
     * fingers, are off by px and would swing the quadratic): the last carried point moved on with the velocity of
     * the nearest carried points, or of the flight at the first one.
     */
    const carried: { f: number; x: number; y: number }[] = [];
    const carryRef: CarryRef = { f: -1, cx: Number.NaN, cy: Number.NaN };
    let carryV = { vx: 0, vy: 0 };
    const predictCarried = (j: number): { x: number; y: number; vx: number; vy: number } => {
      const L = carried.length;
      const last = carried[L - 1];
      let { vx, vy } = carryV;
      if (L >= 2) {
        const q = carried[Math.max(0, L - 4)];
        const dt = q.f - last.f;
        if (dt !== 0) { vx = (q.x - last.x) / dt; vy = (q.y - last.y) / dt; }
      }
      const g = j - last.f;
      return { x: last.x + vx * g, y: last.y + vy * g, vx, vy };
    };
    const pNextFor = (j: number): { x: number; y: number; vx: number; vy: number } =>
      coasted && carried.length > 0 ? predictCarried(j)
        : coast && misses > 0 && !coasted && cf.length >= BACKFILL_COAST_POINTS ? predictFlight(j) : predictBack(BACKFILL_PRED, j);
    for (let j = start - 1; j >= oldest; j--) {
      // The second pass goes on over frames an earlier, weaker measurement reached (an outline fit of the coin
      // merged with the fingers, a short track's back-fill); it stops at a clean one.
      const o = pending[j % K];
      if (o.detected && (!coast || (o.method === 'moments' && !o.occluded && !o.touchingEdge))) break;
      // While coasting over misses (the coin edge-on, merged with the fingertips), the longer
      // quadratic over the flight points extrapolates better than the nearest few.
      const p = pNextFor(j);
      const pNext = coast && misses > 0 && !coasted && cf.length >= BACKFILL_COAST_POINTS ? predictFlight(j + 1) : null;
      // Largest change of the minor axis per frame among the nearest later points (the coin's turn).
      let minorRate = 0;
      for (let q = Math.max(1, fs.length - 3); q < fs.length; q++) {
        minorRate = Math.max(minorRate, Math.abs(ms[q] - ms[q - 1]) / Math.abs(fs[q - 1] - fs[q]));
      }
      // Minor axis extrapolated linearly from the two nearest later points.
      const L = fs.length;
      const minorPred = L >= 2 ? ms[L - 1] + ((ms[L - 1] - ms[L - 2]) / (fs[L - 2] - fs[L - 1])) * (fs[L - 1] - j) : ms[L - 1];
      const found = measureBack(j, p, prevE, minorPred, minorRate, misses, thr, pNext, coast && (coasted || misses > 0), false, coast && coasted, carryRef);
      if (!found) {
        // Coasting, the misses allowed are those of the time the coin takes to move half its diameter, at least
        // BACKFILL_COAST frames (at a high frame rate a coin merged with the fingertips for the same few ms spans
        // more frames), at most BACKFILL_COAST_MAX.
        const coastLimit = Math.min(BACKFILL_COAST_MAX, Math.max(BACKFILL_COAST, Math.ceil((0.5 * diameter) / Math.max(0.5, hypot2(p.vx, p.vy)))));
        if (++misses >= (coast && !coasted ? coastLimit : BACKFILL_MISSES)) break;
        continue;
      }
      if (coast && misses > 0 && !coasted && found.method === 'boundary' && !Number.isFinite(found.fitRms)) {
        coasted = true;
        carryV = { vx: p.vx, vy: p.vy };
      }
      if (coasted) carried.push({ f: j, x: found.ellipse.cx, y: found.ellipse.cy });
      misses = 0;
      const thrJ = pending[j % K].thresholdGray;
      pending[j % K] = observe(j, found, Number.isFinite(thrJ) ? thrJ : thr, false, true);
      fs.push(j); xs.push(found.ellipse.cx); ys.push(found.ellipse.cy); ms.push(found.ellipse.minor);
      prevE = found.ellipse;
    }
  }

  /**
   * The coin of the previous frame (`lastE`, found there) block matched into `frame`: for a coin that the
   * track step lost right after a detection, merged with the fingers that catch it. The shift is searched around
   * the last frame's motion; the match must stay near the track's prediction and the place found must still
   * differ from the background (`mask` of the track step's window `win`).
   */
  function followStep(frame: Uint8Array, t: number, thr: number, gain: number, win: PixelWindow): Found | null {
    const from = lastE!;
    const p = predict(t);
    const speed = hypot2(p.vx, p.vy);
    const m = matchTranslation(prev, frame, width, height, from, 1, p.x - from.cx, p.y - from.cy, 2 + 0.5 * speed, undefined, { refine: false });
    // The coin turns between the frames (its shading and outline change), so the match is allowed twice the
    // foreground threshold; the gate on the prediction keeps it on the coin.
    if (!m.ok || !(m.rms <= 2 * thr)) return null;
    const e: Ellipse = { ...from, cx: from.cx + m.dx, cy: from.cy + m.dy };
    if (hypot2(e.cx - p.x, e.cy - p.y) > 2 + 0.08 * diameter + 0.5 * speed) return null;
    if (e.cx < win.x0 || e.cx >= win.x1 || e.cy < win.y0 || e.cy >= win.y1) return null;
    const st = insideStats(frame, e, win);
    const inner = (Math.PI / 4) * Math.max(1, e.major - 2) * Math.max(1, e.minor - 2);
    // A coin turned away from the light can match the background's gray level over most of its face (few
    // foreground pixels) and still differ from it by its relief: the mean difference from the background
    // counts too. The place the coin left, or a static patch, differs only by the noise.
    if (!(st.area >= 0.5 * inner) && !(meanBackgroundDifference(frame, e, gain) >= 0.5 * thr)) return null;
    return {
      ellipse: e, method: 'boundary', occluded: true, touchingEdge: false,
      areaPx: st.area, meanGray: st.mean, fitRms: NaN, fillRatio: NaN, clean: false,
    };
  }

  /**
   * The coin held in the hand: the previous frame's coin (`lastE`) and the foreground in a disc of one diameter
   * around it, block matched into `frame` as one patch. A caught coin stops turning and moves with the fingers
   * holding it, so the patch matches to the noise (sub-pixel RMS within the foreground threshold); a coin still
   * turning in flight, or sliding past the fingers, changes its shading and outline between frames and does not.
   * The shift is searched around the last held match's shift (the hand slows the coin), else the track's motion.
   */
  function heldStep(frame: Uint8Array, t: number, thr: number, gain: number): Found | null {
    const d = diameter;
    const bgd = bg!.data;
    const found = (cx: number, cy: number): Found => ({
      ellipse: { ...lastE!, cx, cy }, method: 'boundary', occluded: true, touchingEdge: false,
      areaPx: NaN, meanGray: NaN, fitRms: NaN, fillRatio: NaN, clean: false, held: true, fromX: lastE!.cx, fromY: lastE!.cy,
    });
    // A run goes on by matching its first frame (the reference) rather than the previous one: the coin and the hand
    // keep their look, and the steps' sub-pixel errors do not add up (a chain drifted 0.6 px over 20 frames). When
    // the reference no longer matches (the hand turns, the light on it changes), the previous frame becomes it.
    if (Number.isFinite(heldDx) && heldRef.cx === heldRef.cx) {
      const r = heldMatch(heldRef.data, frame, heldRef.cx, heldRef.cy, heldRef.sx + heldDx, heldRef.sy + heldDy, 2 + 0.5 * hypot2(heldDx, heldDy), d, thr, gain, bgd);
      if (r) {
        heldRef.sx = r.dx;
        heldRef.sy = r.dy;
        return found(heldRef.cx + r.dx, heldRef.cy + r.dy);
      }
    }
    // After frames without the coin (lost as the fingers closed on it), the patch is placed where the free flight
    // through the last clean detections puts the coin in the previous frame (the outline fits merged with the
    // fingers before the loss can be px off, and the track's prediction with them), else at the track's prediction.
    // A held run's level is not trusted anyway (see `heldInHand`), its path is.
    const c0 = lastSeen === t - 1 ? null : predictClean(t - 1);
    const q = lastSeen === t - 1 ? null : c0 ?? predict(t - 1);
    const from = q ?? { x: lastE!.cx, y: lastE!.cy };
    // The shift is guessed from the same motion that placed the patch.
    const p = (c0 ? predictClean(t) : null) ?? predict(t);
    const gx = Number.isFinite(heldDx) ? heldDx : p.x - from.x;
    const gy = Number.isFinite(heldDy) ? heldDy : p.y - from.y;
    const r = heldMatch(prev, frame, from.x, from.y, gx, gy, 2 + 0.5 * hypot2(gx, gy), d, thr, gain, bgd);
    if (!r) return null;
    if (heldRef.data.length !== prev.length) heldRef.data = new Uint8Array(prev.length);
    heldRef.data.set(prev);
    heldRef.cx = from.x;
    heldRef.cy = from.y;
    heldRef.sx = r.dx;
    heldRef.sy = r.dy;
    return found(from.x + r.dx, from.y + r.dy);
  }

  /**
   * The held coin's match from `src` (the coin's disc of one diameter at (cx, cy) and the foreground in it) into
   * `frame`: accepted when it matches to the noise (sub-pixel RMS within the foreground threshold) and the
   * foreground in a disc of 1.6 diameters outside the coin (the fingers), matched on its own, moved within 0.5 px of
   * the coin's shift. Held means moved with the hand: a coin still free beside the fingers moves against them (a
   * plain coin turning there can match rigidly by itself, its outline changing by a few pixels only); a coin with
   * nothing around is not held. Returns the coin's shift, or null.
   */
  function heldMatch(
    src: Uint8Array, frame: Uint8Array, cx: number, cy: number, gx: number, gy: number, radius: number, d: number, thr: number, gain: number, bgd: Float32Array,
  ): { dx: number; dy: number } | null {
    const region: Ellipse = { cx, cy, major: d, minor: d, angleRad: 0 };
    const m = matchTranslation(src, frame, width, height, region, 1, gx, gy, radius, (i) => Math.abs(src[i] - gain * bgd[i]) > thr);
    if (!m.ok || !(m.rmsSubpixel <= thr) || m.pixels < 0.25 * (Math.PI / 4) * d * d) return null;
    const e = lastE!;
    const ca = Math.cos(e.angleRad), sa = Math.sin(e.angleRad);
    const ra = e.major / 2 + 2, rb = e.minor / 2 + 2;
    const outsideCoin = (i: number): boolean => {
      const y = (i / width) | 0, x = i - y * width;
      const dx = x - cx, dy = y - cy;
      const u = (ca * dx + sa * dy) / ra, v = (-sa * dx + ca * dy) / rb;
      return u * u + v * v > 1 && Math.abs(src[i] - gain * bgd[i]) > thr;
    };
    const ring = matchTranslation(src, frame, width, height, { ...region, major: 1.6 * d, minor: 1.6 * d }, 1, m.dx, m.dy, 2, outsideCoin);
    if (!ring.ok || ring.pixels < 0.1 * (Math.PI / 4) * d * d || !(ring.rmsSubpixel <= thr)) return null;
    if (hypot2(ring.dx - m.dx, ring.dy - m.dy) > 0.5) return null;
    return { dx: m.dx, dy: m.dy };
  }

  /** One frame's work on `cur` (with `prev` the previous frame): the observation as known now. */
  function processFrame(t: number): FrameObservation {
    const frame = cur;
    if (t < initFrames) {
      init.push(Uint8Array.from(frame));
      if (t < initFrames - 1) return none(t, NaN, true);
      bg!.initFromFrames(init);
      const s: number[] = [];
      for (let j = 1; j < init.length; j++) s.push(estimateNoiseSigma(init[j], init[j - 1], width, height));
      s.sort((a, b) => a - b);
      sigma = s[s.length >> 1];
      init.length = 0;
    } else if (t % 16 === 0) {
      const sNew = estimateNoiseSigma(frame, prev, width, height);
      if (Number.isFinite(sNew)) sigma = Number.isFinite(sigma) ? 0.8 * sigma + 0.2 * sNew : sNew;
    }
    const thr = Math.max(kSigma * (Number.isFinite(sigma) ? sigma : 0), floorGray);
    const gain = estimateGain(frame, bg!.data, width, height);
    const searching = !tracking;
    const step = tracking ? trackStep(frame, t, thr, gain) : searchStep(frame, t, thr, gain);
    let found = step.found;
    if (found) followN = 0;
    else if (follow && tracking && lastE && lastSeen === t - 1 && followN < FOLLOW_FRAMES && Number.isFinite(diameter) && t > initFrames && K > 2) {
      // The moving part of the outline near the expected ellipse (the coin reaching the fingers that catch it),
      // as the back-fill measures the coin leaving them; else the block match alone.
      const before = pending[(t - 2 + K) % K];
      const rate = before && before.frame === t - 2 && before.detected ? lastE.minor - before.minor : 0;
      found = measureBack(t, predict(t), lastE, lastE.minor + rate, Math.abs(rate), 0, thr, null, false, true)
        ?? followStep(frame, t, thr, gain, step.win);
      if (found) followN++;
    }
    // The coin held in the hand: a rigid match of the previous frame's coin wins over no coin or an outline fit
    // merged with the hand (whose errors reach px). Not while searching, nor on frames where the coin touches
    // nothing else (clean, or cut only by the frame border): their shape is measured, a match keeps the last one.
    let held: Found | null = null;
    // After a trusted track was lost, while its clean detections still place the free flight (up to 24 frames after
    // the last), the held match is tried from there each frame: a coin lost among the fingers while still in flight
    // is picked up once the hand has it.
    const coasting = !tracking && !found && coastHeld && cn >= 6 && t - cf[cn - 1] <= 24;
    if (followHeldOn && lastE && Number.isFinite(diameter) && t > initFrames
      && ((tracking && t - lastSeen <= HELD_AFTER_LOST + 1 && (!found || found.occluded)) || coasting)) {
      held = heldStep(frame, t, thr, gain);
      if (held) found = held;
    }
    heldDx = held ? held.ellipse.cx - held.fromX! : Number.NaN;
    heldDy = held ? held.ellipse.cy - held.fromY! : Number.NaN;
    let exclude: PixelWindow | null = null;
    if (found) {
      const e = found.ellipse;
      const r = e.major / 2 + 4;
      exclude = clipWindow(e.cx - r, e.cy - r, e.cx + r + 1, e.cy + r + 1);
      if (!tracking) {
        tracking = true;
        hn = 0;
        // A track resumed by the held match keeps the clean flight it came from; nothing before it is back-filled
        // (the frames between were searched, and the coin was then in flight among the fingers).
        if (!found.held) cn = 0;
        coastHeld = false;
        mn = 0;
        mHead = 0;
        if (hint !== undefined && !Number.isFinite(diameter)) diameter = hint;
        if (Number.isFinite(seed.x)) pushHistory(t - 1, { ...e, cx: seed.x, cy: seed.y });
        acqFrame = t;
        trackFirst = t;
        backfillDue = K > 1 && !found.held;
      }
      lost = 0;
      lastSeen = t;
      trackLen++;
      if (coastDue) coastCount++;
      lastE = e;
      pushHistory(t, e);
      if (found.clean || !Number.isFinite(diameter)) pushMajor(e.major);
      if (found.clean && found.method === 'moments' && !found.occluded) pushClean(t, e);
    } else if (tracking) {
      lost++;
      if (hn > 0 && Number.isFinite(diameter)) {
        const p = predict(t);
        const r = diameter / 2 + 6;
        exclude = clipWindow(p.x - r, p.y - r, p.x + r + 1, p.y + r + 1);
      }
      if (lost > maxLost) {
        tracking = false;
        backfillDue = false;
        coastHeld = trackLen >= MIN_TRUSTED_TRACK;
        // A short track is forgotten (see below), and so is the second pass it was to start.
        if (trackLen < MIN_TRUSTED_TRACK && coastAcq >= acqFrame) coastDue = false;
        tFrame = -1;
        if (trackLen < MIN_TRUSTED_TRACK) {
          hn = 0;
          cn = 0;
          mn = 0;
          mHead = 0;
          diameter = Number.NaN;
          // Its frames are forgotten too (still held, not yet reported): a track this short was more likely a
          // piece of the hand or a misfit than the coin, and later passes must not build on it.
          for (let f = Math.max(trackFirst, t - K + 1); f < t; f++) {
            const o = pending[f % K];
            if (o && o.frame === f && o.detected) pending[f % K] = none(f, o.thresholdGray, o.searching);
          }
        }
        trackLen = 0;
      }
    }
    if (step.win.x1 > step.win.x0 && step.win.y1 > step.win.y0) {
      // The search's rows: the foreground test is made inside the update (the mask holds only the candidates' windows).
      if (searching) bg!.update(frame, prev, null, gain, step.win, exclude, SEARCH_ROW_STEP, t % SEARCH_ROW_STEP, thr);
      else bg!.update(frame, prev, mask, gain, step.win, exclude);
    }
    if (!found) return none(t, thr, searching);
    // Outline growth on clean frames of the forward track; the exposure smears the coin over at most the
    // distance it moves in one frame.
    const measured = found.clean && found.method === 'moments' && !searching;
    const growthOpts = { gain, reachPx: stepSpeed, minContrast: Math.max(20, 2 * thr) };
    const growth = measured ? measureOutlineGrowth(frame, bg!.data, width, height, found.ellipse, growthOpts) : NaN;
    const endGrowth = measured ? measureEndGrowth(frame, bg!.data, width, height, found.ellipse, growthOpts) : NaN;
    return observe(t, found, thr, searching, false, growth, endGrowth);
  }

  return {
    push(image: GrayImage, release?: () => void): FrameObservation | null {
      if (flushed) throw new Error('push after flush: the tracker has ended');
      if (width === 0) setup(image);
      if (image.width !== width || image.height !== height || image.data.length < width * height) {
        throw new Error(`Frame ${frameIndex} is ${image.width}x${image.height}, expected ${width}x${height}`);
      }
      const t = frameIndex++;
      const n = width * height;
      const src = image.data.length === n ? image.data : image.data.subarray(0, n);
      if (K === 1) {
        prev = t === 0 || t === initFrames - 1 ? src : soloKept ?? prevSolo!;
        cur = src;
      } else {
        const slot = t % K;
        // The frame leaving the buffer (t − K) is given back if it was kept without a copy.
        const leaving = slot < ringRelease.length ? ringRelease[slot] : null;
        if (release) {
          leaving?.();
          ring[slot] = src;
          ringRelease[slot] = release;
        } else {
          if (leaving || ring.length <= slot) {
            leaving?.();
            ring[slot] = new Uint8Array(n);
          }
          ring[slot].set(src);
          ringRelease[slot] = null;
        }
        cur = ring[slot];
        prev = t === 0 || t === initFrames - 1 ? cur : ring[(t - 1) % K];
      }
      pending[t % K] = processFrame(t);
      if (K === 1) {
        soloRelease?.();
        soloRelease = release ?? null;
        if (release) soloKept = src;
        else {
          soloKept = null;
          prevSolo!.set(src);
        }
      }
      if (backfillDue && tracking && trackLen >= BACKFILL_AFTER) {
        backfillDue = false;
        backfill(t, false);
        // Frames held: max(0, t − K + 1) … t.
        while (trackFirst - 1 >= Math.max(0, t - K + 1) && pending[(trackFirst - 1) % K].detected && pending[(trackFirst - 1) % K].backfilled) trackFirst--;
        // A pass still due from an earlier track (lost and found again since) keeps its start.
        if (carry && !coastDue) {
          coastDue = true;
          coastAcq = acqFrame;
          coastCount = trackLen;
          coastFrom = acqFrame;
          coastFrom = earliestOfChain(acqFrame, t - K + 1);
        }
      }
      // Due after BACKFILL_COAST_AFTER detections, or while half the buffer still holds frames before the earliest
      // frame reached (the hand carrying the coin up).
      if (coastDue && tracking && (coastCount >= BACKFILL_COAST_AFTER || t - coastFrom >= K >> 1)) {
        coastDue = false;
        if (coastAcq > t - K + 1) backfill(t, true);
      }
      return t >= K - 1 ? pending[(t - K + 1) % K] : null;
    },
    flush(): FrameObservation[] {
      if (flushed) throw new Error('flush called twice: the tracker has ended');
      flushed = true;
      for (let slot = 0; slot < ringRelease.length; slot++) {
        ringRelease[slot]?.();
        ringRelease[slot] = null;
      }
      soloRelease?.();
      soloRelease = null;
      soloKept = null;
      const out: FrameObservation[] = [];
      const last = frameIndex - 1;
      for (let f = Math.max(0, last - K + 2); f <= last; f++) out.push(pending[f % K]);
      return out;
    },
    get lagFrames(): number {
      if (K > 0) return K - 1;
      return opts.bufferFrames !== undefined ? Math.max(1, Math.round(opts.bufferFrames)) - 1 : Number.NaN;
    },
  };
}

/** The largest component of at least 3 px and at most `maxArea` that stays inside the window, centred within `gate` of (x, y); −1 if none. */
function largestBlobNear(c: ComponentLabels, x: number, y: number, gate: number, maxArea: number): number {
  let main = -1;
  for (let k = 0; k < c.count; k++) {
    if (c.area[k] < 3 || c.touchesWindow[k] || c.area[k] > maxArea) continue;
    const dx = c.m10[k] / c.area[k] - x, dy = c.m01[k] / c.area[k] - y;
    if (dx * dx + dy * dy > gate * gate) continue;
    if (main < 0 || c.area[k] > c.area[main]) main = k;
  }
  return main;
}

/** Points of (xs, ys)[0..n) within r of (cx, cy), copied into new arrays. */
function selectNear(
  xs: Float64Array, ys: Float64Array, n: number, cx: number, cy: number, r: number, out: { xs: Float64Array; ys: Float64Array; n: number },
): { xs: Float64Array; ys: Float64Array; n: number } {
  const ox = out.xs, oy = out.ys;
  let m = 0;
  const r2 = r * r;
  for (let i = 0; i < n; i++) {
    const dx = xs[i] - cx, dy = ys[i] - cy;
    if (dx * dx + dy * dy <= r2) { ox[m] = xs[i]; oy[m] = ys[i]; m++; }
  }
  return { xs: ox, ys: oy, n: m };
}

/** Least-squares quadratic in τ = f − t over points [s, e); returns [value, slope] at τ = 0. */
/** Least-squares line v ≈ c0 + c1 τ, τ = f − t, over points s … e − 1: [value, slope] at t. */
function lineFit(fs: Float64Array, vs: Float64Array, s: number, e: number, t: number): [number, number] {
  let s0 = 0, s1 = 0, s2 = 0, b0 = 0, b1 = 0;
  for (let i = s; i < e; i++) {
    const tau = fs[i] - t;
    s0 += 1; s1 += tau; s2 += tau * tau; b0 += vs[i]; b1 += vs[i] * tau;
  }
  const det = s0 * s2 - s1 * s1;
  if (Math.abs(det) < 1e-12) return [vs[e - 1], 0];
  return [(b0 * s2 - s1 * b1) / det, (s0 * b1 - s1 * b0) / det];
}

function quadFit(fs: Float64Array, vs: Float64Array, s: number, e: number, t: number): [number, number] {
  // Normal equations for v ≈ c0 + c1 τ + c2 τ².
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, b0 = 0, b1 = 0, b2 = 0;
  for (let i = s; i < e; i++) {
    const tau = fs[i] - t;
    const t2 = tau * tau;
    s0 += 1; s1 += tau; s2 += t2; s3 += t2 * tau; s4 += t2 * t2;
    b0 += vs[i]; b1 += vs[i] * tau; b2 += vs[i] * t2;
  }
  const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (Math.abs(det) < 1e-12) return [vs[e - 1], 0];
  const c0 = (b0 * (s2 * s4 - s3 * s3) - s1 * (b1 * s4 - s3 * b2) + s2 * (b1 * s3 - s2 * b2)) / det;
  const c1 = (s0 * (b1 * s4 - b2 * s3) - b0 * (s1 * s4 - s3 * s2) + s2 * (s1 * b2 - b1 * s2)) / det;
  return [c0, c1];
}

/** Foreground on the `step`×-decimated grid: pixel (step·x, step·y) of the frame → (x, y) of `out`. */
function decimatedForeground(
  frame: Uint8Array, bg: Float32Array, width: number, height: number, thr: number, gain: number, out: Uint8Array, step: number,
): void {
  const wl = Math.ceil(width / step);
  for (let y = 0, yl = 0; y < height; y += step, yl++) {
    const row = y * width;
    const rowL = yl * wl;
    for (let x = 0, xl = 0; x < width; x += step, xl++) {
      const d = frame[row + x] - gain * bg[row + x];
      out[rowL + xl] = d > thr || d < -thr ? 1 : 0;
    }
  }
}

/** Fraction of foreground pixels in a box whose gray level changed by more than `thr` since `prev`. */
function changedFraction(
  frame: Uint8Array, prev: Uint8Array, mask: Uint8Array, width: number, x0: number, y0: number, x1: number, y1: number, thr: number,
): number {
  let n = 0, changed = 0;
  for (let y = y0; y < y1; y++) {
    for (let i = y * width + x0, end = y * width + x1; i < end; i++) {
      if (mask[i] === 0) continue;
      n++;
      if (Math.abs(frame[i] - prev[i]) > thr) changed++;
    }
  }
  return n > 0 ? changed / n : 0;
}
