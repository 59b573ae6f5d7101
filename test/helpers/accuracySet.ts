/**
 * The accuracy sets: rendered studies of known motion spanning capture rates, sizes, spin, precession and
 * launch speed, with noise, motion blur and the hand. Each entry renders one clip into its own sub-folder
 * and the clips are then gathered into one study folder with one manifest.
 */
import { copyFile, mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { renderStudy, writeManifest, type SynthOptions } from '../../src/synth/index.ts';
import type { Truth } from '../../src/synth/truth.ts';

export type ClipSpec = Omit<SynthOptions, 'outDir' | 'count'> & { name: string };

/**
 * Camera distance for a clip: the coin about 40 px across at 640x480 and 60 px at 1280x720 (60° field of view),
 * or farther when the highest toss of `launchSpeedMS` would leave the frame: the apex u²/2g plus a coin's width
 * must fit above the lowest release (74 % down the frame, `sampleScenario`) with 10 px to spare. A lab frames the
 * whole flight; a clip whose coin leaves the frame is flagged `out_of_frame` and would not test the rest.
 */
function distanceFor(width: number, height: number, launchSpeedMS: [number, number]): number {
  const focal = width / 2 / Math.tan(Math.PI / 6);
  const coinM = 0.02426;
  const coinPx = width >= 1280 ? 60 : 40;
  const apexM = launchSpeedMS[1] ** 2 / (2 * 9.80665);
  const roomPx = 0.74 * (height - 1) - 10;
  return Math.max((focal * coinM) / coinPx, (focal * (apexM + coinM)) / roomPx);
}

const base = (fps: number, width: number, height: number, seed: number, launchSpeedMS: [number, number]): Omit<ClipSpec, 'name'> => ({
  seed,
  captureFps: fps,
  containerFps: 30,
  width,
  height,
  distanceM: distanceFor(width, height, launchSpeedMS),
  noiseSigma: 2,
  exposureFraction: 0.5,
  hand: true,
  launchSpeedMS,
});

/**
 * The full set of the measure issue (run by `npm run accuracy`): launch speeds from 1.5 to 3.5 m/s, coins 20–60 px
 * across (the faster tosses filmed from farther away to keep the flight in the frame).
 */
export const FULL_SET: ClipSpec[] = [
  { name: 'a240', ...base(240, 640, 480, 11, [1.8, 2]), spinRevS: [15, 40] },
  { name: 'a240-fast', ...base(240, 640, 480, 12, [1.8, 2]), spinRevS: [56, 60] },
  { name: 'a480', ...base(480, 640, 480, 13, [2, 2.3]) },
  { name: 'a480-hd', ...base(480, 1280, 720, 14, [3.3, 3.5]) },
  { name: 'a1000', ...base(1000, 640, 480, 15, [2.2, 2.5]) },
  { name: 'a1000-hd', ...base(1000, 1280, 720, 16, [2.6, 2.9]) },
  { name: 'a1000-wobble', ...base(1000, 640, 480, 17, [1.9, 2.1]), precessionDeg: [30, 40] },
  { name: 'a1000-spin60', ...base(1000, 640, 480, 18, [2, 2.2]), spinRevS: [55, 60] },
  { name: 'a2000', ...base(2000, 640, 480, 19, [1.5, 1.7]) },
  { name: 'a2000-hd', ...base(2000, 1280, 720, 20, [1.6, 1.8]) },
];

/** A fast subset for `npm test`. */
export const FAST_SET: ClipSpec[] = [
  { name: 'f500', ...base(500, 640, 480, 31, [1.5, 1.8]), spinRevS: [15, 30] },
  { name: 'f1000', ...base(1000, 640, 480, 32, [1.5, 1.8]) },
];

/** Renders `specs` into `dir` (one study: clips, truth files and a merged manifest.csv). */
export async function renderSet(dir: string, specs: ClipSpec[]): Promise<void> {
  await mkdir(dir, { recursive: true });
  const truths: Truth[] = [];
  for (const spec of specs) {
    const { name, ...opts } = spec;
    const { clips } = await renderStudy({ ...opts, outDir: join(dir, '.render', name), count: 1 });
    for (const clip of clips) {
      await copyFile(clip.file, join(dir, `${name}.mp4`));
      await copyFile(clip.truthPath, join(dir, `${name}.truth.json`));
      truths.push({ ...clip.truth, file: `${name}.mp4`, toss_id: name });
    }
  }
  await writeManifest(dir, truths);
}
