/**
 * The `datapackage.json` descriptor of a dataset folder, generated from the field lists.
 *
 * Follows the Frictionless Data Package, Data Resource, Tabular Data Resource, Table Schema and
 * CSV Dialect specifications, v1 (frictionlessdata.io, specs.frictionlessdata.io, 2017).
 * The CSV files are `tabular-data-resource`s; v1 defines tabular resources over CSV only, so the
 * Parquet copies are plain `data-resource`s that carry the same Table Schema, and the package
 * profile is `data-package`.
 */
import { FLAG_CODES, FRAME_FIELDS, TOSS_FIELDS, fieldDescription, type Field } from './fields.ts';

/** A Table Schema field descriptor (v1) with our `unit` extension property. */
export interface TableSchemaField {
  name: string;
  type: Field['type'];
  description: string;
  unit?: string;
  trueValues?: string[];
  falseValues?: string[];
  constraints?: { required?: boolean; enum?: string[] };
}

/** The Table Schema (v1) descriptor of a field list. */
export function tableSchema(fields: readonly Field[]): { fields: TableSchemaField[]; missingValues: string[] } {
  return {
    fields: fields.map((f) => {
      const out: TableSchemaField = { name: f.name, type: f.type, description: fieldDescription(f) };
      if (f.unit !== undefined) out.unit = f.unit;
      if (f.type === 'boolean') {
        out.trueValues = ['true'];
        out.falseValues = ['false'];
      }
      if (f.required === true || f.enum !== undefined) {
        out.constraints = {};
        if (f.required === true) out.constraints.required = true;
        if (f.enum !== undefined) out.constraints.enum = [...f.enum];
      }
      return out;
    }),
    missingValues: [''],
  };
}

const FORMULA_NOTE =
  'Spreadsheet formula guard: a text cell that would start with =, +, -, @, a tab or a carriage return ' +
  '(possibly after single quotes) is written with one extra single quote in front; remove one leading quote ' +
  'from such a cell to get the value. Number cells are never changed. The Parquet copies hold the text unchanged.';

const CSV_DIALECT = { delimiter: ',', doubleQuote: true, quoteChar: '"', lineTerminator: '\n', header: true };

/**
 * The whole `datapackage.json` descriptor: four resources (`tosses`, `frames` as CSV;
 * `tosses-parquet`, `frames-parquet`), each with its Table Schema, the primary keys `toss_id` and
 * [`toss_id`, `frame`], and the foreign key frames.toss_id → tosses.toss_id. Deterministic: no dates.
 */
export function dataPackage(): Record<string, unknown> {
  const tosses = tableSchema(TOSS_FIELDS);
  const frames = tableSchema(FRAME_FIELDS);
  const flagList = FLAG_CODES.map((f) => `${f.code} (${f.severity}): ${f.meaning}`).join(' ');
  const tossSchema = () => ({ ...tosses, primaryKey: ['toss_id'] });
  const frameSchema = (parent: string) => ({
    ...frames,
    primaryKey: ['toss_id', 'frame'],
    foreignKeys: [{ fields: ['toss_id'], reference: { resource: parent, fields: ['toss_id'] } }],
  });
  const csv = { profile: 'tabular-data-resource', format: 'csv', mediatype: 'text/csv', encoding: 'utf-8', dialect: CSV_DIALECT };
  const parquet = { profile: 'data-resource', format: 'parquet', mediatype: 'application/vnd.apache.parquet' };
  return {
    profile: 'data-package',
    name: 'tossmeter-dataset',
    title: 'Coin tosses measured from high-speed video',
    description:
      'One row per toss (tosses) and one row per (toss, frame) (frames), tidy, in CSV and Parquet. ' +
      'Frames count from 0 and t_s = frame / capture_fps. Pixels: x right, y down, origin at the centre of the ' +
      'top-left pixel. Empty cells are missing values. ' + FORMULA_NOTE + ' Flag codes: ' + flagList,
    resources: [
      { name: 'tosses', path: 'tosses.csv', ...csv, description: `One row per toss. ${FORMULA_NOTE}`, schema: tossSchema() },
      { name: 'frames', path: 'frames.csv', ...csv, description: `One row per (toss, frame). ${FORMULA_NOTE}`, schema: frameSchema('tosses') },
      { name: 'tosses-parquet', path: 'tosses.parquet', ...parquet, description: 'The tosses table as Parquet.', schema: tossSchema() },
      { name: 'frames-parquet', path: 'frames.parquet', ...parquet, description: 'The frames table as Parquet.', schema: frameSchema('tosses-parquet') },
    ],
  };
}
