/**
 * Writes sample-clips/: seven short rendered tosses of an invented officials' academy (trainees T01–T03
 * filmed at 240 to 2000 frames/s), each with its `<clip>.truth.json`, and one manifest.csv.
 * Run: `node --import tsx scripts/make-sample-clips.ts` (about a minute). Deterministic: the same files each run.
 *
 * The set spans the capture rates 240, 480, 500, 1000, 1000, 1000 and 2000 frames/s, with and without the hand,
 * one camera roll with depth motion, one tilt of L unlike ψ, and one strong wobble (ψ 25–35°, the normal
 * starting vertical: the coin never turns over). Sizes are kept small (320x240 where the coin is still
 * 11+ px across, H.264 crf 20), under 5 MB together.
 */
import { readdir, rm, stat } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderStudy, writeManifest, type StudyClip, type SynthOptions } from '../src/synth/index.ts';

const here = fileURLToPath(new URL('.', import.meta.url));
const outDir = resolve(here, '..', 'sample-clips');
const SEED = 2024;

type Sample = Omit<SynthOptions, 'outDir' | 'count' | 'seed' | 'startIndex'>;
const common: Sample = { crf: 20, tosserCount: 3 };
const samples: Sample[] = [
  { captureFps: 240, width: 640, height: 480, launchSpeedMS: [2.2, 2.8], spinRevS: [8, 14] },
  { captureFps: 480, width: 640, height: 480, hand: false, launchSpeedMS: [1.8, 2.4], spinRevS: [15, 25] },
  { captureFps: 1000, width: 640, height: 480, launchSpeedMS: [1.8, 2.6] },
  { captureFps: 1000, width: 320, height: 240, rollDeg: [-4, 4], depthSpeedMS: [0.05, 0.15], launchSpeedMS: [1.6, 2.2] },
  { captureFps: 2000, width: 320, height: 240, hand: false, launchSpeedMS: [1.5, 1.8], spinRevS: [30, 60] },
  { captureFps: 1000, width: 640, height: 480, precessionDeg: [25, 35], spinRevS: [20, 30], launchSpeedMS: [1.8, 2.2], startFace: 'heads' },
  { captureFps: 500, width: 640, height: 480, precessionDeg: [78, 86], tiltDeg: [60, 70], launchSpeedMS: [1.8, 2.4], startFace: 'tails' },
];

async function main(): Promise<void> {
  await rm(outDir, { recursive: true, force: true });
  const clips: StudyClip[] = [];
  for (const [k, s] of samples.entries()) {
    const { clips: one } = await renderStudy({ ...common, ...s, outDir, count: 1, seed: SEED, startIndex: k });
    clips.push(...one);
    const t = one[0].truth;
    process.stderr.write(
      `${t.file}: ${t.capture_fps} fps, ${t.width}x${t.height}, ${t.frames_total} frames, hand ${t.hand}, ` +
        `psi ${t.precession_deg.toFixed(1)} deg, tilt ${t.momentum_tilt_deg.toFixed(1)} deg, ${t.face_changes} face changes\n`,
    );
  }
  await writeManifest(outDir, clips.map((c) => c.truth));
  let total = 0;
  for (const f of (await readdir(outDir)).sort()) {
    const size = (await stat(join(outDir, f))).size;
    total += size;
    process.stderr.write(`${f}\t${(size / 1024).toFixed(0)} KB\n`);
  }
  process.stderr.write(`total ${(total / 1024 / 1024).toFixed(2)} MB in ${outDir}\n`);
  if (total > 5 * 1024 * 1024) throw new Error(`sample clips take ${total} bytes, more than 5 MB`);
}

await main();
