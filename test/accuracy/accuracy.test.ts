/**
 * The full accuracy suite of the measure issue (`npm run accuracy`; CI runs it): a rendered set spanning 240 to
 * 2000 frames/s, 640x480 and 1280x720, precession 30–90°, spin 15–60 rev/s, launch speed 1.5–3.5 m/s, with
 * noise, motion blur and the hand; every clip not flagged must be within the tolerances, at most one
 * clip in ten flagged, and every flag justified by the clip. Ground truth: the renderer's truth files.
 */
import { copyFile, mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readTosses } from '../../src/dataset/index.ts';
import { measureStudy } from '../../src/pipeline/study.ts';
import { FULL_SET, renderSet } from '../helpers/accuracySet.ts';
import { checkAccuracy, checkMedianRotation } from '../helpers/accuracyChecks.ts';
import { compareWithTruth, errorTable } from '../helpers/compareTruth.ts';

let dir = '';
beforeAll(async () => {
  dir = process.env.TOSSMETER_ACCURACY_DIR ?? (await mkdtemp(join(tmpdir(), 'tossmeter-accuracy-')));
  if (!process.env.TOSSMETER_ACCURACY_REUSE) await renderSet(join(dir, 'clips'), FULL_SET);
});
afterAll(async () => {
  if (!process.env.TOSSMETER_ACCURACY_DIR) await rm(dir, { recursive: true, force: true });
});

describe('accuracy on the full rendered set', () => {
  let rows: Awaited<ReturnType<typeof compareWithTruth>> = [];
  it('measures the set: the aliased clip flagged, median spin, precession and tilt errors within the tolerances', async () => {
    const started = Date.now();
    // Always measured afresh: with the clips reused, an earlier run's results would otherwise be resumed.
    await rm(join(dir, 'results'), { recursive: true, force: true });
    const result = await measureStudy({ input: join(dir, 'clips'), out: join(dir, 'results') });
    const seconds = (Date.now() - started) / 1000;
    const frames = result.frames.length;
    rows = await compareWithTruth(join(dir, 'results'), join(dir, 'clips'));
    process.stdout.write(`\n${errorTable(rows)}\n${frames} frames measured in ${seconds.toFixed(1)} s (${(frames / seconds).toFixed(0)} frames/s)\n`);
    // The one clip rendered at 240 frames/s with 56–60 rev/s (under 4.4 frames per revolution) must be flagged as aliased.
    const fast = rows.find((r) => r.tossId === 'a240-fast');
    expect(fast?.flags).toContain('spin_aliased');
    checkMedianRotation(rows);
    // The catch, where it is placed (followed into the hand), within the 1 frame, and with it the face
    // changes and the predicted face on every clip with a flight time; at most one clip flagged (the aliased one).
    for (const r of rows) {
      if (r.catchFrames === null || r.flags.includes('catch_unseen')) continue;
      expect(Math.abs(r.catchFrames), `${r.tossId} catch (frames)`).toBeLessThan(1);
      if (r.flags.includes('spin_aliased')) continue;
      expect([r.faceChangesOk, r.predictedFaceOk], `${r.tossId} face changes, predicted face`).toEqual([true, true]);
    }
    expect(rows.filter((r) => r.status !== 'ok').length).toBeLessThanOrEqual(1);
    // The calibration issue: gravity_fps within 1.5% of the true capture rate at 480 frames/s and above, and the
    // scale within 1% on every clip whose spin is resolved. The aliased clip turns some 40° during an exposure,
    // which smears the outline's ends too: its scale is held to 1.5% (it is 1.2% off, with a stated 0.8%; the
    // calibration issue's note says so).
    for (const r of rows) {
      if (r.captureFps >= 480) expect(Math.abs(r.gravityFpsRel ?? Infinity), `${r.tossId} gravity_fps`).toBeLessThan(0.015);
      const aliased = r.flags.includes('spin_aliased');
      expect(Math.abs(r.pxPerMRel ?? Infinity), `${r.tossId} px_per_m`).toBeLessThan(aliased ? 0.015 : 0.01);
    }
  });

  it('flags a wrongly stated rate (true 1000, stated 960) on every 1000 frames/s clip, and gravity_fps is within 1.5% of the true rate', async () => {
    // The calibration issue's check: the 1000 frames/s clips of the set with a manifest that states 960.
    const src = join(dir, 'clips');
    const wrong = join(dir, 'stated-960');
    await mkdir(wrong, { recursive: true });
    const rowsIn = parse(await readFile(join(src, 'manifest.csv'), 'utf8'), { columns: true }) as Record<string, string>[];
    const kept: Record<string, string>[] = rowsIn.filter((r) => r.capture_fps === '1000').map((r) => ({ ...r, capture_fps: '960' }));
    expect(kept.length).toBeGreaterThanOrEqual(4);
    for (const r of kept) await copyFile(join(src, r.file), join(wrong, r.file));
    await writeFile(join(wrong, 'manifest.csv'), stringify(kept, { header: true }));
    await measureStudy({ input: wrong, out: join(dir, 'results-960') });
    const tosses = await readTosses(join(dir, 'results-960'));
    expect(tosses.length).toBe(kept.length);
    for (const t of tosses) {
      expect(String(t.flags).split(';'), String(t.toss_id)).toContain('fps_mismatch');
      expect(Math.abs((t.gravity_fps as number) / 1000 - 1), String(t.toss_id)).toBeLessThan(0.015);
    }
  });

  it('holds every tolerance of the measure issue on every unflagged clip, at most one in ten flagged', () => {
    expect(rows.length).toBeGreaterThan(0);
    // All ten clips: the aliased one is the one flag allowed (its flag is checked above).
    checkAccuracy(rows, 0.1);
  });
});
