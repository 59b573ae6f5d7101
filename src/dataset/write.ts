/**
 * Writes a dataset folder: `tosses.csv`, `frames.csv`, `tosses.parquet`, `frames.parquet`,
 * `datapackage.json` and `run.json`, each to a temporary name in the folder and then renamed.
 */
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { parquetWriteBuffer } from 'hyparquet-writer';
import { atomicWriteFile } from './atomicWriteFile.ts';
import { DatasetError, canonicalValue, toCsvText } from './cell.ts';
import { dataPackage } from './dataPackage.ts';
import { FRAME_FIELDS, TOSS_FIELDS, type CellValue, type Field, type FrameRow, type TossRow } from './fields.ts';
import { parquetColumns } from './parquetSchema.ts';

/** What `writeDataset` writes. */
export interface DatasetContent {
  readonly tosses: readonly TossRow[];
  readonly frames: readonly FrameRow[];
  /** Anything JSON-serialisable describing the run (options, versions, times); written as `run.json`. */
  readonly run: object;
}

/**
 * Checks rows against a field list and returns canonical copies (see `canonicalValue`).
 * Throws `DatasetError` for a missing or unknown column or a badly typed value.
 *
 * @param table - `tosses` or `frames`, for the messages
 */
export function canonicalRows(table: string, fields: readonly Field[], rows: readonly object[]): Record<string, CellValue>[] {
  const names = new Set(fields.map((f) => f.name));
  return rows.map((row, i) => {
    const where = `${table} row ${i + 1}`;
    const record = row as Record<string, unknown>;
    for (const key of Object.keys(record)) {
      if (!names.has(key)) throw new DatasetError(`${where}: unknown column ${JSON.stringify(key)}`);
    }
    const out: Record<string, CellValue> = {};
    for (const f of fields) {
      if (!(f.name in record)) throw new DatasetError(`${where}, column ${f.name}: missing (use null for an empty cell)`);
      out[f.name] = canonicalValue(f, record[f.name], where);
    }
    return out;
  });
}

/**
 * The CSV text of a table: a header row with the field names, then one line per row; RFC 4180
 * quoting (a cell with a comma, quote, CR or LF is quoted, quotes doubled), `\n` line ends, UTF-8
 * without BOM. Cell texts follow `toCsvText` (empty for null, `true`/`false`, shortest round-trip numbers,
 * the formula guard on strings).
 */
export function tableToCsv(fields: readonly Field[], rows: readonly Record<string, CellValue>[]): string {
  const records = [fields.map((f) => f.name), ...rows.map((row) => fields.map((f) => toCsvText(f, row[f.name] ?? null)))];
  return stringify(records, { record_delimiter: 'unix', quoted_match: /^\s|\s$/ });
}

/**
 * The Parquet bytes of a table (hyparquet-writer, Snappy, one nullable typed column per field).
 * Deterministic: identical rows give identical bytes.
 */
export function tableToParquet(fields: readonly Field[], rows: readonly Record<string, CellValue>[]): Uint8Array {
  const buffer = parquetWriteBuffer({ columnData: parquetColumns(fields, rows), createdBy: 'tossmeter' });
  return new Uint8Array(buffer);
}

/**
 * Writes the dataset into `outDir` (created if needed). All rows are checked first, so a bad row
 * writes nothing. Then each file goes through `atomicWriteFile`: the data files first, then
 * `run.json`, then `datapackage.json` last, so a present descriptor means the tables are complete.
 * Identical input gives byte-identical CSV and Parquet files.
 *
 * @param outDir - the dataset folder
 * @param content - the toss rows, the frame rows and the run record
 * @throws DatasetError when a row does not match the field list
 */
export async function writeDataset(outDir: string, content: DatasetContent): Promise<void> {
  const tosses = canonicalRows('tosses', TOSS_FIELDS, content.tosses);
  const frames = canonicalRows('frames', FRAME_FIELDS, content.frames);
  const files: [string, string | Uint8Array][] = [
    ['tosses.csv', tableToCsv(TOSS_FIELDS, tosses)],
    ['frames.csv', tableToCsv(FRAME_FIELDS, frames)],
    ['tosses.parquet', tableToParquet(TOSS_FIELDS, tosses)],
    ['frames.parquet', tableToParquet(FRAME_FIELDS, frames)],
    ['run.json', `${JSON.stringify(content.run, null, 2)}\n`],
    ['datapackage.json', `${JSON.stringify(dataPackage(), null, 2)}\n`],
  ];
  await mkdir(outDir, { recursive: true });
  for (const [name, data] of files) await atomicWriteFile(join(outDir, name), data);
}
