/**
 * `measureStudy` as a library call: kept results are reused and reported as such, a stage that throws becomes a
 * `failed` row while the study goes on, a stop (AbortSignal) writes no dataset but keeps the finished clips, and
 * symbolic links are judged by where they point. One-row-per-clip and atomic output are this project's contract
 * (DEVELOPERS.md), checked here directly.
 */
import { copyFile, mkdir, readdir, symlink } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { CACHE_DIR } from '../../src/pipeline/resume.ts';
import { measureStudy } from '../../src/pipeline/study.ts';
import { renderTiny, tempDir } from './fixtures.ts';

// A stage that throws for one clip (a bug in an estimator, say): measureClip is wrapped to throw for "boom.mp4".
vi.mock('../../src/pipeline/clip.ts', async (importOriginal) => {
  const mod = await importOriginal<typeof import('../../src/pipeline/clip.ts')>();
  return {
    ...mod,
    measureClip: async (...args: Parameters<typeof mod.measureClip>) => {
      if (args[0].displayFile === 'boom.mp4') throw new RangeError('offset is out of bounds');
      return mod.measureClip(...args);
    },
  };
});

let dir = '';
let tiny = '';
let cleanup: () => Promise<void> = async () => {};
beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('tossmeter-study-'));
  tiny = await renderTiny(join(dir, 'render'));
}, 120_000);
afterAll(async () => {
  await cleanup();
});

async function folder(name: string, clips: string[]): Promise<string> {
  const d = join(dir, name);
  await mkdir(d, { recursive: true });
  for (const c of clips) await copyFile(tiny, join(d, c));
  return d;
}

describe('measureStudy', () => {
  it('two worker threads (the worker bundled from the sources) give the same rows as one clip at a time in this thread', async () => {
    const input = await folder('pool', ['a.mp4', 'b.mp4', 'c.mp4']);
    const one = await measureStudy({ input, out: join(dir, 'pool-1'), fps: 200, jobs: 1, cache: false });
    const two = await measureStudy({ input, out: join(dir, 'pool-2'), fps: 200, jobs: 2, cache: false });
    expect(two.counts).toEqual(one.counts);
    expect(two.tosses).toEqual(one.tosses);
    expect(two.frames).toEqual(one.frames);
    expect(one.counts.failed).toBe(0);
  }, 120_000);

  it('reuses kept results on a second run and says so; cache: false neither reads nor writes them', async () => {
    const input = await folder('twice', ['a.mp4', 'b.mp4']);
    const out = join(dir, 'twice-out');
    const first: boolean[] = [];
    const r1 = await measureStudy({ input, out, fps: 200, jobs: 1 }, { onClip: (_r, _i, _n, info) => first.push(info.cached) });
    const second: boolean[] = [];
    const r2 = await measureStudy({ input, out, fps: 200, jobs: 1 }, { onClip: (_r, _i, _n, info) => second.push(info.cached) });
    expect(first).toEqual([false, false]);
    expect(second).toEqual([true, true]);
    expect(r2.tosses).toEqual(r1.tosses);
    expect(r2.frames).toEqual(r1.frames);
    const noCache = join(dir, 'nocache-out');
    await measureStudy({ input, out: noCache, fps: 200, jobs: 1, cache: false });
    expect(await readdir(noCache)).not.toContain(CACHE_DIR);
  });

  it('turns a stage that throws into a failed row naming the clip, and measures the others', async () => {
    const input = await folder('boom', ['boom.mp4', 'fine.mp4']);
    const r = await measureStudy({ input, out: join(dir, 'boom-out'), fps: 200, jobs: 1 });
    expect(r.tosses.map((t) => t.file)).toEqual(['boom.mp4', 'fine.mp4']);
    expect(r.tosses[0].status).toBe('failed');
    expect(r.tosses[0].error).toBe('clip "boom.mp4": internal error: offset is out of bounds');
    expect(r.tosses[1].status).not.toBe('failed');
    // A failed clip is not kept: the next run tries it again.
    expect(await readdir(join(dir, 'boom-out', CACHE_DIR))).toHaveLength(1);
  });

  it('stopped after its first clip: rejects, writes no dataset file, keeps the finished clip', async () => {
    const input = await folder('stop', ['a.mp4', 'b.mp4', 'c.mp4']);
    const out = join(dir, 'stop-out');
    const stop = new AbortController();
    const run = measureStudy({ input, out, fps: 200, jobs: 1, signal: stop.signal }, { onClip: () => stop.abort(new Error('stop here')) });
    await expect(run).rejects.toThrow('stop here');
    expect(await readdir(out)).toEqual([CACHE_DIR]);
    expect(await readdir(join(out, CACHE_DIR))).toHaveLength(1);
  });

  it('rejects at once when the signal has already fired, creating nothing', async () => {
    const input = await folder('early', ['a.mp4']);
    const out = join(dir, 'early-out');
    await expect(measureStudy({ input, out, fps: 200, signal: AbortSignal.abort(new Error('early')) })).rejects.toThrow('early');
    await expect(readdir(out)).rejects.toThrow(/ENOENT/);
  });

  it('measures a symbolic link to a clip inside the folder, refuses one that leaves it', async () => {
    const input = await folder('links', ['real.mp4']);
    await mkdir(join(input, 'sub'));
    await copyFile(tiny, join(input, 'sub', 'deep.mp4'));
    await symlink(join(input, 'sub', 'deep.mp4'), join(input, 'inside.mp4'));
    await symlink('../render/toss-0001.mp4', join(input, 'escape.mp4'));
    const r = await measureStudy({ input, out: join(dir, 'links-out'), fps: 200, jobs: 1 });
    const by = Object.fromEntries(r.tosses.map((t) => [t.file, t]));
    expect(by['inside.mp4'].status).not.toBe('failed');
    expect(by['inside.mp4'].spin_rev_s).toBe(by['real.mp4'].spin_rev_s);
    expect(by['escape.mp4'].status).toBe('failed');
    expect(by['escape.mp4'].error).toBe('clip "escape.mp4": refused, it resolves outside the input folder');
  });
});
