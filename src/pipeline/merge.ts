/**
 * Joins the dataset folders of a sharded study (`tossmeter measure --shard k/n`, one folder per shard)
 * into one dataset whose CSV and Parquet files are byte-identical to those of a single run over the whole
 * study. Only `run.json` differs: the merged one records the shards it came from.
 *
 * Everything is checked before anything is written: every folder is a finished shard (`run.json` with a
 * shard, `datapackage.json` present), all shards were made with the same options, tool version and ffmpeg
 * version, shards 1..n are each present exactly once, every toss sits in the shard its toss_id hashes to,
 * and no toss_id appears twice. A problem is a `UsageError` (exit code 2) naming the folder.
 */
import { stat, readFile, realpath } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { join, resolve } from 'node:path';
import { z } from 'zod';
import { UsageError, optionError } from '../errors.ts';
import { readFrames, readTosses, writeDataset, type FrameRow, type TossRow } from '../dataset/index.ts';
import { shardOf } from './study.ts';

const require = createRequire(import.meta.url);
const pkg = require('../../package.json') as { version: string };

/** One shard folder as the merge found it. */
export interface MergedShard {
  /** The folder as given. */
  dir: string;
  /** 1-based shard index and the shard count, from its run.json. */
  index: number;
  count: number;
  tosses: number;
  frames: number;
}

/** What `mergeDatasets` returns: the merged rows, their status counts, the shards and the output folder. */
export interface MergeResult {
  tosses: TossRow[];
  frames: FrameRow[];
  /** As `measureStudy`'s: `unusable` counts flagged tosses with no spin rate. */
  counts: { ok: number; flagged: number; failed: number; unusable: number };
  /** The shards, ordered by index. */
  shards: MergedShard[];
  /** Absolute path of the merged dataset folder. */
  outDir: string;
}

const InputSchema = z.object({ file: z.string(), size_bytes: z.number().nullable(), sha256: z.string().nullable() });
const RunSchema = z.looseObject({
  tool_version: z.string(),
  ffmpeg_version: z.string(),
  node_version: z.string().optional(),
  options: z.looseObject({ shard: z.string().nullable() }),
  inputs: z.array(InputSchema),
  started_at: z.string().optional(),
  finished_at: z.string().optional(),
});
type RunRecord = z.infer<typeof RunSchema>;

interface Shard extends MergedShard {
  run: RunRecord;
  /** run.json's options as written (key order kept; zod's output reorders keys). */
  options: Record<string, unknown>;
  tossRows: TossRow[];
  frameRows: FrameRow[];
}

const byText = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/** JSON text with object keys sorted, for comparing option records. */
function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).sort(([a], [b]) => byText(a, b));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

async function isFile(path: string): Promise<boolean> {
  return stat(path).then((s) => s.isFile(), () => false);
}

/** Reads and checks one shard folder (its own consistency only). */
async function readShard(dir: string): Promise<Shard> {
  const where = `shard folder "${dir}"`;
  const st = await stat(dir).catch(() => null);
  if (!st?.isDirectory()) throw new UsageError(`${where}: no such folder`);
  const runFile = join(dir, 'run.json');
  let text: string;
  try {
    text = await readFile(runFile, 'utf8');
  } catch {
    throw new UsageError(`${where}: no run.json (expected the output folder of \`tossmeter measure --shard k/n\`)`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw new UsageError(`${where}: run.json is not valid JSON`);
  }
  const parsed = RunSchema.safeParse(json);
  if (!parsed.success) throw new UsageError(`${where}: run.json is not a tossmeter run record (${z.prettifyError(parsed.error).replace(/\s+/g, ' ').trim()})`);
  const run = parsed.data;
  if (run.options.shard === null) throw new UsageError(`${where}: a full run, not a shard (run.json options.shard is null)`);
  const m = /^(\d+)\/(\d+)$/.exec(run.options.shard);
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!(count >= 1 && index >= 1 && index <= count)) throw new UsageError(`${where}: run.json has shard ${JSON.stringify(run.options.shard)}, expected k/n with 1 ≤ k ≤ n`);
  if (!(await isFile(join(dir, 'datapackage.json')))) throw new UsageError(`${where}: no datapackage.json (the shard's run did not finish)`);
  // Parquet holds the values exactly (no CSV formula guard to undo); the CSV is the fallback.
  const table = async (name: string) => ((await isFile(join(dir, `${name}.parquet`))) ? join(dir, `${name}.parquet`) : dir);
  let tossRows: TossRow[];
  let frameRows: FrameRow[];
  try {
    tossRows = await readTosses(await table('tosses'));
    frameRows = await readFrames(await table('frames'));
  } catch (err) {
    throw new UsageError(`${where}: ${err instanceof Error ? err.message : String(err)}`);
  }
  const options = (json as { options: Record<string, unknown> }).options;
  return { dir, index, count, run, options, tossRows, frameRows, tosses: tossRows.length, frames: frameRows.length };
}

/** Throws unless every shard has the options, versions and count of the first one. */
function checkSameRun(shards: readonly Shard[]): void {
  const first = shards[0];
  const optionsOf = (s: Shard) => {
    const { shard: _shard, ...rest } = s.options;
    return rest as Record<string, unknown>;
  };
  const base = optionsOf(first);
  for (const s of shards.slice(1)) {
    const where = `shard folder "${s.dir}"`;
    if (s.count !== first.count) throw new UsageError(`${where}: shard ${s.index}/${s.count}, but "${first.dir}" is shard ${first.index}/${first.count} (different shard counts)`);
    if (s.run.tool_version !== first.run.tool_version) {
      throw new UsageError(`${where}: made with tossmeter ${s.run.tool_version}, but "${first.dir}" with tossmeter ${first.run.tool_version}`);
    }
    if (s.run.ffmpeg_version !== first.run.ffmpeg_version) {
      throw new UsageError(`${where}: made with ffmpeg ${s.run.ffmpeg_version}, but "${first.dir}" with ffmpeg ${first.run.ffmpeg_version}`);
    }
    const opts = optionsOf(s);
    const keys = [...new Set([...Object.keys(base), ...Object.keys(opts)])].sort(byText);
    for (const key of keys) {
      const a = canonicalJson(base[key]);
      const b = canonicalJson(opts[key]);
      if (a !== b) throw new UsageError(`${where}: made with different options: ${key} is ${b} here but ${a} in "${first.dir}"`);
    }
  }
}

/** Throws unless shards 1..n are each present exactly once. */
function checkComplete(shards: readonly Shard[]): Shard[] {
  const count = shards[0].count;
  const seen = new Map<number, Shard>();
  for (const s of shards) {
    const earlier = seen.get(s.index);
    if (earlier) throw new UsageError(`shard folder "${s.dir}": shard ${s.index}/${count} again (also in "${earlier.dir}")`);
    seen.set(s.index, s);
  }
  const missing = Array.from({ length: count }, (_, i) => i + 1).filter((k) => !seen.has(k));
  if (missing.length > 0) {
    const given = [...seen.keys()].sort((a, b) => a - b).map((k) => `${k}/${count}`).join(', ');
    const list = missing.map((k) => `${k}/${count}`).join(', ');
    throw new UsageError(`shard${missing.length > 1 ? 's' : ''} ${list} missing (given: ${given})`);
  }
  return [...seen.values()].sort((a, b) => a.index - b.index);
}

/** Throws when a toss sits in the wrong shard or a toss_id appears twice. */
function checkTosses(shards: readonly Shard[]): void {
  const owner = new Map<string, Shard>();
  for (const s of shards) {
    for (const t of s.tossRows) {
      const id = String(t.toss_id);
      const earlier = owner.get(id);
      if (earlier === s) throw new UsageError(`shard folder "${s.dir}": toss_id "${id}" appears twice`);
      if (earlier) throw new UsageError(`shard folder "${s.dir}": toss_id "${id}" is also in shard folder "${earlier.dir}"`);
      owner.set(id, s);
      const home = shardOf(id, s.count);
      if (home !== s.index) throw new UsageError(`shard folder "${s.dir}": toss_id "${id}" belongs to shard ${home}/${s.count} by its hash, not ${s.index}/${s.count}`);
    }
    const ids = new Set(s.tossRows.map((t) => String(t.toss_id)));
    const stray = s.frameRows.find((f) => !ids.has(String(f.toss_id)));
    if (stray) throw new UsageError(`shard folder "${s.dir}": the frames table has toss_id "${String(stray.toss_id)}", which is not in the tosses table`);
  }
}

/** The merged run record: the shared options (shard null), every input, and the shards it came from. */
function mergedRun(shards: readonly Shard[]): object {
  const first = shards[0].run;
  const options = { ...shards[0].options, shard: null };
  const inputs = shards.flatMap((s) => s.run.inputs).sort((a, b) => byText(a.file, b.file));
  const times = (key: 'started_at' | 'finished_at') => shards.map((s) => s.run[key]).filter((t): t is string => typeof t === 'string').sort(byText);
  const started = times('started_at');
  const finished = times('finished_at');
  return {
    tool: 'tossmeter',
    tool_version: first.tool_version,
    ffmpeg_version: first.ffmpeg_version,
    node_version: first.node_version ?? null,
    options,
    inputs,
    started_at: started[0] ?? null,
    finished_at: finished[finished.length - 1] ?? null,
    merged_from: shards.map((s) => ({
      folder: s.dir,
      shard: `${s.index}/${s.count}`,
      tosses: s.tosses,
      frames: s.frames,
      node_version: s.run.node_version ?? null,
      started_at: s.run.started_at ?? null,
      finished_at: s.run.finished_at ?? null,
    })),
    merged_by: { tool_version: pkg.version, node_version: process.version, merged_at: new Date().toISOString() },
  };
}

/**
 * Merges the dataset folders of a sharded study into `outDir`.
 *
 * Rows are ordered as a full run orders them: tosses by `file` (code-unit order), each toss's frames after
 * it in the order its shard wrote them. The CSV and Parquet files are then written by `writeDataset`, so they
 * are byte-identical to a full run's; `run.json` keeps the shared options (with `shard: null`), all inputs
 * sorted by file, the earliest start and latest finish, and a `merged_from` list of the shards.
 *
 * @param dirs - the shard folders (any order), together holding shards 1..n of one study exactly once
 * @param outDir - the merged dataset folder (created if needed; must not be one of `dirs`)
 * @throws UsageError naming the folder and the problem: not a finished shard, different options or tool or
 *   ffmpeg versions, a missing or doubled shard, a toss_id in two shards or in the wrong shard
 */
export async function mergeDatasets(dirs: readonly string[], outDir: string): Promise<MergeResult> {
  if (dirs.length === 0) throw new UsageError('merge: no shard folders given');
  const outAbs = resolve(outDir);
  const outReal = await realpath(outAbs).catch(() => outAbs);
  for (const dir of dirs) {
    const real = await realpath(resolve(dir)).catch(() => resolve(dir));
    if (real === outReal) throw optionError('--out', 'a folder other than the shard folders', outDir);
  }
  const read: Shard[] = [];
  for (const dir of dirs) read.push(await readShard(dir));
  checkSameRun(read);
  const shards = checkComplete(read);
  checkTosses(shards);

  const framesOf = new Map<string, FrameRow[]>();
  for (const s of shards) {
    for (const f of s.frameRows) {
      const id = String(f.toss_id);
      let list = framesOf.get(id);
      if (!list) framesOf.set(id, (list = []));
      list.push(f);
    }
  }
  // Same comparator as measureStudy's: Array.prototype.sort is stable, `file` is unique in a study.
  const tosses = shards.flatMap((s) => s.tossRows).sort((a, b) => byText(String(a.file), String(b.file)));
  const frames = tosses.flatMap((t) => framesOf.get(String(t.toss_id)) ?? []);
  await writeDataset(outAbs, { tosses, frames, run: mergedRun(shards) });
  const counts = { ok: 0, flagged: 0, failed: 0, unusable: 0 };
  for (const t of tosses) {
    if (t.status === 'ok' || t.status === 'flagged' || t.status === 'failed') counts[t.status]++;
    if (t.status === 'flagged' && t.spin_rev_s === null) counts.unusable++;
  }
  const summary = shards.map(({ dir, index, count, tosses: n, frames: m }) => ({ dir, index, count, tosses: n, frames: m }));
  return { tosses, frames, counts, shards: summary, outDir: outAbs };
}
