/**
 * The in-flight window of one toss: the frames whose centre a single free-flight model explains, and the
 * release and catch times with sub-frame precision, where the track stops following that model.
 *
 * Free flight seen by a fixed camera moves the image centre along a conic close to a parabola in time
 * (exactly one for a coin at constant depth). The window grows from a seed in the middle of the clean track,
 * frame by frame, while each next detected frame agrees with the model refitted so far; it stops at the first
 * run of disagreeing frames (the hand carries or stops the coin). The release is then the knot of a hinge
 * model fitted to the deviation of the frames around that end: zero in flight, c2 (t_r − t)² in the hand before
 * the release (the push changes the acceleration, not the velocity), c1 (t − t_c) + c2 (t − t_c)² after a catch
 * (a catch can also stop the coin at once) — a one-knot regression
 * spline whose knot is found by a profile search ("Fitting segmented curves whose join points have to be
 * estimated", Journal of the American Statistical Association 61(316), 1966. DOI 10.1080/01621459.1966.10480920).
 */
import { robustLinearFit } from './robustLinearFit.ts';
import { hypot2 } from '../hypot.ts';

export interface TrackPoint {
  tS: number;
  x: number;
  y: number;
  /** Detected in this frame at all. */
  detected: boolean;
  /** A clean measurement (isolated blob, not touching the hand or the edge). */
  clean: boolean;
  /**
   * The centre can place the release: a clean blob, or the coin carried by the hand and block matched (it moves
   * rigidly with the fingers). Not an outline fit of the coin merged with the fingers: its centre errors reach
   * several px and mimic the hand's push. Default: `clean`. A frame that places the release but is not clean is
   * taken as carried: block matched from a patch placed by the track, so its centre may carry a constant offset
   * (the same one for every such frame), which the release knot fits as a free term.
   */
  placesRelease?: boolean;
  /**
   * Block matched with the hand as one rigid patch after the coin stopped turning (the coin held after the catch):
   * its path is exact up to a constant offset per run of consecutive held frames (the frame the run started from
   * was placed by a fit), which the catch knot fits as a free term. Default false.
   */
  held?: boolean;
}

export type FlightWindow =
  | {
      ok: true;
      /** Indices (into the track) of the first and last in-flight frames. */
      first: number;
      last: number;
      releaseTS: number;
      catchTS: number;
      releaseSeS: number;
      catchSeS: number;
      /** False when the track is already in flight at its first detected frame (the release is outside the clip). */
      releaseSeen: boolean;
      catchSeen: boolean;
      /** Robust scale of the centre residuals in flight, px. */
      sigmaPx: number;
    }
  | { ok: false; reason: string };

/**
 * Least number of detected frames after the window for a catch to be seen: the coin is followed in the hand that
 * stopped it (on rendered clips every placed catch had 9 or more; the coin hidden by the fingers, 0 to 3).
 */
const CATCH_FOLLOW_FRAMES = 5;

/** Least number of held frames (see `TrackPoint.held`) by which alone the catch knot is placed. */
const HELD_KNOT_FRAMES = 4;

const design = (t: number, t0: number): number[] => [1, t - t0, (t - t0) ** 2];

function fitAxis(points: TrackPoint[], idx: number[], t0: number, key: 'x' | 'y') {
  return robustLinearFit(
    idx.map((i) => design(points[i].tS, t0)),
    idx.map((i) => points[i][key]),
    { minScale: 0.05 },
  );
}

function predict(coef: number[], t: number, t0: number): number {
  const d = t - t0;
  return coef[0] + coef[1] * d + coef[2] * d * d;
}

/**
 * Sum of squares of `y` explained by the least-squares fit on the columns `cols` (each of length y.length):
 * yᵀX (XᵀX)⁻¹ Xᵀy, by Gaussian elimination on the (small) normal equations; a column that adds
 * nothing new (pivot below 1e-12 of its diagonal) is dropped.
 */
function explainedSS(cols: Float64Array[], y: Float64Array, n: number): number {
  const m = cols.length;
  const a: number[][] = [];
  const b: number[] = [];
  for (let r = 0; r < m; r++) {
    a.push(new Array<number>(m).fill(0));
    let s = 0;
    for (let i = 0; i < n; i++) s += cols[r][i] * y[i];
    b.push(s);
    for (let c = 0; c <= r; c++) {
      let v = 0;
      for (let i = 0; i < n; i++) v += cols[r][i] * cols[c][i];
      a[r][c] = v;
      a[c][r] = v;
    }
  }
  // Cholesky-like elimination in place: explained = Σ (bₖ')² / pivotₖ over the kept columns.
  const diag = a.map((row, i) => row[i]);
  let explained = 0;
  for (let k = 0; k < m; k++) {
    const piv = a[k][k];
    if (!(piv > 1e-12 * Math.max(diag[k], 1e-300))) continue;
    explained += (b[k] * b[k]) / piv;
    for (let r = k + 1; r < m; r++) {
      const f = a[r][k] / piv;
      if (f === 0) continue;
      for (let c = k; c < m; c++) a[r][c] -= f * a[k][c];
      b[r] -= f * b[k];
    }
  }
  return explained;
}

/** Frames after the first clean frame on the flight curve beyond which a release placed by carried frames is not believed. */
const RELEASE_AFTER_FREE = 2;

/**
 * Knot time of the hinge deviation model at one end of the window, searched on a grid of 1/50 frame between
 * `loS` and `hiS`, with its standard error from the profile of the residual sum of squares (Δ = σ²).
 * `side` −1: the model is non-zero before the knot (release); +1: after it (catch). `carriedRun[i]` (≥ 0) marks points
 * whose centre may carry an unknown offset (per axis), the same within a run of consecutive carried frames (one
 * patch carried from frame to frame), each fitted as a free term: the knot is then placed by
 * the shape of the deviation (where its slope vanishes: the velocities match at the release), not its level.
 */
function hingeKnot(
  ts: number[],
  dev: [number, number][],
  loS: number,
  hiS: number,
  side: -1 | 1,
  sigma: number,
  frameS: number,
  linear: boolean,
  edgeTS: number,
  carriedRun: number[],
  weight?: Float64Array,
): { tS: number; seS: number; rss: number; dof: number; hinged: boolean } {
  const step = frameS / 50;
  const n = ts.length;
  // One offset column per run of carried frames (each run starts from its own patch).
  const runs = Math.max(0, ...carriedRun) + 1;
  const offs = Array.from({ length: runs }, (_, r) => Float64Array.from(carriedRun, (c) => (c === r ? 1 : 0)));
  const withOffset = runs > 0 && carriedRun.some((c) => c >= 0);
  const h1 = new Float64Array(n), h2 = new Float64Array(n);
  const w = weight ?? new Float64Array(n).fill(1);
  const ys = [Float64Array.from(dev, (d, i) => w[i] * d[0]), Float64Array.from(dev, (d, i) => w[i] * d[1])];
  if (weight) for (const o of offs) for (let i = 0; i < n; i++) o[i] *= w[i];
  let total = 0;
  for (const y of ys) for (let i = 0; i < n; i++) total += y[i] * y[i];
  // Without a hinge: the offset alone (or nothing).
  const base = withOffset ? total - explainedSS(offs, ys[0], n) - explainedSS(offs, ys[1], n) : total;
  const profile: { t: number; rss: number }[] = [];
  for (let tk = loS; tk <= hiS + 1e-12; tk += step) {
    for (let i = 0; i < n; i++) {
      const h = Math.max(0, side * (ts[i] - tk)) / frameS;
      h1[i] = w[i] * h;
      h2[i] = w[i] * h * h;
    }
    // Least squares of dev ≈ [c0 offset] + [c1 h] + c2 h², h = max(0, side·(t − tk)).
    const cols = [...(withOffset ? offs : []), ...(linear ? [h1] : []), h2];
    let rss = total;
    for (const y of ys) rss -= explainedSS(cols, y, n);
    profile.push({ t: tk, rss });
  }
  let best = profile[0];
  for (const p of profile) if (p.rss < best.rss) best = p;
  // The hinge must earn its place: with no frames off the free-flight curve (the coin first seen already in
  // flight) it would only fit noise. Without a drop of the residual sum of squares by more than 9σ² (3σ), the
  // end of the free-flight frames stands.
  const dof = Math.max(1, 2 * ts.length - (linear ? 5 : 3) - (withOffset ? 2 * runs : 0));
  if (base - best.rss < 9 * sigma * sigma) return { tS: edgeTS, seS: frameS, rss: best.rss, dof, hinged: false };
  const limit = best.rss + sigma * sigma;
  let lo = best.t;
  let hi = best.t;
  for (const p of profile) {
    if (p.rss <= limit) {
      lo = Math.min(lo, p.t);
      hi = Math.max(hi, p.t);
    }
  }
  // The profile's width assumes the hinge explains the end to the noise of the flight. Where it does not (the
  // centres merged with the fingers carry errors of their own), the width is scaled by √(reduced χ²) of the best
  // hinge: a release placed by a pattern the model does not fit is uncertain, and says so.
  const chi2 = best.rss / (dof * sigma * sigma);
  return { tS: best.t, seS: Math.max((hi - lo) / 2, step) * Math.max(1, Math.sqrt(chi2)), rss: best.rss, dof, hinged: true };
}

/** A known depth trend of the coin: Z(t) = Z̄ (1 + rate (t − tRefS)), about the principal point (px). */
export interface DepthTrendHint {
  /** 1/s. */
  rate: number;
  tRefS: number;
  principalX: number;
  principalY: number;
}

/**
 * Finds the in-flight window of `points` (one per frame, in time order, frame interval `frameS`).
 * With `depth` (the coin moving towards or away from the camera), the image positions are first brought to a
 * constant depth: through a pinhole x − x₀ = f X / Z, so (x − x₀)(1 + k (t − t̄)) = f X / Z̄ is a quadratic in
 * time for free flight (X quadratic, Z linear; common practice, no source), while x itself is not (a 25% change
 * of depth bends the image track by several px).
 * Returns `{ ok: false }` when there are fewer than 8 clean detections or no seed fits free flight.
 */
export function findFlightWindow(points: TrackPoint[], frameS: number, depth?: DepthTrendHint): FlightWindow {
  if (depth && Number.isFinite(depth.rate) && depth.rate !== 0) {
    points = points.map((p) => {
      const m = 1 + depth.rate * (p.tS - depth.tRefS);
      return { ...p, x: depth.principalX + (p.x - depth.principalX) * m, y: depth.principalY + (p.y - depth.principalY) * m };
    });
  }
  const cleanIdx = points.map((p, i) => (p.detected && p.clean ? i : -1)).filter((i) => i >= 0);
  if (cleanIdx.length < 8) return { ok: false, reason: `only ${cleanIdx.length} clean detections (need 8)` };
  // Seed: up to 15 clean frames around the middle of the clean track.
  const midPos = cleanIdx.length >> 1;
  const half = Math.min(7, midPos);
  let members = cleanIdx.slice(midPos - half, midPos + half + 1);
  const t0 = points[members[Math.floor(members.length / 2)]].tS;
  let fx = fitAxis(points, members, t0, 'x');
  let fy = fitAxis(points, members, t0, 'y');
  if (!fx.ok || !fy.ok) return { ok: false, reason: 'the seed of the flight fit is degenerate' };
  let sigma = Math.max(hypot2(fx.sigma, fy.sigma), 0.3);
  // A robust fit to every clean frame is the better start when the flight is most of the track (the usual case:
  // the hand holds the coin for a fraction of the clip): take it when it explains most clean frames.
  const globalX = fitAxis(points, cleanIdx, t0, 'x');
  const globalY = fitAxis(points, cleanIdx, t0, 'y');
  if (globalX.ok && globalY.ok) {
    const gs = Math.max(hypot2(globalX.sigma, globalY.sigma), 0.3);
    const explained = cleanIdx.filter((i) => {
      const p = points[i];
      return hypot2(p.x - predict(globalX.coef, p.tS, t0), p.y - predict(globalY.coef, p.tS, t0)) < Math.max(5 * gs, 1.0);
    }).length;
    if (explained >= 0.6 * cleanIdx.length) {
      fx = globalX;
      fy = globalY;
      sigma = gs;
    }
  }

  const detected = points.map((p, i) => (p.detected ? i : -1)).filter((i) => i >= 0);
  const seedLo = detected.indexOf(members[0]);
  const seedHi = detected.indexOf(members[members.length - 1]);
  let lo = seedLo;
  let hi = seedHi;
  // Consensus growth: residuals of every detected frame to the current fit; the window is the run of agreeing
  // frames around the seed, where a run of up to `maxMisses` disagreeing detections (edge-on slivers, a frame
  // cut by the border) does not end it; refit on the window's clean agreeing frames; repeat until it settles.
  // Disagreeing clean frames that end the run: 3, or as many as fit in 5 ms (a coin passing edge-on gives a few
  // frames whose centre is less sure; at high rates they are many frames).
  const maxMisses = Math.max(3, Math.ceil(0.005 / frameS));
  for (let round = 0; round < 40; round++) {
    // Reach at most one window length beyond the current window per round, so the fit is never extrapolated far.
    const reach = hi - lo + 1;
    const cx = fx.ok ? fx.coef : null;
    const cy = fy.ok ? fy.coef : null;
    if (!cx || !cy) return { ok: false, reason: 'the flight fit became degenerate' };
    // A frame agrees when its distance to the fit is within 5σ (at least 1 px) plus 4 standard errors of the
    // fit's own prediction there (which grows as the fit is extrapolated beyond its frames).
    const covX = fx.ok ? fx.covariance : null;
    const covY = fy.ok ? fy.covariance : null;
    const predSe = (cov: number[][] | null, t: number) => {
      if (!cov) return 0;
      const d = [1, t - t0, (t - t0) ** 2];
      let v = 0;
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) v += d[a] * d[b] * cov[a][b];
      return Math.sqrt(Math.max(v, 0));
    };
    const agree = detected.map((i) => {
      const p = points[i];
      const limit = Math.max(5 * sigma, 1.0) + 4 * hypot2(predSe(covX, p.tS), predSe(covY, p.tS));
      return hypot2(p.x - predict(cx, p.tS, t0), p.y - predict(cy, p.tS, t0)) < limit;
    });
    let newLo = seedLo;
    let newHi = seedHi;
    // Only clean detections end the run: a disagreeing edge-on sliver or outline fit is passed over.
    for (let j = seedLo - 1, misses = 0; j >= Math.max(0, lo - reach) && misses < maxMisses; j--) {
      if (agree[j]) {
        newLo = j;
        misses = 0;
      } else if (points[detected[j]].clean) misses++;
    }
    for (let j = seedHi + 1, misses = 0; j < Math.min(detected.length, hi + 1 + reach) && misses < maxMisses; j++) {
      if (agree[j]) {
        newHi = j;
        misses = 0;
      } else if (points[detected[j]].clean) misses++;
    }
    const settled = newLo === lo && newHi === hi && round > 2;
    lo = newLo;
    hi = newHi;
    // Refit on every clean agreeing frame (not only those of the run), so the support can outgrow the run.
    const inliers = detected.filter((i, k) => agree[k] && points[i].clean);
    if (inliers.length < 6) break;
    fx = fitAxis(points, inliers, t0, 'x');
    fy = fitAxis(points, inliers, t0, 'y');
    if (!fx.ok || !fy.ok) return { ok: false, reason: 'the flight fit became degenerate' };
    sigma = Math.max(hypot2(fx.sigma, fy.sigma), 0.3);
    if (settled) break;
  }
  // Final fit on the members, excluding a margin at each end (they may touch the hand).
  let margin = 0;
  const finalFit = (): boolean => {
    members = detected.slice(lo, hi + 1);
    const cleanMembers = members.filter((i) => points[i].clean);
    // The window's ends include the frames where the hand's push (or the catch) had not yet moved the coin off the
    // free-flight curve by more than the noise; keep them out of the final flight fit and let the knot search reach
    // into the window by as many frames.
    margin = Math.min(15, Math.floor(cleanMembers.length / 10));
    const inner = cleanMembers.length > 12 ? cleanMembers.slice(margin, cleanMembers.length - margin) : cleanMembers;
    fx = fitAxis(points, inner, t0, 'x');
    fy = fitAxis(points, inner, t0, 'y');
    if (!fx.ok || !fy.ok) return false;
    sigma = Math.max(hypot2(fx.sigma, fy.sigma), 0.05);
    return true;
  };
  if (!finalFit()) return { ok: false, reason: 'the flight fit is degenerate' };
  const offLimit = () => Math.max(3, 6 * sigma);
  const offBy = (i: number) => hypot2(
    points[i].x - predict(fx.ok ? fx.coef : [0, 0, 0], points[i].tS, t0),
    points[i].y - predict(fy.ok ? fy.coef : [0, 0, 0], points[i].tS, t0),
  );
  // A clean coin (an isolated blob, touching nothing) is not in the hand: the latest clean frame after the window
  // that the free-flight curve still explains (within the catch's limit below) is still in flight, whatever the
  // outline fits between say (merged with the reaching fingers, they can leave the curve by px). The window is
  // extended to it.
  let lastOn = hi;
  for (let j = hi + 1; j < detected.length; j++) if (points[detected[j]].clean && offBy(detected[j]) <= offLimit()) lastOn = j;
  if (lastOn > hi) {
    hi = lastOn;
    if (!finalFit()) return { ok: false, reason: 'the flight fit is degenerate' };
  }
  const first = detected[lo];
  const last = detected[hi];
  // Robust scale of the centres that are not clean (outline fits, edge-on slivers) inside the window.
  const mergedDev = detected.slice(lo, hi + 1).filter((i) => !points[i].clean).map(offBy).sort((a, b) => a - b);
  const mergedSigma = mergedDev.length >= 5
    ? Math.max(sigma, (Math.SQRT2 * mergedDev[mergedDev.length >> 1]) / 1.1774) : 3 * sigma;
  // The release is seen when a frame before the window can place it (see `placesRelease`).
  const placesRelease = (i: number) => points[i].placesRelease ?? points[i].clean;
  const releaseSeen = detected.slice(0, lo).some(placesRelease);
  // The catch is seen when the track after the window clearly leaves the free-flight curve: at least 3 detected
  // frames off it by more than max(3 px, 6σ), among at least CATCH_FOLLOW_FRAMES detected after the window (a coin
  // caught is followed in the hand). A track that merely ends (the coin hidden behind the fingers before they touch
  // it, a few outline fits merged with them first), or goes on near the curve, shows where the coin was last seen,
  // not where the hand stopped it.
  let offCurve = 0;
  for (let j = hi + 1; j < detected.length; j++) if (offBy(detected[j]) > offLimit()) offCurve++;
  const catchSeen = detected.length - 1 - hi >= CATCH_FOLLOW_FRAMES && offCurve >= 3;

  const knot = (side: -1 | 1): { tS: number; seS: number; byHeld: boolean } => {
    const endIdx = side < 0 ? lo : hi;
    const span: number[] = [];
    for (let k = -(margin + 12); k <= margin + 12; k++) {
      const j = endIdx + k;
      if (j < 0 || j >= detected.length) continue;
      // The release is placed by clean and carried frames only, inside the window too: an outline fit of the coin
      // merged with the fingers that follow it for a moment after the release carries an error that mimics a push.
      if (side < 0 && !placesRelease(detected[j])) continue;
      span.push(detected[j]);
    }
    const edgeT = points[detected[endIdx]].tS;
    // The nearest frame outside the window that enters the fit bounds the search (before the window: the nearest
    // that places the release; frames between it and the window say nothing about where the hand let go).
    let outIdx = Math.max(0, Math.min(detected.length - 1, endIdx + side));
    if (side < 0) while (outIdx > 0 && !placesRelease(detected[outIdx])) outIdx--;
    const outsideT = points[detected[outIdx]].tS;
    const reachS = (margin + 2) * frameS;
    const loS = Math.min(edgeT, outsideT) - (side < 0 ? 2 * frameS : reachS);
    let hiS = Math.max(edgeT, outsideT) + (side > 0 ? 2 * frameS : reachS);
    const spanAll = span.slice();
    if (side > 0) {
      // The held path follows the hinge's quadratic while the hand slows the coin, not once the coin rests in it
      // (its deviation from the flight then grows linearly). Held frames are kept up to the first whose speed has
      // fallen under half the flight's there: at a constant deceleration that is half-way to rest.
      const speedOf = (coef: number[], t: number) => coef[1] + 2 * coef[2] * (t - t0);
      for (let k = 1; k < span.length; k++) {
        const a = points[span[k - 1]], b = points[span[k]];
        if (!b.held || !a.detected || !(b.tS > a.tS)) continue;
        const v = hypot2(b.x - a.x, b.y - a.y) / (b.tS - a.tS);
        const tm = (a.tS + b.tS) / 2;
        const vf = hypot2(speedOf(fx.ok ? fx.coef : [0, 0, 0], tm), speedOf(fy.ok ? fy.coef : [0, 0, 0], tm));
        if (v < 0.5 * vf) { span.length = k + 1; break; }
      }
      // The held path can start later than the frame after the window (the coin lost for a few frames as the
      // fingers close): the knot may lie anywhere up to its last frames.
      for (const i of span) if (points[i].held) hiS = Math.max(hiS, points[i].tS - 2 * frameS);
    }
    /** The hinge knot over the frames `use` (indices into `points`), with (`linear`) or without a velocity jump. */
    const fit = (use: number[], linear: boolean, fromS = loS) => {
      const ts = use.map((i) => points[i].tS);
      // Runs of consecutive carried (release) or held (catch) frames, numbered 0, 1, …; −1 for the others.
      let run = -1;
      let prevCarried = -2;
      const carried = use.map((i) => {
        const inRun = side < 0 ? placesRelease(i) && !points[i].clean : points[i].held === true;
        if (!inRun) return -1;
        if (i !== prevCarried + 1) run++;
        prevCarried = i;
        return run;
      });
      const dev = use.map((i): [number, number] => [
        points[i].x - predict(fx.ok ? fx.coef : [0, 0, 0], points[i].tS, t0),
        points[i].y - predict(fy.ok ? fy.coef : [0, 0, 0], points[i].tS, t0),
      ]);
      // At the catch, outline fits of the coin merged with the reaching fingers carry errors of their own: they are
      // weighed by their own scatter in flight (σ over their robust scale), so a few of them cannot place the knot.
      // Held frames (the coin moving rigidly with the hand) are exact up to their run's offset: full weight.
      const weight = side > 0
        ? Float64Array.from(use, (i) => (points[i].clean || points[i].held === true ? 1 : sigma / mergedSigma)) : undefined;
      return hingeKnot(ts, dev, fromS, hiS, side, sigma, frameS, linear, edgeT, carried, weight);
    };
    // At the release the coin leaves the hand with the hand's velocity (only the acceleration jumps: a quadratic
    // hinge); at the catch the hand can stop it at once (the velocity jumps too: linear and quadratic terms).
    const heldIdx = side > 0 ? span.filter((i) => points[i].held) : [];
    /** The last clean frame before `tS` still on the free-flight curve (−∞ if none). */
    const lastFreeBefore = (tS: number): number => {
      let last = Number.NEGATIVE_INFINITY;
      for (const i of detected) if (points[i].tS < tS && points[i].clean && offBy(i) <= offLimit()) last = points[i].tS;
      return last;
    };
    const cleanOrHeld = (i: number) => points[i].clean || points[i].held === true;
    // Held frames slow from the first (the hand stopped the coin at once) are not a slowing path: the knot with the
    // velocity jump, over the clean frames and all held ones, lies where the held path meets the flight's.
    if (heldIdx.length < HELD_KNOT_FRAMES && spanAll.filter((i) => points[i].held).length >= HELD_KNOT_FRAMES) {
      // Where clean frames just before are already cut by the fingers the knot moves into them: its error is at least
      // the spread of a position uniform between it and the held path's first frame.
      const firstHeldT = Math.min(...spanAll.filter((i) => points[i].held).map((i) => points[i].tS));
      const k = fit(spanAll.filter(cleanOrHeld), true, Math.max(loS, Math.min(lastFreeBefore(firstHeldT) - 1.5 * frameS, firstHeldT - 2 * frameS)));
      return { ...k, seS: Math.max(k.seS, (firstHeldT - k.tS) / Math.sqrt(12)), byHeld: false };
    }
    if (heldIdx.length < HELD_KNOT_FRAMES) return { ...fit(span, side > 0), byHeld: false };
    // With a held path, the outline fits merged with the closing fingers (lagging or leading the coin by px) are
    // left out. A held run's level is free, so after the knot only its shape counts. The hand that closes on the
    // coin slows it over mm (the velocity goes on): the hinge without a velocity jump is tried first, over the
    // clean and the held frames, against the one with the jump. The jump's extra term always lowers the residual a
    // little (it also fits clean blobs whose lower edge the fingers already cover, 1–2 px on rendered clips), so
    // the bar is the residual's own spread, 3 standard deviations of a χ² with its degrees of freedom. Within it
    // the knot is placed by the held path alone, where its velocity meets the flight's (the clean frames just
    // before would only bend it); beyond it (an abrupt stop) by the model with the jump, where the held path
    // meets the flight's. Common practice, no source.
    // With a held run's free level, clean frames that the fingers already bias by 1–2 px can pass for the start of
    // the catch: the knot is searched from 1.5 frames before the last clean frame still on the free-flight curve (a
    // coin touching nothing is in flight).
    const cleanHeld = span.filter(cleanOrHeld);
    const fromS = Math.max(loS, Math.min(lastFreeBefore(points[heldIdx[0]].tS) - 1.5 * frameS, points[heldIdx[0]].tS - 2 * frameS));
    const free = fit(cleanHeld, true, fromS);
    const smooth = fit(cleanHeld, false, fromS);
    const bar = Math.max(9, 3 * Math.sqrt(2 * free.dof)) * sigma * sigma;
    if (!(smooth.hinged && smooth.rss - free.rss <= bar)) return { ...free, byHeld: false };
    const byHeld = fit(heldIdx, false, fromS);
    return byHeld.hinged ? { ...byHeld, byHeld: true } : { ...smooth, byHeld: false };
  };
  let rel = releaseSeen ? knot(-1) : { tS: points[first].tS, seS: frameS };
  // A coin seen touching nothing on its flight curve is in flight: a release placed more than RELEASE_AFTER_FREE
  // frames after the first such frame that follows the carried frames says that these were not the coin (a patch
  // that slipped onto the fingers while the coin flew on: rendered, 6 frames after it, where every release placed
  // right was 2.7 frames or more before it). The release is then not seen.
  let releaseSeenHere = releaseSeen;
  if (releaseSeen) {
    let lastCarried = -1;
    for (const i of detected) {
      if (points[i].tS > rel.tS) break;
      if (placesRelease(i) && !points[i].clean) lastCarried = i;
    }
    const firstFree = lastCarried < 0 ? -1 : detected.find((i) => i > lastCarried && points[i].clean && offBy(i) <= offLimit()) ?? -1;
    if (firstFree >= 0 && rel.tS > points[firstFree].tS + RELEASE_AFTER_FREE * frameS) {
      releaseSeenHere = false;
      rel = { tS: points[first].tS, seS: frameS };
    }
  }
  let cat = catchSeen ? knot(1) : { tS: points[last].tS, seS: frameS, byHeld: false };
  if (catchSeen && !cat.byHeld) {
    // Between the last clean frame on the curve (the coin touching nothing) and the knot, only fits of the coin
    // merged with the fingers place the catch, and their errors are not noise (they lag or lead the coin by px).
    // The clean frames only say that the hand took the coin somewhere in that gap: the standard deviation of a
    // uniform position over it, gap/√12, is the least standard error the knot gets.
    let lastClean = Number.NEGATIVE_INFINITY;
    for (const i of detected) {
      if (points[i].tS > cat.tS) break;
      if (points[i].clean && offBy(i) <= offLimit()) lastClean = points[i].tS;
    }
    if (Number.isFinite(lastClean)) cat = { ...cat, seS: Math.max(cat.seS, (cat.tS - lastClean) / Math.sqrt(12)) };
  }
  return {
    ok: true,
    first,
    last,
    releaseTS: rel.tS,
    catchTS: cat.tS,
    releaseSeS: rel.seS,
    catchSeS: cat.seS,
    releaseSeen: releaseSeenHere,
    catchSeen,
    sigmaPx: sigma,
  };
}
