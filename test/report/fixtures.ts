/**
 * An invented study for the report tests (officials' academy trainees T01..T04; every value made up here, not
 * measured): toss rows and frame rows written with `writeDataset`, and optionally small lossless clips whose
 * frames show the coin as a filled ellipse exactly where the frame rows say, so overlays can be checked.
 * Flight is ballistic (height u·τ − g·τ²/2; common practice, no source).
 */
import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { FRAME_FIELDS, TOSS_FIELDS, writeDataset, type FrameRow, type TossRow } from '../../src/dataset/index.ts';
import { halfTurns, sameSideVertical } from '../../src/physics/index.ts';
import { encodeFrames } from '../../src/video/index.ts';

export const G = 9.80665;
export const FPS = 240;
export const IMAGE = { width: 320, height: 400 } as const;
export const PX_PER_M = 900;
export const COIN_PX = 0.02426 * PX_PER_M;

/** Options of {@link makeStudy}. */
export interface StudyFixtureOptions {
  /** Number of tosses; default 24. */
  readonly tosses?: number;
  /** Tosser id for toss i; default T01..T04 in turn. */
  readonly tosser?: (i: number) => string;
  /** Write clips for the first `clips` tosses (into `<root>/clips`); default 0. */
  readonly clips?: number;
  /** Camera roll in degrees written into the rows and applied to the positions; default 0. */
  readonly rollDeg?: number;
  /** Frames written per toss (null: all tosses get frames); default all. */
  readonly framesFor?: (i: number) => boolean;
}

/** A made-up study in a fresh temp folder: `<root>/dataset` (the dataset) and `<root>/clips`. */
export interface StudyFixture {
  readonly root: string;
  readonly datasetDir: string;
  readonly clipsDir: string;
  readonly tosses: TossRow[];
  readonly frames: FrameRow[];
  readonly cleanup: () => Promise<void>;
}

function emptyRow<T>(fields: readonly { name: string }[]): T {
  return Object.fromEntries(fields.map((f) => [f.name, null])) as T;
}

/** Status of toss i: every 7th flagged (from 3), every 11th failed (from 5), the rest ok. */
export function statusOf(i: number): 'ok' | 'flagged' | 'failed' {
  if (i % 11 === 5) return 'failed';
  if (i % 7 === 3) return 'flagged';
  return 'ok';
}

/** Launch speed (m/s), spin (rev/s) and precession (deg) of toss i: deterministic and spread over the plane. */
export function motionOf(i: number): { u: number; spin: number; psiDeg: number } {
  const a = (i * 0.6180339887) % 1;
  const b = (i * 0.7548776662 + 0.3) % 1;
  return { u: 1.6 + 1.4 * a, spin: 12 + 30 * b, psiDeg: 30 + ((i * 37) % 59) };
}

/** Renders one gray frame: background gradient, the coin as a filled ellipse (full axes, angle from +x to +y). */
export function renderFrame(f: FrameRow): Uint8Array {
  const { width, height } = IMAGE;
  const img = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) img[y * width + x] = 40 + Math.round((30 * y) / height);
  if (f.detected !== true) return img;
  const cx = f.cx_px as number, cy = f.cy_px as number;
  const a = (f.major_px as number) / 2, b = Math.max(0.5, (f.minor_px as number) / 2);
  const t = ((f.angle_deg as number) * Math.PI) / 180;
  const c = Math.cos(t), s = Math.sin(t);
  for (let y = Math.max(0, Math.floor(cy - a - 1)); y <= Math.min(height - 1, Math.ceil(cy + a + 1)); y++) {
    for (let x = Math.max(0, Math.floor(cx - a - 1)); x <= Math.min(width - 1, Math.ceil(cx + a + 1)); x++) {
      const dx = x - cx, dy = y - cy;
      const p = (dx * c + dy * s) / a, q = (-dx * s + dy * c) / b;
      if (p * p + q * q <= 1) img[y * width + x] = 215;
    }
  }
  return img;
}

/** Writes the invented study. */
export async function makeStudy(options: StudyFixtureOptions = {}): Promise<StudyFixture> {
  const n = options.tosses ?? 24;
  const tosserOf = options.tosser ?? ((i: number) => `T0${(i % 4) + 1}`);
  const rollRad = ((options.rollDeg ?? 0) * Math.PI) / 180;
  const root = await mkdtemp(join(tmpdir(), 'tossmeter-report-'));
  const datasetDir = join(root, 'dataset');
  const clipsDir = join(root, 'clips');
  await mkdir(clipsDir, { recursive: true });
  const tosses: TossRow[] = [];
  const frames: FrameRow[] = [];
  for (let i = 0; i < n; i++) {
    const status = statusOf(i);
    const id = `toss${String(i).padStart(3, '0')}`;
    const row = emptyRow<TossRow>(TOSS_FIELDS);
    const start = i % 3 === 0 ? 'tails' : 'heads';
    const other = start === 'heads' ? 'tails' : 'heads';
    Object.assign(row, { toss_id: id, file: `${id}.mkv`, tosser: tosserOf(i), status, start_face: start, observed_face: (i * i + (i % 4)) % 7 < 2 ? other : start });
    if (status === 'failed') {
      Object.assign(row, { flags: 'not_measured', error: `clip "${id}.mkv": the coin was never found <in any frame>` });
      tosses.push(row);
      continue;
    }
    const { u, spin, psiDeg } = motionOf(i);
    const flight = (2 * u) / G;
    const changes = Math.floor(Math.abs(halfTurns(u, 2 * Math.PI * spin, G)) + 0.5);
    const same = changes % 2 === 0;
    const release = 10 / FPS;
    Object.assign(row, {
      flags: status === 'flagged' ? 'spin_aliased;track_lost' : null,
      capture_fps: FPS, fps_source: 'manifest', gravity_fps: FPS * 1.002, px_per_m: PX_PER_M, scale_source: 'coin_diameter',
      release_t_s: release, catch_t_s: release + flight, flight_time_s: flight, launch_speed_m_s: u, apex_height_m: (u * u) / (2 * G),
      spin_rev_s: spin, precession_deg: psiDeg, momentum_tilt_deg: 85, face_changes: changes,
      predicted_face: same ? start : other, same_side_predicted: same, p_same_side: sameSideVertical((psiDeg * Math.PI) / 180),
      fit_rms: 0.02, camera_roll_deg: options.rollDeg ?? 0, coin_diameter_mm: 24.26, coin_thickness_mm: 1.75,
      frames_total: 0, frames_tracked: 0,
    });
    if (options.framesFor && !options.framesFor(i)) { tosses.push(row); continue; }
    const total = Math.round(flight * FPS) + 20;
    const x0 = IMAGE.width / 2, y0 = IMAGE.height - 40;
    for (let k = 0; k < total; k++) {
      const t = k / FPS;
      const tau = Math.min(Math.max(t - release, 0), flight);
      const inFlight = t >= release && t <= release + flight;
      const h = (u * tau - 0.5 * G * tau * tau) * PX_PER_M; // px above release
      const theta = 2 * Math.PI * spin * tau;
      const ratio = Math.max(0.1, Math.abs(Math.cos(theta)));
      const f = emptyRow<FrameRow>(FRAME_FIELDS);
      Object.assign(f, {
        toss_id: id, frame: k, t_s: t, detected: true,
        cx_px: x0 + h * Math.sin(rollRad), cy_px: y0 - h * Math.cos(rollRad), // image up is (sin ρ, −cos ρ)
        major_px: COIN_PX, minor_px: COIN_PX * ratio, angle_deg: (20 + 7 * k) % 180, axis_ratio: ratio,
        face_visible: 'unknown', occluded: !inFlight, in_flight: inFlight,
        model_axis_ratio: inFlight ? Math.abs(Math.cos(theta)) : null, residual: inFlight ? ratio - Math.abs(Math.cos(theta)) : null,
        touching_edge: false, method: 'moments',
      });
      frames.push(f);
    }
    Object.assign(row, { frames_total: total, frames_tracked: total });
    tosses.push(row);
  }
  const run = { tool: 'tossmeter', tool_version: '0.0.0-test', options: { input: clipsDir, gravity_m_s2: G }, inputs: tosses.map((t) => ({ file: t.file })) };
  await writeDataset(datasetDir, { tosses, frames, run });
  const withClips = options.clips ?? 0;
  for (const toss of tosses.slice(0, withClips)) {
    const own = frames.filter((f) => f.toss_id === toss.toss_id);
    if (own.length === 0) continue;
    await encodeFrames(join(clipsDir, String(toss.file)), own.map(renderFrame), { ...IMAGE, pixFmt: 'gray', containerFps: 30, codec: 'ffv1' });
  }
  return { root, datasetDir, clipsDir, tosses, frames, cleanup: () => rm(root, { recursive: true, force: true }) };
}
