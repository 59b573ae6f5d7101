/**
 * One toss's parameters, drawn from ranges with the study seed. Each clip index draws from its own
 * stream (`createRng(seed, clipIndex, 'scenario')`), so clip k is the same whatever the study's clip count.
 * Radians and SI units inside; the ranges come in the CLI's units (deg, rev/s, m/s, m).
 */
import { createRng } from './rng.ts';

/** A closed interval `[min, max]`; `min === max` is a fixed value. */
export type Range = readonly [number, number];

/** Which face is up before the toss. */
export type StartFaceChoice = 'heads' | 'tails' | 'random';

/** The ranges a study draws its tosses from (all read-only once resolved). */
export interface ScenarioRanges {
  /** Capture rate, frames/s. */
  readonly captureFps: number;
  /** Image width, px. */
  readonly width: number;
  /** Image height, px. */
  readonly height: number;
  /** Coin diameter, m. */
  readonly coinDiameterM: number;
  /** Coin thickness, m. */
  readonly coinThicknessM: number;
  /** Vertical launch speed u, m/s. */
  readonly launchSpeedMS: Range;
  /** Spin rate Ω/2π (precession of the normal about L), rev/s. */
  readonly spinRevS: Range;
  /** Precession angle ψ between the coin's axis and L, deg, within 0..90. */
  readonly precessionDeg: Range;
  /** Tilt β of L from the vertical, deg, within 0..90; `'precession'` sets β = ψ (the normal starts vertical). */
  readonly tiltDeg: Range | 'precession';
  /** Camera roll about the optical axis, deg. */
  readonly rollDeg: Range;
  /** Launch speed along the optical axis (away from the camera), m/s. */
  readonly depthSpeedMS: Range;
  /** Camera distance: depth of the release point along the optical axis, m. */
  readonly distanceM: number;
  /** Focal length, px. */
  readonly focalPx: number;
  /** Face up before the toss. */
  readonly startFace: StartFaceChoice;
  /** Number of tossers (T01, T02, ...), clips assigned in turn. */
  readonly tosserCount: number;
  /** Whether a hand holds the coin before release and catches it. */
  readonly hand: boolean;
}

/** One toss, fully specified (radians, SI units). */
export interface TossScenario {
  readonly clipIndex: number;
  readonly tossId: string;
  readonly tosser: string;
  readonly captureFps: number;
  readonly width: number;
  readonly height: number;
  readonly coinRadiusM: number;
  readonly coinThicknessM: number;
  readonly focalPx: number;
  /** Depth of the release point along the optical axis, m. */
  readonly cameraDistanceM: number;
  /** Height of the camera centre above the release point, m (puts the release in the lower part of the frame). */
  readonly cameraHeightM: number;
  readonly cameraRollRad: number;
  /** Release position, world, m (y = 0, z = 0: the world origin is level with the release, at its depth). */
  readonly releaseWorld: readonly [number, number, number];
  /** Launch velocity, world, m/s: [horizontal, depth, vertical u]. */
  readonly launchVelocityMS: readonly [number, number, number];
  readonly spinRevS: number;
  readonly precessionRad: number;
  readonly tiltRad: number;
  /** Horizontal direction of L (azimuth from +x towards +y), rad. */
  readonly lAzimuthRad: number;
  /** Initial turn of the coin about its own axis (orientation of the face pattern), rad. */
  readonly twistRad: number;
  readonly startFace: 'heads' | 'tails';
  /** Catch height minus release height, m. */
  readonly catchDzM: number;
  /** Whether the hand is drawn. */
  readonly hand: boolean;
  /** Time the coin rests in the hand before the throw starts, s (0 without the hand). */
  readonly restBeforeS: number;
  /** Distance the hand carries the coin while accelerating it to the launch velocity, m (0 without the hand). */
  readonly holdRiseM: number;
  /** Distance the hand sinks with the coin after the catch while stopping it, m. */
  readonly catchSinkM: number;
  /** Time the coin rests after the hand has stopped, s. */
  readonly restAfterS: number;
  /** Hand drawn mirrored (thumb on the right). */
  readonly handMirrored: boolean;
  /** Hand skin gray level, 0..255. */
  readonly handGray: number;
}

const DEG = Math.PI / 180;

/** A number drawn uniformly from a range (the range's value when it is a point). */
function draw(u: () => number, r: Range): number {
  return r[0] === r[1] ? r[0] : r[0] + (r[1] - r[0]) * u();
}

/**
 * Draws toss `clipIndex` (0-based) of a study from `ranges` with the study `seed`.
 * Deterministic: the same (ranges, seed, clipIndex) always give the same toss, and clips are independent.
 * Ids: `toss-0001`, ...; tossers `T01`, `T02`, ... in turn.
 */
export function sampleScenario(ranges: ScenarioRanges, seed: number, clipIndex: number): TossScenario {
  const rng = createRng(seed, clipIndex, 'scenario');
  const u = (): number => rng.uniform();
  // Fixed order of draws: add new draws at the end so older studies stay the same.
  const launchU = draw(u, ranges.launchSpeedMS);
  const spinRevS = draw(u, ranges.spinRevS);
  const psiRad = draw(u, ranges.precessionDeg) * DEG;
  const tiltRad = ranges.tiltDeg === 'precession' ? psiRad : draw(u, ranges.tiltDeg) * DEG;
  const rollRad = draw(u, ranges.rollDeg) * DEG;
  const depthSpeed = draw(u, ranges.depthSpeedMS);
  const startFace = ranges.startFace === 'random' ? (u() < 0.5 ? 'heads' : 'tails') : ranges.startFace;
  // L roughly along the camera's x axis (a thumb flip seen from the front), either sense, ±45°.
  const lAzimuthRad = (u() < 0.5 ? 0 : Math.PI) + (u() - 0.5) * (Math.PI / 2);
  const twistRad = u() * 2 * Math.PI;
  const horizontal = (u() - 0.5) * 0.16; // ±0.08 m/s
  // ±2 cm, and never above half the apex height u²/2g (the centre must come back down to it)
  const catchDzM = Math.min((u() - 0.5) * 0.04, (0.5 * launchU * launchU) / (2 * 9.80665));
  const holdRiseM = 0.02 + 0.025 * u();
  const restBeforeS = 0.005 + 0.015 * u();
  const catchSinkM = 0.02 + 0.02 * u();
  const restAfterS = 0.01 + 0.02 * u();
  const handMirrored = u() < 0.5;
  const handGray = 150 + 25 * u();
  const releaseFracX = (u() - 0.5) * 0.2; // release within ±10 % of the half width of the centre
  const releaseFracY = 0.74 + 0.06 * u(); // release 74–80 % down the frame

  const f = ranges.focalPx;
  const D = ranges.distanceM;
  const v0 = (ranges.height - 1) / 2;
  const releaseV = releaseFracY * (ranges.height - 1);
  const cameraHeightM = ((releaseV - v0) * D) / f;
  const releaseX = (releaseFracX * ((ranges.width - 1) / 2) * D) / f;
  const count = Math.max(1, ranges.tosserCount);
  return {
    clipIndex,
    tossId: `toss-${String(clipIndex + 1).padStart(4, '0')}`,
    tosser: `T${String((clipIndex % count) + 1).padStart(2, '0')}`,
    captureFps: ranges.captureFps,
    width: ranges.width,
    height: ranges.height,
    coinRadiusM: ranges.coinDiameterM / 2,
    coinThicknessM: ranges.coinThicknessM,
    focalPx: f,
    cameraDistanceM: D,
    cameraHeightM,
    cameraRollRad: rollRad,
    releaseWorld: [releaseX, 0, 0],
    launchVelocityMS: [horizontal, depthSpeed, launchU],
    spinRevS,
    precessionRad: psiRad,
    tiltRad,
    lAzimuthRad,
    twistRad,
    startFace,
    catchDzM,
    hand: ranges.hand,
    restBeforeS: ranges.hand ? restBeforeS : 0,
    holdRiseM: ranges.hand ? holdRiseM : 0,
    catchSinkM,
    restAfterS,
    handMirrored,
    handGray,
  };
}
