/**
 * SLOW (about 1.5 minutes on 2 busy cores; pack + install alone take ~25 s): the package as users get it. `npm pack` (prepack runs the build into dist/), install
 * the tarball into an empty temporary project from the npm cache (`npm install --offline`, falling back to
 * `--prefer-offline`), then use it from plain JavaScript (an .mjs file) and from TypeScript (a .ts file
 * typechecked by the project's tsc against the installed package's .d.ts files, then run with tsx).
 *
 * What is checked: the tarball's contents; the library's entries load and work from dist/ (render two clips,
 * measure them with two worker threads, the compiled `clipWorker.js`; observe a clip; summarise); the dataset
 * the installed package writes is byte-identical to the one the sources in this repository write (the
 * reference: the same code run uncompiled); measureClip called from TypeScript in the main thread gives the
 * measured values the worker threads wrote; every frame of the clip is decoded (the truth file's frame count);
 * the types are real (a wrong use fails to typecheck); the `tossmeter` command starts.
 */
import { execFile } from 'node:child_process';
import { mkdir, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readTosses } from '../../src/dataset/index.ts';
import { measureStudy } from '../../src/pipeline/study.ts';

const run = promisify(execFile);
const REPO = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const TSC = join(REPO, 'node_modules', 'typescript', 'bin', 'tsc');
let root = '';
let app = '';
let tarball = '';

/** Plain JavaScript: every named entry, two clips measured with two worker threads, observe, summarise. */
const CONSUMER_MJS = `
import { measureClip, measureStudy, renderStudy, summarizeStudy, observeClip, readTosses, mergeDatasets,
  estimateToss, TOSS_FIELDS, FRAME_FIELDS, STANDARD_GRAVITY, sameSideVertical, shardOf } from 'tossmeter';
import { join } from 'node:path';

const dir = process.argv[2];
const entries = { measureClip, measureStudy, renderStudy, summarizeStudy, observeClip, readTosses, mergeDatasets, estimateToss, sameSideVertical, shardOf };
const types = Object.fromEntries(Object.entries(entries).map(([k, v]) => [k, typeof v]));
const { clips } = await renderStudy({ outDir: join(dir, 'clips'), count: 2, seed: 11, width: 320, height: 240, captureFps: 500,
  launchSpeedMS: [1.96, 1.96], supersampling: 1, subExposures: 2 });
const study = await measureStudy({ input: join(dir, 'clips'), out: join(dir, 'dataset'), jobs: 2 });
let observed = 0;
let detected = 0;
for await (const o of observeClip(clips[0].file)) { observed++; if (o.detected) detected++; }
const summary = summarizeStudy(await readTosses(join(dir, 'dataset')), { seed: 1, bootstrap: 200 });
console.log(JSON.stringify({ types, counts: study.counts, frames: study.frames.length, observed, detected,
  framesTotal: study.tosses[0].frames_total, summaryTosses: summary.study.tosses, tossFields: TOSS_FIELDS.length,
  frameFields: FRAME_FIELDS.length, g: STANDARD_GRAVITY }));
`;

/** TypeScript: typed use of measureClip on one clip; the result's types are used as they are declared. */
const CONSUMER_TS = `
import { measureClip, type ClipJob, type ClipResult, type FrameObservation, observeClip, parseTruth, type TossRow } from 'tossmeter';
import { readFile } from 'node:fs/promises';

const file: string = process.argv[2];
const truth = parseTruth(await readFile(file.replace(/\\.mp4$/, '.truth.json'), 'utf8'));
const job: ClipJob = {
  file, displayFile: 'clip.mp4', tossId: truth.toss_id, tosser: 'T01', captureFps: truth.capture_fps, fpsSource: 'manifest',
  coinDiameterMm: truth.coin_diameter_mm, coinThicknessMm: truth.coin_thickness_mm, scaleSource: 'manifest',
  focalPx: truth.focal_px, startFace: null, observedFace: null, landing: null, notes: null, gravity: 9.80665,
};
const result: ClipResult = await measureClip(job);
const toss: TossRow = result.toss;
const first: FrameObservation[] = [];
for await (const o of observeClip(file)) { first.push(o); if (first.length === 3) break; }
const spin: number | null = typeof toss.spin_rev_s === 'number' ? toss.spin_rev_s : null;
console.log(JSON.stringify({ toss, spin, frames: result.frames.length, framesTotal: truth.frames_total,
  firstFrames: first.map((o) => o.frame) }));
`;

/** Must NOT typecheck: proves the package's types are loaded (an untyped import would accept it). */
const WRONG_TS = `
import { measureStudy } from 'tossmeter';
const n: number = measureStudy;
await measureStudy({ input: 'x' });
export { n };
`;

const TSCONFIG = {
  compilerOptions: {
    target: 'ES2022', module: 'NodeNext', moduleResolution: 'NodeNext', strict: true, noEmit: true,
    skipLibCheck: false, types: ['node'], typeRoots: [join(REPO, 'node_modules', '@types')],
  },
};

async function npm(args: string[], cwd: string): Promise<string> {
  const { stdout } = await run('npm', args, { cwd, maxBuffer: 64 << 20, env: { ...process.env, npm_config_update_notifier: 'false' } });
  return stdout;
}

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tossmeter-package-'));
  const packed = await npm(['pack', '--pack-destination', root, '--silent'], REPO);
  tarball = join(root, packed.trim().split('\n').pop()!.trim());
  app = join(root, 'app');
  await mkdir(app);
  await writeFile(join(app, 'package.json'), JSON.stringify({ name: 'academy-analysis', version: '1.0.0', private: true, type: 'module' }));
  try {
    await npm(['install', '--offline', '--no-audit', '--no-fund', tarball], app);
  } catch {
    await npm(['install', '--prefer-offline', '--no-audit', '--no-fund', tarball], app);
  }
  await writeFile(join(app, 'consumer.mjs'), CONSUMER_MJS);
  await writeFile(join(app, 'consumer.ts'), CONSUMER_TS);
  await writeFile(join(app, 'tsconfig.json'), JSON.stringify({ ...TSCONFIG, files: ['consumer.ts'] }));
  await mkdir(join(app, 'wrong'));
  await writeFile(join(app, 'wrong', 'wrong.ts'), WRONG_TS);
  // skipLibCheck on here: this project only has to show that the declared types reject a wrong use.
  await writeFile(join(app, 'wrong', 'tsconfig.json'), JSON.stringify({ compilerOptions: { ...TSCONFIG.compilerOptions, skipLibCheck: true }, files: ['wrong.ts'] }));
  // the wrong/ project sits below app/, so 'tossmeter' resolves to app/node_modules as well
  await writeFile(join(app, 'wrong', 'package.json'), JSON.stringify({ type: 'module' }));
}, 150_000);

afterAll(() => rm(root, { recursive: true, force: true }));

describe('the packed package (slow: npm pack + offline install)', () => {
  it('the tarball holds the compiled library with types, the compiled worker, the CLI and no tests', async () => {
    const { stdout } = await run('tar', ['-tzf', tarball]);
    const files = stdout.split('\n').filter(Boolean).map((f) => f.replace(/^package\//, ''));
    for (const f of ['package.json', 'dist/index.js', 'dist/index.d.ts', 'dist/pipeline/clipWorker.js', 'dist/pipeline/merge.js',
      'dist/pipeline/observe.d.ts', 'dist/cli/main.js', 'bin/tossmeter.mjs']) expect(files).toContain(f);
    expect(files.filter((f) => f.startsWith('test/'))).toEqual([]);
    expect(files.filter((f) => f.startsWith('dist/') && f.endsWith('.test.js'))).toEqual([]);
  });

  it('plain JavaScript: entries load, two clips measured in worker threads, observed and summarised; same bytes as the sources write', async () => {
    const { stdout } = await run(process.execPath, ['consumer.mjs', root], { cwd: app, maxBuffer: 16 << 20 });
    const out = JSON.parse(stdout.trim().split('\n').pop()!);
    expect(Object.values(out.types)).toEqual(Array(10).fill('function'));
    expect(out.counts.ok + out.counts.flagged).toBe(2);
    expect(out.counts.failed).toBe(0);
    expect(out.observed).toBe(out.framesTotal);
    expect(out.detected).toBeGreaterThan(100);
    expect(out.summaryTosses).toBe(2);
    expect(out.g).toBe(9.80665);
    // Reference: the repository's own sources on the same clips (one thread, uncompiled).
    await measureStudy({ input: join(root, 'clips'), out: join(root, 'reference'), jobs: 1 });
    for (const file of ['tosses.csv', 'frames.csv', 'tosses.parquet', 'frames.parquet', 'datapackage.json']) {
      const a = await readFile(join(root, 'dataset', file));
      const b = await readFile(join(root, 'reference', file));
      expect(Buffer.compare(a, b), file).toBe(0);
    }
  });

  it('TypeScript: consumer.ts typechecks against the installed .d.ts (skipLibCheck off); a wrong use does not', async () => {
    const [, wrong] = await Promise.all([
      run(process.execPath, [TSC, '-p', 'tsconfig.json'], { cwd: app }),
      run(process.execPath, [TSC, '-p', 'tsconfig.json'], { cwd: join(app, 'wrong') }).then(() => null, (err: { stdout: string }) => err.stdout),
    ]);
    expect(wrong).toMatch(/wrong\.ts\(3,\d+\): error TS2322: Type .* is not assignable to type 'number'/);
    expect(wrong).toMatch(/wrong\.ts\(4,\d+\): error TS2345/); // `out` is missing from the options
  });

  it('TypeScript run with tsx: measureClip on a 0.4 s clip (in this thread) gives the measured values measureStudy wrote (in a worker)', async () => {
    const clip = (await readdir(join(root, 'clips'))).filter((f) => f.endsWith('.mp4')).sort()[0];
    const tsx = join(app, 'node_modules', '.bin', 'tsx');
    const { stdout } = await run(tsx, ['consumer.ts', join(root, 'clips', clip)], { cwd: app, maxBuffer: 16 << 20 });
    const out = JSON.parse(stdout.trim().split('\n').pop()!);
    expect(['ok', 'flagged']).toContain(out.toss.status);
    expect(out.frames).toBe(out.framesTotal); // the renderer's frame count (truth file): every frame decoded, one row each
    expect(out.framesTotal).toBeGreaterThan(200); // 0.4 s of flight at 500 frames/s plus the hand before and after
    expect(out.spin).toBeGreaterThan(0);
    const row = (await readTosses(join(root, 'dataset'))).find((t) => t.toss_id === out.toss.toss_id)!;
    for (const key of ['status', 'flags', 'frames_tracked', 'px_per_m', 'release_t_s', 'catch_t_s', 'spin_rev_s', 'spin_rev_s_se',
      'precession_deg', 'momentum_tilt_deg', 'p_same_side', 'fit_rms'] as const) {
      // An empty string (no flags) is written as an empty cell, which reads back as null.
      const norm = (v: unknown) => (v === '' ? null : v);
      expect(norm(out.toss[key]), key).toEqual(norm(row[key]));
    }
    expect(out.firstFrames).toEqual([0, 1, 2]);
  });

  it('the installed tossmeter command starts and prints the package version', async () => {
    const pkg = JSON.parse(await readFile(join(REPO, 'package.json'), 'utf8')) as { version: string };
    const { stdout } = await run(process.execPath, [join(app, 'node_modules', 'tossmeter', 'bin', 'tossmeter.mjs'), '--version'], { cwd: app });
    expect(stdout.trim()).toBe(pkg.version);
  });
});
