import type { PixelWindow } from './image.ts';

/** Options of {@link createBackgroundModel}. */
export interface BackgroundOptions {
  /** Running-average rate per frame for pixels that are not foreground (default 0.02). */
  readonly rate?: number;
  /**
   * Frames a foreground pixel must stay unchanged (|Δ| ≤ `staticGray` between consecutive
   * frames) before it is absorbed into the background (default 10). Clears ghosts: the
   * place the coin or the hand left, which still differs from an old model.
   */
  readonly staticFrames?: number;
  /** Gray-level change still counted as unchanged for `staticFrames` (default 6). */
  readonly staticGray?: number;
}

/** A per-pixel background estimate (gray levels as float) with selective update. */
export interface BackgroundModel {
  readonly data: Float32Array;
  /** Sets the model to the per-pixel median of the given frames (all `width·height`). */
  initFromFrames(frames: readonly Uint8Array[]): void;
  /**
   * Updates the model inside `window`, skipping the rectangle `exclude` (the coin):
   * non-foreground pixels move towards `frame / gain` by `rate`; foreground pixels that
   * stayed unchanged against `prev` for `staticFrames` frames are replaced by `frame / gain`.
   * With `rowStep` > 1 only rows y ≡ rowPhase (mod rowStep) are updated (a cheaper
   * update spread over frames; static absorption then counts updates, not frames).
   * `mask` must hold the foreground of this frame on the updated rows, or be null with `thresholdGray` given: the
   * foreground test of `foregroundMask` (|frame − gain·model| > thresholdGray) is then made here, on the updated
   * pixels only, which saves a pass over them. Mutates the model only.
   */
  update(frame: Uint8Array, prev: Uint8Array, mask: Uint8Array | null, gain: number, window: PixelWindow, exclude: PixelWindow | null, rowStep?: number, rowPhase?: number, thresholdGray?: number): void;
}

/**
 * Background model of a fixed camera: initialised from the robust per-pixel median of
 * the first frames, then updated selectively (running average away from the foreground,
 * absorption of foreground that stopped changing).
 *
 * Median initialisation and selective running-average update are common practice, no source.
 */
export function createBackgroundModel(width: number, height: number, opts: BackgroundOptions = {}): BackgroundModel {
  const rate = opts.rate ?? 0.02;
  const staticFrames = opts.staticFrames ?? 10;
  const staticGray = opts.staticGray ?? 6;
  const n = width * height;
  const data = new Float32Array(n);
  const still = new Uint8Array(n);
  /** Foreground pixel i: absorbed once it stayed within `staticGray` of `prev` for `staticFrames` updates (inlined by V8). */
  const absorb = (frame: Uint8Array, prev: Uint8Array, inv: number, i: number): void => {
    const f = frame[i];
    const dp = f - prev[i];
    if (dp <= staticGray && dp >= -staticGray) {
      if (++still[i] >= staticFrames) {
        data[i] = f * inv;
        still[i] = 0;
      }
    } else still[i] = 0;
  };
  /**
   * Pixels [i0, i1) of one row: running average away from the foreground (`mask` 0, or with `mask` null the test
   * |f − gain·model| ≤ thr), absorption of foreground that stayed within `staticGray` of `prev` for `staticFrames` updates.
   * One loop for each kind of foreground test (a test chosen inside the loop ran at half the speed in isolation), with
   * the running average written out in it: it runs over a quarter of every searched frame and the whole tracking window.
   */
  const updateRun = (
    frame: Uint8Array, prev: Uint8Array, mask: Uint8Array | null, gain: number, thr: number, inv: number, i0: number, i1: number,
  ): void => {
    const d = data;
    const st = still;
    if (mask === null) {
      for (let i = i0; i < i1; i++) {
        const f = frame[i];
        const b = d[i];
        const e = f - gain * b;
        // !(|e| > thr), NaN included, without the call.
        if (!(e > thr || e < -thr)) {
          d[i] = b + rate * (f * inv - b);
          st[i] = 0;
        } else absorb(frame, prev, inv, i);
      }
      return;
    }
    for (let i = i0; i < i1; i++) {
      const f = frame[i];
      const b = d[i];
      if (mask[i] === 0) {
        d[i] = b + rate * (f * inv - b);
        st[i] = 0;
      } else absorb(frame, prev, inv, i);
    }
  };
  return {
    data,
    initFromFrames(frames) {
      const k = frames.length;
      const buf = new Float64Array(k);
      for (let i = 0; i < n; i++) {
        // Insertion sort of k (a handful of) values.
        for (let j = 0; j < k; j++) {
          const v = frames[j][i];
          let q = j;
          while (q > 0 && buf[q - 1] > v) { buf[q] = buf[q - 1]; q--; }
          buf[q] = v;
        }
        data[i] = k % 2 === 1 ? buf[(k - 1) / 2] : 0.5 * (buf[k / 2 - 1] + buf[k / 2]);
      }
      still.fill(0);
    },
    update(frame, prev, mask, gain, window, exclude, rowStep = 1, rowPhase = 0, thresholdGray = Number.NaN) {
      const inv = 1 / gain;
      if (mask === null && !Number.isFinite(thresholdGray)) throw new Error('background update: no mask and no threshold');
      const run = (i0: number, i1: number): void => updateRun(frame, prev, mask, gain, thresholdGray, inv, i0, i1);
      const ex0 = exclude ? exclude.x0 : 0, ex1 = exclude ? exclude.x1 : 0;
      const ey0 = exclude ? exclude.y0 : 0, ey1 = exclude ? exclude.y1 : 0;
      const { x0, x1 } = window;
      // First row of the window on the phase, then every rowStep-th row.
      const step = rowStep > 1 ? rowStep : 1;
      if (step > 1 && !(rowPhase >= 0 && rowPhase < step)) return; // no row y has y mod rowStep = rowPhase
      let yStart = window.y0;
      if (step > 1) yStart += (((rowPhase - yStart) % step) + step) % step;
      for (let y = yStart; y < window.y1; y += step) {
        const row = y * width;
        if (y >= ey0 && y < ey1 && ex1 > ex0) {
          // The excluded columns cut the row in two runs.
          run(row + x0, row + Math.min(x1, Math.max(x0, ex0)));
          run(row + Math.max(x0, Math.min(x1, ex1)), row + x1);
        } else run(row + x0, row + x1);
      }
    },
  };
}
