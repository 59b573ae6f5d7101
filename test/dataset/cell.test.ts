import { describe, expect, it } from 'vitest';
import { DatasetError, canonicalValue, fromCsvText, toCsvText } from '../../src/dataset/cell.ts';
import type { Field } from '../../src/dataset/fields.ts';
import { AWKWARD_TEXT } from './fixtures.ts';

const text: Field = { name: 'notes', type: 'string', description: 'x.' };
const face: Field = { name: 'start_face', type: 'string', description: 'x.', enum: ['heads', 'tails'] };
const num: Field = { name: 'spin_rev_s', type: 'number', unit: 'rev/s', description: 'x.' };
const int: Field = { name: 'frame', type: 'integer', description: 'x.', required: true };
const bool: Field = { name: 'detected', type: 'boolean', description: 'x.' };

describe('cell', () => {
  it('canonicalValue: empty string, NaN and ±Infinity become null, -0 becomes 0', () => {
    expect(canonicalValue(text, '', 'r')).toBeNull();
    expect(canonicalValue(num, Number.NaN, 'r')).toBeNull();
    expect(canonicalValue(num, Number.NEGATIVE_INFINITY, 'r')).toBeNull();
    expect(Object.is(canonicalValue(num, -0, 'r'), 0)).toBe(true);
    expect(canonicalValue(num, undefined, 'r')).toBeNull();
  });

  it('canonicalValue rejects wrong types, non-integers, enum misses and empty required cells, naming the column', () => {
    expect(() => canonicalValue(num, '1.5', 'tosses row 2')).toThrow(new DatasetError('tosses row 2, column spin_rev_s: expected a number but received "1.5"'));
    expect(() => canonicalValue(int, 1.5, 'frames row 1')).toThrow('frames row 1, column frame: expected an integer but received 1.5');
    expect(() => canonicalValue(int, 2 ** 53, 'frames row 1')).toThrow(/expected an integer/);
    expect(() => canonicalValue(face, 'Heads', 'r')).toThrow('r, column start_face: expected one of heads, tails but received "Heads"');
    expect(() => canonicalValue(int, null, 'r')).toThrow('r, column frame: expected a value (the column is required) but the cell is empty');
    expect(() => canonicalValue(bool, 1, 'r')).toThrow('r, column detected: expected a boolean but received number 1');
    expect(() => canonicalValue(text, { a: 1 }, 'r')).toThrow(DatasetError);
  });

  it('numbers are written in the shortest round-trip form and read back exactly', () => {
    // ECMAScript Number::toString yields the shortest digits that round-trip (ECMA-262 Language Specification, Ecma International, 2024, §6.1.6.1.20).
    const values = [0, 1, -1, 0.1 + 0.2, 1e-7, 1.5e300, -2.5e-308, 5e-324, Number.MAX_SAFE_INTEGER, Math.PI, 1 / 3];
    for (const v of values) {
      const s = toCsvText(num, v);
      expect(s).toBe(String(v));
      expect(fromCsvText(num, s, 'r')).toBe(v);
    }
    expect(toCsvText(num, 0.30000000000000004)).toBe('0.30000000000000004');
    expect(toCsvText(bool, true)).toBe('true');
    expect(toCsvText(bool, false)).toBe('false');
    expect(toCsvText(num, null)).toBe('');
  });

  it('a string starting with = + - @ tab or CR gets one leading quote; numbers never do', () => {
    expect(toCsvText(text, '=SUM(A1)')).toBe("'=SUM(A1)");
    expect(toCsvText(text, '+1')).toBe("'+1");
    expect(toCsvText(text, '-x')).toBe("'-x");
    expect(toCsvText(text, '@x')).toBe("'@x");
    expect(toCsvText(text, '\tx')).toBe("'\tx");
    expect(toCsvText(text, "'=x")).toBe("''=x"); // keeps the guard reversible
    expect(toCsvText(text, "'plain")).toBe("'plain");
    expect(toCsvText(text, 'a=b')).toBe('a=b');
    expect(toCsvText(num, -1.5)).toBe('-1.5');
  });

  it('fromCsvText undoes toCsvText for every awkward string', () => {
    for (const s of AWKWARD_TEXT) expect(fromCsvText(text, toCsvText(text, s), 'r')).toBe(s);
  });

  it('fromCsvText rejects text that is not of the column type, naming the place', () => {
    expect(() => fromCsvText(num, 'abc', 'tosses.csv row 4')).toThrow('tosses.csv row 4, column spin_rev_s: expected a number but received "abc"');
    expect(() => fromCsvText(num, ' 1', 'r')).toThrow(/expected a number/);
    expect(() => fromCsvText(int, '1.0', 'r')).toThrow('r, column frame: expected an integer but received "1.0"');
    expect(() => fromCsvText(bool, 'TRUE', 'r')).toThrow('r, column detected: expected true or false but received "TRUE"');
    expect(fromCsvText(int, '-12', 'r')).toBe(-12);
    expect(fromCsvText(bool, '', 'r')).toBeNull();
  });
});
