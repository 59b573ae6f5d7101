import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tossPlotData, tossPlots } from '../../src/report/tossPlots.ts';
import { G, PX_PER_M, makeStudy, type StudyFixture } from './fixtures.ts';

// The fixture moves the coin ballistically (height u·τ − g·τ²/2; common practice, no source) along the image's
// up direction (sin ρ, −cos ρ) for camera roll ρ, so the heights the report derives must lie on the parabola.
let plain: StudyFixture;
let rolled: StudyFixture;
beforeAll(async () => {
  [plain, rolled] = await Promise.all([makeStudy({ tosses: 3 }), makeStudy({ tosses: 3, rollDeg: 12 })]);
});
afterAll(async () => {
  await plain.cleanup();
  await rolled.cleanup();
});

function check(study: StudyFixture): void {
  const toss = study.tosses[0];
  const own = study.frames.filter((f) => f.toss_id === toss.toss_id);
  const d = tossPlotData(toss, own, G);
  expect(d.timeInSeconds).toBe(true);
  expect(d.window!.start).toBeCloseTo(toss.release_t_s as number, 12);
  expect(d.track).toHaveLength(2 * own.length);
  const u = toss.launch_speed_m_s as number;
  for (const h of d.height!.filter((r) => r.inFlight)) {
    const tau = h.t - d.window!.start;
    expect(Math.abs(h.heightM - (u * tau - 0.5 * G * tau * tau))).toBeLessThan(1e-9);
  }
  const apex = Math.max(...d.parabola!.map((p) => p.heightM));
  expect(apex).toBeCloseTo((u * u) / (2 * G), 3); // apex height u²/(2g), sampled at 64 vertices
  expect(PX_PER_M).toBe(toss.px_per_m);
}

describe('tossPlotData', () => {
  it('puts the heights of a ballistic track on the launch-speed parabola', () => check(plain));
  it('uses the camera roll: up in the image is (sin ρ, −cos ρ)', () => check(rolled));
  it('leaves the flight plot out without a scale', () => {
    const toss = { ...plain.tosses[0], px_per_m: null };
    const d = tossPlotData(toss, plain.frames.filter((f) => f.toss_id === toss.toss_id), G);
    expect(d.height).toBeNull();
    expect(d.parabola).toBeNull();
  });
});

describe('tossPlots', () => {
  it('renders the three plots with labels from the field list', async () => {
    const toss = plain.tosses[0];
    const svgs = await tossPlots(tossPlotData(toss, plain.frames.filter((f) => f.toss_id === toss.toss_id), G), 't0');
    expect(svgs).toHaveLength(3);
    const svg = svgs.join('');
    for (const text of ['track (shaded: in flight)', 'axis ratio: observed and fitted', 'flight: height and parabola', 't_s (s)', 'axis_ratio']) {
      expect(svg).toContain(text);
    }
  });
});
