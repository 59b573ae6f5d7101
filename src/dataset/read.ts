/**
 * Reads a dataset table back from CSV or Parquet, typed by the field list (inverse of `writeDataset`).
 */
import { readFile, stat } from 'node:fs/promises';
import { basename, extname, join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { asyncBufferFromFile, parquetReadObjects } from 'hyparquet';
import { DatasetError, canonicalValue, fromCsvText } from './cell.ts';
import { FRAME_FIELDS, TOSS_FIELDS, type CellValue, type Field, type FrameRow, type TossRow } from './fields.ts';

/**
 * Picks the file to read: `dirOrFile` itself when it is a file, else `<dir>/<table>.csv`,
 * else `<dir>/<table>.parquet`.
 */
async function resolveTableFile(dirOrFile: string, table: string): Promise<string> {
  const info = await stat(dirOrFile);
  if (!info.isDirectory()) return dirOrFile;
  for (const ext of ['.csv', '.parquet']) {
    const candidate = join(dirOrFile, table + ext);
    if (await stat(candidate).then((s) => s.isFile(), () => false)) return candidate;
  }
  throw new DatasetError(`${dirOrFile}: no ${table}.csv or ${table}.parquet in this folder`);
}

function checkColumns(file: string, fields: readonly Field[], columns: readonly string[]): void {
  const have = new Set(columns);
  for (const f of fields) {
    if (f.required === true && !have.has(f.name)) {
      throw new DatasetError(`${file}: expected a column named ${f.name} but found ${columns.map((c) => JSON.stringify(c)).join(', ')}`);
    }
  }
}

/** Rows of a CSV table written by `writeDataset`; missing optional columns read as null, unknown ones are ignored. */
async function readCsvTable(file: string, fields: readonly Field[]): Promise<Record<string, CellValue>[]> {
  const records = parse(await readFile(file, 'utf8'), { bom: true, relax_column_count: false, skip_empty_lines: true }) as string[][];
  const [header, ...body] = records;
  if (header === undefined) throw new DatasetError(`${file}: empty file, expected a header row`);
  checkColumns(file, fields, header);
  const index = new Map(header.map((name, i) => [name, i]));
  const label = basename(file);
  return body.map((cells, r) => {
    const where = `${label} row ${r + 1}`;
    const row: Record<string, CellValue> = {};
    for (const f of fields) {
      const i = index.get(f.name);
      row[f.name] = i === undefined ? null : fromCsvText(f, cells[i] ?? '', where);
    }
    return row;
  });
}

/** Rows of a Parquet table; 64-bit integers come back as numbers, missing columns as null. */
async function readParquetTable(file: string, fields: readonly Field[]): Promise<Record<string, CellValue>[]> {
  const objects = (await parquetReadObjects({ file: await asyncBufferFromFile(file) })) as Record<string, unknown>[];
  const label = basename(file);
  if (objects.length > 0) checkColumns(file, fields, Object.keys(objects[0]));
  return objects.map((obj, r) => {
    const where = `${label} row ${r + 1}`;
    const row: Record<string, CellValue> = {};
    for (const f of fields) {
      const v = obj[f.name];
      row[f.name] = canonicalValue(f, typeof v === 'bigint' ? Number(v) : v, where);
    }
    return row;
  });
}

async function readTable(dirOrFile: string, table: string, fields: readonly Field[]): Promise<Record<string, CellValue>[]> {
  const file = await resolveTableFile(dirOrFile, table);
  const ext = extname(file).toLowerCase();
  if (ext === '.parquet') return readParquetTable(file, fields);
  if (ext === '.csv') return readCsvTable(file, fields);
  throw new DatasetError(`${file}: expected a .csv or .parquet file`);
}

/**
 * Reads the toss table. `dirOrFile` is a dataset folder (reads `tosses.csv`, or `tosses.parquet`
 * when there is no CSV) or a `.csv` / `.parquet` file. Values are typed by `TOSS_FIELDS`; empty
 * cells are `null`; the CSV formula guard quote is removed.
 *
 * @throws DatasetError naming the file, row and column of a value that does not fit its field
 */
export async function readTosses(dirOrFile: string): Promise<TossRow[]> {
  return (await readTable(dirOrFile, 'tosses', TOSS_FIELDS)) as TossRow[];
}

/**
 * Reads the frame table (`frames.csv`, or `frames.parquet` when there is no CSV, or the given file);
 * typed by `FRAME_FIELDS`, like `readTosses`.
 */
export async function readFrames(dirOrFile: string): Promise<FrameRow[]> {
  return (await readTable(dirOrFile, 'frames', FRAME_FIELDS)) as FrameRow[];
}
