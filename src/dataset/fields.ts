/**
 * The dataset's field list: ONE list per table that generates the CSV header,
 * the Parquet schema, the Frictionless Data Package descriptor and the report's labels.
 *
 * Tables are tidy (one row per toss, one row per (toss, frame), one column per quantity),
 * following "Tidy Data", Journal of Statistical Software 59(10), 2014, DOI 10.18637/jss.v059.i10.
 *
 * Conventions written into the descriptions:
 * - frames count from 0 and `t_s = frame / capture_fps` (clip time, the first frame at 0 s);
 * - pixels: x to the right, y down, origin at the centre of the top-left pixel;
 * - `major_px`, `minor_px` are FULL axis lengths; `angle_deg` is the major axis's direction
 *   from +x towards +y, in [0, 180);
 * - faces are `heads` | `tails`; heads is up when the coin's unit normal n (out of the heads face) has n·ẑ > 0.
 *
 * Empty cells: an empty CSV cell, an empty string and a Parquet null all mean "no value" (`null`).
 *
 * Spreadsheet formula guard (CSV only): a STRING cell whose text starts with `=`, `+`, `-`, `@`,
 * a tab or a carriage return, possibly after a run of single quotes, is written with one extra
 * single quote `'` in front, so that a spreadsheet shows it as text instead of running it as a
 * formula (common practice, the "CSV Injection" page of the OWASP community pages; no formal standard).
 * `readTosses`/`readFrames` remove that one quote again; Parquet files hold the text unchanged.
 * Number, integer and boolean cells are never quoted this way (`-1.5` stays `-1.5`).
 */

/** Column types, named as in the Frictionless Table Schema specification (v1). */
export type FieldType = 'string' | 'integer' | 'number' | 'boolean';

/** One column of a dataset table. */
export interface Field {
  /** Column name (snake_case, unit suffix where it has one). */
  readonly name: string;
  readonly type: FieldType;
  /** Unit of measure (e.g. `s`, `m/s`, `rev/s`, `deg`, `px`); absent for counts, labels and ratios. */
  readonly unit?: string;
  /** What the value means, how it was measured, its range. */
  readonly description: string;
  /** The only values allowed (string fields). */
  readonly enum?: readonly string[];
  /** True when every row must have a value. */
  readonly required?: boolean;
}

/** A cell value: `null` is an empty cell. */
export type CellValue = string | number | boolean | null;

const FACES = ['heads', 'tails'] as const;

/** Fields of `tosses.csv` / `tosses.parquet`, one row per toss, in column order. */
export const TOSS_FIELDS = [
  { name: 'toss_id', type: 'string', required: true,
    description: 'Identifier of the toss, unique in the study: the manifest\'s toss_id, or the clip file name without its extension.' },
  { name: 'file', type: 'string', required: true,
    description: 'Path of the clip, relative to the study folder (forward slashes).' },
  { name: 'tosser', type: 'string',
    description: 'Who tossed the coin (from the manifest, e.g. T01).' },
  { name: 'status', type: 'string', required: true, enum: ['ok', 'flagged', 'failed'],
    description: 'ok: measured without problems; flagged: measured, but at least one flag of severity "flag" is set (see flags); failed: the clip could not be measured, the measured columns are empty and error says why.' },
  { name: 'flags', type: 'string',
    description: 'Flag codes set for this toss, separated by ";" (no spaces); empty when none. Codes and their meaning are listed in the data package description.' },
  { name: 'error', type: 'string',
    description: 'Why the toss failed (status failed), as a readable sentence; empty otherwise.' },
  { name: 'capture_fps', type: 'number', unit: 'frames/s',
    description: 'Capture frame rate used for all times: frames per second of real time when the clip was recorded (high-speed clips are usually played back slower).' },
  { name: 'fps_source', type: 'string', enum: ['manifest', 'option', 'container', 'gravity', 'calibration'],
    description: 'Where capture_fps came from: the manifest\'s capture_fps column, a command-line option, or the video container\'s frame rate (only a guess for high-speed footage).' },
  { name: 'gravity_fps', type: 'number', unit: 'frames/s',
    description: 'Capture frame rate that makes the fitted vertical acceleration of the flight equal standard gravity (9.80665 m/s²); a check on capture_fps and on the scale.' },
  { name: 'px_per_m', type: 'number', unit: 'px/m',
    description: 'Image scale at the coin\'s mean depth during the flight, from the coin\'s known diameter and its fitted major axis.' },
  { name: 'scale_source', type: 'string',
    description: 'How px_per_m was obtained (e.g. coin_diameter: from the coin diameter and its image size).' },
  { name: 'frames_total', type: 'integer', unit: 'frames',
    description: 'Number of frames decoded from the clip.' },
  { name: 'frames_tracked', type: 'integer', unit: 'frames',
    description: 'Number of frames in which the coin was detected.' },
  { name: 'release_t_s', type: 'number', unit: 's',
    description: 'Time at which the coin leaves the hand (clip time: frame / capture_fps, the first frame at 0 s).' },
  { name: 'catch_t_s', type: 'number', unit: 's',
    description: 'Time at which the coin meets the hand (or the surface) again (clip time, the first frame at 0 s).' },
  { name: 'flight_time_s', type: 'number', unit: 's',
    description: 'Time in the air: catch_t_s - release_t_s.' },
  { name: 'flight_time_se_s', type: 'number', unit: 's',
    description: 'Standard error of flight_time_s.' },
  { name: 'launch_speed_m_s', type: 'number', unit: 'm/s',
    description: 'Vertical speed of the coin\'s centre at release, positive upwards.' },
  { name: 'apex_height_m', type: 'number', unit: 'm',
    description: 'Rise of the coin\'s centre from its release height to the top of the flight.' },
  { name: 'spin_rev_s', type: 'number', unit: 'rev/s',
    description: 'Spin rate: the precession rate of the coin\'s axis about the angular momentum L, |L| / I1 / (2π), I1 the moment of inertia about a diameter (torque-free symmetric top).' },
  { name: 'spin_rev_s_se', type: 'number', unit: 'rev/s',
    description: 'Standard error of spin_rev_s.' },
  { name: 'precession_deg', type: 'number', unit: 'deg',
    description: 'Angle between the coin\'s axis (a line) and the angular momentum L, folded into 0..90; 90 is a pure flip about a diameter.' },
  { name: 'precession_deg_se', type: 'number', unit: 'deg',
    description: 'Standard error of precession_deg.' },
  { name: 'momentum_tilt_deg', type: 'number', unit: 'deg',
    description: 'Angle between the line of the angular momentum L and the vertical, 0..90; 90 is L horizontal.' },
  { name: 'face_changes', type: 'integer',
    description: 'Number of sign changes of n·ẑ (n the unit normal out of the heads face, ẑ up) between release and catch, from the fitted rotation.' },
  { name: 'start_face', type: 'string', enum: [...FACES],
    description: 'Face up at release (heads or tails), from the manifest or from the clip.' },
  { name: 'predicted_face', type: 'string', enum: [...FACES],
    description: 'Face up at catch predicted from start_face and the fitted rotation (heads or tails).' },
  { name: 'observed_face', type: 'string', enum: [...FACES],
    description: 'Face up at catch as recorded in the manifest (heads or tails); empty when not recorded.' },
  { name: 'same_side_predicted', type: 'boolean',
    description: 'True when predicted_face equals start_face.' },
  { name: 'p_same_side', type: 'number',
    description: 'Fraction of one precession cycle during which the start face is up (n·ẑ has the start sign), from precession_deg and momentum_tilt_deg; 0..1. Empty when the release was not seen (the start face is read there).' },
  { name: 'fit_rms', type: 'number',
    description: 'Root-mean-square of the rotation fit\'s residuals over the flight frames (the residual column of frames.csv: observed minus modelled axis ratio, dimensionless).' },
  { name: 'focal_px', type: 'number', unit: 'px',
    description: 'Focal length of the camera in pixels (from the manifest); empty when unknown.' },
  { name: 'camera_roll_deg', type: 'number', unit: 'deg',
    description: 'Estimated roll of the camera about its optical axis, from the direction of the fitted gravity in the image; positive when image content turns clockwise.' },
  { name: 'gravity_fps_se', type: 'number', unit: 'frames/s',
    description: 'Standard error of gravity_fps.' },
  { name: 'px_per_m_se', type: 'number', unit: 'px/m',
    description: 'Standard error of px_per_m.' },
  { name: 'launch_speed_se_m_s', type: 'number', unit: 'm/s',
    description: 'Standard error of launch_speed_m_s.' },
  { name: 'momentum_tilt_deg_se', type: 'number', unit: 'deg',
    description: 'Standard error of momentum_tilt_deg.' },
  { name: 'p_same_side_se', type: 'number',
    description: 'Standard error of p_same_side, propagated from the angle estimates.' },
  { name: 'coin_diameter_mm', type: 'number', unit: 'mm',
    description: 'Diameter of the coin used for the scale and the inertia.' },
  { name: 'coin_thickness_mm', type: 'number', unit: 'mm',
    description: 'Thickness of the coin used for the inertia.' },
  { name: 'landing', type: 'string', enum: ['caught', 'surface'],
    description: 'How the toss ended, from the manifest: caught in the hand, or landed on a surface.' },
  { name: 'notes', type: 'string',
    description: 'Free text from the manifest.' },
  { name: 'container_fps', type: 'number', unit: 'frames/s',
    description: 'Frame rate stated by the video container (often a playback rate, not the capture rate).' },
  { name: 'frames_dropped', type: 'integer',
    description: 'Frames missing or repeated according to the container\'s timestamps (0 when none); the fits use the true frame times.' },
  { name: 'depth_change_m', type: 'number', unit: 'm',
    description: 'Change of the coin\'s distance from the camera between release and catch, from the change of its apparent size; empty without focal_px.' },
  { name: 'scale_change_ratio', type: 'number',
    description: 'px_per_m at the catch over px_per_m at the release (1 for a coin at constant depth).' },
  { name: 'predicted_face_p', type: 'number',
    description: 'Probability that predicted_face is the face up at the catch, 0..1, from the standard errors of release_t_s and catch_t_s (normal, independent; the fitted rotation taken as exact). Near 0.5 when a face change lies within those errors of the catch or the release: the face is then not known, whatever predicted_face says. Empty without predicted_face.' },
] as const satisfies readonly Field[];

/** Fields of `frames.csv` / `frames.parquet`, one row per (toss, frame), in column order. */
export const FRAME_FIELDS = [
  { name: 'toss_id', type: 'string', required: true,
    description: 'Identifier of the toss (toss_id of tosses.csv).' },
  { name: 'frame', type: 'integer', required: true,
    description: 'Frame index in the clip, counting from 0.' },
  { name: 't_s', type: 'number', unit: 's',
    description: 'Clip time of the frame: frame / capture_fps (the first frame at 0 s).' },
  { name: 'detected', type: 'boolean', required: true,
    description: 'True when the coin was found in this frame.' },
  { name: 'cx_px', type: 'number', unit: 'px',
    description: 'x of the fitted ellipse centre: pixel x to the right, origin at the centre of the top-left pixel.' },
  { name: 'cy_px', type: 'number', unit: 'px',
    description: 'y of the fitted ellipse centre: pixel y down, origin at the centre of the top-left pixel.' },
  { name: 'major_px', type: 'number', unit: 'px',
    description: 'FULL length of the ellipse\'s major axis (not the semi-axis).' },
  { name: 'minor_px', type: 'number', unit: 'px',
    description: 'FULL length of the ellipse\'s minor axis (not the semi-axis); minor_px <= major_px.' },
  { name: 'angle_deg', type: 'number', unit: 'deg',
    description: 'Direction of the major axis, measured from +x towards +y (clockwise on screen, y being down), in [0, 180).' },
  { name: 'axis_ratio', type: 'number',
    description: 'minor_px / major_px, 0..1: |cos| of the angle between the coin\'s axis and the line of sight.' },
  { name: 'face_visible', type: 'string', enum: ['heads', 'tails', 'unknown'],
    description: 'Face turned towards the camera, when it can be told (heads, tails or unknown).' },
  { name: 'occluded', type: 'boolean',
    description: 'True when the coin\'s region touches another foreground region (usually the hand).' },
  { name: 'in_flight', type: 'boolean',
    description: 'True when the frame lies between release and catch and was used in the flight fit.' },
  { name: 'model_axis_ratio', type: 'number',
    description: 'axis_ratio predicted by the fitted rotation at t_s, 0..1.' },
  { name: 'residual', type: 'number',
    description: 'axis_ratio - model_axis_ratio.' },
  { name: 'touching_edge', type: 'boolean',
    description: 'True when the coin\'s region touches the border of the frame.' },
  { name: 'method', type: 'string', enum: ['moments', 'boundary', 'none'],
    description: 'How the ellipse was measured: image moments of the region, a direct fit to its boundary, or none.' },
  { name: 'outline_growth_px', type: 'number', unit: 'px',
    description: 'How much longer the ellipse axes are than the coin\'s, from the gray levels across its edge (the threshold and blur widen the region); empty when not measured (only clean frames of the forward track).' },
  { name: 'end_growth_px', type: 'number', unit: 'px',
    description: 'How far the ends of the major axis lie beyond the coin\'s edge there, on the full axis, from the gray levels across the edge near the ends; major_px less this is the face\'s apparent diameter. Empty when not measured (as outline_growth_px, and on thinner views too).' },
  { name: 'block_matched', type: 'boolean',
    description: 'True when the centre comes from block matching the coin of a neighbouring frame (the coin carried by the hand before the release, held in it after the catch, or merged with the fingers), not from the region or its outline: the axes and angle are the last measured ones, and a run of such frames shares one offset.' },
] as const satisfies readonly Field[];

/** Names of the toss table's columns. */
export type TossFieldName = (typeof TOSS_FIELDS)[number]['name'];
/** Names of the frame table's columns. */
export type FrameFieldName = (typeof FRAME_FIELDS)[number]['name'];

/** One row of `tosses.*`: every column present, `null` for an empty cell. */
export type TossRow = { [K in TossFieldName]: CellValue };
/** One row of `frames.*`: every column present, `null` for an empty cell. */
export type FrameRow = { [K in FrameFieldName]: CellValue };

/** Severity of a flag: `flag` makes the row's status `flagged`; `note` is informational only. */
export type FlagSeverity = 'flag' | 'note';

/** One of our own flag codes, as written in the `flags` column. */
export interface FlagCode {
  readonly code: string;
  readonly severity: FlagSeverity;
  /** One line: what the flag means. */
  readonly meaning: string;
}

/** Every flag code tossmeter writes into `flags`. */
export const FLAG_CODES = [
  { code: 'spin_aliased', severity: 'flag',
    meaning: 'Fewer than about 4 frames per revolution: the spin rate may be aliased to a lower value.' },
  { code: 'track_lost', severity: 'flag',
    meaning: 'The coin was lost for part of the flight; the fit bridges a gap of missing frames.' },
  { code: 'out_of_frame', severity: 'flag',
    meaning: 'The coin left the frame (or touched its border) during the flight.' },
  { code: 'few_flight_frames', severity: 'flag',
    meaning: 'Too few frames in flight for a trustworthy fit.' },
  { code: 'release_unseen', severity: 'flag',
    meaning: 'No frame before the flight places the release (the clip starts with the coin in the air, or the coin was not followed in the hand); release_t_s is the first in-flight frame.' },
  { code: 'catch_unseen', severity: 'flag',
    meaning: 'The track does not show the hand stopping the coin (it ends, or ends within a few frames of leaving the free-flight curve, or stays near it: the clip ends in the air, or the coin goes behind the fingers first); catch_t_s is the last frame seen in flight.' },
  { code: 'fps_from_container', severity: 'flag',
    meaning: 'capture_fps was taken from the video container, which for high-speed footage is usually the playback rate.' },
  { code: 'fit_unconverged', severity: 'flag',
    meaning: 'The rotation or flight fit stopped before converging; its values are the last iterate.' },
  { code: 'off_axis_no_focal', severity: 'note',
    meaning: 'The coin flew far from the image centre and no focal length was given, so perspective was not corrected.' },
  { code: 'fps_mismatch', severity: 'flag',
    meaning: 'gravity_fps differs from capture_fps by more than its uncertainty allows: the capture rate or the scale is probably wrong.' },
  { code: 'frames_dropped', severity: 'note',
    meaning: 'The clip\'s timestamps show missing or duplicated frames.' },
  { code: 'not_measured', severity: 'flag',
    meaning: 'The clip failed (status failed); see error.' },
] as const satisfies readonly FlagCode[];

/**
 * A human label for a field, for tables and plots: the name with its unit, e.g. `spin_rev_s (rev/s)`.
 *
 * @param field - one entry of `TOSS_FIELDS` or `FRAME_FIELDS`
 * @returns `name (unit)`, or just `name` when the field has no unit
 */
export function fieldLabel(field: Field): string {
  return field.unit === undefined ? field.name : `${field.name} (${field.unit})`;
}

/**
 * The field's description with its unit appended (`… Unit: s.`), as written into `datapackage.json`.
 *
 * @param field - one entry of `TOSS_FIELDS` or `FRAME_FIELDS`
 */
export function fieldDescription(field: Field): string {
  return field.unit === undefined ? field.description : `${field.description} Unit: ${field.unit}.`;
}
