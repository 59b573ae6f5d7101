import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { Command } from '@commander-js/extra-typings';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { registerReport } from '../../src/cli/report.ts';
import { UsageError } from '../../src/errors.ts';
import { makeStudy, type StudyFixture } from '../report/fixtures.ts';

let study: StudyFixture;

async function run(args: string[]): Promise<string> {
  let text = '';
  const program = new Command().exitOverride();
  registerReport(program, { write: (s) => void (text += s) });
  await program.parseAsync(['report', ...args], { from: 'user' });
  return text;
}

beforeAll(async () => {
  study = await makeStudy({ tosses: 6 });
});
afterAll(() => study.cleanup());

describe('tossmeter report', () => {
  it('writes the report where --out says and prints its path', async () => {
    const out = join(study.root, 'out', 'study.html');
    expect(await run([study.datasetDir, '--out', out, '--detail', '2', '--clips', study.clipsDir])).toBe(`${out}\n`);
    expect((await stat(out)).size).toBeGreaterThan(10_000);
    const page = await readFile(out, 'utf8');
    expect([...page.matchAll(/<section class="toss /g)]).toHaveLength(2);
  });

  it('--detail 0 gives no toss cards; the default file is <dir>/report.html', async () => {
    expect(await run([study.datasetDir, '--detail', '0'])).toBe(`${join(study.datasetDir, 'report.html')}\n`);
    expect(await readFile(join(study.datasetDir, 'report.html'), 'utf8')).not.toContain('<section class="toss ');
  });

  it('pins the messages of bad options', async () => {
    await expect(run([study.datasetDir, '--detail', 'many'])).rejects.toThrow('Expected an integer from 0 to 100000 for --detail but received "many"');
    await expect(run([study.datasetDir, '--detail', '-1'])).rejects.toThrow(UsageError);
    await expect(run([join(study.root, 'nope')])).rejects.toThrow('Expected a dataset folder written by tossmeter measure for <dir> but received');
    await expect(run([study.datasetDir, '--clips', join(study.root, 'nope')])).rejects.toThrow('for --clips but received');
    await expect(run([study.datasetDir, '--out', study.root])).rejects.toThrow('Expected a file name for the report for --out');
  });

  it('turns an unreadable dataset into a usage error', async () => {
    await expect(run([study.clipsDir])).rejects.toThrow(UsageError);
  });
});
