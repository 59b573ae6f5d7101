/**
 * The one image record of the project: 8-bit gray, flat, row-major, no padding.
 * Pixel (x, y) is `data[y * width + x]`; x to the right, y down, the origin at the
 * centre of the top-left pixel.
 */
export interface GrayImage {
  /** Gray levels 0..255, `width * height` of them, row after row. */
  readonly data: Uint8Array;
  /** Columns, px. */
  readonly width: number;
  /** Rows, px. */
  readonly height: number;
}

/** A rectangle of pixels, `x0 ≤ x < x1`, `y0 ≤ y < y1` (integer pixel indices). */
export interface PixelWindow {
  readonly x0: number;
  readonly y0: number;
  readonly x1: number;
  readonly y1: number;
}
