import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Command } from '@commander-js/extra-typings';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { registerSummarize } from '../../src/cli/summarize.ts';
import { UsageError } from '../../src/errors.ts';

let dir = '';

async function run(args: string[]): Promise<string> {
  let text = '';
  const program = new Command().exitOverride();
  registerSummarize(program, { write: (s) => void (text += s) });
  await program.parseAsync(['summarize', ...args], { from: 'user' });
  return text;
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tossmeter-summarize-'));
  const header = 'toss_id,file,tosser,status,start_face,observed_face,predicted_face,p_same_side,spin_rev_s,' +
    'precession_deg,launch_speed_m_s,flight_time_s,face_changes';
  const lines = [header];
  for (let i = 0; i < 24; i++) {
    const tosser = i % 2 === 0 ? 'T01' : 'T02';
    const status = i === 5 ? 'failed' : i === 7 ? 'flagged' : 'ok';
    const start = i % 3 === 0 ? 'heads' : 'tails';
    const observed = i % 4 === 0 ? (start === 'heads' ? 'tails' : 'heads') : start;
    const measured =
      status === 'failed'
        ? ',,,,,,' // a failed clip: nothing measured (7 empty cells)
        : `${observed},${(0.5 + i / 1000).toFixed(3)},${30 + i},${i},2.${i % 10},0.5,${i % 5}`;
    lines.push(`t${i},clip${i}.mp4,${tosser},${status},${start},${observed},${measured}`);
  }
  await writeFile(join(dir, 'tosses.csv'), lines.join('\n') + '\n');
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('tossmeter summarize', () => {
  it('prints tables and writes summary.json and summary.csv (one row per group)', async () => {
    const out = await run([dir, '--seed', '3', '--resamples', '300']);
    expect(out).toContain('Same-side outcomes');
    expect(out).toMatch(/T01/);
    const summary = JSON.parse(await readFile(join(dir, 'summary.json'), 'utf8'));
    expect(summary.study.tosses).toBe(24);
    expect(summary.study.failed).toBe(1);
    expect(summary.tossers).toHaveLength(2);
    const csv = parse(await readFile(join(dir, 'summary.csv'), 'utf8'), { columns: true }) as Record<string, string>[];
    expect(csv.map((r) => r.tosser)).toEqual(['', 'T01', 'T02']);
    expect(Number(csv[0].same_side_count)).toBe(summary.study.observedSameSide.count);
    expect(Number(csv[0].same_side_n)).toBe(24);
  });

  it('--json prints the same record it writes, identical for the same seed', async () => {
    const out = dir + '/again';
    const a = JSON.parse(await run([dir, '--seed', '3', '--resamples', '300', '--json', '--out', out]));
    const written = JSON.parse(await readFile(join(out, 'summary.json'), 'utf8'));
    expect(a).toEqual(written);
    const b = JSON.parse(await run([dir, '--seed', '3', '--resamples', '300', '--json', '--out', out]));
    expect(b).toEqual(a);
  });

  it('rejects a bad seed and a missing dataset with one error shape', async () => {
    const bad = await run([dir, '--seed', '-1']).catch((e: unknown) => e);
    expect(bad).toBeInstanceOf(UsageError);
    expect((bad as Error).message).toBe('Expected an integer from 0 to 4294967295 for --seed but received "-1"');
    const missing = await run([join(dir, 'nope')]).catch((e: unknown) => e);
    expect(missing).toBeInstanceOf(UsageError);
    expect((missing as Error).message).toMatch(/^Expected a dataset folder or a tosses \.csv\/\.parquet file for <dir>/);
  });
});
