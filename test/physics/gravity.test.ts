import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY } from '../../src/physics/gravity.ts';

describe('STANDARD_GRAVITY', () => {
  it('is the conventional standard acceleration of free fall, 9.80665 m/s² (3rd CGPM, 1901; exact by definition)', () => {
    expect(STANDARD_GRAVITY).toBe(9.80665);
  });
});
