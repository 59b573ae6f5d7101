/**
 * End to end on rendered clips (the fast subset of the accuracy suite) and on the bundled sample clips:
 * `measure` writes the full dataset, DuckDB (an independent reader) reads both CSVs and both Parquet files with
 * the same row counts, and the measurements agree with the renderer's truth within the measure issue's tolerances.
 */
import { mkdtemp, rm, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DuckDBInstance } from '@duckdb/node-api';
import { main } from '../../src/cli/main.ts';
import { FAST_SET, renderSet } from '../helpers/accuracySet.ts';
import { checkAccuracy, checkMedianRotation } from '../helpers/accuracyChecks.ts';
import { compareWithTruth, errorTable } from '../helpers/compareTruth.ts';

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tossmeter-e2e-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function count(sql: string): Promise<number> {
  const db = await DuckDBInstance.create(':memory:');
  const con = await db.connect();
  const reader = await con.runAndReadAll(sql);
  const value = reader.getRows()[0][0];
  con.closeSync();
  return Number(value);
}

describe('measure, end to end', () => {
  it('measures the sample clips into a dataset that DuckDB reads with the same row counts, median rotation errors within the tolerances', async () => {
    const out = join(dir, 'sample-results');
    const code = await main(['node', 'tossmeter', 'measure', 'sample-clips', '--out', out, '--quiet']);
    const files = (await readdir(out)).sort();
    expect(files).toEqual(expect.arrayContaining(['datapackage.json', 'frames.csv', 'frames.parquet', 'run.json', 'tosses.csv', 'tosses.parquet']));
    for (const table of ['tosses', 'frames']) {
      const csv = await count(`SELECT count(*) FROM '${join(out, `${table}.csv`)}'`);
      const parquet = await count(`SELECT count(*) FROM '${join(out, `${table}.parquet`)}'`);
      expect(parquet).toBe(csv);
      expect(csv).toBeGreaterThan(0);
    }
    expect(await count(`SELECT count(*) FROM '${join(out, 'tosses.csv')}'`)).toBe(7);
    // Block-matched frames (the coin carried or held by the hand) say so, and only outline-less boundary rows do.
    const framesCsv = join(out, 'frames.csv');
    expect(await count(`SELECT count(*) FROM '${framesCsv}' WHERE block_matched`)).toBeGreaterThan(10);
    expect(await count(`SELECT count(*) FROM '${framesCsv}' WHERE block_matched AND (method <> 'boundary' OR NOT detected)`)).toBe(0);
    const rows = await compareWithTruth(out, 'sample-clips');
    process.stdout.write(`\nsample clips\n${errorTable(rows)}\n`);
    // The measure issue: the README's main command exits 0. Flags that leave the rotation measured (release or
    // catch not seen) do not make a clip unusable; a failed clip or one with no rotation measured would give 1.
    expect(rows.filter((r) => r.status === 'flagged').length).toBeGreaterThan(0);
    expect(code).toBe(0);
    // Every sample clip is measured: none fails (a tracker bug once failed two whose track began in the buffer's
    // first frames, and a run that failed them still exited 1 like a flagged one).
    expect(rows.filter((r) => r.status === 'failed').map((r) => r.tossId)).toEqual([]);
    checkMedianRotation(rows);
  });

  let fastRows: Awaited<ReturnType<typeof compareWithTruth>> = [];
  it('measures the fast rendered subset with the median spin, precession and tilt errors within the tolerances', async () => {
    await renderSet(join(dir, 'fast'), FAST_SET);
    await main(['node', 'tossmeter', 'measure', join(dir, 'fast'), '--out', join(dir, 'fast-results'), '--quiet']);
    fastRows = await compareWithTruth(join(dir, 'fast-results'), join(dir, 'fast'));
    process.stdout.write(`\nfast rendered subset\n${errorTable(fastRows)}\n`);
    checkMedianRotation(fastRows);
  });

  it('holds every tolerance of the measure issue on every clip of the fast subset', () => {
    expect(fastRows.length).toBeGreaterThan(0);
    checkAccuracy(fastRows, 0);
  });
});
