import { parquetMetadata } from 'hyparquet';
import { parquetWriteBuffer } from 'hyparquet-writer';
import { describe, expect, it } from 'vitest';
import { FRAME_FIELDS, TOSS_FIELDS, type Field } from '../../src/dataset/fields.ts';
import { parquetColumns } from '../../src/dataset/parquetSchema.ts';

// Physical and converted types as defined by the Apache Parquet format specification (parquet.thrift, apache/parquet-format).
const EXPECTED = {
  string: { type: 'BYTE_ARRAY', converted_type: 'UTF8' },
  integer: { type: 'INT32' },
  number: { type: 'DOUBLE' },
  boolean: { type: 'BOOLEAN' },
};

describe('parquetColumns', () => {
  it.each([['tosses', TOSS_FIELDS], ['frames', FRAME_FIELDS]] as const)(
    '%s: one OPTIONAL column per field, in order, typed from the field list (also with zero rows)',
    (_t, fields: readonly Field[]) => {
      const meta = parquetMetadata(parquetWriteBuffer({ columnData: parquetColumns(fields, []) }));
      const leaves = meta.schema.slice(1);
      expect(leaves.map((s) => s.name)).toEqual(fields.map((f) => f.name));
      leaves.forEach((s, i) => {
        expect(s).toMatchObject({ ...EXPECTED[fields[i].type], repetition_type: 'OPTIONAL' });
      });
      expect(Number(meta.num_rows)).toBe(0);
    },
  );

  it('fills absent values with null and refuses integers beyond 32 bits', () => {
    const fields: Field[] = [{ name: 'n', type: 'integer', description: 'x.' }];
    expect(parquetColumns(fields, [{ n: 3 }, {}])[0].data).toEqual([3, null]);
    expect(() => parquetColumns(fields, [{ n: 2 ** 31 }])).toThrow('column n: 2147483648 does not fit a 32-bit Parquet integer');
  });
});
