import { Command } from '@commander-js/extra-typings';
import { describe, expect, it } from 'vitest';
import { registerPlan } from '../../src/cli/plan.ts';
import { UsageError } from '../../src/errors.ts';

async function run(args: string[]): Promise<string> {
  let text = '';
  const program = new Command().exitOverride();
  registerPlan(program, { write: (s) => void (text += s) });
  await program.parseAsync(['plan', ...args], { from: 'user' });
  return text;
}

describe('tossmeter plan', () => {
  it('prints both sample sizes for --same-side 0.508 (30,658 by the normal approximation, computed by hand)', async () => {
    const out = await run(['--same-side', '0.508']);
    expect(out).toContain('normal approximation');
    expect(out).toContain('30,658 tosses');
    expect(out).toContain('exact binomial test');
  });

  it('--json prints the plan record, with the tossers part when --tossers is given', async () => {
    const plan = JSON.parse(await run(['--same-side', '0.508', '--tossers', '60', '--tosser-sd', '0.02', '--json']));
    expect(plan.normalTosses).toBe(30_658);
    expect(plan.clustered.tossers).toBe(60);
    expect(plan.clustered.totalTosses).toBe(plan.clustered.tossesPerTosser * 60);
  });

  it('prints the per-tosser share, or the fewest tossers when the spread makes k too small', async () => {
    expect(await run(['--same-side', '0.508', '--tossers', '60', '--tosser-sd', '0.02'])).toContain('each tosser');
    expect(await run(['--same-side', '0.508', '--tossers', '10', '--tosser-sd', '0.02'])).toMatch(/at least 50 tossers/);
  });

  it.each([
    [['--same-side', '2'], 'Expected a number between 0 and 1 for --same-side but received "2"'],
    [['--same-side', 'abc'], 'Expected a number between 0 and 1 for --same-side but received "abc"'],
    [['--same-side', '0.5'], 'Expected a number between 0 and 1 other than 0.5 for --same-side but received "0.5"'],
    [['--same-side', '0.6', '--power', '1'], 'Expected a number between 0 and 1 for --power but received "1"'],
    [['--same-side', '0.6', '--alpha', '0'], 'Expected a number between 0 and 1 for --alpha but received "0"'],
    [['--same-side', '0.6', '--tossers', '2.5'], 'Expected an integer of at least 1 for --tossers but received "2.5"'],
    [['--same-side', '0.6', '--tosser-sd', '0.1'], 'Expected an integer of at least 1 alongside --tosser-sd for --tossers but received ""'],
    [['--same-side', '0.6', '--tossers', '3', '--tosser-sd', '-1'],
      'Expected a number from 0 up to (not including) 0.4899 for --tosser-sd but received "-1"'],
  ])('rejects %j with one error shape', async (args, message) => {
    const error = await run(args).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(UsageError);
    expect((error as Error).message).toBe(message);
  });
});
