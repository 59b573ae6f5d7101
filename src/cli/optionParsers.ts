/**
 * Parsers for command-line option values, shared by the commands; each throws the one argument-error shape of
 * `optionError` (exit code 2).
 */
import { optionError } from '../errors.ts';

/** A parser for a positive number (`--fps 1000`). */
export function positive(option: string): (value: string) => number {
  return (value: string): number => {
    const n = Number(value);
    if (!(value.trim() !== '' && Number.isFinite(n) && n > 0)) throw optionError(option, 'a positive number', value);
    return n;
  };
}

/** A parser for a whole number from 1 to 64 (`--jobs 4`). */
export function jobsCount(option: string): (value: string) => number {
  return (value: string): number => {
    const n = Number(value);
    if (!(/^\d+$/.test(value.trim()) && n >= 1 && n <= 64)) throw optionError(option, 'an integer from 1 to 64', value);
    return n;
  };
}
