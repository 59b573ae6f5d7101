import { describe, expect, it } from 'vitest';
import { UNKNOWN, measured, percent, percentRange } from '../../src/report/format.ts';

describe('format', () => {
  it('writes rates as percentages with one decimal and unknowns as a dash', () => {
    expect(percent(0.5234)).toBe('52.3 %');
    expect(percent(null)).toBe(UNKNOWN);
    expect(percent(Number.NaN)).toBe(UNKNOWN);
    expect(percentRange({ lower: 0.4812, upper: 0.5639 })).toBe('48.1–56.4 %');
    expect(percentRange(null)).toBe(UNKNOWN);
  });
  it('gives measured values significant digits, integers as they are', () => {
    expect(measured(28.9412, 4)).toBe('28.94');
    expect(measured(0.000123456)).toBe('0.000123');
    expect(measured(33)).toBe('33');
    expect(measured('x')).toBe(UNKNOWN);
  });
});
