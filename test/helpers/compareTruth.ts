/**
 * Compares a measured dataset with the truth files of rendered clips: one row of errors per clip.
 * Used by the end-to-end tests, the accuracy suite and `scripts/accuracy-table.ts`.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { readTosses, type TossRow } from '../../src/dataset/index.ts';
import { parseTruth } from '../../src/synth/truth.ts';

export interface ClipErrors {
  tossId: string;
  status: string;
  flags: string;
  captureFps: number;
  spinRevS: number;
  precessionDeg: number;
  /** Measured minus true; relative errors as fractions. */
  flightTimeFrames: number | null;
  releaseFrames: number | null;
  catchFrames: number | null;
  spinRel: number | null;
  precessionDeg_: number | null;
  tiltDeg: number | null;
  launchRel: number | null;
  pxPerMRel: number | null;
  pSameSide: number | null;
  faceChangesOk: boolean | null;
  predictedFaceOk: boolean | null;
  /** The dataset's own probability that predicted_face is right. */
  predictedFaceP: number | null;
  gravityFpsRel: number | null;
  rollDeg: number | null;
}

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const diff = (a: unknown, b: number): number | null => (num(a) === null ? null : (a as number) - b);
const rel = (a: unknown, b: number): number | null => (num(a) === null ? null : ((a as number) - b) / b);

/** Errors of every toss of `datasetDir` whose clip has a truth file in `clipsDir`. */
export async function compareWithTruth(datasetDir: string, clipsDir: string): Promise<ClipErrors[]> {
  const tosses: TossRow[] = await readTosses(datasetDir);
  const out: ClipErrors[] = [];
  for (const t of tosses) {
    const file = String(t.file);
    const truthPath = join(clipsDir, file.replace(/\.[^.]+$/, '.truth.json'));
    const truth = parseTruth(await readFile(truthPath, 'utf8'));
    const fps = truth.capture_fps;
    out.push({
      tossId: String(t.toss_id),
      status: String(t.status),
      flags: String(t.flags ?? ''),
      captureFps: fps,
      spinRevS: truth.spin_rev_s,
      precessionDeg: truth.precession_deg,
      flightTimeFrames: num(t.flight_time_s) === null ? null : ((t.flight_time_s as number) - truth.flight_time_s) * fps,
      releaseFrames: num(t.release_t_s) === null ? null : ((t.release_t_s as number) - truth.release_t_s) * fps,
      catchFrames: num(t.catch_t_s) === null ? null : ((t.catch_t_s as number) - truth.catch_t_s) * fps,
      spinRel: rel(t.spin_rev_s, truth.spin_rev_s),
      precessionDeg_: diff(t.precession_deg, truth.precession_deg),
      tiltDeg: diff(t.momentum_tilt_deg, truth.momentum_tilt_deg),
      launchRel: rel(t.launch_speed_m_s, truth.launch_speed_m_s),
      pxPerMRel: rel(t.px_per_m, truth.px_per_m),
      pSameSide: diff(t.p_same_side, truth.p_same_side),
      faceChangesOk: num(t.face_changes) === null ? null : t.face_changes === truth.face_changes,
      predictedFaceOk: t.predicted_face === null ? null : t.predicted_face === truth.predicted_face,
      predictedFaceP: num(t.predicted_face_p),
      gravityFpsRel: rel(t.gravity_fps, fps),
      rollDeg: diff(t.camera_roll_deg, truth.camera_roll_deg),
    });
  }
  return out;
}

/** A fixed-width table of the errors, for test output and notes. */
export function errorTable(rows: ClipErrors[]): string {
  const f = (v: number | null, scale: number, digits: number) => (v === null ? '–' : (v * scale).toFixed(digits));
  const b = (v: boolean | null) => (v === null ? '–' : v ? 'ok' : 'WRONG');
  const head = ['toss', 'fps', 'spin', 'psi', 'status', 'flight(fr)', 'release(fr)', 'spin(%)', 'psi(°)', 'tilt(°)', 'launch(%)', 'px/m(%)', 'p_same', 'changes', 'face', 'face_p', 'g_fps(%)', 'roll(°)', 'flags'];
  const lines = rows.map((r) => [
    r.tossId, String(r.captureFps), r.spinRevS.toFixed(1), r.precessionDeg.toFixed(1), r.status,
    f(r.flightTimeFrames, 1, 2), f(r.releaseFrames, 1, 2), f(r.spinRel, 100, 3), f(r.precessionDeg_, 1, 2), f(r.tiltDeg, 1, 2),
    f(r.launchRel, 100, 2), f(r.pxPerMRel, 100, 2), f(r.pSameSide, 1, 4), b(r.faceChangesOk), b(r.predictedFaceOk), f(r.predictedFaceP, 1, 3),
    f(r.gravityFpsRel, 100, 2), f(r.rollDeg, 1, 2), r.flags,
  ]);
  const all = [head, ...lines];
  const widths = head.map((_, j) => Math.max(...all.map((l) => l[j].length)));
  return all.map((l) => l.map((c, j) => c.padStart(widths[j])).join(' ')).join('\n');
}
