/** Rows for the dataset tests: every column present, awkward text in the string columns. */
import { FRAME_FIELDS, TOSS_FIELDS, type CellValue, type FrameRow, type TossRow } from '../../src/dataset/index.ts';

/** A toss row with every column null, then `values`. */
export function tossRow(values: Partial<Record<keyof TossRow, CellValue>>): TossRow {
  return { ...(Object.fromEntries(TOSS_FIELDS.map((f) => [f.name, null])) as TossRow), ...values };
}

/** A frame row with every column null, then `values`. */
export function frameRow(values: Partial<Record<keyof FrameRow, CellValue>>): FrameRow {
  return { ...(Object.fromEntries(FRAME_FIELDS.map((f) => [f.name, null])) as FrameRow), ...values };
}

/** Text that CSV writers get wrong: delimiters, quotes, line ends, unicode, spreadsheet formulas. */
export const AWKWARD_TEXT = [
  'plain',
  'comma, inside',
  'quote " inside',
  '"fully quoted"',
  'line\nbreak',
  'crlf\r\nbreak',
  '  leading and trailing spaces  ',
  'unicode: Zürich – 東京 – ✓ – 😀',
  '=SUM(A1:A9)',
  '+1',
  '-2+3',
  '@cmd',
  '\tTAB',
  "'=already quoted",
  "''-two quotes",
  "'apostrophe first",
  "it's",
  ';semicolon;',
];

/** Three tosses (ok, flagged, failed) with full and empty values. */
export function sampleTosses(): TossRow[] {
  return [
    tossRow({
      toss_id: 'T01-001', file: 'clips/T01-001.mp4', tosser: 'T01', status: 'ok', flags: null, error: null,
      capture_fps: 1000, fps_source: 'manifest', gravity_fps: 998.7, px_per_m: 2512.25, scale_source: 'coin_diameter',
      frames_total: 812, frames_tracked: 790, release_t_s: 0.1234, catch_t_s: 0.5678, flight_time_s: 0.4444,
      flight_time_se_s: 0.0004, launch_speed_m_s: 2.18, apex_height_m: 0.2423, spin_rev_s: 38.5, spin_rev_s_se: 0.05,
      precession_deg: 12.5, precession_deg_se: 0.3, momentum_tilt_deg: 81.2, face_changes: 34, start_face: 'heads',
      predicted_face: 'heads', observed_face: 'heads', same_side_predicted: true, p_same_side: 0.5081, fit_rms: 0.0123,
      focal_px: 1850, camera_roll_deg: -0.7, gravity_fps_se: 1.5, px_per_m_se: 3.25, launch_speed_se_m_s: 0.01,
      momentum_tilt_deg_se: 0.4, p_same_side_se: 0.002, coin_diameter_mm: 24.26, coin_thickness_mm: 1.75,
      landing: 'caught', notes: 'first toss, comma, "quotes"',
    }),
    tossRow({
      toss_id: 'T01-002', file: 'clips/T01-002.mp4', tosser: 'T01', status: 'flagged', flags: 'fps_from_container;spin_aliased',
      capture_fps: 240, fps_source: 'container', frames_total: 300, frames_tracked: 0, spin_rev_s: 1e-7,
      release_t_s: 0.1 + 0.2, launch_speed_m_s: -0, same_side_predicted: false, face_changes: -3,
      predicted_face: 'tails', notes: '=HYPERLINK("http://example.invalid")',
    }),
    tossRow({
      toss_id: 'T02-001', file: 'clips/T02 001.mov', tosser: 'T02', status: 'failed', flags: 'not_measured',
      error: 'The clip could not be decoded:\nffmpeg said "moov atom not found".', gravity_fps: Number.NaN,
      px_per_m: Number.POSITIVE_INFINITY, notes: 'unicode Zürich – 東京 😀',
    }),
  ];
}

/** Frames for the sample tosses, with every awkward text in turn in `toss_id`-independent columns. */
export function sampleFrames(): FrameRow[] {
  const rows: FrameRow[] = [];
  for (let frame = 0; frame < 40; frame++) {
    const detected = frame % 7 !== 3;
    rows.push(frameRow({
      toss_id: 'T01-001', frame, t_s: frame / 1000, detected,
      cx_px: detected ? 320.25 + frame * 1.5 : null, cy_px: detected ? 240.5 - frame * 0.75 : null,
      major_px: detected ? 61.0 : null, minor_px: detected ? 61 * Math.abs(Math.cos(frame / 3)) : null,
      angle_deg: detected ? (frame * 17) % 180 : null, axis_ratio: detected ? Math.abs(Math.cos(frame / 3)) : null,
      face_visible: frame % 2 === 0 ? 'heads' : 'unknown', occluded: frame < 5, in_flight: frame >= 5,
      model_axis_ratio: Math.abs(Math.cos(frame / 3 + 0.01)), residual: detected ? -0.001 * frame : null,
      touching_edge: false, method: detected ? 'moments' : 'none',
    }));
  }
  rows.push(frameRow({ toss_id: 'T01-002', frame: 0, detected: false, method: 'none' }));
  return rows;
}
