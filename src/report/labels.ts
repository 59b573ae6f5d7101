/**
 * Column labels for tables and plot axes, taken from the dataset's one field list (`TOSS_FIELDS`,
 * `FRAME_FIELDS`) through `fieldLabel`, so a renamed column or unit changes the report too.
 */
import { FRAME_FIELDS, TOSS_FIELDS, fieldLabel, type Field, type FrameFieldName, type TossFieldName } from '../dataset/index.ts';

const BY_NAME = new Map<string, Field>([...FRAME_FIELDS, ...TOSS_FIELDS].map((f) => [f.name, f]));

/**
 * The label of a dataset column (`name (unit)`, e.g. `spin_rev_s (rev/s)`), from its field.
 * Toss-table fields win where both tables have the column.
 * @throws RangeError for a name that is in neither field list (a bug in the report, not a data problem)
 */
export function columnLabel(name: TossFieldName | FrameFieldName): string {
  const field = BY_NAME.get(name);
  if (field === undefined) throw new RangeError(`columnLabel: no field named ${JSON.stringify(name)}`);
  return fieldLabel(field);
}

/** The description of a dataset column (for `title` tool tips in tables), from its field. */
export function columnDescription(name: TossFieldName | FrameFieldName): string {
  const field = BY_NAME.get(name);
  if (field === undefined) throw new RangeError(`columnDescription: no field named ${JSON.stringify(name)}`);
  return field.description;
}
