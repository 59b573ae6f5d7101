import { describe, expect, it } from 'vitest';
import { FRAME_FIELDS, TOSS_FIELDS, fieldLabel } from '../../src/dataset/index.ts';
import { columnDescription, columnLabel } from '../../src/report/labels.ts';

describe('columnLabel', () => {
  it('comes from the one field list: name and unit', () => {
    expect(columnLabel('spin_rev_s')).toBe('spin_rev_s (rev/s)');
    expect(columnLabel('axis_ratio')).toBe('axis_ratio');
    for (const f of [...TOSS_FIELDS, ...FRAME_FIELDS]) expect(columnLabel(f.name)).toBe(fieldLabel(f));
    expect(columnDescription('t_s')).toBe(FRAME_FIELDS.find((f) => f.name === 't_s')!.description);
  });
  it('throws for a name in neither list', () => {
    expect(() => columnLabel('nope' as never)).toThrow(RangeError);
  });
});
