/**
 * `tossmeter summarize <dir>`: reads a dataset's toss table, summarises it (`summarizeStudy`), prints a table
 * and writes `summary.json` and `summary.csv` (one row per group, `summaryRows`). No computation here.
 */
import { mkdir, stat } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import type { Command } from '@commander-js/extra-typings';
import { stringify } from 'csv-stringify/sync';
import { DatasetError, atomicWriteFile, readTosses } from '../dataset/index.ts';
import { UsageError, optionError } from '../errors.ts';
import { QUANTITY_COLUMNS, summarizeStudy, type GroupSummary, type StudySummary } from '../stats/summarize.ts';
import { summaryRows } from '../stats/summaryRows.ts';
import type { ProportionInterval } from '../stats/wilson.ts';
import type { CliOutput } from './plan.ts';

const stdout: CliOutput = { write: (text) => void process.stdout.write(text) };

function integerOption(option: string, text: string, min: number, max: number): number {
  const value = /^\s*\d+\s*$/.test(text) ? Number(text) : Number.NaN;
  if (!(value >= min && value <= max)) throw optionError(option, `an integer from ${min} to ${max}`, text);
  return value;
}

const fixed = (v: number | null, digits: number): string => (v === null ? '-' : v.toFixed(digits));
const span = (i: ProportionInterval | null, digits = 4): string =>
  i === null ? '-' : `${i.lower.toFixed(digits)}-${i.upper.toFixed(digits)}`;

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (cells: string[]): string => cells.map((s, c) => s.padEnd(widths[c])).join('  ').trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n') + '\n';
}

const groupName = (g: GroupSummary): string => (g.kind === 'study' ? 'all' : g.tosser === '' ? '(none)' : g.tosser!);

/** The summary as readable tables (our own labels). */
function formatSummary(summary: StudySummary): string {
  const pct = Math.round(summary.confidence * 100);
  const groups = [summary.study, ...summary.tossers];
  const outcome = table(
    ['tosser', 'tosses', 'ok', 'flagged', 'failed', 'same side', 'rate', `score ${pct}%`, `exact ${pct}%`,
      `pooled [${pct}%]`, `model [bootstrap ${pct}%]`, 'face calls'],
    groups.map((g) => [
      groupName(g),
      String(g.tosses),
      String(g.ok),
      String(g.flagged),
      String(g.failed),
      `${g.observedSameSide.count}/${g.observedSameSide.n}`,
      fixed(g.observedSameSide.rate, 4),
      span(g.observedSameSide.wilson),
      span(g.observedSameSide.clopperPearson),
      g.pooledSameSide === null ? '-' : `${g.pooledSameSide.rate.toFixed(4)} [${span(g.pooledSameSide)}]`,
      g.predictedSameSide.mean === null
        ? '-'
        : `${g.predictedSameSide.mean.toFixed(4)} [${span(g.predictedSameSide.bootstrap)}]`,
      g.faceAgreement.n === 0 ? '-' : `${g.faceAgreement.count}/${g.faceAgreement.n} (${fixed(g.faceAgreement.rate, 3)})`,
    ]),
  );
  const labels: Record<(typeof QUANTITY_COLUMNS)[number], string> = {
    spin_rev_s: 'spin rev/s',
    precession_deg: 'precession deg',
    launch_speed_m_s: 'launch m/s',
    flight_time_s: 'flight s',
  };
  const motion = table(
    ['tosser', ...QUANTITY_COLUMNS.map((c) => `${labels[c]} median [5%, 95%]`), 'never turned'],
    groups.map((g) => [
      groupName(g),
      ...QUANTITY_COLUMNS.map((c) => {
        const q = g.quantiles[c];
        return q.p50 === null ? '-' : `${q.p50.toPrecision(3)} [${q.p05!.toPrecision(3)}, ${q.p95!.toPrecision(3)}]`;
      }),
      g.neverTurned.n === 0 ? '-' : `${g.neverTurned.count}/${g.neverTurned.n}`,
    ]),
  );
  const p = summary.pooling;
  const pooling =
    p === null
      ? 'Pooling across tossers: not enough same-side data.\n'
      : p.completePooling
        ? `Pooling across tossers: no spread beyond chance; every tosser gets the pooled rate ${p.meanRate.toFixed(4)}.\n`
        : `Pooling across tossers: pooled rate ${p.meanRate.toFixed(4)}, between-tosser sd ${p.betweenTosserSd.toFixed(4)}` +
          ` (beta-binomial, prior weight ${p.precision!.toFixed(1)} tosses).\n`;
  return `Same-side outcomes (start face = landing face)\n${outcome}\nMotion\n${motion}\n${pooling}`;
}

/**
 * Registers `summarize <dir> [--out <dir>] [--seed n] [--resamples n] [--skip-flagged] [--json]`.
 * `<dir>` is a dataset folder or a tosses .csv/.parquet file; the output folder defaults to the dataset folder.
 * Invalid options or an unreadable dataset throw a UsageError (exit code 2 in the CLI main).
 * @param program - the root command
 * @param output - where to print; default standard output
 */
export function registerSummarize(program: Command, output: CliOutput = stdout): void {
  program
    .command('summarize')
    .description('Summarise a measured study: same-side rates, model predictions, motion, per tosser.')
    .argument('<dir>', 'dataset folder (or a tosses .csv / .parquet file)')
    .option('--out <dir>', 'folder for summary.json and summary.csv (default: the dataset folder)')
    .option('--seed <n>', 'seed of the bootstrap', '1')
    .option('--resamples <n>', 'bootstrap resamples', '2000')
    .option('--skip-flagged', 'leave flagged tosses out of the measured quantities')
    .option('--json', 'print the summary as JSON instead of tables')
    .action(async (dir, opts) => {
      const seed = integerOption('--seed', opts.seed, 0, 4294967295);
      const resamples = integerOption('--resamples', opts.resamples, 1, 1_000_000);
      const input = resolve(dir);
      const info = await stat(input).catch(() => null);
      if (info === null) throw optionError('<dir>', 'a dataset folder or a tosses .csv/.parquet file', dir);
      let rows;
      try {
        rows = await readTosses(input);
      } catch (err) {
        if (err instanceof DatasetError) throw new UsageError(err.message);
        throw err;
      }
      const summary = summarizeStudy(rows, { seed, bootstrap: resamples, includeFlagged: opts.skipFlagged !== true });
      const outDir = resolve(opts.out ?? (info.isDirectory() ? input : dirname(input)));
      await mkdir(outDir, { recursive: true });
      await atomicWriteFile(join(outDir, 'summary.json'), JSON.stringify(summary, null, 2) + '\n');
      await atomicWriteFile(join(outDir, 'summary.csv'), stringify(summaryRows(summary), { header: true }));
      output.write(opts.json === true ? JSON.stringify(summary, null, 2) + '\n' : formatSummary(summary));
    });
}
