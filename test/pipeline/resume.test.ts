/**
 * The clip cache of `resume.ts`: keys that change exactly when a result could, entries that round-trip and are
 * never trusted when damaged, and the sweep of temporary files left by killed runs. SHA-256 reference values are the
 * published test vectors of FIPS 180-2 (Secure Hash Standard, NIST, 2002; "abc" in its appendix B.1).
 */
import { spawnSync } from 'node:child_process';
import { mkdir, readdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ClipJob, ClipResult } from '../../src/pipeline/clip.ts';
import { failedClipRow } from '../../src/pipeline/clip.ts';
import { CACHE_DIR, cacheKey, fileSha256, openClipCache, removeStaleTemps } from '../../src/pipeline/resume.ts';
import { tempDir } from './fixtures.ts';

let dir = '';
let cleanup: () => Promise<void> = async () => {};
beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('tossmeter-resume-unit-'));
});
afterAll(async () => {
  await cleanup();
});

const JOB: ClipJob = {
  file: '/data/study/a.mp4',
  displayFile: 'a.mp4',
  tossId: 'a',
  tosser: 'T01',
  captureFps: 1000,
  fpsSource: 'manifest',
  coinDiameterMm: 24.26,
  coinThicknessMm: 1.75,
  scaleSource: 'manifest',
  focalPx: null,
  startFace: 'heads',
  observedFace: null,
  landing: 'caught',
  notes: null,
  gravity: 9.80665,
};
const PARTS = { contentSha256: 'ab'.repeat(32), job: JOB, toolVersion: '0.1.0', ffmpegVersion: 'N-1' };

/** A measured-looking result: a failed row turned `flagged`, with one frame row. */
function result(): ClipResult {
  const toss = { ...failedClipRow(JOB, 'x'), status: 'flagged', flags: 'release_unseen', error: null, spin_rev_s: 0.1 + 0.2 };
  const frame = {
    toss_id: 'a', frame: 0, t_s: 0, detected: true, cx_px: 1 / 3, cy_px: 2, major_px: 30, minor_px: 10, angle_deg: 179.99999999999997,
    axis_ratio: 1 / 3, face_visible: 'unknown', occluded: false, in_flight: true, model_axis_ratio: null, residual: null, touching_edge: false, method: 'boundary', outline_growth_px: null, end_growth_px: null, block_matched: false,
  };
  return { toss, frames: [frame], framesPerSecond: 123 } as unknown as ClipResult;
}

describe('fileSha256', () => {
  it('matches the FIPS 180-2 test vector for "abc"', async () => {
    const f = join(dir, 'abc.bin');
    await writeFile(f, 'abc');
    expect(await fileSha256(f)).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});

describe('cacheKey', () => {
  it('is a SHA-256 hex digest, the same for the same parts whatever the key order or the absolute path', () => {
    const key = cacheKey(PARTS);
    expect(key).toMatch(/^[0-9a-f]{64}$/);
    const reordered = Object.fromEntries(Object.entries(JOB).reverse()) as unknown as ClipJob;
    expect(cacheKey({ ...PARTS, job: reordered })).toBe(key);
    expect(cacheKey({ ...PARTS, job: { ...JOB, file: '/elsewhere/moved/a.mp4' } })).toBe(key);
  });

  it('changes with the content, every job value that reaches the rows, the tool version and the ffmpeg version', () => {
    const key = cacheKey(PARTS);
    const changed: ClipJob[] = [
      { ...JOB, displayFile: 'b.mp4' },
      { ...JOB, tossId: 'b' },
      { ...JOB, tosser: 'T02' },
      { ...JOB, captureFps: 999.9 },
      { ...JOB, fpsSource: 'option' },
      { ...JOB, coinDiameterMm: 24.25 },
      { ...JOB, coinThicknessMm: 1.8 },
      { ...JOB, scaleSource: 'default' },
      { ...JOB, focalPx: 500 },
      { ...JOB, startFace: 'tails' },
      { ...JOB, observedFace: 'heads' },
      { ...JOB, landing: 'surface' },
      { ...JOB, notes: 'n' },
      { ...JOB, gravity: 9.81 },
    ];
    const keys = new Set([key, ...changed.map((job) => cacheKey({ ...PARTS, job }))]);
    expect(keys.size).toBe(changed.length + 1);
    expect(cacheKey({ ...PARTS, contentSha256: 'cd'.repeat(32) })).not.toBe(key);
    expect(cacheKey({ ...PARTS, toolVersion: '0.1.1' })).not.toBe(key);
    expect(cacheKey({ ...PARTS, ffmpegVersion: 'N-2' })).not.toBe(key);
  });
});

describe('openClipCache', () => {
  it('keeps a result and gives back the same rows (frames/s is not kept)', async () => {
    const out = join(dir, 'roundtrip');
    const cache = await openClipCache(out);
    const key = cacheKey(PARTS);
    expect(await cache.get(key)).toBeNull();
    await cache.put(key, result());
    const back = await cache.get(key);
    expect(back).toEqual({ ...result(), framesPerSecond: 0 });
    expect(await readdir(join(out, CACHE_DIR))).toEqual([`${key}.json`]);
  });

  it('with fresh, misses every entry but still writes', async () => {
    const out = join(dir, 'fresh');
    const key = cacheKey(PARTS);
    await (await openClipCache(out)).put(key, result());
    const fresh = await openClipCache(out, { fresh: true });
    expect(await fresh.get(key)).toBeNull();
    expect(await (await openClipCache(out)).get(key)).not.toBeNull();
  });

  it('ignores an entry that is cut short, under another key, of another format, or with a row the dataset refuses', async () => {
    const out = join(dir, 'damaged');
    const cache = await openClipCache(out);
    const key = cacheKey(PARTS);
    const file = join(out, CACHE_DIR, `${key}.json`);
    await cache.put(key, result());
    const good = await readFile(file, 'utf8');
    const entry = JSON.parse(good);
    const damaged = [
      good.slice(0, good.length / 2),
      JSON.stringify({ ...entry, key: 'f'.repeat(64) }),
      JSON.stringify({ ...entry, format: 99 }),
      JSON.stringify({ ...entry, toss: { ...entry.toss, status: 'great' } }),
      JSON.stringify({ ...entry, toss: { ...entry.toss, surprise: 1 } }),
      JSON.stringify({ ...entry, frames: [{ ...entry.frames[0], frame: 0.5 }] }),
      '',
    ];
    for (const text of damaged) {
      await writeFile(file, text);
      expect(await cache.get(key), text.slice(0, 80)).toBeNull();
    }
  });

  it('refuses a key that is not a hex digest (no path can be smuggled in)', async () => {
    const cache = await openClipCache(join(dir, 'keys'));
    await expect(cache.put('../../escape', result())).rejects.toThrow(/not a SHA-256 hex digest/);
  });
});

describe('removeStaleTemps', () => {
  it('removes temporary files of processes that are gone and keeps those of live ones and other files', async () => {
    const d = join(dir, 'temps');
    await mkdir(d);
    // A pid that has exited: a child run to completion.
    const gone = spawnSync(process.execPath, ['-e', '0']).pid!;
    const names = [`.tosses.csv.${gone}.a1b2c3d4e5f6.tmp`, `.k.json.${process.pid}.0a0b0c0d0e0f.tmp`, 'tosses.csv', 'note.tmp'];
    for (const n of names) await writeFile(join(d, n), 'x');
    expect(await removeStaleTemps(d)).toBe(1);
    expect((await readdir(d)).sort()).toEqual(names.slice(1).sort());
    expect(await removeStaleTemps(join(dir, 'no-such-folder'))).toBe(0);
  });
});
