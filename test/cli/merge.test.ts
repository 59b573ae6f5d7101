/**
 * `tossmeter merge`: the command parses its folders and --out, merges, prints the closing table; a refusal is a
 * UsageError (exit code 2 through main) with the library's message. Runs in-process on a program that has only
 * this command (main.ts registers it; the lead wires it in).
 */
import { Command, CommanderError } from '@commander-js/extra-typings';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { registerMerge } from '../../src/cli/merge.ts';
import { writeDataset } from '../../src/dataset/index.ts';
import { UsageError } from '../../src/errors.ts';
import { shardOf } from '../../src/pipeline/study.ts';
import { tossRow } from '../dataset/fixtures.ts';

let root = '';
const ids = ['T01-001', 'T01-002', 'T02-001', 'T02-002', 'T03-001'];

function program(): Command {
  const p = new Command().name('tossmeter').exitOverride();
  registerMerge(p);
  return p;
}

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tossmeter-cli-merge-'));
  for (const k of [1, 2]) {
    const mine = ids.filter((id) => shardOf(id, 2) === k).sort();
    await writeDataset(join(root, `s${k}`), {
      tosses: mine.map((id) => tossRow({ toss_id: id, file: `${id}.mp4`, status: 'ok' })),
      frames: [],
      run: { tool_version: '0.1.0', ffmpeg_version: 'x', options: { input: 'clips', shard: `${k}/2` }, inputs: [] },
    });
  }
});
afterAll(() => rm(root, { recursive: true, force: true }));

describe('tossmeter merge', () => {
  it('merges the folders into --out and prints the shards and the closing table', async () => {
    const out: string[] = [];
    const err: string[] = [];
    const o = vi.spyOn(process.stdout, 'write').mockImplementation((s) => (out.push(String(s)), true));
    const e = vi.spyOn(process.stderr, 'write').mockImplementation((s) => (err.push(String(s)), true));
    try {
      await program().parseAsync(['node', 'tossmeter', 'merge', join(root, 's2'), join(root, 's1'), '--out', join(root, 'merged')]);
    } finally {
      o.mockRestore();
      e.mockRestore();
    }
    expect(err.join('')).toMatch(/^merged 2 shards: 1\/2 \(\d tosses\), 2\/2 \(\d tosses\)\n$/);
    expect(out.join('')).toContain('clips ok                 5');
    const csv = await readFile(join(root, 'merged', 'tosses.csv'), 'utf8');
    expect(csv.trim().split('\n').slice(1).map((l) => l.split(',')[0])).toEqual([...ids].sort());
  });

  it('a missing shard is a UsageError with the library message', async () => {
    await expect(program().parseAsync(['node', 'tossmeter', 'merge', join(root, 's1'), '--out', join(root, 'm2'), '--quiet']))
      .rejects.toThrow(new UsageError('shard 2/2 missing (given: 1/2)'));
  });

  it('--out is required and at least one folder is required (commander errors, exit code 2 in main)', async () => {
    const quiet = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
    try {
      await expect(program().parseAsync(['node', 'tossmeter', 'merge', join(root, 's1')])).rejects.toBeInstanceOf(CommanderError);
      await expect(program().parseAsync(['node', 'tossmeter', 'merge', '--out', join(root, 'm3')])).rejects.toBeInstanceOf(CommanderError);
    } finally {
      quiet.mockRestore();
    }
  });
});
