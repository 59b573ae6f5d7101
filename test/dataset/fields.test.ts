import { describe, expect, it } from 'vitest';
import { FLAG_CODES, FRAME_FIELDS, TOSS_FIELDS, fieldDescription, fieldLabel, type Field } from '../../src/dataset/fields.ts';

// The column order is the project's published contract (the task brief); it is copied here literally.
const TOSS_ORDER = [
  'toss_id', 'file', 'tosser', 'status', 'flags', 'error', 'capture_fps', 'fps_source', 'gravity_fps', 'px_per_m',
  'scale_source', 'frames_total', 'frames_tracked', 'release_t_s', 'catch_t_s', 'flight_time_s', 'flight_time_se_s',
  'launch_speed_m_s', 'apex_height_m', 'spin_rev_s', 'spin_rev_s_se', 'precession_deg', 'precession_deg_se',
  'momentum_tilt_deg', 'face_changes', 'start_face', 'predicted_face', 'observed_face', 'same_side_predicted',
  'p_same_side', 'fit_rms',
  'focal_px', 'camera_roll_deg', 'gravity_fps_se', 'px_per_m_se', 'launch_speed_se_m_s', 'momentum_tilt_deg_se',
  'p_same_side_se', 'coin_diameter_mm', 'coin_thickness_mm', 'landing', 'notes',
  'container_fps', 'frames_dropped', 'depth_change_m', 'scale_change_ratio', 'predicted_face_p',
];
const FRAME_ORDER = [
  'toss_id', 'frame', 't_s', 'detected', 'cx_px', 'cy_px', 'major_px', 'minor_px', 'angle_deg', 'axis_ratio',
  'face_visible', 'occluded', 'in_flight', 'model_axis_ratio', 'residual', 'touching_edge', 'method', 'outline_growth_px', 'end_growth_px',
  'block_matched',
];
// Table Schema v1 field types (Frictionless Table Schema specification, frictionlessdata.io, v1) that we use.
const TYPES = ['string', 'integer', 'number', 'boolean'];

const byName = (fields: readonly Field[], name: string): Field => fields.find((f) => f.name === name) as Field;

describe('fields', () => {
  it('TOSS_FIELDS has exactly the agreed columns in the agreed order', () => {
    expect(TOSS_FIELDS.map((f) => f.name)).toEqual(TOSS_ORDER);
  });

  it('FRAME_FIELDS has exactly the agreed columns in the agreed order', () => {
    expect(FRAME_FIELDS.map((f) => f.name)).toEqual(FRAME_ORDER);
  });

  it.each([['TOSS_FIELDS', TOSS_FIELDS], ['FRAME_FIELDS', FRAME_FIELDS]] as const)(
    '%s: names unique snake_case, known types, a sentence of description, enums only on strings',
    (_label, fields: readonly Field[]) => {
      expect(new Set(fields.map((f) => f.name)).size).toBe(fields.length);
      for (const f of fields) {
        expect(f.name).toMatch(/^[a-z][a-z0-9_]*$/);
        expect(TYPES).toContain(f.type);
        expect(f.description.length).toBeGreaterThan(10);
        expect(f.description).toMatch(/[.)]$/);
        if (f.enum !== undefined) {
          expect(f.type).toBe('string');
          expect(new Set(f.enum).size).toBe(f.enum.length);
        }
      }
    },
  );

  it('every name with a unit suffix (_s, _m, _m_s, _deg, _px, _mm, _fps) carries that unit', () => {
    const suffixUnit: [RegExp, string][] = [
      [/_m_s$|_se_m_s$/, 'm/s'], [/_deg(_se)?$/, 'deg'], [/_px$/, 'px'], [/_mm$/, 'mm'], [/_fps(_se)?$/, 'frames/s'],
      [/_rev_s(_se)?$/, 'rev/s'], [/_per_m(_se)?$/, 'px/m'], [/_m$/, 'm'], [/(^|_)t_s$|_s$/, 's'],
    ];
    for (const f of [...TOSS_FIELDS, ...FRAME_FIELDS] as readonly Field[]) {
      const rule = suffixUnit.find(([re]) => re.test(f.name));
      if (rule !== undefined) expect({ name: f.name, unit: f.unit }).toEqual({ name: f.name, unit: rule[1] });
    }
  });

  it('faces are heads|tails, status ok|flagged|failed, fps_source manifest|option|container|gravity|calibration, face_visible adds unknown', () => {
    for (const name of ['start_face', 'predicted_face', 'observed_face']) expect(byName(TOSS_FIELDS, name).enum).toEqual(['heads', 'tails']);
    expect(byName(TOSS_FIELDS, 'status').enum).toEqual(['ok', 'flagged', 'failed']);
    expect(byName(TOSS_FIELDS, 'fps_source').enum).toEqual(['manifest', 'option', 'container', 'gravity', 'calibration']);
    expect(byName(FRAME_FIELDS, 'face_visible').enum).toEqual(['heads', 'tails', 'unknown']);
    expect(byName(TOSS_FIELDS, 'same_side_predicted').type).toBe('boolean');
    expect(byName(TOSS_FIELDS, 'face_changes').type).toBe('integer');
    expect(byName(FRAME_FIELDS, 'frame').type).toBe('integer');
  });

  it('descriptions state the shared conventions (frame origin, pixel axes, full axes, angle range)', () => {
    expect(byName(FRAME_FIELDS, 'frame').description).toMatch(/from 0/);
    expect(byName(FRAME_FIELDS, 't_s').description).toMatch(/frame \/ capture_fps/);
    expect(byName(FRAME_FIELDS, 'cx_px').description).toMatch(/right.*centre of the top-left pixel/);
    expect(byName(FRAME_FIELDS, 'cy_px').description).toMatch(/down/);
    expect(byName(FRAME_FIELDS, 'major_px').description).toMatch(/FULL/);
    expect(byName(FRAME_FIELDS, 'minor_px').description).toMatch(/FULL/);
    expect(byName(FRAME_FIELDS, 'angle_deg').description).toMatch(/\+x towards \+y.*\[0, 180\)/);
    expect(byName(TOSS_FIELDS, 'spin_rev_s').description).toMatch(/\|L\| \/ I1 \/ \(2π\)/);
    expect(byName(TOSS_FIELDS, 'precession_deg').description).toMatch(/0\.\.90/);
    expect(byName(TOSS_FIELDS, 'momentum_tilt_deg').description).toMatch(/vertical, 0\.\.90/);
    expect(byName(TOSS_FIELDS, 'gravity_fps').description).toMatch(/9\.80665/);
  });

  it('FLAG_CODES lists the required codes once each, with a severity and a one-line meaning', () => {
    const codes = FLAG_CODES.map((f) => f.code);
    expect(new Set(codes).size).toBe(codes.length);
    for (const code of ['spin_aliased', 'track_lost', 'out_of_frame', 'few_flight_frames', 'release_unseen', 'catch_unseen',
      'fps_from_container', 'fit_unconverged', 'off_axis_no_focal', 'fps_mismatch', 'frames_dropped', 'not_measured']) {
      expect(codes).toContain(code);
    }
    for (const f of FLAG_CODES) {
      expect(f.code).toMatch(/^[a-z][a-z_]*$/); // no ';' so that the flags column can be split
      expect(['flag', 'note']).toContain(f.severity);
      expect(f.meaning).not.toMatch(/\n/);
    }
    expect(FLAG_CODES.find((f) => f.code === 'spin_aliased')?.meaning).toMatch(/4 frames per revolution/);
  });

  it('fieldLabel adds the unit in brackets and fieldDescription appends it as a sentence', () => {
    expect(fieldLabel(byName(TOSS_FIELDS, 'spin_rev_s'))).toBe('spin_rev_s (rev/s)');
    expect(fieldLabel(byName(TOSS_FIELDS, 'status'))).toBe('status');
    expect(fieldDescription(byName(TOSS_FIELDS, 'flight_time_s'))).toBe('Time in the air: catch_t_s - release_t_s. Unit: s.');
    expect(fieldDescription(byName(TOSS_FIELDS, 'status'))).toBe(byName(TOSS_FIELDS, 'status').description);
  });
});
