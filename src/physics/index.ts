/** The physics core: closed forms of the coin's flight and rotation (radians, SI units). */
export * from './vec3.ts';
export * from './gravity.ts';
export * from './disc.ts';
export * from './precession.ts';
export * from './upFace.ts';
export * from './sameSide.ts';
export * from './ballistic.ts';
export * from './bands.ts';
