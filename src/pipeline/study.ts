/**
 * A study: a folder of clips (or one clip), its manifest, every clip measured, and the dataset written.
 * Options are resolved once into read-only jobs (manifest wins over options, options over defaults); the
 * measuring runs in one place; a clip that fails becomes a `failed` row and the batch goes on.
 */
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, realpath, rm, stat } from 'node:fs/promises';
import { basename, extname, isAbsolute, join, relative, resolve, sep, dirname } from 'node:path';
import { createRequire } from 'node:module';
import { availableParallelism, tmpdir } from 'node:os';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { UsageError } from '../errors.ts';
import { STANDARD_GRAVITY } from '../physics/index.ts';
import { ffmpegVersion } from '../video/index.ts';
import { readManifest, writeDataset, type FrameRow, type Manifest, type ManifestRow, type TossRow } from '../dataset/index.ts';
import { failedClipRow, measureClip, type ClipJob, type ClipResult } from './clip.ts';
import { cacheKey, fileSha256, openClipCache } from './resume.ts';

const require = createRequire(import.meta.url);
const pkg = require('../../package.json') as { version: string };

/** File endings taken as clips, any case. */
export const CLIP_EXTENSIONS = ['.mp4', '.mov', '.avi', '.mkv'];

/** Default coin when neither the manifest nor the options give one: 24.26 mm × 1.75 mm (a US quarter; common practice, no source). */
export const DEFAULT_COIN = { diameterMm: 24.26, thicknessMm: 1.75 };

export interface StudyOptions {
  /** A folder of clips or one clip. */
  input: string;
  /** Output folder. */
  out: string;
  /** Manifest file (default: `manifest.csv` in the input folder when present). */
  manifest?: string;
  /** Default capture rate for clips the manifest does not cover, frames/s. */
  fps?: number;
  /** Default coin diameter and thickness, mm. */
  coinMm?: number;
  coinThicknessMm?: number;
  /** Default focal length, px. */
  focalPx?: number;
  /** Gravity, m/s² (default standard gravity). */
  gravity?: number;
  /** Measure only shard `index` (1-based) of `count`: the clips whose toss_id hashes to it (see `shardOf`). */
  shard?: { index: number; count: number };
  /** Clips measured at once, each in its own worker thread (default: the number of cores; 1 runs in this thread). */
  jobs?: number;
  /** Ignore results kept by an earlier run in `<out>/.tossmeter-cache/` and measure every clip again (default false). */
  fresh?: boolean;
  /**
   * Clips without a stated capture rate: after a first pass at the container's rate, measure them again at the
   * study's median gravity-implied rate (`fps_source` = gravity).
   */
  fpsFromGravity?: boolean;
  /** A calibration (from `tossmeter calibrate`): clips without a stated rate use its study gravity rate. */
  calibrationGravityFps?: number;
  /** Keep and reuse finished clips' results in `<out>/.tossmeter-cache/` (default true; false neither reads nor writes it). */
  cache?: boolean;
  /** Stops the study: clips in progress are cancelled, no dataset file is written, the promise rejects. */
  signal?: AbortSignal;
}

export interface StudyProgress {
  /**
   * Called after each clip with its result, its position (0-based, in order of completion) and the count;
   * `info.cached` is true when the result was kept from an earlier run rather than measured now.
   */
  onClip?(result: ClipResult, index: number, count: number, info: { cached: boolean }): void;
}

export interface StudyResult {
  tosses: TossRow[];
  frames: FrameRow[];
  /** `unusable`: flagged tosses whose rotation could not be measured at all (no spin rate), a subset of `flagged`. */
  counts: { ok: number; flagged: number; failed: number; unusable: number };
  outDir: string;
}

function isClip(name: string): boolean {
  return CLIP_EXTENSIONS.includes(extname(name).toLowerCase());
}

/**
 * The shard (1..count) a toss belongs to: the first 4 bytes of SHA-256 of its toss_id, modulo `count`, plus 1.
 * Deterministic across machines, so the shards of a job array split a study with no coordination.
 */
export function shardOf(tossId: string, count: number): number {
  const digest = createHash('sha256').update(tossId, 'utf8').digest();
  return (digest.readUInt32BE(0) % count) + 1;
}

/** Lists the clips of `input` (sorted by name) and finds its manifest. */
async function discover(input: string, manifestOpt?: string): Promise<{ root: string; clips: string[]; manifest: Manifest | null; single: boolean }> {
  const abs = resolve(input);
  let st;
  try {
    st = await stat(abs);
  } catch {
    throw new UsageError(`input "${input}": no such file or folder`);
  }
  const root = st.isDirectory() ? abs : dirname(abs);
  let clips: string[];
  if (st.isDirectory()) {
    const entries = await readdir(abs, { withFileTypes: true });
    clips = entries.filter((e) => (e.isFile() || e.isSymbolicLink()) && isClip(e.name)).map((e) => join(abs, e.name));
  } else {
    clips = [abs];
  }
  clips.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  let manifest: Manifest | null = null;
  // A single clip uses the manifest beside it too (its row, when it has one).
  const manifestPath = manifestOpt ? resolve(manifestOpt) : join(root, 'manifest.csv');
  if (manifestPath) {
    const exists = await stat(manifestPath).then(() => true, () => false);
    if (exists) manifest = await readManifest(manifestPath);
    else if (manifestOpt) throw new UsageError(`manifest "${manifestOpt}": no such file`);
  }
  return { root, clips, manifest, single: !st.isDirectory() };
}

/** Resolves every clip into a job; manifest values win over options, options over defaults. */
function resolveJobs(root: string, clips: string[], manifest: Manifest | null, opts: StudyOptions): { jobs: ClipJob[]; missing: ClipJob[] } {
  const byFile = new Map<string, ManifestRow>();
  if (manifest) for (const row of manifest.rows) byFile.set(resolve(manifest.dir, row.file), row);
  const make = (file: string, row: ManifestRow | undefined): ClipJob => {
    const fpsFromManifest = row?.captureFps;
    const coinFromManifest = row?.coinDiameterMm !== undefined;
    return {
      file,
      displayFile: relative(root, file).split(sep).join('/'),
      tossId: row?.tossId ?? basename(file, extname(file)),
      tosser: row?.tosser ?? null,
      captureFps: fpsFromManifest ?? opts.fps ?? opts.calibrationGravityFps ?? null,
      fpsSource: fpsFromManifest !== undefined ? 'manifest' : opts.fps !== undefined ? 'option' : opts.calibrationGravityFps !== undefined ? 'calibration' : 'container',
      coinDiameterMm: row?.coinDiameterMm ?? opts.coinMm ?? DEFAULT_COIN.diameterMm,
      coinThicknessMm: row?.coinThicknessMm ?? opts.coinThicknessMm ?? DEFAULT_COIN.thicknessMm,
      scaleSource: coinFromManifest ? 'manifest' : opts.coinMm !== undefined ? 'option' : 'default',
      focalPx: row?.focalPx ?? opts.focalPx ?? null,
      startFace: row?.startFace ?? null,
      observedFace: row?.observedFace ?? null,
      landing: row?.landing ?? null,
      notes: row?.notes ?? null,
      gravity: opts.gravity ?? STANDARD_GRAVITY,
    };
  };
  const jobs = clips.map((c) => make(c, byFile.get(c)));
  const present = new Set(clips);
  const missing = [...byFile.entries()].filter(([file]) => !present.has(file)).map(([file, row]) => make(file, row));
  return { jobs, missing };
}

/**
 * Measures every clip of the study and writes the dataset into `opts.out`.
 *
 * Each finished clip's result is kept in `<out>/.tossmeter-cache/` (see `resume.ts`), so a run that was stopped
 * and started again with the same command measures only the clips it had not finished (`fresh` ignores them).
 * A clip that fails, even through an internal error of a stage, becomes a `failed` row and the study goes on.
 * When `opts.signal` fires, the clips in progress are stopped (their ffmpeg children killed, the worker pool
 * destroyed), nothing is written to the dataset files, and the promise rejects with the signal's reason;
 * the kept results stay for the next run.
 *
 * @throws UsageError for an input or manifest that cannot be used (nothing measured)
 */
export async function measureStudy(opts: StudyOptions, progress: StudyProgress = {}): Promise<StudyResult> {
  const startedAt = new Date().toISOString();
  const discovered = await discover(opts.input, opts.manifest);
  const { root, clips, manifest } = discovered;
  const resolved = resolveJobs(root, clips, manifest, opts);
  const inShard = (job: ClipJob) => !opts.shard || shardOf(job.tossId, opts.shard.count) === opts.shard.index;
  const jobs = resolved.jobs.filter(inShard);
  // One clip given: the manifest's other rows are not part of this run.
  const missing = discovered.single ? [] : resolved.missing.filter(inShard);
  if (resolved.jobs.length === 0 && resolved.missing.length === 0) throw new UsageError(`input "${opts.input}": no clips (${CLIP_EXTENSIONS.join(' ')}) found`);
  opts.signal?.throwIfAborted();
  const rootReal = await realpath(root);
  const ffmpeg = await ffmpegVersion().catch(() => 'unknown');
  const cache = opts.cache === false ? null : await openClipCache(resolve(opts.out), { fresh: opts.fresh });
  const results: ClipResult[] = [];
  const hashes = new Map<string, string | null>();
  const count = jobs.length + missing.length;
  let index = 0;
  const jobCount = Math.max(1, Math.min(opts.jobs ?? availableParallelism(), jobs.length || 1));
  // ffmpeg's decoder threads: share the cores so the pool does not oversubscribe them.
  const threads = Math.max(1, Math.floor(availableParallelism() / jobCount));
  let pool: Promise<{ pool: Piscina; dispose(): Promise<void> }> | null = null;
  const aborted = () => opts.signal?.aborted === true;
  const failed = (job: ClipJob, why: string): ClipResult => ({ toss: failedClipRow(job, `clip "${job.displayFile}": ${why}`), frames: [], framesPerSecond: 0 });
  const measureOne = async (job: ClipJob): Promise<{ result: ClipResult; cached: boolean }> => {
    const real = await realpath(job.file).catch(() => job.file);
    const rel = relative(rootReal, real);
    if (rel === '..' || rel.startsWith(`..${sep}`) || isAbsolute(rel)) return { result: failed(job, 'refused, it resolves outside the input folder'), cached: false };
    const contentSha256 = await fileSha256(job.file).catch(() => null);
    hashes.set(job.file, contentSha256);
    const key = cache && contentSha256 ? cacheKey({ contentSha256, job, toolVersion: pkg.version, ffmpegVersion: ffmpeg }) : null;
    const kept = key ? await cache!.get(key) : null;
    if (kept) return { result: kept, cached: true };
    let result: ClipResult;
    try {
      if (jobCount === 1) result = await measureClip(job, { signal: opts.signal, threads: opts.jobs === undefined ? undefined : threads });
      else {
        pool ??= createPool(jobCount);
        const { pool: workers } = await pool;
        // Stop through a port, not piscina's signal: a terminated worker would leave its ffmpeg children running.
        const { port1, port2 } = new MessageChannel();
        const onAbort = () => port1.postMessage('stop');
        opts.signal?.addEventListener('abort', onAbort, { once: true });
        if (aborted()) onAbort();
        try {
          result = (await workers.run({ job, threads, stop: port2 }, { transferList: [port2] })) as ClipResult;
        } finally {
          opts.signal?.removeEventListener('abort', onAbort);
          port1.close();
        }
      }
    } catch (err) {
      if (aborted()) throw err;
      // A stage that threw (a bug, a worker that died): this clip fails, the study goes on.
      result = failed(job, `internal error: ${err instanceof Error ? err.message : String(err)}`);
    }
    // A clip that finished while the stop was coming in may have had a step cut short: never keep it.
    if (aborted()) throw opts.signal!.reason;
    // The kept copy is a convenience: a full disk or a read-only folder must not cost the study its result.
    if (key && result.toss.status !== 'failed') await cache!.put(key, result).catch(() => undefined);
    return { result, cached: false };
  };
  let next = 0;
  const lane = async (): Promise<void> => {
    while (next < jobs.length && !aborted()) {
      const job = jobs[next++];
      const { result, cached } = await measureOne(job);
      results.push(result);
      progress.onClip?.(result, index++, count, { cached });
    }
  };
  // Wait for every lane to settle before the pool goes, so no clip is left running in the background.
  const settled = await Promise.allSettled(Array.from({ length: jobCount }, lane));
  await (await (pool as Promise<{ dispose(): Promise<void> }> | null))?.dispose();
  opts.signal?.throwIfAborted();
  const rejected = settled.find((s): s is PromiseRejectedResult => s.status === 'rejected');
  if (rejected) throw rejected.reason;
  if (opts.fpsFromGravity) {
    // The study's gravity rate: the median over the measured clips (it does not depend on the rate assumed).
    const rates = results.map((r) => r.toss.gravity_fps).filter((v): v is number => typeof v === 'number').sort((a, b) => a - b);
    if (rates.length > 0) {
      const mid = rates.length >> 1;
      const median = rates.length % 2 ? rates[mid] : 0.5 * (rates[mid - 1] + rates[mid]);
      for (let i = 0; i < results.length; i++) {
        const job = jobs.find((j) => j.displayFile === results[i].toss.file);
        if (!job || job.fpsSource !== 'container' || results[i].toss.status === 'failed') continue;
        results[i] = (await measureOne({ ...job, captureFps: median, fpsSource: 'gravity' })).result;
      }
    }
  }
  for (const job of missing) {
    const result = failed(job, 'listed in the manifest but the file does not exist');
    results.push(result);
    progress.onClip?.(result, index++, count, { cached: false });
  }
  results.sort((a, b) => (a.toss.file! < b.toss.file! ? -1 : a.toss.file! > b.toss.file! ? 1 : 0));
  const tosses = results.map((r) => r.toss);
  const frames = results.flatMap((r) => r.frames);
  const inputs = [];
  for (const job of jobs) {
    const st = await stat(job.file).catch(() => null);
    const sha = hashes.has(job.file) ? hashes.get(job.file)! : st ? await fileSha256(job.file).catch(() => null) : null;
    inputs.push({ file: job.displayFile, size_bytes: st?.size ?? null, sha256: st ? sha : null });
  }
  const run = {
    tool: 'tossmeter',
    tool_version: pkg.version,
    ffmpeg_version: ffmpeg,
    node_version: process.version,
    options: {
      input: opts.input,
      manifest: manifest ? manifest.file : null,
      fps: opts.fps ?? null,
      coin_mm: opts.coinMm ?? null,
      coin_thickness_mm: opts.coinThicknessMm ?? null,
      focal_px: opts.focalPx ?? null,
      gravity_m_s2: opts.gravity ?? STANDARD_GRAVITY,
      shard: opts.shard ? `${opts.shard.index}/${opts.shard.count}` : null,
      fps_from_gravity: opts.fpsFromGravity === true,
      calibration_gravity_fps: opts.calibrationGravityFps ?? null,
    },
    inputs,
    started_at: startedAt,
    finished_at: new Date().toISOString(),
  };
  opts.signal?.throwIfAborted();
  await writeDataset(opts.out, { tosses, frames, run });
  const counts = { ok: 0, flagged: 0, failed: 0, unusable: 0 };
  for (const t of tosses) {
    counts[t.status as 'ok' | 'flagged' | 'failed']++;
    if (t.status === 'flagged' && t.spin_rev_s === null) counts.unusable++;
  }
  return { tosses, frames, counts, outDir: resolve(opts.out) };
}

/** Young-generation limit of each worker's heap, MB (V8's semi-spaces are about a third of it each). */
const WORKER_YOUNG_GENERATION_MB = 12;

/**
 * The worker pool: compiled workers when running from dist/; from the TypeScript sources, one bundle of the
 * worker made for this pool (see {@link bundleWorker}), else the tsx bootstrap. `dispose` destroys the pool and
 * removes the bundle.
 */
async function createPool(threads: number): Promise<{ pool: Piscina; dispose(): Promise<void> }> {
  const compiled = import.meta.url.endsWith('.js');
  const bundle = compiled ? null : await bundleWorker();
  const filename = bundle?.file ?? fileURLToPath(new URL(compiled ? './clipWorker.js' : './clipWorkerBootstrap.mjs', import.meta.url));
  // Workers inherit the parent's Node options; --input-type (for an inline script) breaks a worker's file entry.
  const execArgv = process.execArgv.filter((a) => !a.startsWith('--input-type'));
  // A bundled worker needs no loader: drop tsx's (`--import tsx`), or each worker would start a loader thread.
  if (bundle) {
    for (let i = execArgv.length - 1; i >= 0; i--) {
      if (/^--(import|require|loader)=tsx$/.test(execArgv[i])) execArgv.splice(i, 1);
      else if (execArgv[i] === 'tsx' && /^--(import|require|loader)$/.test(execArgv[i - 1] ?? '')) execArgv.splice(--i, 2);
    }
  }
  // A small young generation: V8 otherwise grows it under the steady per-frame garbage (bench's small set, two
  // workers: peak RSS 388 MB without a limit, 377 with 12 MB, 409 with 24; frames/s unchanged within the noise).
  const resourceLimits = { maxYoungGenerationSizeMb: WORKER_YOUNG_GENERATION_MB };
  const pool = new Piscina({ filename, minThreads: threads, maxThreads: threads, idleTimeout: 1000, execArgv, resourceLimits });
  return {
    pool,
    async dispose() {
      await pool.destroy();
      await bundle?.dispose();
    },
  };
}

/**
 * From the TypeScript sources, the worker bundled into one plain ES module (esbuild, which tsx itself runs on),
 * in a temporary folder: a worker that registers tsx starts a loader thread of its own and transpiles every module
 * again, about 60 MB of memory per worker. The bundle's `import.meta.url` and `require` point at the worker's
 * source file, so packages (and the ffmpeg binaries) resolve as they do from the sources. Null when esbuild
 * cannot be loaded or the bundle fails (the caller falls back to the tsx bootstrap), or when
 * `TOSSMETER_WORKER_LOADER=tsx` asks for the bootstrap.
 */
async function bundleWorker(): Promise<{ file: string; dispose(): Promise<void> } | null> {
  if (process.env.TOSSMETER_WORKER_LOADER === 'tsx') return null;
  let build: typeof import('esbuild').build;
  try {
    ({ build } = await import('esbuild'));
  } catch {
    return null;
  }
  const entry = fileURLToPath(new URL('./clipWorker.ts', import.meta.url));
  const url = pathToFileURL(entry).href;
  let dir: string;
  try {
    dir = await mkdtemp(join(tmpdir(), 'tossmeter-worker-'));
  } catch {
    return null;
  }
  const dispose = () => rm(dir, { recursive: true, force: true });
  const file = join(dir, 'clipWorker.mjs');
  try {
    await build({
      entryPoints: [entry], outfile: file, bundle: true, platform: 'node', format: 'esm', target: 'node20',
      logLevel: 'silent', sourcemap: false,
      define: { 'import.meta.url': JSON.stringify(url) },
      banner: { js: `import { createRequire as __tossmeterRequire } from 'node:module'; const require = __tossmeterRequire(${JSON.stringify(url)});` },
    });
  } catch {
    await dispose();
    return null;
  }
  return { file, dispose };
}
