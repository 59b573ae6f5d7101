/**
 * Renders a synthetic study: for each clip, draw the toss, build its motion and camera, render and
 * encode the frames, and write `<clip>.truth.json`; then `manifest.csv` in the invented scenario of an
 * officials' academy filming trainee tosses (tossers T01, T02, ...).
 */
import { mkdir, rename, writeFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { encodeFrames } from '../video/index.ts';
import { createCamera } from './camera.ts';
import { computeTruth } from './clipTruth.ts';
import { buildMotion } from './motion.ts';
import { resolveSynthOptions, type ResolvedSynthOptions, type SynthOptions } from './options.ts';
import { createClipRenderer, frameCount } from './render.ts';
import { sampleScenario, type ScenarioRanges, type TossScenario } from './scenario.ts';
import { serializeTruth, type Truth } from './truth.ts';

/** The manifest's columns, in order. */
export const MANIFEST_COLUMNS = [
  'file', 'toss_id', 'capture_fps', 'coin_diameter_mm', 'coin_thickness_mm', 'tosser',
  'start_face', 'observed_face', 'landing', 'notes', 'focal_px',
] as const;

/** One written clip. */
export interface StudyClip {
  /** Absolute path of the video. */
  file: string;
  /** Absolute path of its truth file. */
  truthPath: string;
  /** The truth as written (rounded). */
  truth: Truth;
}

/** The scenario ranges of resolved options. */
export function scenarioRanges(o: ResolvedSynthOptions): ScenarioRanges {
  return {
    captureFps: o.captureFps,
    width: o.width,
    height: o.height,
    coinDiameterM: o.coinDiameterMm / 1000,
    coinThicknessM: o.coinThicknessMm / 1000,
    launchSpeedMS: o.launchSpeedMS,
    spinRevS: o.spinRevS,
    precessionDeg: o.precessionDeg,
    tiltDeg: o.tiltDeg,
    rollDeg: o.rollDeg,
    depthSpeedMS: o.depthSpeedMS,
    distanceM: o.distanceM,
    focalPx: o.focalPx,
    startFace: o.startFace,
    tosserCount: o.tosserCount,
    hand: o.hand,
  };
}

/** The camera of a scenario: level, at the scenario's distance and height, rolled. */
export function scenarioCamera(sc: TossScenario) {
  return createCamera({
    focalPx: sc.focalPx,
    width: sc.width,
    height: sc.height,
    centerWorld: [0, -sc.cameraDistanceM, sc.cameraHeightM],
    rollRad: sc.cameraRollRad,
  });
}

async function writeAtomic(path: string, text: string): Promise<void> {
  const tmp = `${path}.${process.pid}.partial`;
  await writeFile(tmp, text);
  await rename(tmp, path);
}

/**
 * Writes `manifest.csv` into `outDir` for the clips of `truths`, in order (columns {@link MANIFEST_COLUMNS};
 * notes: the trainee session, A for clips 1–8, B for 9–16, ...). Returns its absolute path.
 */
export async function writeManifest(outDir: string, truths: readonly Truth[]): Promise<string> {
  const rows = truths.map((t) => {
    const session = String.fromCharCode(65 + (Math.floor(t.clip_index / 8) % 26));
    return [
      t.file, t.toss_id, String(t.capture_fps), String(t.coin_diameter_mm), String(t.coin_thickness_mm),
      t.tosser, t.start_face, t.observed_face, t.landing,
      `trainee session ${session}${t.hand ? '' : ', tosser out of view'}`, String(t.focal_px),
    ];
  });
  const manifestPath = join(resolve(outDir), 'manifest.csv');
  await writeAtomic(manifestPath, stringify(rows, { header: true, columns: [...MANIFEST_COLUMNS] }));
  return manifestPath;
}

/**
 * Renders `options.count` clips into `options.outDir` (created if missing), each with its truth file, then
 * `manifest.csv`. Options are validated first (UsageError naming the CLI flag). Clips are rendered one after
 * another; each clip's frames are produced lazily while ffmpeg encodes them (bounded memory).
 *
 * @returns the clips written and the manifest's absolute path.
 */
export async function renderStudy(options: SynthOptions): Promise<{ clips: StudyClip[]; manifestPath: string }> {
  const o = resolveSynthOptions(options);
  const outDir = resolve(o.outDir);
  await mkdir(outDir, { recursive: true });
  const ranges = scenarioRanges(o);
  const codec = o.lossless ? 'ffv1' : 'h264';
  const clips: StudyClip[] = [];
  for (let k = 0; k < o.count; k++) {
    const index = o.startIndex + k;
    const sc = sampleScenario(ranges, o.seed, index);
    const motion = buildMotion(sc);
    const cam = scenarioCamera(sc);
    const fileName = `${sc.tossId}.${o.lossless ? 'mkv' : 'mp4'}`;
    const file = join(outDir, fileName);
    const renderer = createClipRenderer(motion, cam, {
      exposureFraction: o.exposureFraction,
      subExposures: o.subExposures,
      supersampling: o.supersampling,
      noiseSigma: o.noiseSigma,
      background: o.background,
      seed: o.seed,
    });
    const framesTotal = frameCount(motion);
    await encodeFrames(file, renderer.frames(), {
      width: o.width,
      height: o.height,
      pixFmt: 'gray',
      containerFps: o.containerFps,
      codec,
      crf: o.crf,
      preset: o.x264Preset,
    });
    const truth = computeTruth(motion, cam, {
      file: fileName,
      containerFps: o.containerFps,
      framesTotal,
      background: o.background,
      exposureFraction: o.exposureFraction,
      noiseSigma: o.noiseSigma,
      codec,
      seed: o.seed,
    });
    const text = serializeTruth(truth);
    const truthPath = join(outDir, `${sc.tossId}.truth.json`);
    await writeAtomic(truthPath, text);
    const written = JSON.parse(text) as Truth;
    clips.push({ file, truthPath, truth: written });
    o.onClip?.({ index, file, framesTotal });
  }
  const manifestPath = await writeManifest(outDir, clips.map((c) => c.truth));
  return { clips, manifestPath };
}
