import { DuckDBConnection } from '@duckdb/node-api';
import { mkdtemp, readFile, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DatasetError } from '../../src/dataset/cell.ts';
import { FRAME_FIELDS, TOSS_FIELDS } from '../../src/dataset/fields.ts';
import { tableToCsv, writeDataset } from '../../src/dataset/write.ts';
import { AWKWARD_TEXT, frameRow, sampleFrames, sampleTosses, tossRow } from './fixtures.ts';

const FILES = ['datapackage.json', 'frames.csv', 'frames.parquet', 'run.json', 'tosses.csv', 'tosses.parquet'];
let root: string;
beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tossmeter-write-'));
});
afterAll(async () => {
  await rm(root, { recursive: true, force: true });
});

/** Tosses with each awkward string in `notes` and `tosser`. */
function awkwardTosses() {
  return [...sampleTosses(), ...AWKWARD_TEXT.map((s, i) => tossRow({ toss_id: `X${i}`, file: `x${i}.mp4`, status: 'ok', tosser: s, notes: s }))];
}

describe('writeDataset', () => {
  it('writes the six files and no temporary file; two writes of the same input are byte-identical', async () => {
    const a = join(root, 'a');
    const b = join(root, 'b');
    const content = { tosses: awkwardTosses(), frames: sampleFrames(), run: { version: '0.1.0', options: { jobs: 2 } } };
    await writeDataset(a, content);
    await writeDataset(b, content);
    await writeDataset(b, content); // overwriting an existing dataset
    expect((await readdir(a)).sort()).toEqual(FILES);
    expect((await readdir(b)).sort()).toEqual(FILES);
    for (const f of FILES) expect(Buffer.compare(await readFile(join(a, f)), await readFile(join(b, f)))).toBe(0);
    expect(JSON.parse(await readFile(join(a, 'run.json'), 'utf8'))).toEqual(content.run);
  });

  it('CSV: header from the field list, RFC 4180 quoting, LF ends, booleans true/false, null empty, no -0/NaN/Infinity', async () => {
    const csv = tableToCsv(TOSS_FIELDS, [
      { ...tossRow({ toss_id: 'a', file: 'b', status: 'ok' }), notes: 'say "hi", then\nleave', same_side_predicted: false, spin_rev_s: 0 },
    ]);
    const [header] = csv.split('\n');
    expect(header).toBe(TOSS_FIELDS.map((f) => f.name).join(','));
    expect(csv.includes(',"say ""hi"", then\nleave",')).toBe(true); // RFC 4180 (IETF, 2005) §2 rules 6 and 7
    expect(csv).toContain(',false,');
    const dir = join(root, 'numbers');
    await writeDataset(dir, { tosses: sampleTosses(), frames: [], run: {} });
    const text = await readFile(join(dir, 'tosses.csv'), 'utf8');
    expect(text).not.toMatch(/NaN|Infinity|(^|,)-0(,|$)/m);
    expect(text).toContain(',0.30000000000000004,');
    expect(text).toContain(',1e-7,');
    expect(text).toContain(`,"'=HYPERLINK(""http://example.invalid"")"`);
    expect(text).not.toContain('\r');
  });

  it('rejects rows that do not match the field list before writing anything', async () => {
    const dir = join(root, 'bad');
    const good = sampleTosses()[0];
    await expect(writeDataset(dir, { tosses: [{ ...good, extra_column: 1 } as never], frames: [], run: {} }))
      .rejects.toThrow(new DatasetError('tosses row 1: unknown column "extra_column"'));
    const { notes: _omit, ...missing } = good;
    await expect(writeDataset(dir, { tosses: [missing as never], frames: [], run: {} }))
      .rejects.toThrow('tosses row 1, column notes: missing (use null for an empty cell)');
    await expect(writeDataset(dir, { tosses: [good, { ...good, status: 'done' }], frames: [], run: {} }))
      .rejects.toThrow('tosses row 2, column status: expected one of ok, flagged, failed but received "done"');
    await expect(writeDataset(dir, { tosses: [], frames: [frameRow({ toss_id: 'a', frame: 1.5, detected: true })], run: {} }))
      .rejects.toThrow('frames row 1, column frame: expected an integer but received 1.5');
    await expect(readdir(dir)).rejects.toThrow(/ENOENT/);
  });

  describe('DuckDB (independent reader, no options)', () => {
    const dir = () => join(root, 'duck');
    let db: DuckDBConnection;
    const tosses = awkwardTosses();
    const frames = sampleFrames();
    beforeAll(async () => {
      await writeDataset(dir(), { tosses, frames, run: {} });
      db = await DuckDBConnection.create();
    });
    afterAll(() => db.closeSync());

    const query = async (sql: string) => (await db.runAndReadAll(sql)).getRowObjectsJS();
    it.each([
      ['tosses.csv', TOSS_FIELDS, () => tosses.length],
      ['frames.csv', FRAME_FIELDS, () => frames.length],
      ['tosses.parquet', TOSS_FIELDS, () => tosses.length],
      ['frames.parquet', FRAME_FIELDS, () => frames.length],
    ] as const)('%s: same row count and column names', async (file, fields, count) => {
      const path = join(dir(), file).replaceAll("'", "''");
      const reader = await db.runAndReadAll(`SELECT * FROM '${path}'`);
      expect(reader.columnNames()).toEqual(fields.map((f) => f.name));
      expect(reader.currentRowCount).toBe(count());
    });

    it('an empty dataset (no tosses) still has every column in all four files', async () => {
      const empty = join(root, 'empty');
      await writeDataset(empty, { tosses: [], frames: [], run: {} });
      for (const [file, fields] of [['tosses.csv', TOSS_FIELDS], ['frames.parquet', FRAME_FIELDS]] as const) {
        const reader = await db.runAndReadAll(`SELECT * FROM '${join(empty, file)}'`);
        expect(reader.columnNames()).toEqual(fields.map((f) => f.name));
        expect(reader.currentRowCount).toBe(0);
      }
    });

    it('Parquet column types are DuckDB VARCHAR / INTEGER / DOUBLE / BOOLEAN as the field list says', async () => {
      const want = { string: 'VARCHAR', integer: 'INTEGER', number: 'DOUBLE', boolean: 'BOOLEAN' };
      const rows = await query(`DESCRIBE SELECT * FROM '${join(dir(), 'tosses.parquet')}'`);
      expect(rows.map((r) => r.column_type)).toEqual(TOSS_FIELDS.map((f) => want[f.type]));
    });

    it('DuckDB reads the awkward text back from the CSV (formula guard quote included) and from Parquet (unchanged)', async () => {
      const csv = await query(`SELECT notes FROM '${join(dir(), 'tosses.csv')}' WHERE toss_id LIKE 'X%' ORDER BY toss_id`);
      const pq = await query(`SELECT notes FROM '${join(dir(), 'tosses.parquet')}' WHERE toss_id LIKE 'X%' ORDER BY toss_id`);
      const order = AWKWARD_TEXT.map((s, i) => ({ id: `X${i}`, s })).sort((x, y) => (x.id < y.id ? -1 : 1));
      expect(pq.map((r) => r.notes)).toEqual(order.map((o) => o.s));
      expect(csv.map((r) => r.notes)).toEqual(order.map((o) => (/^'*[=+\-@\t\r]/.test(o.s) ? `'${o.s}` : o.s)));
      const nulls = await query(`SELECT count(*) AS n FROM '${join(dir(), 'tosses.parquet')}' WHERE gravity_fps IS NULL`);
      expect(Number(nulls[0].n)).toBe(tosses.filter((t) => t.gravity_fps === null || Number.isNaN(t.gravity_fps)).length);
    });
  });
});
