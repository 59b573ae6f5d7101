/**
 * Faults during a run: a `measure` killed with SIGKILL after its first clip and started again finishes with
 * tosses.csv, frames.csv and both Parquet files byte-identical to an uninterrupted run, measuring only the
 * clips that were missing; Ctrl-C (SIGINT) stops cleanly (ffmpeg children killed, no dataset or temporary file
 * left, a message saying how to resume, exit code 130); `--fresh` measures everything again; and the dataset
 * does not depend on `--jobs`.
 *
 * Exit codes 130 (SIGINT) and 143 (SIGTERM) follow the shells' 128 + signal number convention (POSIX Shell Command
 * Language, "Exit Status for Commands", The Open Group Base Specifications Issue 7, 2018).
 */
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CACHE_DIR } from '../../src/pipeline/resume.ts';
import { childrenOf, isAlive, renderSmall, runCli, spawnCli, tempDir, waitFor } from '../pipeline/fixtures.ts';

let root = '';
let clips = '';
let cleanup: () => Promise<void> = async () => {};
const DATA = ['tosses.csv', 'frames.csv', 'tosses.parquet', 'frames.parquet'];

beforeAll(async () => {
  ({ dir: root, cleanup } = await tempDir('tossmeter-resume-'));
  clips = join(root, 'clips');
  await renderSmall(clips, { count: 2 });
}, 300_000);

afterAll(async () => {
  await cleanup();
});

/** Cache entries present (finished ones only, not temporary files). */
async function entries(out: string): Promise<string[]> {
  const names = await readdir(join(out, CACHE_DIR)).catch(() => [] as string[]);
  return names.filter((n) => /^[0-9a-f]{64}\.json$/.test(n)).sort();
}

/** Every file under `dir`, recursively, relative. */
async function allFiles(dir: string): Promise<string[]> {
  const found = await readdir(dir, { recursive: true, withFileTypes: true }).catch(() => []);
  return found.filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name).slice(dir.length + 1)).sort();
}

async function same(outA: string, outB: string): Promise<void> {
  for (const f of DATA) {
    const a = await readFile(join(outA, f));
    const b = await readFile(join(outB, f));
    expect(b.equals(a), `${f} differs between ${outA} and ${outB}`).toBe(true);
  }
}

describe('resume after SIGKILL, --fresh, and --jobs', () => {
  const reference = () => join(root, 'uninterrupted');
  const resumed = () => join(root, 'resumed');

  it('an uninterrupted run with --jobs 2 keeps one cache entry per measured clip', async () => {
    const run = await runCli(['measure', clips, '--out', reference(), '--jobs', '2']);
    expect(run.code).toBeLessThanOrEqual(1);
    expect(run.stderr).not.toContain('kept from an earlier run');
    expect(await entries(reference())).toHaveLength(2);
  });

  let keptBeforeKill = 0;
  it('a run killed with SIGKILL after its first clip leaves its finished clips and no dataset', async () => {
    const cli = spawnCli(['measure', clips, '--out', resumed(), '--jobs', '1']);
    await waitFor(async () => (await entries(resumed())).length >= 1, 120_000, 'the first cache entry');
    cli.child.kill('SIGKILL');
    const exit = await cli.exited;
    expect(exit.signal).toBe('SIGKILL');
    keptBeforeKill = (await entries(resumed())).length;
    expect(keptBeforeKill).toBeGreaterThanOrEqual(1);
    expect(keptBeforeKill, 'the run finished before it could be killed').toBeLessThan(2);
    for (const f of DATA) expect(await allFiles(resumed())).not.toContain(f);
  });

  it('started again, it measures only the missing clips and ends byte-identical to the uninterrupted run', async () => {
    const run = await runCli(['measure', clips, '--out', resumed(), '--jobs', '1']);
    expect(run.code).toBeLessThanOrEqual(1);
    const kept = run.stderr.split('\n').filter((l) => l.includes('kept from an earlier run'));
    const measured = run.stderr.split('\n').filter((l) => /frames\/s$/.test(l));
    expect(kept).toHaveLength(keptBeforeKill);
    expect(measured).toHaveLength(2 - keptBeforeKill);
    await same(reference(), resumed());
    expect(await entries(resumed())).toEqual(await entries(reference()));
    expect((await allFiles(resumed())).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('--fresh measures every clip again (--jobs 1) and gives the same bytes as --jobs 2', async () => {
    const run = await runCli(['measure', clips, '--out', resumed(), '--jobs', '1', '--fresh']);
    expect(run.stderr).not.toContain('kept from an earlier run');
    expect(run.stderr.split('\n').filter((l) => /frames\/s$/.test(l))).toHaveLength(2);
    await same(reference(), resumed());
  });
});

describe('Ctrl-C (SIGINT) and SIGTERM', () => {
  const cases: [string, NodeJS.Signals, number][] = [
    ['1', 'SIGINT', 130],
    ['2', 'SIGINT', 130],
    ['1', 'SIGTERM', 143],
  ];
  it.each(cases)('--jobs %s, %s: kills the ffmpeg children, writes no dataset and no temporary file, says how to resume, exits %i', async (jobs, signal, code) => {
    const out = join(root, `interrupted-${jobs}-${signal}`);
    const cli = spawnCli(['measure', clips, '--out', out, '--jobs', jobs]);
    const pid = cli.child.pid!;
    // Interrupt while a clip is being decoded: wait for an ffmpeg child of the tool.
    let children: number[] = [];
    await waitFor(async () => (children = await childrenOf(pid, 'ffmpeg')).length > 0, 120_000, 'an ffmpeg child');
    cli.child.kill(signal);
    const exit = await cli.exited;
    expect(exit.code, cli.stderr()).toBe(code);
    expect(cli.stderr()).toContain('run the same command again: finished clips are kept');
    for (const child of children) expect(await isAlive(child), `ffmpeg ${child} still running`).toBe(false);
    const left = await allFiles(out);
    expect(left.filter((f) => !f.startsWith(`${CACHE_DIR}/`))).toEqual([]);
    expect(left.filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});
