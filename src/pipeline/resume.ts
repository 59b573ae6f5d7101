/**
 * Resume: each finished clip's result is kept in the output folder, so a study that was stopped (Ctrl-C,
 * SIGKILL, a power cut) and started again re-measures only the clips it had not finished.
 *
 * Layout: `<out>/.tossmeter-cache/<key>.json`, one file per clip result, written with `atomicWriteFile`
 * (a reader sees a whole entry or none). The key is SHA-256 over the clip's content hash, every job value
 * that reaches the clip's rows, the tool version and the ffmpeg version; so a changed clip, a changed
 * manifest row or option, or a new version simply misses the cache. An entry that cannot be read or does not
 * match the dataset's field list is ignored (the clip is measured again), never trusted.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, readdir, readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { FRAME_FIELDS, TOSS_FIELDS, atomicWriteFile, canonicalRows, type FrameRow, type TossRow } from '../dataset/index.ts';
import type { ClipJob, ClipResult } from './clip.ts';

/** The cache folder's name inside the output folder. */
export const CACHE_DIR = '.tossmeter-cache';

/** Format number of a cache entry; bump it when the entry's shape changes. */
const ENTRY_FORMAT = 1;

/** What a clip's cache key is made of. */
export interface CacheKeyParts {
  /** SHA-256 (hex) of the clip file's bytes. */
  contentSha256: string;
  /** The resolved job (its absolute `file` is left out: moving the study folder keeps the cache valid). */
  job: ClipJob;
  /** tossmeter's version. */
  toolVersion: string;
  /** The ffmpeg version string (decoding may differ between builds). */
  ffmpegVersion: string;
}

/** Serialises a value with object keys sorted, so equal values give equal text whatever the key order. */
function stableJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map(stableJson).join(',')}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj).filter((k) => obj[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${stableJson(obj[k])}`).join(',')}}`;
}

/**
 * The cache key of one clip: hex SHA-256 of the stable JSON of its parts (the job without its absolute path).
 * Two jobs get the same key exactly when their content, row-shaping values and versions are equal.
 */
export function cacheKey(parts: CacheKeyParts): string {
  const { file: _abs, ...job } = parts.job;
  const text = stableJson({ format: ENTRY_FORMAT, content: parts.contentSha256, job, tool: parts.toolVersion, ffmpeg: parts.ffmpegVersion });
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** SHA-256 (hex) of a file's bytes, streamed. */
export async function fileSha256(file: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(file)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/** True when a process with this pid is alive (signal 0 probes without sending anything). */
function alive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Removes temporary files that `atomicWriteFile` left in `dir` when its process was killed mid-write
 * (`.<name>.<pid>.<random>.tmp` whose pid is no longer alive). Files of live processes are kept.
 *
 * @returns the number of files removed (0 when the folder does not exist)
 */
export async function removeStaleTemps(dir: string): Promise<number> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return 0;
  }
  let removed = 0;
  for (const name of names) {
    const m = /^\..+\.(\d+)\.[0-9a-f]+\.tmp$/.exec(name);
    if (m === null || alive(Number(m[1]))) continue;
    await rm(join(dir, name), { force: true });
    removed++;
  }
  return removed;
}

/** The clip cache of one output folder. */
export interface ClipCache {
  /** The cache folder (absolute when `outDir` was). */
  readonly dir: string;
  /** The kept result for `key`, or null (absent, unreadable, or not matching the field lists; `fresh` always misses). */
  get(key: string): Promise<ClipResult | null>;
  /** Keeps `result` under `key` (atomically). Only `ok` and `flagged` results are worth keeping; the caller decides. */
  put(key: string, result: ClipResult): Promise<void>;
}

/**
 * Opens (and creates) the cache folder of `outDir`, removing temporary files of killed runs first.
 *
 * @param outDir - the study's output folder
 * @param opts.fresh - ignore kept results (entries are still written, replacing old ones); default false
 */
export async function openClipCache(outDir: string, opts: { fresh?: boolean } = {}): Promise<ClipCache> {
  const dir = join(outDir, CACHE_DIR);
  await mkdir(dir, { recursive: true });
  await removeStaleTemps(dir);
  await removeStaleTemps(outDir);
  const fileOf = (key: string) => {
    if (!/^[0-9a-f]{64}$/.test(key)) throw new Error(`cache key "${key}" is not a SHA-256 hex digest`);
    return join(dir, `${key}.json`);
  };
  return {
    dir,
    async get(key) {
      if (opts.fresh) return null;
      try {
        const entry = JSON.parse(await readFile(fileOf(key), 'utf8')) as { format?: unknown; key?: unknown; toss?: unknown; frames?: unknown };
        if (entry.format !== ENTRY_FORMAT || entry.key !== key || typeof entry.toss !== 'object' || entry.toss === null || !Array.isArray(entry.frames)) return null;
        // Throws DatasetError for a row that the dataset writer would refuse: then the entry is not used.
        canonicalRows('tosses', TOSS_FIELDS, [entry.toss]);
        canonicalRows('frames', FRAME_FIELDS, entry.frames as object[]);
        return { toss: entry.toss as TossRow, frames: entry.frames as FrameRow[], framesPerSecond: 0 };
      } catch {
        return null;
      }
    },
    async put(key, result) {
      const text = `${JSON.stringify({ format: ENTRY_FORMAT, key, toss: result.toss, frames: result.frames })}\n`;
      await atomicWriteFile(fileOf(key), text);
    },
  };
}
