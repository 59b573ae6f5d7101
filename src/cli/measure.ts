/**
 * `tossmeter measure <input> --out <dir>`: measure every clip of a folder into a tidy dataset.
 * Parses options, calls `measureStudy`, prints progress and a closing table. No computation here.
 */
import { Command } from '@commander-js/extra-typings';
import { readFile } from 'node:fs/promises';
import cliProgress from 'cli-progress';
import { optionError, UsageError } from '../errors.ts';
import { measureStudy, type StudyResult } from '../pipeline/study.ts';
import type { ClipResult } from '../pipeline/clip.ts';
import { jobsCount, positive } from './optionParsers.ts';

function shardSpec(value: string): { index: number; count: number } {
  const m = /^(\d+)\/(\d+)$/.exec(value.trim());
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!(count >= 1 && index >= 1 && index <= count)) throw optionError('--shard', 'k/n with 1 ≤ k ≤ n', value);
  return { index, count };
}

/** The study gravity rate of a calibration file written by `tossmeter calibrate`. */
async function readCalibrationRate(file: string): Promise<number> {
  let cal: { format?: string; study?: { gravity_fps_median?: unknown } };
  try {
    cal = JSON.parse(await readFile(file, 'utf8'));
  } catch (err) {
    throw new UsageError(`calibration "${file}": cannot be read as JSON (${err instanceof Error ? err.message : String(err)})`);
  }
  const rate = cal?.study?.gravity_fps_median;
  if (cal?.format !== 'tossmeter-calibration' || typeof rate !== 'number' || !(rate > 0)) {
    throw new UsageError(`calibration "${file}": not a tossmeter calibration with a study gravity rate`);
  }
  return rate;
}

function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

function fmt(v: number | null, digits: number): string {
  return v === null ? '–' : v.toFixed(digits);
}

/** The closing table: clips ok / flagged / failed, medians and the same-side count. */
export function closingTable(result: StudyResult): string {
  const measured = result.tosses.filter((t) => t.status !== 'failed');
  const nums = (key: 'spin_rev_s' | 'precession_deg') =>
    measured.map((t) => t[key]).filter((v): v is number => typeof v === 'number');
  const same = measured.filter((t) => t.same_side_predicted === true).length;
  const withSide = measured.filter((t) => typeof t.same_side_predicted === 'boolean').length;
  const rows: [string, string][] = [
    ['clips ok', String(result.counts.ok)],
    ['clips flagged', `${result.counts.flagged} (${result.counts.unusable} with no rotation measured)`],
    ['clips failed', String(result.counts.failed)],
    ['median spin (rev/s)', fmt(median(nums('spin_rev_s')), 2)],
    ['median precession (deg)', fmt(median(nums('precession_deg')), 1)],
    ['same side predicted', `${same} of ${withSide}`],
    ['dataset', result.outDir],
  ];
  const width = Math.max(...rows.map((r) => r[0].length));
  return rows.map(([k, v]) => `  ${k.padEnd(width)}  ${v}`).join('\n') + '\n';
}

/** Exit code after Ctrl-C (SIGINT): 128 + 2, as shells report it (common practice, no source). */
export const EXIT_INTERRUPTED = 130;

/** Exit code after SIGTERM (a batch scheduler's stop): 128 + 15 (common practice, no source). */
export const EXIT_TERMINATED = 143;

/** What the tool prints when a study is stopped with Ctrl-C or SIGTERM. */
export const INTERRUPTED_MESSAGE = 'tossmeter: interrupted; nothing was written to the dataset. To resume, run the same command again: finished clips are kept.';

/** One progress line: `[3/12] clip.mp4: flagged (release_unseen), 410 frames/s`; `(kept from an earlier run)` for a cached clip. */
export function clipLine(r: ClipResult, index: number, count: number, cached = false): string {
  const t = r.toss;
  const what = t.status === 'failed' ? `failed: ${t.error}` : `${t.status}${t.flags ? ` (${t.flags})` : ''}`;
  const speed = cached ? ', kept from an earlier run' : r.framesPerSecond > 0 ? `, ${r.framesPerSecond.toFixed(0)} frames/s` : '';
  return `[${index + 1}/${count}] ${t.file}: ${what}${speed}\n`;
}

/** Adds the `measure` command to `program`. */
export function registerMeasure(program: Command): void {
  program
    .command('measure')
    .description('Measure every clip of a folder (or one clip) into a tidy dataset of tosses and frames.')
    .argument('<input>', 'a folder of clips (.mp4 .mov .avi .mkv) or one clip')
    .requiredOption('--out <dir>', 'output folder for the dataset')
    .option('--manifest <file>', 'manifest CSV (default: manifest.csv in the input folder, when present)')
    .option('--fps <n>', 'capture rate for clips the manifest does not cover, frames/s', positive('--fps'))
    .option('--coin-mm <d>', 'coin diameter for clips the manifest does not cover, mm (default 24.26)', positive('--coin-mm'))
    .option('--coin-thickness-mm <h>', 'coin thickness, mm (default 1.75)', positive('--coin-thickness-mm'))
    .option('--focal-px <f>', 'lens focal length in px, for the per-frame viewing ray', positive('--focal-px'))
    .option('--gravity <g>', 'local gravity, m/s² (default standard gravity 9.80665)', positive('--gravity'))
    .option('--jobs <n>', 'clips measured at once (default: the number of cores)', jobsCount('--jobs'))
    .option('--shard <k/n>', 'measure only shard k of n (split by a hash of toss_id; join with `tossmeter merge`)', shardSpec)
    .option('--fresh', 'measure every clip again, ignoring results kept in <out>/.tossmeter-cache by an earlier run')
    .option('--fps-from-gravity', 'for clips without a stated rate, adopt the study\'s median gravity-implied rate')
    .option('--calibration <file>', 'calibration.json from `tossmeter calibrate`: its gravity rate for clips without a stated rate')
    .option('--quiet', 'print nothing but errors')
    .action(async (input, o) => {
      const quiet = Boolean(o.quiet);
      const tty = process.stderr.isTTY === true;
      let bar: cliProgress.SingleBar | null = null;
      const started = Date.now();
      let frames = 0;
      // Ctrl-C (SIGINT) or a scheduler's SIGTERM: stop the clips in progress (their ffmpeg children and workers are
      // killed), write no dataset file, exit 130 (143 for SIGTERM). A second signal while stopping exits at once.
      const stop = new AbortController();
      let stopCode: number = EXIT_INTERRUPTED;
      const onSignal = (signal: NodeJS.Signals): void => {
        if (stop.signal.aborted) process.exit(stopCode);
        stopCode = signal === 'SIGTERM' ? EXIT_TERMINATED : EXIT_INTERRUPTED;
        stop.abort(new Error(`interrupted (${signal})`));
      };
      process.on('SIGINT', onSignal);
      process.on('SIGTERM', onSignal);
      let result: StudyResult;
      try {
        result = await measureStudy(
          {
            input,
            out: o.out,
            manifest: o.manifest,
            fps: o.fps,
            coinMm: o.coinMm,
            coinThicknessMm: o.coinThicknessMm,
            focalPx: o.focalPx,
            gravity: o.gravity,
            jobs: o.jobs,
            shard: o.shard,
            fresh: Boolean(o.fresh),
            fpsFromGravity: Boolean(o.fpsFromGravity),
            calibrationGravityFps: o.calibration ? await readCalibrationRate(o.calibration) : undefined,
            signal: stop.signal,
          },
          {
            onClip(r, index, count, info) {
              if (quiet) return;
              if (!info.cached) frames += r.frames.length;
              if (tty) {
                if (!bar) {
                  bar = new cliProgress.SingleBar(
                    { format: 'clip {value} of {total} | {bar} | {fps} frames/s | {eta_formatted} left', stream: process.stderr, hideCursor: true },
                    cliProgress.Presets.shades_classic,
                  );
                  bar.start(count, 0, { fps: '0' });
                }
                const fps = (frames / Math.max((Date.now() - started) / 1000, 1e-3)).toFixed(0);
                bar.update(index + 1, { fps });
              } else {
                process.stderr.write(clipLine(r, index, count, info.cached));
              }
            },
          },
        );
      } catch (err) {
        (bar as cliProgress.SingleBar | null)?.stop();
        if (!stop.signal.aborted) throw err;
        process.stderr.write(`${INTERRUPTED_MESSAGE}\n`);
        process.exitCode = stopCode;
        return;
      } finally {
        process.off('SIGINT', onSignal);
        process.off('SIGTERM', onSignal);
      }
      (bar as cliProgress.SingleBar | null)?.stop();
      if (!quiet) process.stdout.write(closingTable(result));
      // 1 when a clip failed or is flagged unusable (no rotation measured); a flag that leaves the rotation
      // measured (the release or catch not seen, a frame-rate warning) is in the table and the dataset.
      process.exitCode = result.counts.failed + result.counts.unusable > 0 ? 1 : 0;
    });
}
