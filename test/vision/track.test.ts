import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeFrames } from '../../src/video/index.ts';
import { createTracker, type FrameObservation, type TrackerOptions } from '../../src/vision/track.ts';
import { carrySequence, coinHandGap, handEllipses, tossSequence, type TossSequence } from './synthSequence.ts';

/** Observations of two trackers with options `a` and `b` over one decode of `file`. */
async function runTwo(file: string, a: TrackerOptions, b: TrackerOptions): Promise<[FrameObservation[], FrameObservation[]]> {
  const ta = createTracker(a), tb = createTracker(b);
  const oa: FrameObservation[] = [], ob: FrameObservation[] = [];
  for await (const f of decodeFrames(file, { pixFmt: 'gray' })) {
    const x = ta.push(f), y = tb.push(f);
    if (x) oa.push(x);
    if (y) ob.push(y);
  }
  oa.push(...ta.flush());
  ob.push(...tb.flush());
  return [oa, ob];
}

function run(seq: TossSequence, opts: Parameters<typeof createTracker>[0] = {}): FrameObservation[] {
  const tr = createTracker(opts);
  const out: FrameObservation[] = [];
  for (const data of seq.frames) {
    const o = tr.push({ data, width: seq.width, height: seq.height });
    if (o) out.push(o);
  }
  out.push(...tr.flush());
  return out;
}

/** Frames where the drawn coin is fully inside the image and at least 8 px from the hand. */
function isolated(seq: TossSequence, t: number): boolean {
  const c = seq.coins[t]!.ellipse;
  const r = c.major / 2 + 2;
  return coinHandGap(seq.coins[t]!, seq.hands[t]) > 8 && c.cx - r > 0 && c.cy - r > 0 && c.cx + r < seq.width - 1 && c.cy + r < seq.height - 1;
}

describe('createTracker on synthetic toss sequences (rasterised here, independent of src/)', () => {
  const seq = tossSequence({ seed: 3, width: 640, height: 480, diameterPx: 80, apexY: 100, frames: 100 });
  const obs = run(seq);

  it('reports one observation per frame, in order, NaN when not detected', () => {
    expect(obs.map((o) => o.frame)).toEqual(seq.frames.map((_, i) => i));
    for (const o of obs) if (!o.detected) expect([o.cx, o.major, o.areaPx].every(Number.isNaN)).toBe(true);
  });

  it('on isolated frames: centre within 0.5 px and axis ratio within 0.03 of the drawn ellipse, edge-on (ratio 0.05) frames included', () => {
    let n = 0, edgeOn = 0;
    for (let t = 0; t < seq.frames.length; t++) {
      if (!isolated(seq, t) || t < 20) continue; // the coin separates from the hand at frame ~17; acquisition takes 2 frames
      const o = obs[t], c = seq.coins[t]!.ellipse;
      expect(o.detected, `frame ${t}`).toBe(true);
      expect(Math.hypot(o.cx - c.cx, o.cy - c.cy), `frame ${t}`).toBeLessThan(0.5);
      expect(Math.abs(o.minor / o.major - c.minor / c.major), `frame ${t}`).toBeLessThan(0.03);
      expect(Math.abs(o.major - c.major), `frame ${t}`).toBeLessThan(3.5);
      if (c.minor / c.major < 0.1) edgeOn++;
      n++;
    }
    expect(n).toBeGreaterThan(50);
    expect(edgeOn).toBeGreaterThanOrEqual(3);
  });

  it('follows the visible face: mean gray is bright for face 1 (205) and dark for face 2 (35) on face-on frames', () => {
    for (let t = 20; t < seq.frames.length; t++) {
      const o = obs[t], c = seq.coins[t]!;
      if (!o.detected || o.method !== 'moments' || c.ellipse.minor / c.ellipse.major < 0.5) continue;
      if (c.gray > 128) expect(o.meanGray).toBeGreaterThan(150);
      else expect(o.meanGray).toBeLessThan(90);
    }
  });

  it('never reports the hand: every detection lies on the drawn coin, none inside a hand blob away from it', () => {
    let detections = 0;
    for (let t = 0; t < seq.frames.length; t++) {
      const o = obs[t];
      if (!o.detected) continue;
      detections++;
      const c = seq.coins[t]!.ellipse;
      expect(Math.hypot(o.cx - c.cx, o.cy - c.cy), `frame ${t}`).toBeLessThan(0.25 * c.major);
      expect(Math.abs(o.major - c.major), `frame ${t}`).toBeLessThan(0.15 * c.major);
      const h = seq.hands[t];
      if (h) for (const e of handEllipses(h)) expect(Math.hypot(o.cx - e.cx, o.cy - e.cy) < 5 && Math.abs(o.major - e.major) < 5).toBe(false);
    }
    expect(detections).toBeGreaterThan(55);
  });

  it('flags frames where the coin touches the catching hand as occluded and fits them from the boundary', () => {
    const occ = obs.filter((o) => o.detected && o.occluded);
    expect(occ.length).toBeGreaterThanOrEqual(1);
    for (const o of occ) expect(o.method).toBe('boundary');
  });

  it('re-acquires a coin that leaves the frame at the top and comes back', () => {
    const out = tossSequence({ seed: 9, width: 480, height: 360, diameterPx: 60, apexY: -60, frames: 90 });
    const o = run(out);
    const firstOut = out.coins.findIndex((c) => c !== null && c.ellipse.cy + c.ellipse.major / 2 < 0);
    expect(firstOut).toBeGreaterThan(0);
    const back = out.coins.findIndex((c, t) => t > firstOut && c !== null && c.ellipse.cy - c.ellipse.major / 2 > 2);
    expect(back).toBeGreaterThan(firstOut);
    // while fully out: nothing detected
    for (let t = firstOut; t < back; t++) {
      const c = out.coins[t]!.ellipse;
      if (c.cy + c.major / 2 < -1) expect(o[t].detected, `frame ${t}`).toBe(false);
    }
    // within 3 frames of being fully back: tracked again, and accurate on isolated frames after
    let found = -1;
    for (let t = back; t < back + 4; t++) if (o[t].detected) { found = t; break; }
    expect(found).toBeGreaterThanOrEqual(back);
    for (let t = found + 1; t < out.frames.length; t++) {
      if (!isolated(out, t)) continue;
      const c = out.coins[t]!.ellipse;
      expect(o[t].detected, `frame ${t}`).toBe(true);
      // 1.2 px, not 0.5: after re-entry a few frames (3 of 12 here) come out 0.5–1 px off; a known weakness.
      expect(Math.hypot(o[t].cx - c.cx, o[t].cy - c.cy), `frame ${t}`).toBeLessThan(1.2);
    }
    // frames cut by the top edge that are reported are flagged
    for (let t = 0; t < out.frames.length; t++) {
      const c = out.coins[t]!.ellipse;
      const halfHeight = Math.hypot((c.major / 2) * Math.sin(c.angleRad), (c.minor / 2) * Math.cos(c.angleRad));
      if (o[t].detected && c.cy - halfHeight < -1) expect(o[t].touchingEdge, `frame ${t}`).toBe(true);
    }
  });

  it('back-fills the coin carried by the accelerating hand before the release: within 1 px of the drawn coin, never on the ghost or the hand', () => {
    // minMajorPx 30: this rasterised hand's finger gaps make coin-sized (~21 px) ellipse-like blobs; see the small-coin test.
    const cs = carrySequence({ seed: 2, diameterPx: 40, holdFrames: 10, release: 30, frames: 56 });
    const o = run(cs, { minMajorPx: 30 });
    expect(o.map((x) => x.frame)).toEqual(cs.frames.map((_, i) => i));
    const before = o.filter((x) => x.frame <= cs.release && x.detected);
    // The hand moves the coin from frame 10 on; the frames before the release are all back-filled.
    expect(before.length).toBeGreaterThanOrEqual(12);
    for (const x of before) expect(x.backfilled, `frame ${x.frame}`).toBe(true);
    for (const x of o) {
      if (!x.detected) continue;
      const c = cs.coins[x.frame]!.ellipse;
      expect(Math.hypot(x.cx - c.cx, x.cy - c.cy), `frame ${x.frame}`).toBeLessThan(1);
      // not on the ghost: the coin's starting place, once the drawn coin has left it
      const fromStart = Math.hypot(c.cx - cs.startCentre.x, c.cy - cs.startCentre.y);
      if (fromStart > 4) expect(Math.hypot(x.cx - cs.startCentre.x, x.cy - cs.startCentre.y), `frame ${x.frame}`).toBeGreaterThan(fromStart - 1);
    }
    // While the coin stands still in the hand (frames ≤ 10) it equals the background model: nothing reported.
    for (let t = 0; t <= 10; t++) expect(o[t].detected, `frame ${t}`).toBe(false);
  });

  it.each([1, 8])('with release keeps the pushed frames without a copy, gives each back once it is done with it, and observes the same (bufferFrames %i)', (bufferFrames) => {
    const copied = run(seq, { bufferFrames });
    const tr = createTracker({ bufferFrames });
    const out: FrameObservation[] = [];
    const held = new Set<number>();
    const released: number[] = [];
    for (let t = 0; t < seq.frames.length; t++) {
      const data = Uint8Array.from(seq.frames[t]);
      held.add(t);
      const o = tr.push({ data, width: seq.width, height: seq.height }, () => {
        released.push(t);
        held.delete(t);
        data.fill(255); // a released buffer is overwritten at once: reading it again would change the observations
      });
      if (o) out.push(o);
      // At most the buffer's frames (and the previous one for the causal tracker) are held.
      expect(held.size).toBeLessThanOrEqual(Math.max(bufferFrames, 2));
    }
    out.push(...tr.flush());
    expect(held.size).toBe(0);
    expect(released.slice().sort((a, b) => a - b)).toEqual(seq.frames.map((_, i) => i));
    expect(out).toEqual(copied);
  });

  it('emits with a lag of K − 1 frames (null while it fills), flush returns the rest in order; bufferFrames 1 is the causal tracker', () => {
    const frames = seq.frames.slice(0, 30);
    const tr = createTracker({ bufferFrames: 8 });
    const got: (FrameObservation | null)[] = frames.map((data) => tr.push({ data, width: seq.width, height: seq.height }));
    expect(tr.lagFrames).toBe(7);
    expect(got.slice(0, 7).every((g) => g === null)).toBe(true);
    expect(got.slice(7).map((g) => g!.frame)).toEqual(Array.from({ length: 23 }, (_, i) => i));
    expect(tr.flush().map((g) => g.frame)).toEqual([23, 24, 25, 26, 27, 28, 29]);
    expect(() => tr.push({ data: frames[0], width: seq.width, height: seq.height })).toThrow(/flush/);
    const causal = createTracker({ bufferFrames: 1 });
    expect(frames.map((data) => causal.push({ data, width: seq.width, height: seq.height })!.frame)).toEqual(frames.map((_, i) => i));
    expect(causal.flush()).toEqual([]);
    // Default K at 640×480: 48 frames (15 MB); with carryBackfill 96 (29 MB), under the 64 MiB cap (218 frames at this size).
    const def = createTracker();
    def.push({ data: frames[0], width: seq.width, height: seq.height });
    expect(def.lagFrames).toBe(47);
    const carry = createTracker({ carryBackfill: true });
    carry.push({ data: frames[0], width: seq.width, height: seq.height });
    expect(carry.lagFrames).toBe(95);
  });

  it('tracks small coins (16 and 24 px at 480×360, 20 px at 1280×720 on the coarser search grid) with the default minimum size, edge-on slivers included, and never a fingertip', () => {
    for (const [d, width, height] of [[16, 480, 360], [24, 480, 360], [20, 1280, 720]]) {
      const sq = tossSequence({ seed: 4, width, height, diameterPx: d, apexY: 60, frames: 80 });
      const o = run(sq);
      let n = 0, found = 0, thin = 0, thinFound = 0;
      const catchStart = sq.hands.findIndex((h, t) => t > 20 && h !== null);
      for (let t = 0; t < o.length; t++) {
        const c = sq.coins[t]!.ellipse;
        if (o[t].detected && t > 14 && t < catchStart) {
          // from the release (frame 14) to the catch: every detection is on the coin, none on the hand
          expect(Math.hypot(o[t].cx - c.cx, o[t].cy - c.cy), `d ${d} frame ${t}`).toBeLessThan(0.25 * d);
        }
        if (!isolated(sq, t) || t < 20) continue;
        n++;
        if (o[t].detected) {
          found++;
          // 1.5 px: on edge-on slivers of small coins the centre along the sliver is off by up to ~1.2 px; the rest are ~0.1 px
          expect(Math.hypot(o[t].cx - c.cx, o[t].cy - c.cy), `d ${d} frame ${t}`).toBeLessThan(1.5);
        }
        if (c.minor / c.major < 0.15) { thin++; if (o[t].detected) thinFound++; }
      }
      expect(n).toBeGreaterThan(30);
      expect(found / n, `d ${d}`).toBeGreaterThanOrEqual(0.95);
      expect(thin).toBeGreaterThanOrEqual(2);
      // Slivers of a 16 px coin are about 1 px thick: half of them is what the moments and outline fits keep.
      expect(thinFound, `d ${d}: ${thinFound} of ${thin}`).toBeGreaterThanOrEqual(Math.ceil(thin / 2));
    }
  });

  it('rejects frames of a different size', () => {
    const tr = createTracker();
    tr.push({ data: new Uint8Array(16), width: 4, height: 4 });
    expect(() => tr.push({ data: new Uint8Array(25), width: 5, height: 5 })).toThrow(/5x5/);
  });

  it('carryBackfill: on a rendered clip (coin edge-on between the fingers at the release) reports the coin in the hand before the release, within 1.5 px of the truth', async () => {
    // sample-clips/toss-0001: rendered with known motion (truth file beside it); 240 fps, release at frame 8.4.
    const file = new URL('../../sample-clips/toss-0001.mp4', import.meta.url).pathname;
    const truth = JSON.parse(readFileSync(file.replace(/\.mp4$/, '.truth.json'), 'utf8')) as {
      release_t_s: number; capture_fps: number; frames: { ellipse: { cx: number; cy: number } }[];
    };
    const release = truth.release_t_s * truth.capture_fps;
    const [a, b] = await runTwo(file, {}, { carryBackfill: true });
    expect(b.map((o) => o.frame)).toEqual(a.map((o) => o.frame));
    // Without the second pass the back-fill stops after the release (the problem this option addresses).
    expect(a.filter((o) => o.detected && o.frame < release).length).toBe(0);
    const before = b.filter((o) => o.detected && o.frame < release);
    expect(before.length).toBeGreaterThanOrEqual(3);
    // Every frame the option adds or changes lies on the rendered coin.
    let added = 0;
    for (const o of b) {
      const p = a[o.frame];
      if (!o.detected || (p.detected && p.cx === o.cx && p.cy === o.cy)) continue;
      added++;
      const e = truth.frames[o.frame].ellipse;
      expect(Math.hypot(o.cx - e.cx, o.cy - e.cy), `frame ${o.frame}`).toBeLessThan(1.5);
    }
    expect(added).toBeGreaterThanOrEqual(before.length);
    for (const o of before) expect(o.backfilled && o.occluded && o.method === 'boundary', `frame ${o.frame}`).toBe(true);
  });
  it('carryBackfill at 1000 fps: the carried run before the release keeps the drawn path up to one offset (matched against its reference frame)', async () => {
    // sample-clips/toss-0003: rendered with known motion; the hand carries the coin for some 20 frames before the
    // release. The run's centres share the error of the patch it started from; about it they keep the drawn path
    // within 0.2 px (0.15 here; chained from frame to frame 0.18 on this short carry, while on the 2000 frames/s
    // clips of the accuracy set the chain drifted 0.4–1.4 px and moved the release by 1–3 frames).
    const file = new URL('../../sample-clips/toss-0003.mp4', import.meta.url).pathname;
    const truth = JSON.parse(readFileSync(file.replace(/\.mp4$/, '.truth.json'), 'utf8')) as {
      release_t_s: number; capture_fps: number; frames: { ellipse: { cx: number; cy: number } }[];
    };
    const release = truth.release_t_s * truth.capture_fps;
    const [obs] = await runTwo(file, { carryBackfill: true }, { carryBackfill: true });
    const carried = obs.filter((o) => o.detected && o.frame < release && o.method === 'boundary' && Number.isNaN(o.fitRms));
    expect(carried.length).toBeGreaterThanOrEqual(15);
    const err = carried.map((o) => [o.cx - truth.frames[o.frame].ellipse.cx, o.cy - truth.frames[o.frame].ellipse.cy]);
    const mx = err.reduce((a, e) => a + e[0], 0) / err.length, my = err.reduce((a, e) => a + e[1], 0) / err.length;
    for (let k = 0; k < err.length; k++) expect(Math.hypot(err[k][0] - mx, err[k][1] - my), `frame ${carried[k].frame}`).toBeLessThan(0.2);
  });

  it('followIntoHand: on rendered clips, the frames it adds (the coin reaching the catching fingers, or turned to the gray of the background) lie within 3 px of the drawn coin', async () => {
    // sample-clips toss-0001 (240 fps) and toss-0003 (1000 fps): rendered with known motion (truth files beside them).
    for (const name of ['toss-0001', 'toss-0003']) {
      const file = new URL(`../../sample-clips/${name}.mp4`, import.meta.url).pathname;
      const truth = JSON.parse(readFileSync(file.replace(/\.mp4$/, '.truth.json'), 'utf8')) as {
        catch_t_s: number; capture_fps: number; frames: { ellipse: { cx: number; cy: number } | null }[];
      };
      const catchFrame = truth.catch_t_s * truth.capture_fps;
      const [a, b] = await runTwo(file, { followIntoHand: false }, {});
      let added = 0;
      for (const o of b) {
        const p = a[o.frame];
        if (!o.detected || o.frame >= catchFrame || (p.detected && p.cx === o.cx && p.cy === o.cy)) continue;
        added++;
        const e = truth.frames[o.frame].ellipse!;
        expect(Math.hypot(o.cx - e.cx, o.cy - e.cy), `${name} frame ${o.frame}`).toBeLessThan(3);
      }
      expect(added, name).toBeGreaterThanOrEqual(5);
      const last = (obs: FrameObservation[]) => Math.max(...obs.filter((o) => o.detected).map((o) => o.frame));
      expect(last(b), name).toBeGreaterThanOrEqual(last(a));
    }
  });
  it('followHeld: on rendered clips, the coin held after the catch is followed with the hand; each held run keeps the drawn path up to its start offset', async () => {
    // sample-clips toss-0001 (240 fps) and toss-0003 (1000 fps): rendered with known motion (truth files beside them).
    for (const name of ['toss-0001', 'toss-0003']) {
      const file = new URL(`../../sample-clips/${name}.mp4`, import.meta.url).pathname;
      const truth = JSON.parse(readFileSync(file.replace(/\.mp4$/, '.truth.json'), 'utf8')) as {
        catch_t_s: number; capture_fps: number; frames: { ellipse: { cx: number; cy: number } | null }[];
      };
      const catchFrame = truth.catch_t_s * truth.capture_fps;
      const [off, on] = await runTwo(file, { followHeld: false }, {});
      expect(off.some((o) => o.heldInHand), name).toBe(false);
      const held = on.filter((o) => o.heldInHand);
      expect(held.length, name).toBeGreaterThanOrEqual(8);
      let start: { frame: number; ex: number; ey: number } | null = null;
      for (const o of held) {
        // Held means moving with the hand: never while the coin is still in flight.
        expect(o.frame, name).toBeGreaterThan(catchFrame);
        expect([o.method, o.occluded, Number.isNaN(o.fitRms)], `${name} frame ${o.frame}`).toEqual(['boundary', true, true]);
        const e = truth.frames[o.frame].ellipse!;
        const ex = o.cx - e.cx, ey = o.cy - e.cy;
        if (!start || !on[o.frame - 1].heldInHand) start = { frame: o.frame, ex, ey };
        // Matched against the run's first frame (not chained from frame to frame), the path keeps to the drawn one
        // within 0.15 px here (a chain of sub-pixel steps drifted 1 px over 20 frames).
        const drift = Math.hypot(ex - start.ex, ey - start.ey);
        expect(drift, `${name} frame ${o.frame}`).toBeLessThan(0.15);
      }
    }
  });
});
