/**
 * The command-line tool's entry: builds the command tree and runs it.
 * Each command lives in its own file under src/cli/ and registers itself here.
 */
import { Command, CommanderError } from '@commander-js/extra-typings';
import { createRequire } from 'node:module';
import { registerCalibrate } from './calibrate.ts';
import { registerMeasure } from './measure.ts';
import { registerMerge } from './merge.ts';
import { registerPlan } from './plan.ts';
import { registerReport } from './report.ts';
import { registerSummarize } from './summarize.ts';
import { registerSynth } from './synth.ts';
import { UsageError } from '../errors.ts';

const require = createRequire(import.meta.url);
const pkg = require('../../package.json') as { version: string };

/** Exit codes shared by every command (documented in the README). */
export const EXIT = { ok: 0, clipProblem: 1, usage: 2 } as const;

/** Builds the command tree; exported so tests can run commands in-process. */
export function buildProgram(): Command {
  const program = new Command()
    .name('tossmeter')
    .description('Measure tossed coins from high-speed video.')
    .version(pkg.version)
    .exitOverride()
    .showHelpAfterError();
  registerMeasure(program);
  registerMerge(program);
  registerCalibrate(program);
  registerSynth(program);
  registerSummarize(program);
  registerPlan(program);
  registerReport(program);
  return program;
}

/** Runs the tool with `argv` (as in process.argv) and returns the exit code. */
export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return typeof process.exitCode === 'number' ? process.exitCode : EXIT.ok;
  } catch (err) {
    if (err instanceof CommanderError) {
      return err.exitCode === 0 ? EXIT.ok : EXIT.usage;
    }
    if (err instanceof UsageError) {
      process.stderr.write(`tossmeter: ${err.message}\n`);
      return EXIT.usage;
    }
    throw err;
  }
}
