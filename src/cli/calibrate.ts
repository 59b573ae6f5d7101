/**
 * `tossmeter calibrate <input> --out <dir>`: measures the clips and reports, per clip and for the study, the
 * container rate, the stated rate, the rate gravity implies, the scale, the roll, the depth range and the
 * dropped frames; writes the dataset and `calibration.json` into --out.
 */
import { Command } from '@commander-js/extra-typings';
import { join } from 'node:path';
import { atomicWriteFile } from '../dataset/index.ts';
import { STANDARD_GRAVITY } from '../physics/index.ts';
import { measureStudy } from '../pipeline/study.ts';
import { calibrationFromTosses, calibrationTable } from '../pipeline/calibrate.ts';
import { jobsCount, positive } from './optionParsers.ts';

/** Adds the `calibrate` command to `program`. */
export function registerCalibrate(program: Command): void {
  program
    .command('calibrate')
    .description('Check frame rate, scale, camera roll, depth and dropped frames from the clips themselves.')
    .argument('<input>', 'a folder of clips or one clip')
    .requiredOption('--out <dir>', 'output folder (the measured dataset and calibration.json)')
    .option('--manifest <file>', 'manifest CSV (default: manifest.csv in the input folder)')
    .option('--fps <n>', 'stated capture rate for clips the manifest does not cover, frames/s', positive('--fps'))
    .option('--coin-mm <d>', 'coin diameter for clips the manifest does not cover, mm (default 24.26)', positive('--coin-mm'))
    .option('--coin-thickness-mm <h>', 'coin thickness, mm (default 1.75)', positive('--coin-thickness-mm'))
    .option('--focal-px <f>', 'focal length, px (for depth in metres)', positive('--focal-px'))
    .option('--gravity <g>', 'local gravity, m/s² (default 9.80665)', positive('--gravity'))
    .option('--jobs <n>', 'clips measured at once', jobsCount('--jobs'))
    .action(async (input, o) => {
      const gravity = o.gravity ?? STANDARD_GRAVITY;
      const result = await measureStudy({ input, out: o.out, manifest: o.manifest, fps: o.fps, coinMm: o.coinMm, coinThicknessMm: o.coinThicknessMm, focalPx: o.focalPx, gravity, jobs: o.jobs });
      const cal = calibrationFromTosses(result.tosses, gravity);
      await atomicWriteFile(join(o.out, 'calibration.json'), JSON.stringify(cal, null, 2) + '\n');
      process.stdout.write(calibrationTable(cal));
      process.stdout.write(`calibration written to ${join(result.outDir, 'calibration.json')}\n`);
      process.exitCode = result.counts.failed > 0 || cal.study.fps_mismatch_clips > 0 ? 1 : 0;
    });
}
