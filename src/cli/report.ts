/**
 * `tossmeter report <dir>`: writes one self-contained HTML report of a measured dataset (`buildReport`) and
 * prints its path. No computation here.
 */
import { stat } from 'node:fs/promises';
import { resolve } from 'node:path';
import type { Command } from '@commander-js/extra-typings';
import { DatasetError } from '../dataset/index.ts';
import { UsageError, optionError } from '../errors.ts';
import { buildReport } from '../report/index.ts';
import type { CliOutput } from './plan.ts';

const stdout: CliOutput = { write: (text) => void process.stdout.write(text) };

function integerOption(option: string, text: string, min: number, max: number): number {
  const value = /^\s*\d+\s*$/.test(text) ? Number(text) : Number.NaN;
  if (!(value >= min && value <= max)) throw optionError(option, `an integer from ${min} to ${max}`, text);
  return value;
}

const isDir = (p: string): Promise<boolean> => stat(p).then((s) => s.isDirectory(), () => false);

/**
 * Registers `report <dir> [--out <file>] [--clips <dir>] [--detail <n>] [--seed <n>]`.
 * `<dir>` is a dataset folder written by `tossmeter measure`; the report goes to `<dir>/report.html` unless
 * `--out` says otherwise; `--clips` is the folder of the clips (default: the measure run's input folder);
 * `--detail` is how many tosses get a card (default 50, flagged first); `--seed` seeds the summary's bootstrap
 * (default 1). Bad options or an unreadable dataset throw a UsageError (exit code 2 in the CLI main).
 * @param program - the root command
 * @param output - where the report's path is printed; default standard output
 */
export function registerReport(program: Command, output: CliOutput = stdout): void {
  program
    .command('report')
    .description('Write a self-contained HTML report of a measured study: summary, plots, per-toss checks.')
    .argument('<dir>', 'dataset folder written by tossmeter measure')
    .option('--out <file>', 'report file (default: <dir>/report.html)')
    .option('--clips <dir>', 'folder of the measured clips, for the frame strips (default: the input of the measure run)')
    .option('--detail <n>', 'tosses shown one by one, flagged first', '50')
    .option('--seed <n>', 'seed of the bootstrap', '1')
    .action(async (dir, opts) => {
      const detail = integerOption('--detail', opts.detail, 0, 100_000);
      const seed = integerOption('--seed', opts.seed, 0, 4294967295);
      if (!(await isDir(resolve(dir)))) throw optionError('<dir>', 'a dataset folder written by tossmeter measure', dir);
      if (opts.clips !== undefined && !(await isDir(resolve(opts.clips)))) throw optionError('--clips', 'a folder of clips', opts.clips);
      if (opts.out !== undefined && (opts.out.trim() === '' || (await isDir(resolve(opts.out))))) {
        throw optionError('--out', 'a file name for the report', opts.out);
      }
      let file: string;
      try {
        file = await buildReport(dir, { out: opts.out, clipsDir: opts.clips, maxTossesWithDetail: detail, seed });
      } catch (err) {
        if (err instanceof DatasetError) throw new UsageError(err.message);
        throw err;
      }
      output.write(`${file}\n`);
    });
}
