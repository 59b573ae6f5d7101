/**
 * One cell's value between the typed row and the text of a CSV file, and the checks that keep rows typed.
 * See `fields.ts` for the conventions (empty = null, the spreadsheet formula guard).
 */
import type { CellValue, Field } from './fields.ts';

/** A string that a spreadsheet would run as a formula, after any run of single quotes we added before. */
const FORMULA_START = /^'*[=+\-@\t\r]/;
/** Text written by `toCsvText` with the guard quote in front. */
const GUARDED = /^'+[=+\-@\t\r]/;

/** A dataset file or row that does not match its field list. */
export class DatasetError extends Error {
  override name = 'DatasetError';
}

/**
 * Checks one value against its field and returns it in canonical form: `''`, `NaN`, `±Infinity`
 * become `null`, `-0` becomes `0`. Throws `DatasetError` for a wrong type, a non-integer or
 * unsafe integer, a value outside the field's enum, or a missing required value.
 *
 * @param field - the column
 * @param value - the row's value (`undefined` counts as missing)
 * @param where - names the row in the error message, e.g. `tosses row 3`
 */
export function canonicalValue(field: Field, value: unknown, where: string): CellValue {
  let v: CellValue;
  if (value === null || value === undefined || value === '') v = null;
  else if (typeof value === 'number') {
    if (field.type !== 'number' && field.type !== 'integer') throw typeError(field, value, where);
    if (!Number.isFinite(value)) v = null;
    else {
      if (field.type === 'integer' && !Number.isSafeInteger(value)) {
        throw new DatasetError(`${where}, column ${field.name}: expected an integer but received ${String(value)}`);
      }
      v = Object.is(value, -0) ? 0 : value;
    }
  } else if (typeof value === 'string') {
    if (field.type !== 'string') throw typeError(field, value, where);
    if (field.enum !== undefined && !field.enum.includes(value)) {
      throw new DatasetError(
        `${where}, column ${field.name}: expected one of ${field.enum.join(', ')} but received ${JSON.stringify(value)}`,
      );
    }
    v = value;
  } else if (typeof value === 'boolean') {
    if (field.type !== 'boolean') throw typeError(field, value, where);
    v = value;
  } else {
    throw typeError(field, value, where);
  }
  if (v === null && field.required === true) {
    throw new DatasetError(`${where}, column ${field.name}: expected a value (the column is required) but the cell is empty`);
  }
  return v;
}

function typeError(field: Field, value: unknown, where: string): DatasetError {
  const shown = typeof value === 'string' ? JSON.stringify(value) : `${typeof value} ${String(value)}`;
  return new DatasetError(`${where}, column ${field.name}: expected a ${field.type} but received ${shown}`);
}

/**
 * The CSV text of a canonical value: `''` for null, `true`/`false`, numbers as JavaScript's
 * shortest round-trip representation (`String(n)`, e.g. `0.1`, `1e-7`), strings as they are
 * except for the formula guard (one `'` in front of text starting with `= + - @`, tab or CR).
 */
export function toCsvText(field: Field, value: CellValue): string {
  if (value === null) return '';
  if (typeof value === 'string') return FORMULA_START.test(value) ? `'${value}` : value;
  return String(value);
}

/**
 * The typed value of one CSV cell (inverse of `toCsvText`); throws `DatasetError` naming the place.
 *
 * @param field - the column
 * @param text - the cell's text, unquoted by the CSV parser
 * @param where - names the file and row in the error message
 */
export function fromCsvText(field: Field, text: string, where: string): CellValue {
  if (text === '') return canonicalValue(field, null, where);
  switch (field.type) {
    case 'string':
      return canonicalValue(field, GUARDED.test(text) ? text.slice(1) : text, where);
    case 'boolean':
      if (text === 'true') return true;
      if (text === 'false') return false;
      throw new DatasetError(`${where}, column ${field.name}: expected true or false but received ${JSON.stringify(text)}`);
    case 'integer':
    case 'number': {
      const n = field.type === 'integer' ? (/^[+-]?\d+$/.test(text) ? Number(text) : NaN) : Number(text.trim() === text ? text : NaN);
      if (!Number.isFinite(n)) {
        throw new DatasetError(`${where}, column ${field.name}: expected ${field.type === 'integer' ? 'an integer' : 'a number'} but received ${JSON.stringify(text)}`);
      }
      return canonicalValue(field, n, where);
    }
  }
}
