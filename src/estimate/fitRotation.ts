/**
 * Least-squares fit of the torque-free precession model to the coin's image moments over the in-flight
 * frames: spectral start for the spin rate, a coarse grid over the orientation, Levenberg–Marquardt from
 * the best starts, then Tukey reweighting of frames that the model does not explain.
 *
 * Observables are sign-free (the second-moment matrix is quadratic in n), so the fit is blind to the flips
 * of one view; the caller fixes the branch with the start face.
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007. DOI 10.1137/S0036144504446436 (the model)
 * [2] "Studies in astronomical time series analysis. II", The Astrophysical Journal 263, 1982 (periodogram)
 */
import { levenbergMarquardt } from './levenbergMarquardt.ts';
import { lombScargle } from './periodogram.ts';
import { silhouetteVariancesInto } from './silhouetteMoments.ts';
import { P, PARAM_COUNT, lFrame, lFramePartials, modelMoments, sqrtModelMomentsGradInto, type RotationFrame } from './rotationModel.ts';
import { hypot3 } from '../hypot.ts';

/** Most frames one step of the search looks at (thinned evenly beyond this). */
const SEARCH_FRAMES = 160;

/** The search grid over the orientation, degrees: precession ψ, and the direction (α, γ) of the angular momentum. */
const GRID_PSI = [20, 40, 55, 70, 85];
const GRID_ALPHA = [15, 35, 55, 75, 88];
const GRID_GAMMA = [0, 30, 60, 90, 120, 150];
/** Short fits started per spin candidate, from its best grid points that are not neighbours of one another. */
const STARTS_PER_CANDIDATE = 4;

/** cos and sin of the grid's 12 starting phases kπ/6. */
const PHASE_COS = Float64Array.from({ length: 12 }, (_, k) => Math.cos((k * Math.PI) / 6));
const PHASE_SIN = Float64Array.from({ length: 12 }, (_, k) => Math.sin((k * Math.PI) / 6));

/** How much worse than the best solution so far a seed may fit a shorter window and still be carried on. */
const PRUNE_FACTOR = 3;

/** Highest spin rate searched by default, rev/s: well above hand tosses (tens of rev/s; common practice, no source). */
export const MAX_SPIN_REV_S = 150;

export interface RotationFitOptions {
  /** Coin thickness over radius, h / a. */
  tau: number;
  /** Capture rate, frames/s (sets the highest frequency searched). */
  captureFps: number;
  /** Reference time for the phase and the depth trend (mean time of the frames), s. */
  tMidS: number;
  /** Per-frame prior weights (default 1). */
  weights?: ArrayLike<number>;
  /** Highest spin rate searched, rev/s (default: a quarter of the capture rate, the aliasing limit, at most MAX_SPIN_REV_S). */
  maxSpinRevS?: number;
}

export type RotationFit =
  | {
      ok: true;
      params: Float64Array;
      standardErrors: Float64Array;
      /** Covariance of the parameters (row-major, PARAM_COUNT²), or null when singular. */
      covariance: number[][] | null;
      /** RMS of the normalised residuals (units of the face-on variance). */
      rms: number;
      converged: boolean;
      /** Final per-frame weights (0: rejected as an outlier). */
      weights: Float64Array;
      /** Spin-rate candidates tried, rev/s. */
      candidatesRevS: number[];
    }
  | { ok: false; reason: string };

/** Square root of the 2×2 symmetric positive semi-definite matrix [[xx, xy], [xy, yy]], closed form. */
function sqrtm2(xx: number, xy: number, yy: number): [number, number, number] {
  const sd = Math.sqrt(Math.max(xx * yy - xy * xy, 0));
  const t = Math.sqrt(Math.max(xx + yy + 2 * sd, 1e-300));
  return [(xx + sd) / t, xy / t, (yy + sd) / t];
}

function median(values: number[]): number {
  const s = Float64Array.from(values).sort(); // numeric order, faster than a comparator
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : 0.5 * (s[mid - 1] + s[mid]);
}

/** Peak frequencies (Hz) of the periodogram, highest power first, at most `count`. */
function spectralPeaks(frames: RotationFrame[], norm: number, fmaxHz: number, count: number): number[] {
  const t = frames.map((f) => f.tS);
  const span = t[t.length - 1] - t[0];
  const y1 = frames.map((f) => (f.sxx - f.syy) / norm);
  const y2 = frames.map((f) => (2 * f.sxy) / norm);
  const y3 = frames.map((f) => (f.sxx + f.syy) / norm);
  const df = 1 / (8 * span);
  const fmin = Math.max(1 / span, 2);
  const freqs: number[] = [];
  for (let f = fmin; f <= fmaxHz; f += df) freqs.push(f);
  const power = lombScargle(t, [y1, y2, y3], freqs);
  const peaks: { f: number; p: number }[] = [];
  for (let i = 1; i < freqs.length - 1; i++) {
    if (power[i] > power[i - 1] && power[i] >= power[i + 1]) peaks.push({ f: freqs[i], p: power[i] });
  }
  peaks.sort((a, b) => b.p - a.p);
  // Keep distinct peaks (not side lobes of a stronger one).
  const kept: number[] = [];
  for (const pk of peaks) {
    if (kept.every((f) => Math.abs(f - pk.f) > 3 / span)) kept.push(pk.f);
    if (kept.length >= count) break;
  }
  return kept;
}

/**
 * Fits the precession model to `frames` (at least 12, spanning at least one observable period).
 * Returns `{ ok: false, reason }` when there is too little data or no start converges.
 */
export function fitRotation(frames: RotationFrame[], opts: RotationFitOptions): RotationFit {
  if (frames.length < 12) return { ok: false, reason: `only ${frames.length} usable in-flight frames (need 12)` };
  const tMid = opts.tMidS;
  const tau = opts.tau;
  const majorSemi = frames.map((f) => {
    const half = 0.5 * (f.sxx + f.syy);
    const diff = Math.sqrt(0.25 * (f.sxx - f.syy) ** 2 + f.sxy * f.sxy);
    return 2 * Math.sqrt(half + diff); // semi-major, px (full major is 4·√λ)
  });
  const radius0 = median(majorSemi);
  if (!(radius0 > 0)) return { ok: false, reason: 'no coin size in the frames' };
  const norm = radius0 * radius0 / 4;
  // Spin rates searched: up to the aliasing limit (a quarter of the capture rate) and at most MAX_SPIN_REV_S.
  const fmax = Math.min(opts.captureFps / 2, 2 * (opts.maxSpinRevS ?? Math.min(opts.captureFps / 4, MAX_SPIN_REV_S)) * 1.05);
  const peaks = spectralPeaks(frames, norm, fmax, 3);
  const candidates: number[] = [];
  for (const f of peaks) {
    for (const c of [f, f / 2]) {
      if (c > 0.5 && candidates.every((x) => Math.abs(x - c) / c > 0.02)) candidates.push(c);
    }
  }
  if (candidates.length === 0) return { ok: false, reason: 'no periodic signal in the axis ratio' };

  const prior = opts.weights ?? new Float64Array(frames.length).fill(1);
  const weights = Float64Array.from(prior);
  // Residuals over the frames with indices lo, lo + stride, … below hi: the search works on growing windows of
  // time, thinned to at most SEARCH_FRAMES frames; the final refinements use every frame (stride 1).
  let lo = 0;
  let hi = frames.length;
  let stride = 1;
  const used = () => Math.ceil((hi - lo) / stride);
  // The search runs on the orthographic view (every frame seen along the optical axis), whose cost surface is
  // smoother; the perspective view of each frame is switched on for the final refinement.
  const orthographic = frames.map((f) => ({ ...f, geom: { d: [0, 0, 1], ex: [1, 0, 0], ey: [0, 1, 0], jac: [1, 0, 0, 1] } as RotationFrame['geom'] }));
  const perspective = frames.some((f) => f.geom.d[2] !== 1);
  let view: RotationFrame[] = perspective ? orthographic : frames;
  const obsSqrt = frames.map((f) => sqrtm2(f.sxx, f.sxy, f.syy));
  const normSqrt = radius0 / 2;
  const residuals = (p: Float64Array, out: Float64Array): void => {
    const basis = lFrame(p[P.alpha], p[P.gamma]);
    for (let i = lo, k = 0; i < hi; i += stride, k += 3) {
      const f = view[i];
      const mm = modelMoments(p, f, tau, tMid, basis);
      // Residuals of the matrix square root (the "semi-axis" matrix, px): an outline error of the same size in px
      // weighs the same on a face-on and on an edge-on frame (the entries of Σ itself grow with the coin's size).
      const [qxx, qxy, qyy] = sqrtm2(mm.sxx, mm.sxy, mm.syy);
      const w = Math.sqrt(weights[i]) / normSqrt;
      const o = obsSqrt[i];
      out[k] = w * (o[0] - o[2] - (qxx - qyy));
      out[k + 1] = w * 2 * (o[1] - qxy);
      out[k + 2] = w * (o[0] + o[2] - (qxx + qyy));
    }
  };
  // The Jacobian of `residuals`, row-major (3 rows per frame, PARAM_COUNT columns), analytic: one pass over
  // the frames instead of the 2·PARAM_COUNT passes of central differences.
  const grad = new Float64Array(3 + 3 * PARAM_COUNT);
  const jacobian = (p: Float64Array, out: Float64Array): void => {
    const basis = lFramePartials(p[P.alpha], p[P.gamma]);
    const nP = PARAM_COUNT;
    for (let i = lo, k = 0; i < hi; i += stride, k += 3) {
      sqrtModelMomentsGradInto(p, view[i], tau, tMid, basis, grad);
      const w = Math.sqrt(weights[i]) / normSqrt;
      const r0 = k * nP;
      const r1 = r0 + nP;
      const r2 = r1 + nP;
      for (let j = 0; j < nP; j++) {
        const dxx = grad[3 + j];
        const dxy = grad[3 + nP + j];
        const dyy = grad[3 + 2 * nP + j];
        out[r0 + j] = -w * (dxx - dyy);
        out[r1 + j] = -w * 2 * dxy;
        out[r2 + j] = -w * (dxx + dyy);
      }
    }
  };
  const scratch = new Float64Array(frames.length * 3);
  const costOf = (p: Float64Array): number => {
    residuals(p, scratch);
    let s = 0;
    for (let i = 0; i < used() * 3; i++) s += scratch[i] * scratch[i];
    return s;
  };
  // Is every frame of the search view seen along the optical axis (d = ẑ, J = I)? Then the grid's cost has the
  // closed form below.
  const orthographicView = view.every((f) => {
    const g = f.geom;
    return g.d[0] === 0 && g.d[1] === 0 && g.d[2] === 1 && g.ex[0] === 1 && g.ex[1] === 0 && g.ex[2] === 0 && g.ey[0] === 0 && g.ey[1] === 1 && g.ey[2] === 0 &&
      g.jac[0] === 1 && g.jac[1] === 0 && g.jac[2] === 0 && g.jac[3] === 1;
  });
  const sil = { lambdaMajor: 0, lambdaMinor: 0 };
  // cos and sin of the spin phase Ω·(t − tMid) of the window's frames (set per spin candidate, see `setGridPhases`):
  // the grid's starting phases φ0 are then added by angle addition, without a cosine per frame and grid point.
  let gridCos = new Float64Array(0);
  let gridSin = new Float64Array(0);
  const setGridPhases = (omega: number): void => {
    const count = used();
    if (gridCos.length < count) {
      gridCos = new Float64Array(count);
      gridSin = new Float64Array(count);
    }
    for (let i = lo, j = 0; i < hi; i += stride, j++) {
      const a = omega * (frames[i].tS - tMid);
      gridCos[j] = Math.cos(a);
      gridSin[j] = Math.sin(a);
    }
  };
  /**
   * `costOf` of a grid point (radius radius0, no depth trend, no outline growth or blur, rim share 1) in the
   * orthographic view, without the general model's per-frame geometry: the operations of modelMoments with d = ẑ
   * and J = I (where n·d = n_z, p = (n_x, n_y) and Σ = Σ_v exactly), so the same cost up to rounding (the phase
   * comes by angle addition from `setGridPhases`).
   */
  const gridCostOrthographic = (psi: number, basis: { l: number[]; e1: number[]; e2: number[] }, cosPhi0: number, sinPhi0: number): number => {
    const { l, e1, e2 } = basis;
    const cp = Math.cos(psi);
    const sp = Math.sin(psi);
    const s2 = radius0 * radius0;
    let sum = 0;
    for (let i = lo, j = 0; i < hi; i += stride, j++) {
      const c = (gridCos[j] * cosPhi0 - gridSin[j] * sinPhi0) * sp;
      const s = (gridSin[j] * cosPhi0 + gridCos[j] * sinPhi0) * sp;
      const px = cp * l[0] + c * e1[0] + s * e2[0];
      const py = cp * l[1] + c * e1[1] + s * e2[1];
      const nz = cp * l[2] + c * e1[2] + s * e2[2];
      silhouetteVariancesInto(Math.abs(nz), tau, sil);
      const pp = px * px + py * py;
      let vxx = s2 * sil.lambdaMajor;
      let vyy = vxx;
      let vxy = 0;
      if (pp > 1e-14) {
        const k = (s2 * (sil.lambdaMinor - sil.lambdaMajor)) / pp;
        vxx += k * px * px;
        vyy += k * py * py;
        vxy = k * px * py;
      }
      const sd = Math.sqrt(Math.max(vxx * vyy - vxy * vxy, 0));
      const t = Math.sqrt(Math.max(vxx + vyy + 2 * sd, 1e-300));
      const qxx = (vxx + sd) / t;
      const qxy = vxy / t;
      const qyy = (vyy + sd) / t;
      const w = Math.sqrt(weights[i]) / normSqrt;
      const o = obsSqrt[i];
      const r0 = w * (o[0] - o[2] - (qxx - qyy));
      const r1 = w * 2 * (o[1] - qxy);
      const r2 = w * (o[0] + o[2] - (qxx + qyy));
      sum += r0 * r0;
      sum += r1 * r1;
      sum += r2 * r2;
    }
    return sum;
  };
  // Windows are centred on the median frame, which lies in the data even when the coin left the frame
  // around the apex (a gap in the middle of the flight).
  // The centre of the longest run of frames without a gap of more than 3 frame intervals.
  let runStart = 0;
  let bestRun = { from: 0, to: 0 };
  for (let i = 1; i <= frames.length; i++) {
    if (i === frames.length || frames[i].tS - frames[i - 1].tS > 3 / opts.captureFps) {
      if (i - runStart > bestRun.to - bestRun.from) bestRun = { from: runStart, to: i };
      runStart = i;
    }
  }
  const tCentre = frames[(bestRun.from + bestRun.to) >> 1].tS;
  /** Frames within ±halfS of the window centre. */
  const setWindow = (halfS: number): void => {
    lo = 0;
    while (lo < frames.length - 1 && frames[lo].tS < tCentre - halfS) lo++;
    hi = frames.length;
    while (hi > lo + 1 && frames[hi - 1].tS > tCentre + halfS) hi--;
    stride = Math.max(1, Math.ceil((hi - lo) / SEARCH_FRAMES));
  };
  const fullHalf = Math.max(tCentre - frames[0].tS, frames[frames.length - 1].tS - tCentre);

  const lower = new Float64Array(PARAM_COUNT).fill(-Infinity);
  const upper = new Float64Array(PARAM_COUNT).fill(Infinity);
  lower[P.radiusPx] = radius0 * 0.5;
  upper[P.radiusPx] = radius0 * 2;
  lower[P.depthRate] = -3;
  upper[P.depthRate] = 3;
  lower[P.psi] = 0;
  // ψ runs over [0, π] (ψ and π − ψ with ℓ reversed are the same motion): a bound at 90° would be a stationary
  // point of the cost by that symmetry, where the search could not leave it.
  upper[P.psi] = Math.PI;
  lower[P.omega] = 0;
  lower[P.deltaPx] = -4;
  upper[P.deltaPx] = 4;
  lower[P.blur] = 0;
  upper[P.blur] = 1.5;
  // The rim's share is held at 1 (the coin's known thickness): left free it trades off against the scale and
  // the outline growth and the scale wanders by several per cent.
  lower[P.rim] = 1;
  upper[P.rim] = 1;
  const stepScale = [radius0, 1, 1, 1, 1, 100, 1, 1, 1, 1];
  const fitFrom = (start: Float64Array, iterations: number) =>
    levenbergMarquardt(residuals, start, { m: used() * 3, lower, upper, stepScale, maxIterations: iterations, jacobian });

  // 1. For each spin candidate, a grid over orientation and phase on a short window (about 1.5 observable
  //    periods each side of the reference time, where a slightly wrong rate costs little phase), then a short
  //    Levenberg–Marquardt run from the best grid points that are not neighbours of one another.
  const deg = Math.PI / 180;
  /** A start of the grid: orientation and precession in degrees, the rest at the default size, no growth, no blur. */
  const gridPoint = (psi: number, alpha: number, gamma: number, omega: number, phi0: number): Float64Array => {
    const p = new Float64Array(PARAM_COUNT);
    p[P.radiusPx] = radius0;
    p[P.alpha] = alpha * deg;
    p[P.gamma] = gamma * deg;
    p[P.psi] = psi * deg;
    p[P.omega] = omega;
    p[P.phi0] = phi0;
    p[P.rim] = 1;
    return p;
  };
  const seeds: { cost: number; p: Float64Array; half: number }[] = [];
  for (const revS of candidates) {
    const half = Math.min(fullHalf, Math.max(1.5 / revS, 12 / opts.captureFps));
    setWindow(half);
    const omega = 2 * Math.PI * revS;
    const grid: { cost: number; i: number; j: number; g: number; k: number }[] = [];
    if (orthographicView) setGridPhases(omega);
    for (let i = 0; i < GRID_PSI.length; i++) {
      for (let j = 0; j < GRID_ALPHA.length; j++) {
        for (let g = 0; g < GRID_GAMMA.length; g++) {
          const basis = lFrame(GRID_ALPHA[j] * deg, GRID_GAMMA[g] * deg);
          for (let k = 0; k < 12; k++) {
            const cost = orthographicView
              ? gridCostOrthographic(GRID_PSI[i] * deg, basis, PHASE_COS[k], PHASE_SIN[k])
              : costOf(gridPoint(GRID_PSI[i], GRID_ALPHA[j], GRID_GAMMA[g], omega, (k * Math.PI) / 6));
            grid.push({ cost, i, j, g, k });
          }
        }
      }
    }
    grid.sort((a, b) => a.cost - b.cost);
    // The best grid points that are not neighbours of a better one (one step or less in every coordinate, γ and
    // the phase cyclic): neighbours of one grid minimum mostly lead to the same solution.
    const cyclic = (d: number, n: number) => Math.min(Math.abs(d), n - Math.abs(d));
    const chosen: typeof grid = [];
    for (const pt of grid) {
      if (chosen.length >= STARTS_PER_CANDIDATE) break;
      const near = chosen.some((c) => Math.abs(c.i - pt.i) <= 1 && Math.abs(c.j - pt.j) <= 1
        && cyclic(c.g - pt.g, GRID_GAMMA.length) <= 1 && cyclic(c.k - pt.k, 12) <= 1);
      if (!near) chosen.push(pt);
    }
    for (const g of chosen) {
      const r = fitFrom(gridPoint(GRID_PSI[g.i], GRID_ALPHA[g.j], GRID_GAMMA[g.g], omega, (g.k * Math.PI) / 6), 15);
      if (r.ok) seeds.push({ cost: r.cost / Math.max(used(), 1), p: r.params, half });
    }
  }
  seeds.sort((a, b) => a.cost - b.cost);

  /**
   * The least-median criterion for comparing candidate solutions: the median over the window's frames of the
   * residual norm (unweighted). Robust costs with each candidate's own weights cannot be compared: a wrong
   * model can lower its cost by rejecting more frames.
   */
  const medianResidual = (p: Float64Array): number => {
    const saved = Float64Array.from(weights);
    for (let i = lo; i < hi; i++) weights[i] = prior[i];
    residuals(p, scratch);
    weights.set(saved);
    const norms: number[] = [];
    for (let k = 0; k < used(); k++) norms.push(hypot3(scratch[3 * k], scratch[3 * k + 1], scratch[3 * k + 2]));
    return median(norms);
  };

  // Tukey weights of the frames in the current window from the residuals of `p` (scale: MAD of the norms).
  const reweight = (p: Float64Array): void => {
    for (let i = lo; i < hi; i++) weights[i] = prior[i];
    residuals(p, scratch);
    const norms: number[] = [];
    for (let i = lo, k = 0; i < hi; i += stride, k += 3) {
      norms.push(hypot3(scratch[k], scratch[k + 1], scratch[k + 2]) / Math.max(Math.sqrt(prior[i]), 1e-12));
    }
    const scale = Math.max(1.4826 * median(norms), 1e-6);
    for (let i = lo, k = 0; i < hi; i += stride, k++) {
      const u = norms[k] / (4.685 * scale);
      weights[i] = prior[i] * (Math.abs(u) < 1 ? (1 - u * u) ** 2 : 0);
    }
  };

  // 2. Continuation: distinct seeds are refitted, robustly, on windows growing by half until they hold every frame.
  const distinct: typeof seeds = [];
  for (const sd of seeds) {
    const near = distinct.some(
      (d) => Math.abs(d.p[P.omega] - sd.p[P.omega]) / sd.p[P.omega] < 0.01 && Math.abs(d.p[P.psi] - sd.p[P.psi]) < 0.05 && Math.abs(d.p[P.alpha] - sd.p[P.alpha]) < 0.05,
    );
    if (!near) distinct.push(sd);
    if (distinct.length >= 6) break;
  }
  let best: ReturnType<typeof levenbergMarquardt> | null = null;
  let bestCost = Infinity;
  for (const seed of distinct) {
    let p = seed.p;
    let half = seed.half;
    let r: ReturnType<typeof levenbergMarquardt> | null = null;
    while (true) {
      half = Math.min(half * 1.5, fullHalf);
      setWindow(half);
      reweight(p);
      r = fitFrom(p, half >= fullHalf ? 60 : 15);
      if (!r.ok) break;
      p = r.params;
      if (half >= fullHalf) break;
      // A seed that already fits its shorter window PRUNE_FACTOR times worse than the best full-flight solution so
      // far (median residual per frame) is abandoned: a longer window only adds frames for it to miss.
      if (medianResidual(p) > PRUNE_FACTOR * bestCost) {
        r = null;
        break;
      }
    }
    if (!r || !r.ok) continue;
    // Compare candidates by their robust cost with unit weights for the kept frames.
    weights.set(prior);
    const c = medianResidual(r.params);
    if (c < bestCost) {
      bestCost = c;
      best = r;
    }
  }
  lo = 0;
  hi = frames.length;
  stride = 1;
  const m = frames.length * 3;
  if (!best || !best.ok) return { ok: false, reason: 'no start of the rotation fit converged' };
  // Across a long gap (the coin out of the frame near the apex) the phase can slip by whole turns: try the
  // spin rates that differ by k half turns over the distance between the data on the two sides, keep the best.
  let gapAt = -1;
  let gapS = 0;
  for (let i = 1; i < frames.length; i++) {
    const g = frames[i].tS - frames[i - 1].tS;
    if (g > gapS) {
      gapS = g;
      gapAt = i;
    }
  }
  const periodS = (2 * Math.PI) / Math.max(best.params[P.omega], 1e-9);
  if (gapAt > 0 && gapS > periodS) {
    const before = frames.slice(0, gapAt).reduce((s2, f) => s2 + f.tS, 0) / gapAt;
    const after = frames.slice(gapAt).reduce((s2, f) => s2 + f.tS, 0) / (frames.length - gapAt);
    // Half turns: near ψ = 90° the observables repeat every half turn.
    const step = Math.PI / (after - before);
    // On the flight's frames thinned as the search's windows are (at most SEARCH_FRAMES; the continuation's last
    // fit saw the same frames): a slip of whole turns shows on every turn's samples, and the refinements below
    // use every frame.
    stride = Math.max(1, Math.ceil(frames.length / SEARCH_FRAMES));
    weights.set(prior);
    reweight(best.params);
    let bestSlipCost = medianResidual(best.params);
    for (const k of [-4, -3, -2, -1, 1, 2, 3, 4]) {
      const start = Float64Array.from(best.params);
      start[P.omega] += k * step;
      if (!(start[P.omega] > 0)) continue;
      const r = fitFrom(start, 40);
      if (!r.ok) continue;
      const c = medianResidual(r.params);
      if (c < bestSlipCost) {
        bestSlipCost = c;
        best = r;
      }
    }
    stride = 1;
  }
  if (perspective) {
    // Perspective refinement from the orthographic solution and from its mirror image (γ + π), which the
    // orthographic view cannot tell apart but the per-frame rays can.
    view = frames;
    let refined: ReturnType<typeof levenbergMarquardt> | null = null;
    let refinedCost = Infinity;
    for (const dg of [0, Math.PI]) {
      const start = Float64Array.from(best.params);
      start[P.gamma] += dg;
      weights.set(prior);
      reweight(start);
      const r = fitFrom(start, 60);
      if (!r.ok) continue;
      weights.set(prior);
      const c = medianResidual(r.params);
      if (c < refinedCost) {
        refinedCost = c;
        refined = r;
      }
    }
    if (refined) best = refined;
  }
  // Tukey reweighting on per-frame residual norms, twice, refitting from the current best.
  let current = best;
  for (let round = 0; round < 2; round++) {
    const out = new Float64Array(m);
    weights.set(prior);
    residuals(current.params, out);
    const norms: number[] = [];
    for (let i = 0; i < frames.length; i++) {
      norms.push(hypot3(out[3 * i], out[3 * i + 1], out[3 * i + 2]) / Math.max(Math.sqrt(prior[i]), 1e-12));
    }
    const scale = Math.max(1.4826 * median(norms), 1e-6);
    for (let i = 0; i < frames.length; i++) {
      const u = norms[i] / (4.685 * scale);
      weights[i] = prior[i] * (Math.abs(u) < 1 ? (1 - u * u) ** 2 : 0);
    }
    const r = fitFrom(current.params, 100);
    if (!r.ok) break;
    current = r;
  }
  const p = current.params;
  // Canonical form: Ω ≥ 0 (bounded), ψ in [0, π] (fold with `foldedPrecession`), angles wrapped.
  p[P.phi0] = ((p[P.phi0] % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
  return {
    ok: true,
    params: p,
    standardErrors: current.standardErrors,
    covariance: current.covariance ? current.covariance.to2DArray() : null,
    rms: current.rms,
    converged: current.converged,
    weights,
    candidatesRevS: candidates,
  };
}
