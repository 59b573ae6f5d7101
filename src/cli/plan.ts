/**
 * `tossmeter plan`: how many tosses a study needs to tell a given same-side rate from ½, by the normal
 * approximation and by the exact binomial test, and how to share them among tossers who differ.
 * Parses and validates options, calls `planTosses`, prints. No computation here.
 */
import type { Command } from '@commander-js/extra-typings';
import { optionError } from '../errors.ts';
import { planTosses, type TossPlan } from '../stats/power.ts';

/** Where a command prints; tests pass their own. */
export interface CliOutput {
  /** Writes text to standard output (default: process.stdout). */
  readonly write: (text: string) => void;
}

const stdout: CliOutput = { write: (text) => void process.stdout.write(text) };

/** A finite decimal number from an option string, or null. */
function parseNumber(text: string): number | null {
  if (!/^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(text)) return null;
  const value = Number(text);
  return Number.isFinite(value) ? value : null;
}

function probabilityOption(option: string, text: string): number {
  const value = parseNumber(text);
  if (value === null || !(value > 0 && value < 1)) throw optionError(option, 'a number between 0 and 1', text);
  return value;
}

const count = (n: number): string => n.toLocaleString('en-US');

/** The plan as readable text (our own labels). */
function formatPlan(plan: TossPlan): string {
  const lines = [
    `Tosses needed to tell a same-side rate of ${plan.sameSideRate} from ${plan.nullRate}`,
    `(two-sided alpha ${plan.alpha}, power ${plan.power})`,
    '',
    `  normal approximation   ${count(plan.normalTosses).padStart(12)} tosses`,
    `  exact binomial test    ${count(plan.exactTosses).padStart(12)} tosses` +
      `  (power ${plan.exactPower.toFixed(4)}; significant at <= ${count(plan.exactLowerCritical)}` +
      ` or >= ${count(plan.exactUpperCritical)} same-side)`,
  ];
  const c = plan.clustered;
  if (c !== null) {
    lines.push(
      '',
      `Shared among ${count(c.tossers)} tossers, between-tosser sd ${c.tosserSd}` +
        ` (intraclass correlation ${c.icc.toPrecision(3)}), from the normal approximation:`,
    );
    if (c.feasible && c.tossesPerTosser !== null && c.totalTosses !== null && c.designEffect !== null) {
      lines.push(
        `  each tosser            ${count(c.tossesPerTosser).padStart(12)} tosses`,
        `  in all                 ${count(c.totalTosses).padStart(12)} tosses  (design effect ${c.designEffect.toFixed(3)})`,
      );
    } else {
      lines.push(
        `  not reachable: with this spread no number of tosses per tosser is enough;`,
        `  at least ${count(c.minimumTossers)} tossers are needed.`,
      );
    }
  }
  return lines.join('\n') + '\n';
}

/**
 * Registers `plan --same-side <p> [--power 0.8] [--alpha 0.05] [--tossers k] [--tosser-sd s] [--json]`.
 * Invalid options throw a UsageError built by `optionError` (exit code 2 in the CLI main).
 * @param program - the root command
 * @param output - where to print; default standard output
 */
export function registerPlan(program: Command, output: CliOutput = stdout): void {
  program
    .command('plan')
    .description('How many tosses a study needs to detect a same-side bias.')
    .requiredOption('--same-side <p>', 'same-side rate to detect, between 0 and 1 (not 0.5)')
    .option('--power <p>', 'desired power, between 0 and 1', '0.8')
    .option('--alpha <a>', 'two-sided significance level, between 0 and 1', '0.05')
    .option('--tossers <k>', 'number of tossers sharing the tosses')
    .option('--tosser-sd <s>', "standard deviation of the tossers' same-side rates (needs --tossers)")
    .option('--json', 'print the plan as JSON')
    .action((opts) => {
      const sameSide = probabilityOption('--same-side', opts.sameSide);
      if (sameSide === 0.5) throw optionError('--same-side', 'a number between 0 and 1 other than 0.5', opts.sameSide);
      const power = probabilityOption('--power', opts.power);
      const alpha = probabilityOption('--alpha', opts.alpha);
      let tossers: number | undefined;
      if (opts.tossers !== undefined) {
        if (!/^\s*\d+\s*$/.test(opts.tossers) || Number(opts.tossers) < 1 || !Number.isSafeInteger(Number(opts.tossers))) {
          throw optionError('--tossers', 'an integer of at least 1', opts.tossers);
        }
        tossers = Number(opts.tossers);
      }
      let tosserSd = 0;
      if (opts.tosserSd !== undefined) {
        const limit = Math.sqrt(sameSide * (1 - sameSide));
        const value = parseNumber(opts.tosserSd);
        if (value === null || !(value >= 0 && value < limit)) {
          throw optionError('--tosser-sd', `a number from 0 up to (not including) ${limit.toFixed(4)}`, opts.tosserSd);
        }
        if (tossers === undefined) throw optionError('--tossers', 'an integer of at least 1 alongside --tosser-sd', '');
        tosserSd = value;
      }
      const plan = planTosses({ sameSideRate: sameSide, power, alpha, tossers, tosserSd });
      output.write(opts.json === true ? JSON.stringify(plan, null, 2) + '\n' : formatPlan(plan));
    });
}
