/**
 * The study manifest: a CSV file beside the clips, one row per clip, only `file` required.
 *
 * Columns (header row required, names case-insensitive, in any order): `file, toss_id, capture_fps,
 * coin_diameter_mm, coin_thickness_mm, tosser, start_face (heads|tails), observed_face (heads|tails),
 * landing (caught|surface), notes, focal_px`. Other columns are kept, as text, in `extra`.
 * A UTF-8 BOM, CRLF line ends and a semicolon delimiter (detected from the header line) are accepted;
 * an empty cell means "not given".
 *
 * Row numbers in messages count data rows from 1: the first row after the header is row 1;
 * blank lines are not counted. (A spreadsheet shows row N as its row N + 1.)
 */
import { readFile } from 'node:fs/promises';
import { dirname, posix, resolve, win32 } from 'node:path';
import { parse } from 'csv-parse/sync';
import { z } from 'zod';
import { UsageError } from '../errors.ts';

/** A manifest that cannot be used; the message names the file, the row, the column and what was expected. */
export class ManifestError extends UsageError {
  override name = 'ManifestError';
  constructor(
    message: string,
    /** The manifest as named in the message. */
    readonly file: string,
    /** 1-based data row (header not counted), when the problem is in a row. */
    readonly row?: number,
    /** The column's name, when the problem is in one column. */
    readonly column?: string,
  ) {
    super(message);
  }
}

/** True when `p` names a file inside the manifest's folder: relative, no `..` segment, not empty. */
function staysInFolder(p: string): boolean {
  if (p.includes('\0') || posix.isAbsolute(p) || win32.isAbsolute(p) || /^[A-Za-z]:/.test(p)) return false;
  const parts = p.split(/[\\/]/);
  return !parts.includes('..') && parts.some((s) => s !== '' && s !== '.');
}

/** The default toss id: the clip's file name without folder and extension. */
function tossIdFromFile(file: string): string {
  return posix.parse(file.replace(/\\/g, '/')).name;
}

const positiveNumber = z
  .string()
  .trim()
  .min(1)
  .pipe(z.coerce.number())
  .refine((n) => Number.isFinite(n) && n > 0);
const text = z.string().trim().min(1);
const face = z.string().trim().toLowerCase().pipe(z.enum(['heads', 'tails']));

/**
 * One manifest row, from cell texts keyed by camelCase field (absent = empty cell) to typed values.
 * `tossId` defaults to the file name without its extension.
 */
export const ManifestRowSchema = z
  .object({
    file: text.refine(staysInFolder),
    tossId: text.optional(),
    captureFps: positiveNumber.optional(),
    coinDiameterMm: positiveNumber.optional(),
    coinThicknessMm: positiveNumber.optional(),
    tosser: text.optional(),
    startFace: face.optional(),
    observedFace: face.optional(),
    landing: z.string().trim().toLowerCase().pipe(z.enum(['caught', 'surface'])).optional(),
    notes: text.optional(),
    focalPx: positiveNumber.optional(),
    /** Cells of columns the manifest format does not know, by their header name. */
    extra: z.record(z.string(), z.string()).default({}),
  })
  .transform((r) => ({ ...r, tossId: r.tossId ?? tossIdFromFile(r.file) }));

/** A parsed manifest row (camelCase, units in the names). */
export type ManifestRow = z.output<typeof ManifestRowSchema>;
type RowKey = Exclude<keyof ManifestRow, 'extra'>;

/** Column name → row key, in the documented column order. */
const COLUMNS: Readonly<Record<string, RowKey>> = {
  file: 'file',
  toss_id: 'tossId',
  capture_fps: 'captureFps',
  coin_diameter_mm: 'coinDiameterMm',
  coin_thickness_mm: 'coinThicknessMm',
  tosser: 'tosser',
  start_face: 'startFace',
  observed_face: 'observedFace',
  landing: 'landing',
  notes: 'notes',
  focal_px: 'focalPx',
};

const EXPECTED: Readonly<Record<RowKey, string>> = {
  file: 'a clip path relative to the manifest\'s folder (not absolute, no "..")',
  tossId: 'a toss id',
  captureFps: 'a positive number',
  coinDiameterMm: 'a positive number',
  coinThicknessMm: 'a positive number',
  tosser: 'a name',
  startFace: 'heads or tails',
  observedFace: 'heads or tails',
  landing: 'caught or surface',
  notes: 'text',
  focalPx: 'a positive number',
};

/** A parsed manifest. */
export interface Manifest {
  /** The manifest file as given to `readManifest` (or the label given to `parseManifest`). */
  readonly file: string;
  /** The folder that clip paths are relative to (absolute for `readManifest`). */
  readonly dir: string;
  /** Header names as written (trimmed). */
  readonly columns: readonly string[];
  readonly rows: readonly ManifestRow[];
}

/** `,` or `;`: whichever occurs more often outside quotes in the header line (comma on a tie). */
function detectDelimiter(textIn: string): ',' | ';' {
  let commas = 0;
  let semicolons = 0;
  let quoted = false;
  for (const ch of textIn) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === '\n' || ch === '\r')) break;
    else if (!quoted && ch === ',') commas++;
    else if (!quoted && ch === ';') semicolons++;
  }
  return semicolons > commas ? ';' : ',';
}

const UTF8 = new TextDecoder('utf-8', { fatal: true });

/**
 * Parses manifest text. Given bytes, it checks that every cell is UTF-8 (and says which row and column is not);
 * given a string, it takes it as already decoded. Does not touch the file system.
 *
 * @param input - the manifest's bytes or text
 * @param fileLabel - how messages name the manifest (e.g. its path)
 * @param dir - folder the clip paths are relative to (default `.`)
 * @throws ManifestError for anything that does not fit the format
 */
export function parseManifest(input: string | Uint8Array, fileLabel: string, dir = '.'): Manifest {
  const fail = (where: string, message: string, row?: number, column?: string): never => {
    throw new ManifestError(`${fileLabel} ${where}: ${message}`, fileLabel, row, column);
  };
  let source: string;
  let decode: (cell: string) => string | undefined;
  if (typeof input === 'string') {
    source = input.replace(/^\uFEFF/, '');
    decode = (cell) => cell;
  } else {
    const bytes = input[0] === 0xef && input[1] === 0xbb && input[2] === 0xbf ? input.subarray(3) : input;
    // latin1 maps each byte to one char, so the CSV structure (all ASCII) is kept and each cell's bytes are recoverable
    source = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1');
    decode = (cell) => {
      try {
        return UTF8.decode(Buffer.from(cell, 'latin1'));
      } catch {
        return undefined;
      }
    };
  }

  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(source, {
      delimiter: detectDelimiter(source),
      relax_column_count: true,
      skip_empty_lines: true,
      info: true,
    }) as unknown as typeof records;
  } catch (err) {
    const e = err as { lines?: number; message: string };
    return fail(`line ${e.lines ?? '?'}`, `not readable as CSV (${e.message})`);
  }
  const headerRecord = records[0];
  if (headerRecord === undefined) return fail('header', 'expected a header row with a "file" column but the file is empty');

  const columns = headerRecord.record.map((raw, i) => {
    const name = decode(raw);
    if (name === undefined) return fail('header', `column ${i + 1}: expected UTF-8 text but found bytes that are not UTF-8 (save the manifest as UTF-8)`);
    return name.trim();
  });
  const keys = columns.map((c) => COLUMNS[c.toLowerCase()]);
  const seen = new Set<string>();
  columns.forEach((c, i) => {
    const norm = keys[i] !== undefined ? c.toLowerCase() : c;
    if (c !== '' && seen.has(norm)) fail('header', `column ${c}: expected each column once but it appears twice`);
    seen.add(norm);
  });
  if (!keys.includes('file')) {
    fail('header', `expected a column named "file" but found ${columns.map((c) => JSON.stringify(c)).join(', ')}`);
  }

  const rows: ManifestRow[] = [];
  const rowOfId = new Map<string, number>();
  records.slice(1).forEach(({ record }, i) => {
    const row = i + 1;
    const cells = record.map((raw, c) => {
      const cell = decode(raw);
      if (cell === undefined) {
        const col = columns[c] || `#${c + 1}`;
        fail(`row ${row}, column ${col}`, 'expected UTF-8 text but found bytes that are not UTF-8 (save the manifest as UTF-8)', row, col);
      }
      return (cell as string).trim();
    });
    if (cells.every((c) => c === '')) return; // a row of empty cells, as spreadsheets leave them
    cells.forEach((cell, c) => {
      if (cell !== '' && (c >= columns.length || columns[c] === '')) {
        fail(`row ${row}`, `expected at most ${columns.filter((n) => n !== '').length} cells, one per named header column, but found a value ${JSON.stringify(cell)} in cell ${c + 1}`, row);
      }
    });
    const input: Record<string, unknown> = {};
    const extra: Record<string, string> = {};
    columns.forEach((name, c) => {
      const cell = cells[c] ?? '';
      if (cell === '' || name === '') return;
      const key = keys[c];
      if (key === undefined) extra[name] = cell;
      else input[key] = cell;
    });
    input.extra = extra;
    const parsed = ManifestRowSchema.safeParse(input);
    if (!parsed.success) {
      const key = (parsed.error.issues[0]?.path[0] ?? 'file') as RowKey;
      const col = columns[keys.indexOf(key)] ?? 'file';
      const received = input[key];
      const what = received === undefined ? 'the cell is empty' : `received ${JSON.stringify(received)}`;
      return fail(`row ${row}, column ${col}`, `expected ${EXPECTED[key]} but ${what}`, row, col);
    }
    const first = rowOfId.get(parsed.data.tossId);
    if (first !== undefined) {
      const fromFile = input.tossId === undefined ? ' (taken from the file name; give each row a toss_id)' : '';
      fail(`row ${row}, column toss_id`, `expected a unique toss_id but received ${JSON.stringify(parsed.data.tossId)}${fromFile}, already used in row ${first}`, row, 'toss_id');
    }
    rowOfId.set(parsed.data.tossId, row);
    rows.push(parsed.data);
  });
  return { file: fileLabel, dir, columns, rows };
}

/**
 * Reads and checks a manifest file. Clip paths in it are relative to the manifest's folder.
 *
 * @param file - path of the manifest CSV; messages name it as given
 * @throws ManifestError when the file is missing or does not fit the format (see `parseManifest`)
 */
export async function readManifest(file: string): Promise<Manifest> {
  let bytes: Uint8Array;
  try {
    bytes = await readFile(file);
  } catch (err) {
    throw new ManifestError(`${file}: cannot read the manifest (${(err as NodeJS.ErrnoException).code ?? String(err)})`, file);
  }
  return parseManifest(bytes, file, dirname(resolve(file)));
}
