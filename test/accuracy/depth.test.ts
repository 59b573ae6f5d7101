/**
 * The calibration issue's depth-moving clips (`npm run accuracy`): rendered tosses whose coin moves 12–16 cm
 * towards or away from the camera during the flight (test/helpers/depthSet.ts), measured with the focal length
 * from the manifest. Checked: px/m (the scale at the mean depth of the flight) within 1% on every clip; the depth
 * change within 1 cm; on every clip whose release is seen, the launch speed within 1% once the release-time error
 * is taken out (the vertical speed changes by g per second of release error), and within the 2% as
 * measured; at least 3 of the 4 clips must have the release seen. Ground truth: the renderer's truth files (launch_speed_m_s is the
 * vertical component, as the dataset's column).
 *
 * Tolerance of the depth change, from the error budget of Z(tC) − Z(tR) = (f / s̄) k (tC − tR): px/m within 1%
 * puts 1% on f / s̄ (0.2 cm on 20 cm); the depth trend k from the major axes was within 4% on ten rendered
 * clips (0.8 cm on 20 cm); a window end off by 2 frames at 480 frames/s moves it by 0.15 cm at 0.35 m/s.
 * Together about 1 cm.
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY } from '../../src/physics/index.ts';
import { readTosses } from '../../src/dataset/index.ts';
import { measureStudy } from '../../src/pipeline/study.ts';
import { parseTruth } from '../../src/synth/truth.ts';
import { renderSet } from '../helpers/accuracySet.ts';
import { DEPTH_SET, depthClipOptions } from '../helpers/depthSet.ts';

const DEPTH_TOLERANCE_M = 0.01;
const PX_PER_M_TOLERANCE = 0.01;
const LAUNCH_TOLERANCE = 0.02;
const LAUNCH_AT_TRUE_RELEASE_TOLERANCE = 0.01;

interface DepthRow {
  toss: string;
  fps: number;
  releaseSeen: boolean;
  releaseFrames: number | null;
  launchRel: number | null;
  /** Launch speed error with the release-time error taken out: (v + g Δt_release) / u − 1. */
  launchAtTrueReleaseRel: number | null;
  pxPerMRel: number | null;
  depthTrueM: number;
  depthErrM: number | null;
  flags: string;
}

let dir = '';
let rows: DepthRow[] = [];
beforeAll(async () => {
  dir = process.env.TOSSMETER_DEPTH_DIR ?? (await mkdtemp(join(tmpdir(), 'tossmeter-depth-')));
  if (!process.env.TOSSMETER_DEPTH_REUSE) await renderSet(join(dir, 'clips'), DEPTH_SET.map(depthClipOptions));
  // Always measured afresh: with the clips reused, an earlier run's results would otherwise be resumed.
  await rm(join(dir, 'results'), { recursive: true, force: true });
  await measureStudy({ input: join(dir, 'clips'), out: join(dir, 'results') });
  const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
  for (const t of await readTosses(join(dir, 'results'))) {
    const truth = parseTruth(await readFile(join(dir, 'clips', String(t.file).replace(/\.[^.]+$/, '.truth.json')), 'utf8'));
    const flags = String(t.flags ?? '');
    const launch = num(t.launch_speed_m_s);
    const release = num(t.release_t_s);
    const releaseErrS = release === null ? null : release - truth.release_t_s;
    rows.push({
      toss: String(t.toss_id),
      fps: truth.capture_fps,
      releaseSeen: !flags.split(';').includes('release_unseen') && release !== null,
      releaseFrames: releaseErrS === null ? null : releaseErrS * truth.capture_fps,
      launchRel: launch === null ? null : launch / truth.launch_speed_m_s - 1,
      launchAtTrueReleaseRel: launch === null || releaseErrS === null ? null : (launch + STANDARD_GRAVITY * releaseErrS) / truth.launch_speed_m_s - 1,
      pxPerMRel: num(t.px_per_m) === null ? null : (t.px_per_m as number) / truth.px_per_m - 1,
      depthTrueM: truth.depth_change_m,
      depthErrM: num(t.depth_change_m) === null ? null : (t.depth_change_m as number) - truth.depth_change_m,
      flags,
    });
  }
  const f = (v: number | null, scale: number, d: number) => (v === null ? '–' : (v * scale).toFixed(d));
  const head = ['toss', 'fps', 'release', 'release(fr)', 'launch(%)', 'launch@true rel(%)', 'px/m(%)', 'depth true(cm)', 'depth err(cm)', 'flags'];
  const lines = rows.map((r) => [
    r.toss, String(r.fps), r.releaseSeen ? 'seen' : 'unseen', f(r.releaseFrames, 1, 2), f(r.launchRel, 100, 2), f(r.launchAtTrueReleaseRel, 100, 2),
    f(r.pxPerMRel, 100, 2), f(r.depthTrueM, 100, 1), f(r.depthErrM, 100, 2), r.flags,
  ]);
  const all = [head, ...lines];
  const widths = head.map((_, j) => Math.max(...all.map((l) => l[j].length)));
  process.stdout.write(`\n${all.map((l) => l.map((c, j) => c.padStart(widths[j])).join(' ')).join('\n')}\n`);
});
afterAll(async () => {
  if (!process.env.TOSSMETER_DEPTH_DIR) await rm(dir, { recursive: true, force: true });
});

describe('accuracy on depth-moving clips (12–16 cm towards and away from the camera)', () => {
  it('measures every clip: px/m within 1% and the depth change within 1 cm', () => {
    expect(rows.length).toBe(DEPTH_SET.length);
    for (const r of rows) {
      expect(Math.abs(r.pxPerMRel ?? Infinity), `${r.toss} px_per_m`).toBeLessThan(PX_PER_M_TOLERANCE);
      expect(Math.abs(r.depthErrM ?? Infinity), `${r.toss} depth_change_m`).toBeLessThan(DEPTH_TOLERANCE_M);
    }
  });

  it('scores at least 2 clips with the release seen; on each the launch speed at the true release is within 1%', () => {
    const scored = rows.filter((r) => r.releaseSeen);
    expect(scored.length).toBeGreaterThanOrEqual(2);
    for (const r of scored) {
      expect(Math.abs(r.launchAtTrueReleaseRel ?? Infinity), `${r.toss} launch speed at the true release`).toBeLessThan(LAUNCH_AT_TRUE_RELEASE_TOLERANCE);
    }
  });

  // The calibration issue's tolerance: launch speed within 2% on depth-moving clips.
  it('holds the launch speed within 2% on every clip with the release seen, on at least 3 of the 4', () => {
    const scored = rows.filter((r) => r.releaseSeen);
    expect(scored.length).toBeGreaterThanOrEqual(3);
    for (const r of scored) expect(Math.abs(r.launchRel ?? Infinity), `${r.toss} launch speed`).toBeLessThan(LAUNCH_TOLERANCE);
  });
});
