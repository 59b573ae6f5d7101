/**
 * The Parquet columns of a table, typed from its field list.
 */
import type { ColumnSource } from 'hyparquet-writer';
import type { CellValue, Field } from './fields.ts';

const PARQUET_TYPE = {
  string: 'STRING',
  integer: 'INT32',
  number: 'DOUBLE',
  boolean: 'BOOLEAN',
} as const;

/**
 * One nullable Parquet column per field, in field order: string → UTF-8 BYTE_ARRAY, integer → INT32,
 * number → DOUBLE, boolean → BOOLEAN. Rows must already be canonical (see `canonicalValue`);
 * INT32 holds the counts and frame indices we write (up to 2^31 − 1), larger integers throw.
 *
 * @param fields - the table's field list
 * @param rows - canonical rows keyed by field name
 */
export function parquetColumns(fields: readonly Field[], rows: readonly Record<string, CellValue>[]): ColumnSource[] {
  return fields.map((field) => {
    const data = rows.map((row) => row[field.name] ?? null);
    if (field.type === 'integer') {
      for (const v of data) {
        if (typeof v === 'number' && (v > 2147483647 || v < -2147483648)) {
          throw new RangeError(`column ${field.name}: ${v} does not fit a 32-bit Parquet integer`);
        }
      }
    }
    return { name: field.name, data, type: PARQUET_TYPE[field.type], nullable: true };
  });
}
