/**
 * mergeDatasets on shard folders written directly with writeDataset (no video): the merged tables must be
 * byte-identical to the tables of the whole study written in one go, and every inconsistency is refused
 * with a message naming the folder. The whole-clip version (real measureStudy runs) is test/e2e/shards.test.ts.
 */
import { mkdtemp, readFile, rm, writeFile, cp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeDataset, type FrameRow, type TossRow } from '../../src/dataset/index.ts';
import { UsageError } from '../../src/errors.ts';
import { mergeDatasets } from '../../src/pipeline/merge.ts';
import { shardOf } from '../../src/pipeline/study.ts';
import { AWKWARD_TEXT, frameRow, tossRow } from '../dataset/fixtures.ts';

const TABLES = ['tosses.csv', 'frames.csv', 'tosses.parquet', 'frames.parquet', 'datapackage.json'];
const COUNT = 3;

/** 24 tosses, files named out of order on purpose, awkward notes, some failed (no frames). */
function study(): { tosses: TossRow[]; frames: FrameRow[] } {
  const tosses: TossRow[] = [];
  const frames: FrameRow[] = [];
  for (let i = 0; i < 24; i++) {
    const id = `T0${1 + (i % 3)}-${String(i).padStart(3, '0')}`;
    const failed = i % 7 === 5;
    tosses.push(tossRow({
      toss_id: id, file: `${['b', 'a', 'c', 'A', 'a b'][i % 5]}/${id}.mp4`, tosser: id.slice(0, 3),
      status: failed ? 'failed' : i % 4 === 0 ? 'flagged' : 'ok', flags: failed ? 'not_measured' : null,
      error: failed ? `clip "${id}": no frames` : null, capture_fps: 1000, fps_source: 'manifest',
      spin_rev_s: failed ? null : 20 + i / 3, precession_deg: failed ? null : 0.1 + i * 3.7, frames_total: failed ? null : 5,
      notes: AWKWARD_TEXT[i % AWKWARD_TEXT.length],
    }));
    if (!failed) {
      for (let frame = 0; frame < 5; frame++) {
        frames.push(frameRow({ toss_id: id, frame, t_s: frame / 1000, detected: frame !== 2, cx_px: frame !== 2 ? 100 + i + frame / 3 : null, method: frame !== 2 ? 'moments' : 'none' }));
      }
    }
  }
  return { tosses, frames };
}

const byFile = (a: TossRow, b: TossRow) => (String(a.file) < String(b.file) ? -1 : String(a.file) > String(b.file) ? 1 : 0);

function runRecord(shard: string | null, over: Record<string, unknown> = {}, options: Record<string, unknown> = {}) {
  return {
    tool: 'tossmeter', tool_version: '0.1.0', ffmpeg_version: 'N-test', node_version: 'v20.0.0',
    options: { input: 'clips', manifest: null, fps: 1000, coin_mm: null, coin_thickness_mm: null, focal_px: null, gravity_m_s2: 9.80665, shard, ...options },
    inputs: [], started_at: '2025-01-01T00:00:00.000Z', finished_at: '2025-01-01T00:01:00.000Z', ...over,
  };
}

describe('mergeDatasets', () => {
  let root: string;
  const { tosses, frames } = study();
  const shardDir = (k: number) => join(root, `shard-${k}`);

  /** Writes shard k/COUNT of the study (rows in full-run order, as measureStudy writes them) into `dir`. */
  async function writeShard(dir: string, k: number, run = runRecord(`${k}/${COUNT}`), count = COUNT): Promise<void> {
    const mine = tosses.filter((t) => shardOf(String(t.toss_id), count) === k).sort(byFile);
    const ids = new Set(mine.map((t) => t.toss_id));
    const inputs = mine.map((t) => ({ file: t.file, size_bytes: 1, sha256: null }));
    await writeDataset(dir, { tosses: mine, frames: frames.filter((f) => ids.has(f.toss_id)), run: { ...run, inputs } });
  }

  beforeAll(async () => {
    root = await mkdtemp(join(tmpdir(), 'tossmeter-merge-'));
    await writeDataset(join(root, 'full'), { tosses: [...tosses].sort(byFile), frames: [...frames].sort((a, b) => byFile(tosses.find((t) => t.toss_id === a.toss_id)!, tosses.find((t) => t.toss_id === b.toss_id)!)), run: runRecord(null) });
    for (let k = 1; k <= COUNT; k++) await writeShard(shardDir(k), k);
  });
  afterAll(() => rm(root, { recursive: true, force: true }));

  it('every shard holds some tosses (the test split is not degenerate)', () => {
    const sizes = [1, 2, 3].map((k) => tosses.filter((t) => shardOf(String(t.toss_id), COUNT) === k).length);
    expect(sizes.every((n) => n > 0)).toBe(true);
    expect(sizes.reduce((a, b) => a + b)).toBe(24);
  });

  it('the merged CSV, Parquet and datapackage.json are byte-identical to the whole study written at once, whatever the folder order', async () => {
    for (const [name, order] of [['m1', [1, 2, 3]], ['m2', [3, 1, 2]]] as const) {
      const out = join(root, name);
      const result = await mergeDatasets(order.map(shardDir), out);
      expect(result.tosses).toHaveLength(24);
      expect(result.shards.map((s) => s.index)).toEqual([1, 2, 3]);
      for (const file of TABLES) {
        expect(Buffer.compare(await readFile(join(out, file)), await readFile(join(root, 'full', file))), file).toBe(0);
      }
    }
  });

  it('rows come out sorted by file in code-unit order (upper case before lower, "a b" before "a/")', async () => {
    const result = await mergeDatasets([1, 2, 3].map(shardDir), join(root, 'm3'));
    const files = result.tosses.map((t) => String(t.file));
    expect(files).toEqual([...files].sort());
    expect(files[0].startsWith('A/')).toBe(true);
    expect(result.frames.map((f) => f.toss_id)).toEqual(result.tosses.flatMap((t) => frames.filter((f) => f.toss_id === t.toss_id).map((f) => f.toss_id)));
    expect(result.counts.ok + result.counts.flagged + result.counts.failed).toBe(24);
  });

  it('the merged run.json keeps the options with shard null, all inputs sorted, and lists the shards', async () => {
    await mergeDatasets([3, 2, 1].map(shardDir), join(root, 'm4'));
    const run = JSON.parse(await readFile(join(root, 'm4', 'run.json'), 'utf8'));
    expect(run.options).toEqual(runRecord(null).options);
    expect(Object.keys(run.options)).toEqual(Object.keys(runRecord(null).options));
    expect(run.inputs.map((i: { file: string }) => i.file)).toEqual(tosses.map((t) => String(t.file)).sort());
    expect(run.merged_from.map((s: { shard: string }) => s.shard)).toEqual(['1/3', '2/3', '3/3']);
    expect(run.merged_from.map((s: { tosses: number }) => s.tosses).reduce((a: number, b: number) => a + b)).toBe(24);
    expect(run.tool_version).toBe('0.1.0');
  });

  describe('refusals (UsageError, exit code 2, naming the folder)', () => {
    const refuse = (dirs: string[], out: string, message: string) =>
      expect(mergeDatasets(dirs, join(root, out))).rejects.toThrow(new UsageError(message));

    it('a missing shard', () => refuse([shardDir(1), shardDir(3)], 'x1', 'shard 2/3 missing (given: 1/3, 3/3)'));

    it('two missing shards', () => refuse([shardDir(2)], 'x1', 'shards 1/3, 3/3 missing (given: 2/3)'));

    it('a doubled shard', async () => {
      await cp(shardDir(2), join(root, 'copy-2'), { recursive: true });
      await refuse([shardDir(1), shardDir(2), join(root, 'copy-2'), shardDir(3)], 'x2', `shard folder "${join(root, 'copy-2')}": shard 2/3 again (also in "${shardDir(2)}")`);
    });

    it('different options (compared without the shard)', async () => {
      const dir = join(root, 'fps-2');
      await writeShard(dir, 2, runRecord('2/3', {}, { fps: 500 }));
      await refuse([shardDir(1), dir, shardDir(3)], 'x3', `shard folder "${dir}": made with different options: fps is 500 here but 1000 in "${shardDir(1)}"`);
    });

    it('a different tool version and a different ffmpeg version', async () => {
      const tool = join(root, 'tool-3');
      const ffmpeg = join(root, 'ffmpeg-3');
      await writeShard(tool, 3, runRecord('3/3', { tool_version: '0.2.0' }));
      await writeShard(ffmpeg, 3, runRecord('3/3', { ffmpeg_version: '7.1' }));
      await refuse([shardDir(1), shardDir(2), tool], 'x4', `shard folder "${tool}": made with tossmeter 0.2.0, but "${shardDir(1)}" with tossmeter 0.1.0`);
      await refuse([shardDir(1), shardDir(2), ffmpeg], 'x4', `shard folder "${ffmpeg}": made with ffmpeg 7.1, but "${shardDir(1)}" with ffmpeg N-test`);
    });

    it('shards of different counts', async () => {
      const dir = join(root, 'of-2');
      await writeShard(dir, 2, runRecord('2/2'), 2);
      await refuse([shardDir(1), dir], 'x5', `shard folder "${dir}": shard 2/2, but "${shardDir(1)}" is shard 1/3 (different shard counts)`);
    });

    it('a toss_id in two shards, and a toss in a shard its hash does not give', async () => {
      const dir = join(root, 'extra-3');
      const stranger = tosses.find((t) => shardOf(String(t.toss_id), COUNT) === 1)!;
      const mine = tosses.filter((t) => shardOf(String(t.toss_id), COUNT) === 3);
      await writeDataset(dir, { tosses: [...mine, stranger], frames: [], run: runRecord('3/3') });
      await refuse([shardDir(1), shardDir(2), dir], 'x6', `shard folder "${dir}": toss_id "${String(stranger.toss_id)}" is also in shard folder "${shardDir(1)}"`);
      // Without shard 1's copy the stray row is caught by its hash.
      const lone = join(root, 'lone-1');
      await writeDataset(lone, { tosses: [], frames: [], run: runRecord('1/3') });
      await refuse([lone, shardDir(2), dir], 'x6', `shard folder "${dir}": toss_id "${String(stranger.toss_id)}" belongs to shard 1/3 by its hash, not 3/3`);
    });

    it('a full run, a folder without run.json, an unfinished shard, a missing folder', async () => {
      await refuse([join(root, 'full')], 'x7', `shard folder "${join(root, 'full')}": a full run, not a shard (run.json options.shard is null)`);
      await refuse([root], 'x7', `shard folder "${root}": no run.json (expected the output folder of \`tossmeter measure --shard k/n\`)`);
      const unfinished = join(root, 'unfinished-1');
      await cp(shardDir(1), unfinished, { recursive: true });
      await rm(join(unfinished, 'datapackage.json'));
      await refuse([unfinished], 'x7', `shard folder "${unfinished}": no datapackage.json (the shard's run did not finish)`);
      await refuse([join(root, 'nope')], 'x7', `shard folder "${join(root, 'nope')}": no such folder`);
      const bad = join(root, 'bad-json');
      await cp(shardDir(1), bad, { recursive: true });
      await writeFile(join(bad, 'run.json'), '{"tool_version": 1');
      await refuse([bad], 'x7', `shard folder "${bad}": run.json is not valid JSON`);
    });

    it('--out is one of the shard folders, or no folders at all', async () => {
      await expect(mergeDatasets([shardDir(1), shardDir(2), shardDir(3)], shardDir(2)))
        .rejects.toThrow(new UsageError(`Expected a folder other than the shard folders for --out but received ${JSON.stringify(shardDir(2))}`));
      await expect(mergeDatasets([], join(root, 'x8'))).rejects.toThrow(new UsageError('merge: no shard folders given'));
    });
  });
});
