/**
 * The depth-moving set of the calibration issue: rendered clips whose coin moves 10–20 cm along the optical
 * axis during the flight (towards and away from the camera), at 480 and 1000 frames/s, 640x480 and 1280x720,
 * with the hand, sensor noise σ 2 and motion blur. Each spec states the depth change it wants; the depth speed
 * that gives it is worked out from the toss the seed draws (its launch speed and catch height fix the flight
 * time), and the camera distance is the nearest one that keeps the whole flight in the frame.
 */
import { STANDARD_GRAVITY } from '../../src/physics/index.ts';
import {
  buildMotion,
  projectPoint,
  resolveSynthOptions,
  sampleScenario,
  scenarioCamera,
  scenarioRanges,
  worldToCamera,
  type SynthOptions,
} from '../../src/synth/index.ts';
import type { ClipSpec } from './accuracySet.ts';

/** One clip of the depth set: the render options but the depth speed and distance, and the depth change wanted. */
export interface DepthClipSpec {
  name: string;
  captureFps: number;
  width: number;
  height: number;
  seed: number;
  launchSpeedMS: [number, number];
  /** Depth at the catch minus depth at the release, m (positive: away from the camera). */
  depthChangeM: number;
}

/** Pixels the coin's outline keeps from every frame edge during the flight. */
const MARGIN_PX = 8;

/** The render options of `spec` at camera distance `distanceM` and depth speed `depthSpeedMS`. */
function optionsOf(spec: DepthClipSpec, distanceM: number, depthSpeedMS: number): Omit<SynthOptions, 'outDir'> {
  return {
    count: 1,
    seed: spec.seed,
    captureFps: spec.captureFps,
    containerFps: 30,
    width: spec.width,
    height: spec.height,
    distanceM,
    noiseSigma: 2,
    exposureFraction: 0.5,
    hand: true,
    launchSpeedMS: spec.launchSpeedMS,
    depthSpeedMS: [depthSpeedMS, depthSpeedMS],
  };
}

/**
 * Resolves `spec` into render options: the depth speed that moves the coin by `depthChangeM` over the flight
 * the seed draws (depth is linear in time: the optical axis is horizontal), and the smallest camera distance,
 * from the coin about 40 px (640 wide) or 60 px (1280 wide) across at the release and up in 2% steps, at which
 * the coin's centre stays at least its radius plus 8 px inside the frame over the whole flight.
 */
export function depthClipOptions(spec: DepthClipSpec): ClipSpec {
  const probe = resolveSynthOptions({ outDir: '.', ...optionsOf(spec, 1, 0) });
  const sc0 = sampleScenario(scenarioRanges(probe), spec.seed, 0);
  // Flight time to the catch height: z(T) = u T − g T²/2 = catchDz (closed-form ballistic, common practice).
  const u = sc0.launchVelocityMS[2];
  const flightS = (u + Math.sqrt(u * u - 2 * STANDARD_GRAVITY * sc0.catchDzM)) / STANDARD_GRAVITY;
  const depthSpeed = spec.depthChangeM / flightS;
  const coinPx = spec.width >= 1280 ? 60 : 40;
  let distanceM = (probe.focalPx * (probe.coinDiameterMm / 1000)) / coinPx;
  for (let step = 0; step < 200; step++, distanceM *= 1.02) {
    const opts = resolveSynthOptions({ outDir: '.', ...optionsOf(spec, distanceM, depthSpeed) });
    const sc = sampleScenario(scenarioRanges(opts), spec.seed, 0);
    const motion = buildMotion(sc);
    const cam = scenarioCamera(sc);
    let inside = true;
    for (let q = 0; q <= 40 && inside; q++) {
      const t = motion.releaseTS + ((motion.catchTS - motion.releaseTS) * q) / 40;
      const c = motion.stateAt(t).center;
      const [x, y] = projectPoint(cam, c);
      const depth = worldToCamera(cam, c)[2];
      const r = (opts.focalPx * sc.coinRadiusM) / depth + MARGIN_PX;
      inside = x >= r && y >= r && x <= spec.width - 1 - r && y <= spec.height - 1 - r;
    }
    if (inside) return { name: spec.name, ...optionsOf(spec, distanceM, depthSpeed) };
  }
  throw new RangeError(`${spec.name}: no camera distance keeps the flight in the frame`);
}

/**
 * The depth set run by `npm run accuracy` (test/accuracy/depth.test.ts): 640x480 only, to keep the suite near
 * 90 s on two cores (1280x720 clips of the same kind were checked by hand; see the calibration issue's note).
 */
export const DEPTH_SET: DepthClipSpec[] = [
  { name: 'd480-away', captureFps: 480, width: 640, height: 480, seed: 41, launchSpeedMS: [2.1, 2.3], depthChangeM: 0.15 },
  { name: 'd480-toward', captureFps: 480, width: 640, height: 480, seed: 46, launchSpeedMS: [2.1, 2.3], depthChangeM: -0.15 },
  { name: 'd1000-toward', captureFps: 1000, width: 640, height: 480, seed: 43, launchSpeedMS: [2.0, 2.2], depthChangeM: -0.12 },
  { name: 'd1000-toward-b', captureFps: 1000, width: 640, height: 480, seed: 49, launchSpeedMS: [2.0, 2.2], depthChangeM: -0.16 },
];
