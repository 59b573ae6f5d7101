/**
 * One toss from its per-frame observations: the in-flight window, the rotation fit (which also gives the
 * scale at the coin's depth), the metric flight fit, and the derived quantities (face changes, predicted
 * face, same-side probability), with flags wherever a number cannot be trusted.
 *
 * A value that cannot be trusted is null and its reason is a flag; never a confident wrong number.
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007. DOI 10.1137/S0036144504446436
 */
import { faceChanges, sameSideFraction } from '../physics/index.ts';
import { sameFaceProbability } from './faceProbability.ts';
import { findFlightWindow, type TrackPoint } from './findFlightWindow.ts';
import { fitFlight } from './fitFlight.ts';
import { fitRotation } from './fitRotation.ts';
import { robustLinearFit } from './robustLinearFit.ts';
import { P, ellipseMoments, lFrame, modelMoments, normalAtCamera, type RotationFrame } from './rotationModel.ts';
import { nearFaceMagnification, viewGeometry } from './viewGeometry.ts';
import { hypot2 } from '../hypot.ts';

export type Face = 'heads' | 'tails';

/** What the estimator needs of one frame's observation (the tracker's `FrameObservation` has these fields). */
/**
 * Largest error of the major axis corrected by the measured end growth on exactly covered test ellipses, px
 * (round to 10×4 px, three thresholds: 0.22 px in test/vision/outlineGrowth.test.ts), rounded up.
 */
const GROWTH_BIAS_PX = 0.25;

export interface ObservedFrame {
  frame: number;
  detected: boolean;
  cx: number;
  cy: number;
  major: number;
  minor: number;
  angleRad: number;
  method: 'moments' | 'boundary' | 'none';
  occluded: boolean;
  touchingEdge: boolean;
  /** How much larger the ellipse is than the coin on its full axes, px, from the edge's gray levels (NaN: not measured). */
  outlineGrowthPx?: number;
  /** How far the major axis's ends lie beyond the coin's edge there, full axis, px (NaN or absent: not measured). */
  endGrowthPx?: number;
  /** RMS distance of the outline to the ellipse, px; NaN for a centre placed by block matching alone (default NaN). */
  fitRms?: number;
  /** Placed by the rigid match of the coin held in the hand after the catch (default false). */
  heldInHand?: boolean;
}

export interface TossContext {
  /** The capture rate the time base uses, frames/s. */
  captureFps: number;
  /** Per-frame times, s (default frame / captureFps); the true times when frames were dropped. */
  frameTimesS?: number[];
  coinDiameterM: number;
  coinThicknessM: number;
  /** Focal length in px, when known (for the per-frame viewing ray). */
  focalPx: number | null;
  width: number;
  height: number;
  startFace: Face | null;
  /** Gravity, m/s² (default standard gravity). */
  gravity: number;
}

export interface TossEstimate {
  flags: string[];
  framesTracked: number;
  releaseTS: number | null;
  catchTS: number | null;
  flightTimeS: number | null;
  flightTimeSeS: number | null;
  launchSpeedMS: number | null;
  launchSpeedSeMS: number | null;
  apexHeightM: number | null;
  gravityFps: number | null;
  gravityFpsSe: number | null;
  pxPerM: number | null;
  pxPerMSe: number | null;
  /** Change of depth between release and catch, m (needs the focal length). */
  depthChangeM: number | null;
  /** Scale at the catch over the scale at the release. */
  scaleChangeRatio: number | null;
  cameraRollDeg: number | null;
  spinRevS: number | null;
  spinRevSSe: number | null;
  precessionDeg: number | null;
  precessionDegSe: number | null;
  momentumTiltDeg: number | null;
  momentumTiltDegSe: number | null;
  faceChanges: number | null;
  predictedFace: Face | null;
  sameSidePredicted: boolean | null;
  pSameSide: number | null;
  pSameSideSe: number | null;
  /**
   * Probability that `predictedFace` is the face up at the catch, given the standard errors of the release and
   * catch times (normal, independent) and the fitted rotation taken as exact; null without a predicted face.
   */
  predictedFaceP: number | null;
  fitRms: number | null;
  /** Per frame (same order as the input): in flight, the model's axis ratio and the residual of the observed one. */
  inFlight: boolean[];
  modelAxisRatio: (number | null)[];
  residual: (number | null)[];
}

const DEG = 180 / Math.PI;

function emptyEstimate(n: number, flags: string[], tracked: number): TossEstimate {
  return {
    flags,
    framesTracked: tracked,
    releaseTS: null,
    catchTS: null,
    flightTimeS: null,
    flightTimeSeS: null,
    launchSpeedMS: null,
    launchSpeedSeMS: null,
    apexHeightM: null,
    gravityFps: null,
    gravityFpsSe: null,
    pxPerM: null,
    pxPerMSe: null,
    depthChangeM: null,
    scaleChangeRatio: null,
    cameraRollDeg: null,
    spinRevS: null,
    spinRevSSe: null,
    precessionDeg: null,
    precessionDegSe: null,
    momentumTiltDeg: null,
    momentumTiltDegSe: null,
    faceChanges: null,
    predictedFace: null,
    sameSidePredicted: null,
    pSameSide: null,
    pSameSideSe: null,
    predictedFaceP: null,
    fitRms: null,
    inFlight: new Array(n).fill(false),
    modelAxisRatio: new Array(n).fill(null),
    residual: new Array(n).fill(null),
  };
}

/** Frames per revolution below which the spin rate is ambiguous (the axis ratio oscillates at twice the spin). */
export const MIN_FRAMES_PER_REV = 4.4;
/** Fewest clean in-flight frames for a rotation fit. */
export const MIN_FLIGHT_FRAMES = 16;

/** Derived same-side quantities for the start-face normal, from the fitted parameters and the up vector. */
function sideQuantities(p: ArrayLike<number>, up: number[], tMid: number, tRelease: number, tCatch: number) {
  const { l, e1, e2 } = lFrame(p[P.alpha], p[P.gamma]);
  const nRel = normalAtCamera(p, tRelease, tMid);
  const sigma = nRel[0] * up[0] + nRel[1] * up[1] + nRel[2] * up[2] >= 0 ? 1 : -1; // start face normal = σ n
  const lz = sigma * (l[0] * up[0] + l[1] * up[1] + l[2] * up[2]);
  const betaS = Math.acos(Math.max(-1, Math.min(1, lz)));
  const psi = p[P.psi];
  const theta = Math.atan2(e2[0] * up[0] + e2[1] * up[1] + e2[2] * up[2], e1[0] * up[0] + e1[1] * up[1] + e1[2] * up[2]);
  const omega = p[P.omega];
  // σ n·ẑ = cos ψ cos β_s + sin ψ sin β_s cos(Ω t + φ'), φ' = φ0 − θ − Ω t̄ (+π when σ = −1).
  const phi = p[P.phi0] - theta - omega * tMid + (sigma < 0 ? Math.PI : 0);
  const changes = faceChanges(psi, betaS, omega, phi, tRelease, tCatch);
  const pSame = sameSideFraction(psi, betaS, true);
  const sameFaceAround = (t: number, se: number) => sameFaceProbability(psi, betaS, omega, phi, t, se);
  return { sigma, betaS, changes, pSame, sameFaceAround };
}

/** Least axis ratio of a frame used for the scale: nearer edge-on the rim and the blur dominate the outline. */
const SCALE_MIN_AXIS_RATIO = 0.35;

/**
 * The scale and the depth trend from the major axis (DESIGN §5): on clean in-flight frames that are not near
 * edge-on, the major axis less the outline growth measured from the edge's gray levels, divided by the fitted
 * model's perspective magnification of that frame (the model's major
 * axis with no depth trend, growth, blur or rim, over its diameter), is the coin's diameter in px at its depth
 * in that frame. The depth trend k comes from these diameters ({@link depthTrendFromDiameters}), not from the
 * rotation fit: there it trades against the outline growth, the rim and the blur, which change the moments but
 * hardly the major axis (its k was 5–11% off on rendered clips moving 12–20 cm in depth; the major axis's within
 * 4%). Each diameter brought to the mean time `tMid` by 1 + k (t − t̄) gives the diameter at the mean depth: the
 * median over the frames, with its standard error from the spread (1.2533 · 1.4826 · MAD / √n, the median of a
 * normal sample; common practice, no source) combined with the growth's own and a systematic term (below). The
 * major axis's extent is the face's diameter: the rim widens the outline across it, so the magnification leaves
 * the rim out; but it is the diameter of the face nearer the camera, h/2 nearer than the centre, so with a known
 * focal length the magnification includes that face's ({@link nearFaceMagnification}: on the rendered clips, coins
 * 1.75 mm thick at 34 cm, it took px/m from 0.55% to 0.38% high). The growth is each frame's own growth at the
 * major axis's ends (`endGrowthPx`) when at least 12 frames have it: motion blur and the threshold lengthen the mask along the major axis by an amount that differs
 * from frame to frame and from the all-round growth (on rendered 20 px coins at 480 frames/s the all-round
 * median left px/m 1.0% high; the ends' own growth 0.3% low). Else the clip's median all-round growth
 * (`outlineGrowthPx`) is taken off every frame. Null when fewer than 12 frames carry either (then the rotation
 * fit's radius and depth trend are used).
 */
function scaleFromMajorAxis(
  frames: ObservedFrame[], flightIdx: number[], rotFrames: RotationFrame[], p: Float64Array, tau: number, tMid: number, radiusM: number,
  times: number[], focalPx: number | null,
): { pxPerM: number; pxPerMSe: number; growthPx: number; depthRate: number; depthRateSe: number } | null {
  const growth: number[] = [];
  const use: number[] = [];
  const atEnds: number[] = [];
  for (let k = 0; k < flightIdx.length; k++) {
    const f = frames[flightIdx[k]];
    if (!(f.minor / f.major >= SCALE_MIN_AXIS_RATIO)) continue;
    use.push(k);
    if (Number.isFinite(f.outlineGrowthPx)) growth.push(f.outlineGrowthPx!);
    if (Number.isFinite(f.endGrowthPx)) atEnds.push(k);
  }
  // Each frame's own growth at the major axis's ends when enough frames have it (blur and the threshold differ
  // from frame to frame, and the all-round growth is an average over the outline); else the clip's median
  // all-round growth for every frame.
  const perFrameGrowth = atEnds.length >= 12;
  if (!perFrameGrowth && growth.length < 12) return null;
  const g = perFrameGrowth ? medianAndSe(atEnds.map((k) => frames[flightIdx[k]].endGrowthPx!)) : medianAndSe(growth);
  const perFrame = diametersPx(frames, flightIdx, perFrameGrowth ? atEnds : use, rotFrames, p, tau, tMid,
    (f) => (perFrameGrowth ? f.endGrowthPx! : g.median), focalPx);
  const tOf = (k: number) => times[flightIdx[k]];
  const trend = depthTrendFromDiameters(perFrame.map((q) => tOf(q.k)), perFrame.map((q) => q.diameterPx), tMid);
  const depthRate = trend.ok ? trend.rate : p[P.depthRate];
  const depthRateSe = trend.ok ? trend.rateSe : Number.NaN;
  // Z(t) = Z̄ (1 + k (t − t̄)), so D(t̄) = D(t) (1 + k (t − t̄)).
  const diam = perFrame.map((q) => q.diameterPx * (1 + depthRate * (tOf(q.k) - tMid)));
  const ratio = perFrame.map((q) => q.ratio);
  const d = medianAndSe(diam);
  // What the spread does not show: the growth is not the same at every turn of the coin (texture, rim, blur
  // across the axis). Half the gap between the diameters from the rounder and the thinner half of the frames
  // joins the standard error as a systematic term.
  const cut = medianAndSe(ratio).median;
  const round = diam.filter((_, q) => ratio[q] >= cut);
  const thin = diam.filter((_, q) => ratio[q] < cut);
  const systematic = round.length >= 6 && thin.length >= 6 ? Math.abs(medianAndSe(round).median - medianAndSe(thin).median) / 2 : 0;
  const radiusPx = d.median / 2;
  // Nor does it show the growth model's own bias, the same on every frame: the corrected major axis of exactly
  // covered test ellipses is within GROWTH_BIAS_PX of the truth (outlineGrowth's tests), taken as uniform within
  // that bound. On a clip of thousands of frames it is most of the error (0.2–0.5% on a 40 px coin).
  const bias = GROWTH_BIAS_PX / Math.sqrt(3);
  return { pxPerM: radiusPx / radiusM, pxPerMSe: Math.hypot(d.se, perFrameGrowth ? 0 : g.se, systematic, bias) / 2 / radiusM, growthPx: g.median, depthRate, depthRateSe };
}

/** Median of `v` and its standard error 1.2533 · 1.4826 · MAD / √n. */
function medianAndSe(v: number[]): { median: number; se: number } {
  const s = [...v].sort((a, b) => a - b);
  const med = s.length % 2 ? s[s.length >> 1] : 0.5 * (s[(s.length >> 1) - 1] + s[s.length >> 1]);
  const dev = s.map((x) => Math.abs(x - med)).sort((a, b) => a - b);
  const mad = dev.length % 2 ? dev[dev.length >> 1] : 0.5 * (dev[(dev.length >> 1) - 1] + dev[dev.length >> 1]);
  return { median: med, se: (1.2533 * 1.4826 * mad) / Math.sqrt(s.length) };
}

/** Result of {@link depthTrendFromDiameters}. */
export type DepthTrend =
  | {
      ok: true;
      /** k in Z(t) = Z̄ (1 + k (t − t_ref)), 1/s: the relative rate of change of the depth at `tRefS`. */
      rate: number;
      rateSe: number;
      /** The coin's diameter in px at `tRefS` (from the fitted line, not a median). */
      diameterAtRefPx: number;
      /** Frames kept by the robust fit. */
      kept: number;
    }
  | { ok: false; reason: string };

/**
 * The depth trend of a flight from the coin's diameter in px in each frame (the major axis less the outline
 * growth, over the perspective magnification of its place in the image). Pinhole: the diameter is
 * D(t) = f · 2a / Z(t) (common practice, no source), so 1 / D(t) = Z(t) / (2 a f) is linear in t when the depth
 * is (a level optical axis: no gravity along it). A robust straight line (Tukey biweight, `robustLinearFit`)
 * through 1 / D against t − `tRefS` gives Z(t) / Z̄ = 1 + k (t − `tRefS`), k = slope / intercept, and its
 * standard error by the delta method. Needs at least 12 frames with a positive diameter; does not mutate its
 * inputs. A straight line through D itself would be biased: 1 / Z is not linear in t.
 */
export function depthTrendFromDiameters(tS: readonly number[], diameterPx: readonly number[], tRefS: number): DepthTrend {
  const rows: number[][] = [];
  const y: number[] = [];
  for (let i = 0; i < tS.length; i++) {
    if (!(diameterPx[i] > 0) || !Number.isFinite(tS[i])) continue;
    rows.push([1, tS[i] - tRefS]);
    y.push(1 / diameterPx[i]);
  }
  if (rows.length < 12) return { ok: false, reason: `only ${rows.length} frames with a diameter (need 12)` };
  const fit = robustLinearFit(rows, y, { minScale: 1e-12 });
  if (!fit.ok) return { ok: false, reason: fit.reason };
  const [c0, c1] = fit.coef;
  if (!(c0 > 0)) return { ok: false, reason: 'the fitted depth is not positive' };
  const rate = c1 / c0;
  // Delta method for k = c1 / c0: ∂k/∂c0 = −c1/c0², ∂k/∂c1 = 1/c0.
  const cv = fit.covariance;
  const g0 = -c1 / (c0 * c0);
  const g1 = 1 / c0;
  const rateSe = Math.sqrt(Math.max(0, g0 * g0 * cv[0][0] + 2 * g0 * g1 * cv[0][1] + g1 * g1 * cv[1][1]));
  let kept = 0;
  for (const w of fit.weights) if (w > 0) kept++;
  return { ok: true, rate, rateSe, diameterAtRefPx: 1 / c0, kept };
}

/**
 * The per-frame diameter in px of the frames `use` (indices into `flightIdx`): the major axis less the clip's
 * outline growth, over the fitted model's perspective magnification of that frame (the model's major axis with
 * no depth trend, growth, blur or rim, over its diameter 2 G0) times the near face's magnification (1 without a
 * focal length).
 */
function diametersPx(
  frames: ObservedFrame[], flightIdx: number[], use: number[], rotFrames: RotationFrame[], p: Float64Array, tau: number, tMid: number,
  growthOf: (f: ObservedFrame) => number, focalPx: number | null,
): { k: number; diameterPx: number; ratio: number }[] {
  const bare = Float64Array.from(p);
  bare[P.depthRate] = 0;
  bare[P.deltaPx] = 0;
  bare[P.blur] = 0;
  bare[P.rim] = 0;
  const out: { k: number; diameterPx: number; ratio: number }[] = [];
  for (const k of use) {
    const mm = modelMoments(bare, rotFrames[k], tau, tMid);
    const half = 0.5 * (mm.sxx + mm.syy);
    const root = Math.sqrt(0.25 * (mm.sxx - mm.syy) ** 2 + mm.sxy * mm.sxy);
    const majorModel = 4 * Math.sqrt(half + root);
    // The outline's ends are those of the face nearer the camera (see nearFaceMagnification).
    const g = rotFrames[k].geom;
    const near = focalPx === null ? 1
      : nearFaceMagnification(normalAtCamera(bare, rotFrames[k].tS, tMid), g.d, (p[P.radiusPx] * g.d[2]) / focalPx, tau, focalPx);
    const mag = (majorModel / (2 * p[P.radiusPx])) * near;
    const f = frames[flightIdx[k]];
    if (mag > 0) out.push({ k, diameterPx: (f.major - growthOf(f)) / mag, ratio: f.minor / f.major });
  }
  return out;
}

/**
 * Estimates one toss from `frames` (one per decoded frame, in order). Pure: no I/O, inputs untouched.
 */
export function estimateToss(frames: ObservedFrame[], ctx: TossContext): TossEstimate {
  const n = frames.length;
  const flags: string[] = [];
  const frameS = 1 / ctx.captureFps;
  const times = ctx.frameTimesS ?? frames.map((f) => f.frame / ctx.captureFps);
  const tracked = frames.filter((f) => f.detected).length;
  const clean = (f: ObservedFrame) => f.detected && f.method === 'moments' && !f.occluded && !f.touchingEdge;
  // Block-matched frames (an outline was not fitted: fitRms NaN) carry the coin rigidly with the fingers.
  const matched = (f: ObservedFrame) => f.detected && f.method === 'boundary' && !Number.isFinite(f.fitRms ?? Number.NaN);
  const points: TrackPoint[] = frames.map((f, i) => ({
    tS: times[i], x: f.cx, y: f.cy, detected: f.detected, clean: clean(f), placesRelease: clean(f) || matched(f),
    held: f.detected && f.heldInHand === true,
  }));
  // The depth trend from the coin's apparent size (1 / major axis is linear in t; clean frames not near edge-on,
  // robustly, so frames in the hand drop out), for a window fit that holds when the coin moves in depth.
  const sizeIdx = frames.map((f, i) => (clean(f) && f.minor >= SCALE_MIN_AXIS_RATIO * f.major ? i : -1)).filter((i) => i >= 0);
  const tSize = sizeIdx.map((i) => times[i]);
  const tSizeRef = tSize.length > 0 ? tSize[tSize.length >> 1] : 0;
  const sizeTrend = depthTrendFromDiameters(tSize, sizeIdx.map((i) => frames[i].major), tSizeRef);
  const win = findFlightWindow(points, frameS, sizeTrend.ok
    ? { rate: sizeTrend.rate, tRefS: tSizeRef, principalX: (ctx.width - 1) / 2, principalY: (ctx.height - 1) / 2 }
    : undefined);
  if (!win.ok) return emptyEstimate(n, ['track_lost'], tracked);
  const est = emptyEstimate(n, flags, tracked);
  const tR = win.releaseTS;
  const tC = win.catchTS;
  if (!win.releaseSeen) flags.push('release_unseen');
  if (!win.catchSeen) flags.push('catch_unseen');
  for (let i = 0; i < n; i++) est.inFlight[i] = times[i] > tR && times[i] < tC;

  // In-flight clean frames for the rotation and scale, with an image velocity for the blur term.
  const flightIdx: number[] = [];
  for (let i = win.first; i <= win.last; i++) if (clean(frames[i]) && est.inFlight[i]) flightIdx.push(i);
  const inFlightCount = est.inFlight.filter(Boolean).length;
  const detectedInFlight = frames.filter((f, i) => est.inFlight[i] && f.detected).length;
  const edgeInFlight = frames.filter((f, i) => est.inFlight[i] && (f.touchingEdge || !f.detected)).length;
  if (inFlightCount > 0 && edgeInFlight / inFlightCount > 0.4) flags.push('out_of_frame');
  if (inFlightCount > 0 && detectedInFlight / inFlightCount < 0.5) flags.push('track_lost');
  if (flightIdx.length < MIN_FLIGHT_FRAMES) {
    flags.push('few_flight_frames');
    return { ...est, flags: [...new Set(flags)].sort() };
  }
  const tMid = flightIdx.reduce((s, i) => s + times[i], 0) / flightIdx.length;
  const design = flightIdx.map((i) => [1, times[i] - tMid, (times[i] - tMid) ** 2]);
  const vxFit = robustLinearFit(design, flightIdx.map((i) => frames[i].cx));
  const vyFit = robustLinearFit(design, flightIdx.map((i) => frames[i].cy));
  const u0 = (ctx.width - 1) / 2;
  const v0 = (ctx.height - 1) / 2;
  const rotFrames: RotationFrame[] = flightIdx.map((i) => {
    const f = frames[i];
    const [sxx, sxy, syy] = ellipseMoments(f.major, f.minor, f.angleRad);
    const dt = times[i] - tMid;
    const vx = vxFit.ok ? (vxFit.coef[1] + 2 * vxFit.coef[2] * dt) * frameS : 0;
    const vy = vyFit.ok ? (vyFit.coef[1] + 2 * vyFit.coef[2] * dt) * frameS : 0;
    return { tS: times[i], sxx, sxy, syy, vxPx: vx, vyPx: vy, geom: viewGeometry(f.cx, f.cy, ctx.focalPx, u0, v0) };
  });
  const radiusM = ctx.coinDiameterM / 2;
  const tau = ctx.coinThicknessM / radiusM;
  const rot = fitRotation(rotFrames, { tau, captureFps: ctx.captureFps, tMidS: tMid });
  if (!rot.ok) {
    flags.push('fit_unconverged');
    return { ...est, releaseTS: tR, catchTS: tC, flightTimeS: tC - tR, flags: [...new Set(flags)].sort() };
  }
  if (!rot.converged) flags.push('fit_unconverged');
  const p = rot.params;
  const se = rot.standardErrors;
  const scale = scaleFromMajorAxis(frames, flightIdx, rotFrames, p, tau, tMid, radiusM, times, ctx.focalPx);
  // The scale at the mean time t̄ of the frames used, and the depth trend: s(t) = f / Z(t) = s̄ / (1 + k (t − t̄)).
  const pxPerMMid = scale ? scale.pxPerM : p[P.radiusPx] / radiusM;
  const depthRate = scale ? scale.depthRate : p[P.depthRate];
  const depthRateSe = scale && Number.isFinite(scale.depthRateSe) ? scale.depthRateSe : se[P.depthRate];
  const scaleAt = (t: number) => pxPerMMid / (1 + depthRate * (t - tMid));
  // px_per_m is the scale at the mean depth of the flight: the depth is linear in t, so at the flight's middle
  // (tR + tC) / 2 when both ends are seen (the clean frames need not be spread evenly over the flight); otherwise
  // an end is only the last frame tracked and t̄ is the better guess.
  const tFlightMid = win.releaseSeen && win.catchSeen ? 0.5 * (tR + tC) : tMid;
  const pxPerM = scaleAt(tFlightMid);
  const pxPerMSe = ((scale ? scale.pxPerMSe : se[P.radiusPx] / radiusM) * pxPerM) / pxPerMMid;

  // Per-frame model ratio and residual (in flight); fit_rms is the RMS of the axis-ratio residual of the frames kept.
  let sumSq = 0;
  let kept = 0;
  for (let k = 0; k < flightIdx.length; k++) {
    const i = flightIdx[k];
    const mm = modelMoments(p, rotFrames[k], tau, tMid);
    est.modelAxisRatio[i] = mm.axisRatio;
    est.residual[i] = frames[i].minor / frames[i].major - mm.axisRatio;
    if (rot.weights[k] > 0) {
      sumSq += est.residual[i]! ** 2;
      kept++;
    }
  }

  // Metric flight over every detected in-flight frame whose centre is trustworthy (clean or boundary).
  const flightAll: number[] = [];
  for (let i = win.first; i <= win.last; i++) if (frames[i].detected && est.inFlight[i]) flightAll.push(i);
  /** The metric flight fit of the in-flight frames with the scale `scale(t)` at the coin's depth. */
  const flightWith = (scale: (t: number) => number) => fitFlight({
    tS: flightAll.map((i) => times[i]),
    uPx: flightAll.map((i) => frames[i].cx),
    vPx: flightAll.map((i) => frames[i].cy),
    pxPerM: flightAll.map((i) => scale(times[i])),
    u0,
    v0,
    releaseTS: tR,
    catchTS: tC,
    captureFps: ctx.captureFps,
    gravity: ctx.gravity,
    pxPerMRelSe: pxPerMSe / pxPerM,
  });
  const flight = flightWith(scaleAt);

  // The depth trend's own error moves the metric track: refit with k one standard error higher and add the change
  // of the launch speed to its standard error (the trend is fitted apart from the track, so the two add in quadrature).
  let launchTrendSe = 0;
  if (flight.ok && Number.isFinite(depthRateSe) && depthRateSe > 0) {
    const k1 = depthRate + depthRateSe;
    const shifted = flightWith((t) => pxPerMMid / (1 + k1 * (t - tMid)));
    if (shifted.ok) launchTrendSe = Math.abs(shifted.launchSpeedMS - flight.launchSpeedMS);
  }

  const spinRevS = p[P.omega] / (2 * Math.PI);
  const framesPerRev = ctx.captureFps / spinRevS;
  const aliased = framesPerRev < MIN_FRAMES_PER_REV;
  if (aliased) flags.push('spin_aliased');

  est.releaseTS = win.releaseSeen ? tR : null;
  est.catchTS = win.catchSeen ? tC : null;
  if (win.releaseSeen && win.catchSeen) {
    est.flightTimeS = tC - tR;
    est.flightTimeSeS = hypot2(win.releaseSeS, win.catchSeS);
  }
  est.pxPerM = pxPerM;
  est.pxPerMSe = pxPerMSe;
  est.scaleChangeRatio = scaleAt(tC) / scaleAt(tR);
  // Depth: Z(t) = Z̄ (1 + k (t − t̄)) with Z̄ = f / s̄, so Z(tC) − Z(tR) = (f / s̄) k (tC − tR).
  if (ctx.focalPx !== null) est.depthChangeM = (ctx.focalPx / pxPerMMid) * depthRate * (tC - tR);
  est.fitRms = kept > 0 ? Math.sqrt(sumSq / kept) : null;
  if (flight.ok) {
    // The stated rate disagrees with gravity by more than three standard errors and more than 2%.
    const gap = Math.abs(flight.gravityFps - ctx.captureFps);
    if (gap > 3 * flight.gravityFpsSe && gap > 0.02 * ctx.captureFps) flags.push('fps_mismatch');
    est.gravityFps = flight.gravityFps;
    est.gravityFpsSe = flight.gravityFpsSe;
    est.cameraRollDeg = flight.rollRad * DEG;
    if (win.releaseSeen) {
      est.launchSpeedMS = flight.launchSpeedMS;
      est.launchSpeedSeMS = hypot2(flight.launchSpeedSeMS, launchTrendSe);
      est.apexHeightM = flight.apexHeightM;
    }
  }
  if (aliased) return { ...est, flags: [...new Set(flags)].sort() };

  est.spinRevS = spinRevS;
  est.spinRevSSe = se[P.omega] / (2 * Math.PI);
  // The angle between the coin's axis (a line) and L, folded into 0..90°.
  est.precessionDeg = Math.min(p[P.psi], Math.PI - p[P.psi]) * DEG;
  est.precessionDegSe = se[P.psi] * DEG;
  // The vertical in camera coordinates: opposite to gravity's image direction (optical axis horizontal).
  const down = flight.ok ? flight.down : [0, 1];
  const up = [-down[0], -down[1], 0];
  const { l } = lFrame(p[P.alpha], p[P.gamma]);
  const lz = Math.abs(l[0] * up[0] + l[1] * up[1] + l[2] * up[2]);
  est.momentumTiltDeg = Math.acos(Math.min(1, lz)) * DEG;
  const side = sideQuantities(p, up, tMid, tR, tC);
  // Which face started up is read at the release: where it was not seen, the coin may have turned over before the
  // first frame tracked, so the start face's share of the cycle is not known.
  est.pSameSide = win.releaseSeen ? side.pSame : null;
  // Standard errors of tilt and p_same_side by the delta method over (α, γ, ψ).
  if (rot.covariance) {
    const idx = [P.alpha, P.gamma, P.psi];
    const grad = (fn: (q: Float64Array) => number) =>
      idx.map((j) => {
        const q1 = Float64Array.from(p);
        const q2 = Float64Array.from(p);
        const h = 1e-6;
        q1[j] += h;
        q2[j] -= h;
        return (fn(q1) - fn(q2)) / (2 * h);
      });
    const variance = (g: number[]) => {
      let v = 0;
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) v += g[a] * g[b] * rot.covariance![idx[a]][idx[b]];
      return Math.sqrt(Math.max(v, 0));
    };
    const tiltOf = (q: Float64Array) => {
      const f = lFrame(q[P.alpha], q[P.gamma]).l;
      return Math.acos(Math.min(1, Math.abs(f[0] * up[0] + f[1] * up[1] + f[2] * up[2]))) * DEG;
    };
    est.momentumTiltDegSe = variance(grad(tiltOf));
    if (win.releaseSeen) est.pSameSideSe = variance(grad((q) => sideQuantities(q, up, tMid, tR, tC).pSame));
  }
  if (win.releaseSeen && win.catchSeen) {
    est.faceChanges = side.changes;
    est.sameSidePredicted = side.changes % 2 === 0;
    if (ctx.startFace) {
      const other: Face = ctx.startFace === 'heads' ? 'tails' : 'heads';
      est.predictedFace = est.sameSidePredicted ? ctx.startFace : other;
      // Right when the parity of the changes holds at both ends, or flips at both.
      const pR = side.sameFaceAround(tR, win.releaseSeS);
      const pC = side.sameFaceAround(tC, win.catchSeS);
      est.predictedFaceP = pR * pC + (1 - pR) * (1 - pC);
    }
  }
  return { ...est, flags: [...new Set(flags)].sort() };
}
