/**
 * Test helpers of the synth tests: the reference libraries, loaded the way DEPENDENCIES.md says.
 * - @techstark/opencv-js 4.12 (dev): an Emscripten "thenable", never awaited nor returned from an async
 *   function; loaded with createRequire, ready on onRuntimeInitialized, handed on wrapped as `{ cv }`.
 * - odex 2.0.4 (dev): the ODEX extrapolation integrator, through createRequire (its package ships .ts sources).
 * - jstat 1.9.6 (dev): distribution functions.
 */
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type Cv = any;

/** Resolves to `{ cv }` once OpenCV's runtime is initialised (60 s limit). */
export function loadOpenCv(): Promise<{ cv: Cv }> {
  return new Promise((resolve, reject) => {
    const cv: Cv = require('@techstark/opencv-js');
    const timer = setTimeout(() => reject(new Error('OpenCV did not initialise in 60 s')), 60_000);
    const done = (): void => {
      clearTimeout(timer);
      resolve({ cv });
    };
    if (typeof cv.Mat === 'function' && typeof cv.fitEllipse === 'function') done();
    else cv.onRuntimeInitialized = done;
  });
}

/** The part of odex's Solver the tests use. */
export interface OdexSolver {
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
/** odex (CommonJS), typed locally. */
export const odex = require('odex') as { Solver: new (n: number) => OdexSolver };

/** jStat's normal distribution functions. */
export const jStat = (require('jstat') as { jStat: { normal: { cdf(x: number, mean: number, sd: number): number } } }).jStat;
