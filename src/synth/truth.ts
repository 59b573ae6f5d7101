/**
 * The ground truth written beside each rendered clip (`<clip>.truth.json`): one record of toss-level
 * values and one per frame. The zod schema is the single source of the type; the writer keeps the
 * schema's key order and rounds every number to 10 significant digits, so the same seed gives
 * byte-identical files.
 */
import { z } from 'zod';

const face = z.enum(['heads', 'tails']);
const num = z.number();
const vec3 = z.tuple([num, num, num]);

/** One frame's truth. Times are frame times k / capture_fps (the middle of the exposure). */
export const TruthFrameSchema = z.object({
  /** Frame number from 0. */
  frame: z.number().int().nonnegative(),
  /** Time, s. */
  t_s: num,
  /** Strictly between release and catch. */
  in_flight: z.boolean(),
  /** The (drawn) hand touches the coin. */
  hand_contact: z.boolean(),
  /** Coin centre, world, m (z up; origin level with the release, at its depth). */
  center_world: vec3,
  /** Projection of the coin centre, px. */
  center_px: z.tuple([num, num]),
  /** Heads normal, world, unit. */
  normal_world: vec3,
  /** Exact perspective image of the coin's mid-plane circle; null if it is not an ellipse. */
  ellipse: z
    .object({ cx: num, cy: num, major: num, minor: num, angle_deg: num })
    .nullable(),
  /** minor / major of that ellipse. */
  axis_ratio: num.nullable(),
  /** |n·d|, d the unit ray from the camera centre to the coin centre. */
  n_dot_view: num,
});

/** A clip's truth: toss-level values, then the frames. */
export const TruthSchema = z.object({
  toss_id: z.string(),
  file: z.string(),
  capture_fps: num,
  container_fps: num,
  width: z.number().int().positive(),
  height: z.number().int().positive(),
  frames_total: z.number().int().positive(),
  coin_diameter_mm: num,
  coin_thickness_mm: num,
  focal_px: num,
  /** Depth of the release point along the optical axis, m. */
  camera_distance_m: num,
  camera_roll_deg: num,
  release_t_s: num,
  catch_t_s: num,
  flight_time_s: num,
  /** Vertical component u of the launch velocity, m/s. */
  launch_speed_m_s: num,
  /** Apex height above the release, m (u²/2g). */
  apex_height_m: num,
  /** Precession rate of the normal about L, |L|/I1/2π, rev/s. */
  spin_rev_s: num,
  /** Angle between the coin's axis (a line) and L, deg, 0..90. */
  precession_deg: num,
  /** Angle between the line of L and the vertical, deg, 0..90. */
  momentum_tilt_deg: num,
  /** Sign changes of n·ẑ between release and catch. */
  face_changes: z.number().int().nonnegative(),
  start_face: face,
  /** Face up at the catch. */
  predicted_face: face,
  /** Face up after the catch (the coin is caught, so the predicted face). */
  observed_face: face,
  same_side: z.boolean(),
  /** Fraction of one precession cycle with the start face up. */
  p_same_side: num,
  /** f / mean depth of the coin during the flight, px/m. */
  px_per_m: num,
  /** Depth at the catch minus depth at the release, m. */
  depth_change_m: num,
  tosser: z.string(),
  // further values (not in the dataset's field list)
  /** Landing: always `caught` here. */
  landing: z.literal('caught'),
  /** Catch height minus release height, m. */
  catch_height_m: num,
  /** Horizontal (image-plane) and depth components of the launch velocity, m/s. */
  horizontal_speed_m_s: num,
  depth_speed_m_s: num,
  /** Angle between the heads normal and L, deg, 0..180 (unfolded ψ). */
  heads_psi_deg: num,
  /** Phase φ0 of the heads normal about L at release, deg (frame of physics `precessionFrame`). */
  phase0_deg: num,
  /** Angular momentum direction, world, unit. */
  l_hat_world: vec3,
  /** Gravity, m/s². */
  gravity_m_s2: num,
  hand: z.boolean(),
  background: z.enum(['textured', 'plain']),
  exposure_fraction: num,
  noise_sigma: num,
  codec: z.enum(['h264', 'ffv1']),
  seed: num,
  clip_index: z.number().int().nonnegative(),
  frames: z.array(TruthFrameSchema),
});

/** One clip's truth (type from {@link TruthSchema}). */
export type Truth = z.infer<typeof TruthSchema>;
/** One frame's truth. */
export type TruthFrame = z.infer<typeof TruthFrameSchema>;

/** Rounds to 10 significant digits (and −0 to 0); non-numbers pass through. */
function roundDeep(v: unknown): unknown {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) return v;
    const r = Number(v.toPrecision(10));
    return r === 0 ? 0 : r;
  }
  if (Array.isArray(v)) return v.map(roundDeep);
  if (v !== null && typeof v === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) out[k] = roundDeep(x);
    return out;
  }
  return v;
}

/**
 * Serialises a truth record: validated with {@link TruthSchema} (keys in the schema's order),
 * numbers rounded to 10 significant digits, toss values one per line, one line per frame.
 * Throws a ZodError when the record does not match the schema.
 */
export function serializeTruth(truth: Truth): string {
  const parsed = TruthSchema.parse(roundDeep(truth)); // parse also orders the keys as in the schema
  const { frames, ...toss } = parsed;
  const head = JSON.stringify(toss, null, 2);
  const lines = frames.map((f) => `    ${JSON.stringify(f)}`);
  return `${head.slice(0, -2)},\n  "frames": [\n${lines.join(',\n')}\n  ]\n}\n`;
}

/** Parses a truth file's text (throws a ZodError naming the offending field). */
export function parseTruth(text: string): Truth {
  return TruthSchema.parse(JSON.parse(text));
}
