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
   * `mask` must hold the foreground of this frame on the updated rows. Mutates the model only.
   */
  update(frame: Uint8Array, prev: Uint8Array, mask: Uint8Array, gain: number, window: PixelWindow, exclude: PixelWindow | null, rowStep?: number, rowPhase?: number): void;
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
    update(frame, prev, mask, gain, window, exclude, rowStep = 1, rowPhase = 0) {
      const inv = 1 / gain;
      const ex0 = exclude ? exclude.x0 : 0, ex1 = exclude ? exclude.x1 : 0;
      const ey0 = exclude ? exclude.y0 : 0, ey1 = exclude ? exclude.y1 : 0;
      for (let y = window.y0; y < window.y1; y++) {
        if (rowStep > 1 && y % rowStep !== rowPhase) continue;
        const row = y * width;
        const rowExcluded = y >= ey0 && y < ey1;
        for (let x = window.x0; x < window.x1; x++) {
          if (rowExcluded && x >= ex0 && x < ex1) continue;
          const i = row + x;
          const f = frame[i];
          if (mask[i] === 0) {
            data[i] += rate * (f * inv - data[i]);
            still[i] = 0;
          } else {
            const d = f - prev[i];
            if (d <= staticGray && d >= -staticGray) {
              if (++still[i] >= staticFrames) {
                data[i] = f * inv;
                still[i] = 0;
              }
            } else still[i] = 0;
          }
        }
      }
    },
  };
}
