/**
 * Calibration from the clips themselves (the calibration issue): on rendered clips with a known capture rate,
 * a container rate unlike it, a camera roll and frames dropped from the container, `tossmeter calibrate`
 * writes calibration.json with the gravity-implied rate, the roll and the dropped-frame count per clip.
 * Ground truth: the renderer's truth files; the dropped frames are removed here with ffmpeg's select filter.
 */
import { mkdtemp, readFile, rm, writeFile, copyFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { renderStudy } from '../../src/synth/index.ts';
import { ffmpegPath, runChild } from '../../src/video/index.ts';

let dir = '';
let truthRoll = 0;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tossmeter-calibrate-'));
  const { clips } = await renderStudy({
    outDir: join(dir, 'render'), count: 2, seed: 41, width: 640, height: 480, captureFps: 500, containerFps: 30,
    distanceM: 0.42, launchSpeedMS: [1.6, 1.9], spinRevS: [15, 30], rollDeg: [5, 6],
  });
  truthRoll = clips[0].truth.camera_roll_deg;
  const clipsDir = join(dir, 'clips');
  await runChild(ffmpegPath(), ['-v', 'error', '-version']);
  await import('node:fs/promises').then((fs) => fs.mkdir(clipsDir, { recursive: true }));
  await copyFile(clips[0].file, join(clipsDir, 'T01-a.mp4'));
  // Clip b: frames 60, 61 and 120 dropped from the container (their slots stay empty in the timestamps).
  const r = await runChild(ffmpegPath(), [
    '-v', 'error', '-i', `file:${clips[1].file}`, '-vf', "select='not(eq(n\\,60)+eq(n\\,61)+eq(n\\,120))'", '-vsync', 'vfr',
    '-c:v', 'libx264', '-pix_fmt', 'yuv420p', '-crf', '18', '-preset', 'veryfast', '-y', join(clipsDir, 'T01-b.mp4'),
  ]);
  expect(r.code).toBe(0);
  await writeFile(join(clipsDir, 'manifest.csv'), 'file,toss_id,capture_fps,tosser\nT01-a.mp4,a,500,T01\nT01-b.mp4,b,500,T01\n');
}, 300_000);
afterAll(async () => {
  if (!process.env.KEEP) await rm(dir, { recursive: true, force: true });
});

describe('tossmeter calibrate', () => {
  it('writes calibration.json: container rate, gravity rate near the true rate, roll, dropped frames', async () => {
    const code = await main(['node', 'tossmeter', 'calibrate', join(dir, 'clips'), '--out', join(dir, 'cal')]);
    process.exitCode = 0;
    expect([0, 1]).toContain(code);
    const cal = JSON.parse(await readFile(join(dir, 'cal', 'calibration.json'), 'utf8'));
    expect(cal.format).toBe('tossmeter-calibration');
    expect(cal.per_clip).toHaveLength(2);
    const a = cal.per_clip.find((c: { toss_id: string }) => c.toss_id === 'a');
    const b = cal.per_clip.find((c: { toss_id: string }) => c.toss_id === 'b');
    expect(a.container_fps).toBeCloseTo(30, 6);
    expect(a.stated_fps).toBe(500);
    // Dropped frames found exactly from the timestamps.
    expect(a.frames_dropped).toBe(0);
    expect(b.frames_dropped).toBe(3);
    // The roll of the camera from the direction of the fitted acceleration, within 1° (the calibration issue).
    expect(Math.abs(a.camera_roll_deg - truthRoll)).toBeLessThan(1);
    // The gravity-implied rate: within 5% here (the 1.5% needs the scale within 1%; see the issue note).
    for (const c of [a, b]) expect(Math.abs(c.gravity_fps - 500) / 500).toBeLessThan(0.05);
    expect(cal.study.frames_dropped_total).toBe(3);
  });
});
