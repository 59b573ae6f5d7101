/**
 * A strip of a few frames of one clip, cropped around the coin, with the fitted ellipse of `frames.csv` drawn on
 * each: quality control you can see. Frames are decoded once (gray), only the wanted ones are kept, and decoding
 * stops after the last one. Each crop is enlarged with a bicubic kernel to `displayPx · drawScale` pixels and
 * the ellipse is drawn at that resolution as an SVG overlay composited by sharp, so it stays sharp at 2x.
 *
 * Geometry: image coordinates put the origin at the centre of the top-left pixel, so pixel i covers
 * [i − ½, i + ½); in a crop starting at pixel (x0, y0) enlarged by s, the point (x, y) lands at
 * ((x − x0 + ½)·s, (y − y0 + ½)·s). `angle_deg` turns the major axis from +x towards +y, which is SVG's
 * `rotate()` direction in its y-down frame.
 */
import sharp from 'sharp';
import type { FrameRow } from '../dataset/index.ts';
import { decodeFrames } from '../video/index.ts';

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** One picture of the strip. */
export interface StripImage {
  /** Frame index in the clip. */
  readonly frame: number;
  /** Clip time (s), when the frame row has one. */
  readonly tS: number | null;
  /** True when the frame lies in the flight window. */
  readonly inFlight: boolean;
  /** `data:image/png;base64,…` */
  readonly dataUri: string;
  /** Display size in CSS px (the PNG has `displayPx · drawScale` pixels a side). */
  readonly displayPx: number;
}

/** The square crop of the image: top-left pixel and side, in image pixels. */
export interface CropBox {
  readonly left: number;
  readonly top: number;
  readonly side: number;
}

/** Options of {@link frameStrip}. */
export interface FrameStripOptions {
  /** Frames in the strip; default 6. */
  readonly count?: number;
  /** Displayed side of each picture in CSS px; default 150. */
  readonly displayPx?: number;
  /** Drawing resolution over the display size (≥ 2 keeps the ellipse sharp on high-density screens); default 2. */
  readonly drawScale?: number;
  /** Stops the decode. */
  readonly signal?: AbortSignal;
}

const hasEllipse = (f: FrameRow): boolean =>
  f.detected === true && [f.cx_px, f.cy_px, f.major_px, f.minor_px, f.angle_deg].every((v) => num(v) !== null) && num(f.major_px)! > 0;

/**
 * Picks up to `count` frames spread evenly (by index) over the in-flight frames with an ellipse, or over all
 * frames with an ellipse when none is in flight. Returns them sorted by frame.
 */
export function pickStripFrames(frames: readonly FrameRow[], count = 6): FrameRow[] {
  const withEllipse = frames.filter(hasEllipse).sort((a, b) => num(a.frame)! - num(b.frame)!);
  const flying = withEllipse.filter((f) => f.in_flight === true);
  const pool = flying.length > 0 ? flying : withEllipse;
  if (pool.length <= count) return pool;
  const picked = new Set<number>();
  for (let i = 0; i < count; i++) picked.add(Math.round((i * (pool.length - 1)) / (count - 1 || 1)));
  return [...picked].sort((a, b) => a - b).map((i) => pool[i]);
}

/**
 * The square crop around the coin: side 2.2 × the largest major axis among `picked` (at least 32 px, at most
 * the image's smaller side), centred on the frame's ellipse and moved inside the image.
 */
export function cropAround(frame: FrameRow, picked: readonly FrameRow[], width: number, height: number): CropBox {
  const major = Math.max(...picked.map((f) => num(f.major_px)!));
  const side = Math.max(1, Math.min(width, height, Math.max(32, Math.ceil(2.2 * major))));
  const clamp = (v: number, hi: number): number => Math.min(Math.max(v, 0), hi);
  const left = clamp(Math.round(num(frame.cx_px)! - side / 2 + 0.5), width - side);
  const top = clamp(Math.round(num(frame.cy_px)! - side / 2 + 0.5), height - side);
  return { left, top, side };
}

/**
 * The SVG overlay (outPx × outPx) drawing a frame's fitted ellipse in a crop enlarged to `outPx`: a dark halo
 * under a bright line, and a small cross at the centre. Line widths are in output pixels.
 */
export function ellipseOverlaySvg(frame: FrameRow, crop: CropBox, outPx: number): string {
  const s = outPx / crop.side;
  const cx = (num(frame.cx_px)! - crop.left + 0.5) * s;
  const cy = (num(frame.cy_px)! - crop.top + 0.5) * s;
  const rx = (num(frame.major_px)! / 2) * s; // FULL axes in frames.csv: halve for radii
  const ry = (num(frame.minor_px)! / 2) * s;
  const angle = num(frame.angle_deg)!;
  const w = Math.max(1.5, outPx / 150);
  const f = (v: number): string => v.toFixed(3);
  const shape = (stroke: string, width: number): string =>
    `<ellipse cx="${f(cx)}" cy="${f(cy)}" rx="${f(rx)}" ry="${f(ry)}" transform="rotate(${f(angle)} ${f(cx)} ${f(cy)})" fill="none" stroke="${stroke}" stroke-width="${f(width)}"/>` +
    `<path d="M${f(cx - 3 * w)} ${f(cy)}H${f(cx + 3 * w)}M${f(cx)} ${f(cy - 3 * w)}V${f(cy + 3 * w)}" stroke="${stroke}" stroke-width="${f(width)}"/>`;
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${outPx}" height="${outPx}" viewBox="0 0 ${outPx} ${outPx}">` +
    shape('rgba(0,0,0,0.55)', 2.4 * w) + shape('#FFD23F', w) + '</svg>';
}

/**
 * Decodes `file` once and returns the strip of up to `count` frames of `frames` (that clip's frame rows),
 * each cropped around the coin with its ellipse drawn, as PNG data URIs. Frames without an ellipse are not shown.
 *
 * @throws VideoError when the clip cannot be decoded
 */
export async function frameStrip(file: string, frames: readonly FrameRow[], options: FrameStripOptions = {}): Promise<StripImage[]> {
  const count = options.count ?? 6;
  const displayPx = options.displayPx ?? 150;
  const outPx = Math.round(displayPx * (options.drawScale ?? 2));
  const picked = pickStripFrames(frames, count);
  if (picked.length === 0) return [];
  const wanted = new Map(picked.map((f) => [num(f.frame)!, f]));
  const last = Math.max(...wanted.keys());
  const images: StripImage[] = [];
  for await (const decoded of decodeFrames(file, { pixFmt: 'gray', signal: options.signal })) {
    const row = wanted.get(decoded.index);
    if (row !== undefined) {
      const crop = cropAround(row, picked, decoded.width, decoded.height);
      const enlarged = await sharp(decoded.data, { raw: { width: decoded.width, height: decoded.height, channels: 1 } })
        .extract({ left: crop.left, top: crop.top, width: crop.side, height: crop.side })
        .resize(outPx, outPx, { kernel: 'cubic' })
        .toColourspace('srgb')
        .raw()
        .toBuffer({ resolveWithObject: true });
      const png = await sharp(enlarged.data, { raw: { width: enlarged.info.width, height: enlarged.info.height, channels: enlarged.info.channels } })
        .composite([{ input: Buffer.from(ellipseOverlaySvg(row, crop, outPx)), left: 0, top: 0 }])
        .png({ compressionLevel: 9 })
        .toBuffer();
      images.push({
        frame: decoded.index,
        tS: num(row.t_s),
        inFlight: row.in_flight === true,
        dataUri: `data:image/png;base64,${png.toString('base64')}`,
        displayPx,
      });
    }
    if (decoded.index >= last) break; // stops ffmpeg: the rest of the clip is not needed
  }
  return images;
}
