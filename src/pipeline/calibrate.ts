/**
 * Calibration of a study from its own clips (DESIGN §5): per clip the container rate, the stated rate, the
 * rate gravity implies, the scale, the camera roll, the depth change and the dropped frames; per study the
 * medians and the spread, and the rate gravity implies for the whole study (the median over the clips that
 * measured it). `measure --calibration` can adopt it for clips without a stated rate.
 */
import type { TossRow } from '../dataset/index.ts';

export interface ClipCalibration {
  file: string;
  toss_id: string;
  status: string;
  container_fps: number | null;
  stated_fps: number | null;
  fps_source: string | null;
  gravity_fps: number | null;
  gravity_fps_se: number | null;
  fps_mismatch: boolean;
  px_per_m: number | null;
  px_per_m_se: number | null;
  camera_roll_deg: number | null;
  depth_change_m: number | null;
  scale_change_ratio: number | null;
  frames_dropped: number | null;
}

export interface StudyCalibration {
  clips: number;
  /** Median over the clips that measured it; the rate `--fps-from-gravity` adopts. */
  gravity_fps_median: number | null;
  /** Robust spread (1.4826 · MAD) of gravity_fps over the clips. */
  gravity_fps_spread: number | null;
  px_per_m_median: number | null;
  camera_roll_deg_median: number | null;
  depth_change_m_range: [number, number] | null;
  frames_dropped_total: number;
  fps_mismatch_clips: number;
}

export interface Calibration {
  format: 'tossmeter-calibration';
  version: 1;
  gravity_m_s2: number;
  study: StudyCalibration;
  per_clip: ClipCalibration[];
}

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Builds the calibration of a measured study from its toss rows. Pure. */
export function calibrationFromTosses(tosses: readonly TossRow[], gravity: number): Calibration {
  const perClip: ClipCalibration[] = tosses.map((t) => ({
    file: String(t.file),
    toss_id: String(t.toss_id),
    status: String(t.status),
    container_fps: num(t.container_fps),
    stated_fps: t.fps_source === 'container' ? null : num(t.capture_fps),
    fps_source: typeof t.fps_source === 'string' ? t.fps_source : null,
    gravity_fps: num(t.gravity_fps),
    gravity_fps_se: num(t.gravity_fps_se),
    fps_mismatch: String(t.flags ?? '').split(';').includes('fps_mismatch'),
    px_per_m: num(t.px_per_m),
    px_per_m_se: num(t.px_per_m_se),
    camera_roll_deg: num(t.camera_roll_deg),
    depth_change_m: num(t.depth_change_m),
    scale_change_ratio: num(t.scale_change_ratio),
    frames_dropped: num(t.frames_dropped),
  }));
  const pick = (key: keyof ClipCalibration) => perClip.map((c) => c[key]).filter((v): v is number => typeof v === 'number');
  const gfps = pick('gravity_fps');
  const gMed = median(gfps);
  const spread = gMed === null ? null : 1.4826 * (median(gfps.map((v) => Math.abs(v - gMed))) ?? 0);
  const depth = pick('depth_change_m');
  return {
    format: 'tossmeter-calibration',
    version: 1,
    gravity_m_s2: gravity,
    study: {
      clips: perClip.length,
      gravity_fps_median: gMed,
      gravity_fps_spread: spread,
      px_per_m_median: median(pick('px_per_m')),
      camera_roll_deg_median: median(pick('camera_roll_deg')),
      depth_change_m_range: depth.length ? [Math.min(...depth), Math.max(...depth)] : null,
      frames_dropped_total: pick('frames_dropped').reduce((a, b) => a + b, 0),
      fps_mismatch_clips: perClip.filter((c) => c.fps_mismatch).length,
    },
    per_clip: perClip,
  };
}

/** A fixed-width text table of the calibration (our own labels). */
export function calibrationTable(cal: Calibration): string {
  const f = (v: number | null, d: number) => (v === null ? '–' : v.toFixed(d));
  const head = ['clip', 'container fps', 'stated fps', 'gravity fps', '± se', 'px/m', 'roll °', 'depth Δ m', 'dropped', 'check'];
  const rows = cal.per_clip.map((c) => [
    c.file, f(c.container_fps, 2), f(c.stated_fps, 1), f(c.gravity_fps, 1), f(c.gravity_fps_se, 1), f(c.px_per_m, 1),
    f(c.camera_roll_deg, 2), f(c.depth_change_m, 3), c.frames_dropped === null ? '–' : String(c.frames_dropped),
    c.status === 'failed' ? 'failed' : c.fps_mismatch ? 'RATE MISMATCH' : 'ok',
  ]);
  const s = cal.study;
  rows.push(['study (median)', '', '', f(s.gravity_fps_median, 1), f(s.gravity_fps_spread, 1), f(s.px_per_m_median, 1),
    f(s.camera_roll_deg_median, 2), s.depth_change_m_range ? `${f(s.depth_change_m_range[0], 3)}..${f(s.depth_change_m_range[1], 3)}` : '–',
    String(s.frames_dropped_total), `${s.fps_mismatch_clips} mismatched`]);
  const all = [head, ...rows];
  const w = head.map((_, j) => Math.max(...all.map((r) => r[j].length)));
  return all.map((r) => r.map((c, j) => (j === 0 ? c.padEnd(w[j]) : c.padStart(w[j]))).join('  ')).join('\n') + '\n';
}
