import { describe, expect, it } from 'vitest';
import * as physics from '../../src/physics/index.ts';

// The contract of src/physics/ in DEVELOPERS.md ("Module contracts"): other modules import these names.
describe('src/physics/index.ts', () => {
  it('re-exports every name of the DEVELOPERS.md contract', () => {
    const functions = [
      'dot', 'cross', 'norm', 'normalize', 'add', 'sub', 'scale', 'rotationAbout', 'matMul', 'matVec', 'transpose',
      'identity3', 'matColumn', 'matFromColumns',
      'discInertia',
      'precessionFrame', 'normalAt', 'precessionFromState', 'attitudeAt', 'angularVelocityAt',
      'upComponent', 'faceChanges',
      'sameSideFraction', 'sameSideVertical',
      'ballisticPosition', 'ballisticVelocity', 'apexHeight', 'flightTime',
      'halfTurns', 'bandBoundaryOmega', 'bandFace',
    ];
    for (const name of functions) expect(typeof (physics as Record<string, unknown>)[name], name).toBe('function');
    expect(physics.STANDARD_GRAVITY).toBe(9.80665);
  });
});
