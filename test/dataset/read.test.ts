import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DatasetError } from '../../src/dataset/cell.ts';
import { canonicalRows, writeDataset } from '../../src/dataset/write.ts';
import { readFrames, readTosses } from '../../src/dataset/read.ts';
import { FRAME_FIELDS, TOSS_FIELDS, type TossRow } from '../../src/dataset/fields.ts';
import { AWKWARD_TEXT, sampleFrames, sampleTosses, tossRow } from './fixtures.ts';

let root: string;
let dir: string;
const tosses: TossRow[] = [
  ...sampleTosses(),
  ...AWKWARD_TEXT.map((s, i) => tossRow({ toss_id: `X${i}`, file: s, status: 'flagged', flags: s, error: s, tosser: s, notes: s, scale_source: s })),
];
const frames = sampleFrames();
// What a reader must give back: the rows with NaN/±Infinity as null and -0 as 0 (the documented canonical form).
const expectedTosses = canonicalRows('tosses', TOSS_FIELDS, tosses);
const expectedFrames = canonicalRows('frames', FRAME_FIELDS, frames);

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tossmeter-read-'));
  dir = join(root, 'ds');
  await writeDataset(dir, { tosses, frames, run: {} });
});
afterAll(async () => {
  await rm(root, { recursive: true, force: true });
});

describe('readTosses / readFrames', () => {
  it('the expected rows really contain the hard cases (nulls, -0, NaN, formula text, newlines)', () => {
    expect(expectedTosses[1].launch_speed_m_s).toBe(0);
    expect(expectedTosses[2].gravity_fps).toBeNull();
    expect(expectedTosses[2].px_per_m).toBeNull();
    expect(expectedTosses.some((r) => r.notes === '=SUM(A1:A9)')).toBe(true);
    expect(expectedTosses.some((r) => typeof r.error === 'string' && r.error.includes('\n'))).toBe(true);
  });

  it.each(['tosses.csv', 'tosses.parquet'])('write → read of %s gives the input back exactly', async (file) => {
    const back = await readTosses(join(dir, file));
    expect(back).toEqual(expectedTosses);
    expect(Object.is(back[1].launch_speed_m_s, 0)).toBe(true);
    expect(Object.keys(back[0])).toEqual(TOSS_FIELDS.map((f) => f.name));
  });

  it.each(['frames.csv', 'frames.parquet'])('write → read of %s gives the input back exactly', async (file) => {
    const back = await readFrames(join(dir, file));
    expect(back).toEqual(expectedFrames);
    expect(back.map((r) => r.minor_px)).toEqual(frames.map((r) => r.minor_px)); // doubles bit-exact
  });

  it('given a folder, reads the CSV; without a CSV, the Parquet file', async () => {
    expect(await readTosses(dir)).toEqual(expectedTosses);
    const pqOnly = join(root, 'pq');
    await mkdir(pqOnly);
    await writeDataset(join(root, 'full'), { tosses, frames, run: {} });
    const { copyFile } = await import('node:fs/promises');
    await copyFile(join(root, 'full', 'frames.parquet'), join(pqOnly, 'frames.parquet'));
    expect(await readFrames(pqOnly)).toEqual(expectedFrames);
    await expect(readTosses(pqOnly)).rejects.toThrow(`${pqOnly}: no tosses.csv or tosses.parquet in this folder`);
  });

  it('an empty string is read back as null (empty cells are missing values in both formats)', async () => {
    const d = join(root, 'empty-string');
    await writeDataset(d, { tosses: [tossRow({ toss_id: 'a', file: 'a.mp4', status: 'ok', notes: '' })], frames: [], run: {} });
    expect((await readTosses(join(d, 'tosses.csv')))[0].notes).toBeNull();
    expect((await readTosses(join(d, 'tosses.parquet')))[0].notes).toBeNull();
  });

  it('a hand-edited CSV with a bad cell or a missing required column fails naming file, row and column', async () => {
    const bad = join(root, 'bad.csv');
    await writeFile(bad, 'toss_id,frame,detected,t_s\nA,0,true,0\nA,1,yes,0.001\n');
    await expect(readFrames(bad)).rejects.toThrow(new DatasetError('bad.csv row 2, column detected: expected true or false but received "yes"'));
    await writeFile(bad, 'toss_id,file\nA,a.mp4\n');
    await expect(readTosses(bad)).rejects.toThrow(/bad\.csv: expected a column named status/);
    await writeFile(bad, 'toss_id,frame,detected\nA,0,true\n');
    expect((await readFrames(bad))[0]).toMatchObject({ toss_id: 'A', frame: 0, detected: true, cx_px: null, method: null });
  });
});
