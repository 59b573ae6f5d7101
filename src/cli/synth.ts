/**
 * `tossmeter synth`: renders clips of known motion (the test ground truth) with their truth files and
 * a manifest. Parses and checks the options, calls `renderStudy`, prints one line per clip.
 */
import type { Command } from '@commander-js/extra-typings';
import { optionError } from '../errors.ts';
import { renderStudy } from '../synth/study.ts';
import { SYNTH_DEFAULTS } from '../synth/options.ts';
import type { Range } from '../synth/scenario.ts';
import { X264_PRESETS } from '../video/index.ts';

/** A number option: any finite number. */
function numberArg(flag: string, what: string) {
  return (text: string): number => {
    const v = Number(text.trim());
    if (text.trim() === '' || !Number.isFinite(v)) throw optionError(flag, what, text);
    return v;
  };
}

/** An integer option. */
function intArg(flag: string, what: string) {
  return (text: string): number => {
    const v = Number(text.trim());
    if (text.trim() === '' || !Number.isInteger(v)) throw optionError(flag, what, text);
    return v;
  };
}

/** A range `min:max` (or one value, meaning min = max). */
function rangeArg(flag: string, unit: string) {
  return (text: string): Range => {
    const parts = text.split(':').map((s) => s.trim());
    const nums = parts.map(Number);
    const ok = (parts.length === 1 || parts.length === 2) && parts.every((p) => p !== '') && nums.every(Number.isFinite);
    if (!ok || (nums.length === 2 && nums[0] > nums[1])) throw optionError(flag, `a range min:max or one value (${unit})`, text);
    return nums.length === 1 ? [nums[0], nums[0]] : [nums[0], nums[1]];
  };
}

/** `WxH` in px. */
function sizeArg(text: string): { width: number; height: number } {
  const m = /^\s*(\d+)\s*[xX]\s*(\d+)\s*$/.exec(text);
  if (m === null) throw optionError('--size', 'a size WxH in px, e.g. 640x480', text);
  return { width: Number(m[1]), height: Number(m[2]) };
}

function choiceArg<T extends string>(flag: string, choices: readonly T[]) {
  return (text: string): T => {
    if (!(choices as readonly string[]).includes(text)) {
      const list = choices.map((c) => `"${c}"`);
      throw optionError(flag, list.length <= 2 ? list.join(' or ') : `one of ${list.join(', ')}`, text);
    }
    return text as T;
  };
}

const fmtRange = (r: Range): string => (r[0] === r[1] ? String(r[0]) : `${r[0]}:${r[1]}`);

/** Adds the `synth` command to `program`. */
export function registerSynth(program: Command): void {
  const d = SYNTH_DEFAULTS;
  program
    .command('synth')
    .description(
      'Render clips of tossed coins of known motion (ground truth): one video, one <clip>.truth.json per toss, and manifest.csv.',
    )
    .requiredOption('--out <dir>', 'folder for the clips, truth files and manifest.csv (created if missing)')
    .option('--count <n>', 'number of clips', intArg('--count', 'an integer from 1 to 100000'), d.count)
    .option('--seed <n>', 'study seed (same seed: same clips and byte-identical truth files)', intArg('--seed', 'an integer from 0 to 2147483647'), d.seed)
    .option('--fps <n>', 'capture rate, frames/s', numberArg('--fps', 'a frame rate'), d.captureFps)
    .option('--container-fps <n>', 'frame rate written into the container, frames/s (playback rate, unlike the capture rate)', numberArg('--container-fps', 'a frame rate'), d.containerFps)
    .option('--size <WxH>', `image size, px (even numbers for H.264; default ${d.width}x${d.height})`, sizeArg)
    .option('--coin-mm <mm>', 'coin diameter, mm', numberArg('--coin-mm', 'a diameter in mm'), d.coinDiameterMm)
    .option('--coin-thickness-mm <mm>', 'coin thickness, mm', numberArg('--coin-thickness-mm', 'a thickness in mm'), d.coinThicknessMm)
    .option('--launch-speed <min:max>', `vertical launch speed, m/s (default ${fmtRange(d.launchSpeedMS)})`, rangeArg('--launch-speed', 'm/s'))
    .option('--spin <min:max>', `spin rate (precession of the normal about L, |L|/I1/2π), rev/s (default ${fmtRange(d.spinRevS)})`, rangeArg('--spin', 'rev/s'))
    .option('--precession <min:max>', `precession angle between the coin's axis and L, deg in 0..90 (default ${fmtRange(d.precessionDeg)})`, rangeArg('--precession', 'deg'))
    .option('--tilt <min:max>', 'angle between L and the vertical, deg in 0..90 (default: equal to the precession, so the normal starts vertical)', rangeArg('--tilt', 'deg'))
    .option('--exposure <fraction>', 'exposure time as a fraction of the frame interval, 0..1 (motion blur)', numberArg('--exposure', 'a fraction of the frame interval from 0 to 1'), d.exposureFraction)
    .option('--noise <sigma>', 'sensor noise, Gaussian sigma in gray levels', numberArg('--noise', 'a gray-level sigma from 0 to 100'), d.noiseSigma)
    .option('--background <kind>', 'background: textured or plain', choiceArg('--background', ['textured', 'plain'] as const), d.background)
    .option('--hand', 'draw the hand that holds the coin before release and catches it (default)')
    .option('--no-hand', 'no hand: the clip starts at the release')
    .option('--distance <m>', 'camera distance (depth of the release point), m', numberArg('--distance', 'a positive number (m)'), d.distanceM)
    .option('--focal-px <px>', 'focal length, px (default: a 60° horizontal field of view)', numberArg('--focal-px', 'a positive number (px)'))
    .option('--roll <min:max>', `camera roll about the optical axis, deg (default ${fmtRange(d.rollDeg)})`, rangeArg('--roll', 'deg'))
    .option('--depth-speed <min:max>', `launch speed along the optical axis (away from the camera), m/s (default ${fmtRange(d.depthSpeedMS)})`, rangeArg('--depth-speed', 'm/s'))
    .option('--tosser-count <n>', 'number of tossers T01.., clips assigned in turn', intArg('--tosser-count', 'an integer from 1 to 99'), d.tosserCount)
    .option('--start-face <face>', 'face up before the toss: heads, tails or random', choiceArg('--start-face', ['heads', 'tails', 'random'] as const), d.startFace)
    .option('--lossless', 'lossless FFV1 in .mkv instead of H.264 (yuv420p) in .mp4')
    .option('--crf <n>', 'H.264 constant rate factor, 0 (best) to 51', numberArg('--crf', 'a constant rate factor from 0 to 51'), d.crf)
    .option('--x264-preset <name>', `libx264 speed preset (${X264_PRESETS.join(', ')})`, choiceArg('--x264-preset', X264_PRESETS), d.x264Preset)
    .option('--sub-exposures <n>', 'sub-exposures averaged over the exposure for motion blur', intArg('--sub-exposures', 'an integer from 1 to 64'), d.subExposures)
    .action(async (opts) => {
      const { clips, manifestPath } = await renderStudy({
        outDir: opts.out,
        count: opts.count,
        seed: opts.seed,
        captureFps: opts.fps,
        containerFps: opts.containerFps,
        width: opts.size?.width,
        height: opts.size?.height,
        coinDiameterMm: opts.coinMm,
        coinThicknessMm: opts.coinThicknessMm,
        launchSpeedMS: opts.launchSpeed,
        spinRevS: opts.spin,
        precessionDeg: opts.precession,
        tiltDeg: opts.tilt,
        exposureFraction: opts.exposure,
        noiseSigma: opts.noise,
        background: opts.background,
        hand: opts.hand !== false,
        distanceM: opts.distance,
        focalPx: opts.focalPx,
        rollDeg: opts.roll,
        depthSpeedMS: opts.depthSpeed,
        tosserCount: opts.tosserCount,
        startFace: opts.startFace,
        lossless: opts.lossless === true,
        crf: opts.crf,
        x264Preset: opts.x264Preset,
        subExposures: opts.subExposures,
        onClip: ({ index, file, framesTotal }) => process.stderr.write(`synth: clip ${index + 1}: ${file} (${framesTotal} frames)\n`),
      });
      process.stdout.write(`wrote ${clips.length} clips and ${manifestPath}\n`);
    });
}
