/**
 * Test helper: loads @techstark/opencv-js (a dev dependency, the reference library of
 * the ellipse and moment tests). The module is an Emscripten "thenable": it is never
 * awaited nor returned from an async function, only handed on wrapped as `{ cv }`.
 */
import { createRequire } from 'node:module';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type Cv = any;

export function loadOpenCv(): Promise<{ cv: Cv }> {
  return new Promise((resolve, reject) => {
    const require = createRequire(import.meta.url);
    const cv: Cv = require('@techstark/opencv-js');
    const timer = setTimeout(() => reject(new Error('OpenCV did not initialise in 60 s')), 60_000);
    const done = (): void => {
      clearTimeout(timer);
      resolve({ cv });
    };
    if (typeof cv.Mat === 'function' && typeof cv.moments === 'function') done();
    else cv.onRuntimeInitialized = done;
  });
}
