/**
 * Seeded fuzzing: 200 mutants of a tiny rendered clip (bytes flipped, cut short, blocks repeated) each go
 * through `measureClip`, and 200 mutants of a sample manifest through `parseManifest`. Every clip mutant must end
 * within its time limit with a row that the dataset writer accepts (a `failed` row naming the clip, or a measured
 * one); every manifest mutant must give a manifest whose rows keep the format's promises, or a `ManifestError`
 * naming the file. Nothing else may come out: no other exception, no hang.
 *
 * Mutation-based fuzzing of file inputs (bit flips, truncation, block duplication) is common practice, no source.
 * Set TOSSMETER_FUZZ_SEED to try another sequence; the default seed keeps CI deterministic.
 */
import { writeFile, readFile } from 'node:fs/promises';
import { isAbsolute, join, relative, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FRAME_FIELDS, ManifestError, TOSS_FIELDS, canonicalRows, parseManifest } from '../../src/dataset/index.ts';
import { measureClip, type ClipJob, type ClipResult } from '../../src/pipeline/clip.ts';
import { ffmpegPath, fileUrl, runChild } from '../../src/video/index.ts';
import { renderTiny, tempDir } from '../pipeline/fixtures.ts';
import { mulberry32 } from '../helpers/mulberry32.ts';

const SEED = Number(process.env.TOSSMETER_FUZZ_SEED ?? 20240601);
const MUTANTS = 200;
/** Per-mutant guard against a hang: far above the ~1 s a mutant takes, below the video layer's own 30 s floor ×2. */
const MUTANT_LIMIT_MS = 60_000;

const prng = mulberry32;

/** One mutant of `src`: kind 0 flips 1–24 bytes, 1 cuts the file short, 2 repeats 1–3 blocks of 16–4096 bytes in place. */
function mutate(src: Uint8Array, k: number, rand: () => number): { bytes: Uint8Array; what: string } {
  const int = (n: number) => Math.floor(rand() * n);
  switch (k % 3) {
    case 0: {
      const out = Uint8Array.from(src);
      const n = 1 + int(24);
      for (let i = 0; i < n; i++) out[int(out.length)] ^= 1 + int(255);
      return { bytes: out, what: `${n} bytes flipped` };
    }
    case 1: {
      const at = int(src.length);
      return { bytes: src.slice(0, at), what: `cut at ${at} of ${src.length}` };
    }
    default: {
      let out = src;
      const n = 1 + int(3);
      for (let i = 0; i < n; i++) {
        const len = 16 + int(4081);
        const from = int(Math.max(1, out.length - len));
        const to = int(out.length);
        const block = out.slice(from, from + len);
        const next = new Uint8Array(out.length + block.length);
        next.set(out.subarray(0, to), 0);
        next.set(block, to);
        next.set(out.subarray(to), to + block.length);
        out = next;
      }
      return { bytes: out, what: `${n} blocks repeated` };
    }
  }
}

let dir = '';
let cleanup: () => Promise<void> = async () => {};
let sample: Uint8Array = new Uint8Array(0);

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('tossmeter-fuzz-'));
  const tiny = await renderTiny(join(dir, 'tiny'));
  // The index (moov) first, as cameras and `-movflags +faststart` write it: then a cut clip keeps its first frames.
  const fast = join(dir, 'sample.mp4');
  const remux = await runChild(ffmpegPath(), ['-hide_banner', '-nostdin', '-i', fileUrl(tiny), '-c', 'copy', '-movflags', '+faststart', '-y', fileUrl(fast)], { timeoutMs: 60_000 });
  expect(remux.code, remux.stderrTail).toBe(0);
  sample = new Uint8Array(await readFile(fast));
}, 120_000);

afterAll(async () => {
  await cleanup();
});

function job(file: string, name: string): ClipJob {
  return {
    file,
    displayFile: name,
    tossId: name.replace(/\.mp4$/, ''),
    tosser: null,
    captureFps: 200,
    fpsSource: 'manifest',
    coinDiameterMm: 24.26,
    coinThicknessMm: 1.75,
    scaleSource: 'manifest',
    focalPx: null,
    startFace: null,
    observedFace: null,
    landing: null,
    notes: null,
    gravity: 9.80665,
  };
}

async function withinLimit(p: Promise<ClipResult>, name: string): Promise<ClipResult> {
  let timer: NodeJS.Timeout | undefined;
  const limit = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${name}: no result within ${MUTANT_LIMIT_MS} ms`)), MUTANT_LIMIT_MS);
  });
  try {
    return await Promise.race([p, limit]);
  } finally {
    clearTimeout(timer);
  }
}

describe('fuzzed clips through measureClip', () => {
  it(`${MUTANTS} seeded mutants of a tiny clip each give a row the dataset accepts, within the time limit`, async () => {
    const unmutated = await measureClip(job(join(dir, 'sample.mp4'), 'sample.mp4'));
    expect(unmutated.toss.status, String(unmutated.toss.error)).not.toBe('failed');
    const rand = prng(SEED);
    const mutants = Array.from({ length: MUTANTS }, (_, k) => ({ k, name: `mutant-${String(k).padStart(3, '0')}.mp4`, ...mutate(sample, k, rand) }));
    const outcomes = new Map<string, number>();
    const started = performance.now();
    let next = 0;
    // Two at a time: most of a mutant's time is spent waiting for ffprobe and ffmpeg.
    const lane = async (): Promise<void> => {
      while (next < mutants.length) {
        const m = mutants[next++];
        const file = join(dir, m.name);
        await writeFile(file, m.bytes);
        const r = await withinLimit(measureClip(job(file, m.name)), `${m.name} (${m.what})`);
        const where = `${m.name} (${m.what})`;
        expect(r.toss.file, where).toBe(m.name);
        expect(['ok', 'flagged', 'failed'], where).toContain(r.toss.status);
        // The dataset writer takes the row as it is (types, enums, required cells): a bad row would sink the whole study.
        expect(() => canonicalRows('tosses', TOSS_FIELDS, [r.toss]), where).not.toThrow();
        expect(() => canonicalRows('frames', FRAME_FIELDS, r.frames), where).not.toThrow();
        if (r.toss.status === 'failed') {
          expect(r.toss.error, where).toMatch(new RegExp(`^clip "${m.name}": .{4,}`));
          expect(r.frames, where).toEqual([]);
        } else {
          expect(r.frames.length, where).toBeGreaterThan(0);
          expect(r.frames.every((f) => f.toss_id === r.toss.toss_id), where).toBe(true);
        }
        const key: string = r.toss.status === 'failed' ? `failed: ${String(r.toss.error).slice(m.name.length + 8).replace(/\(.*$/, '').replace(/\d+/g, 'N').trim().slice(0, 60)}` : String(r.toss.status);
        outcomes.set(key, (outcomes.get(key) ?? 0) + 1);
      }
    };
    await Promise.all([lane(), lane()]);
    const seconds = (performance.now() - started) / 1000;
    process.stdout.write(`\nclip fuzz, seed ${SEED}: ${MUTANTS} mutants in ${seconds.toFixed(1)} s\n${[...outcomes].sort((a, b) => b[1] - a[1]).map(([k, n]) => `  ${String(n).padStart(3)}  ${k}`).join('\n')}\n`);
    expect([...outcomes.values()].reduce((a, b) => a + b, 0)).toBe(MUTANTS);
  }, 600_000);
});

describe('fuzzed manifests through parseManifest', () => {
  const SAMPLE = [
    'file,toss_id,capture_fps,coin_diameter_mm,coin_thickness_mm,tosser,start_face,observed_face,landing,notes,focal_px',
    'toss-0001.mp4,toss-0001,1000,24.26,1.75,T01,heads,tails,caught,trainee session A,554.3',
    'sub/toss-0002.mp4,toss-0002,1000,24.26,1.75,T02,tails,tails,surface,"said ""ok"", then tossed",554.3',
    'toss-0003.mp4,,500,,,T03,,,,,',
  ].join('\n');
  /** Byte strings that mean something to a CSV reader or a path, spliced in by the fuzzer. */
  const TOKENS = ['"', ',', ';', '\n', '\r\n', '\r', '..', '/', '\\', '../', '/etc/passwd', 'C:\\x', '\0', '-1', '0', 'NaN', 'Infinity', '1e999', 'HEADS', 'edge', '\uFEFF', 'é', '\xff\xfe', '=cmd|x', ' ', ''];

  it(`${MUTANTS} seeded mutants each give a manifest that keeps the format's promises, or a ManifestError`, () => {
    const rand = prng(SEED + 1);
    const int = (n: number) => Math.floor(rand() * n);
    const base = Buffer.from(SAMPLE, 'utf8');
    let accepted = 0;
    let refused = 0;
    for (let k = 0; k < MUTANTS; k++) {
      let bytes: Uint8Array;
      if (k % 4 === 3) {
        const at = int(base.length);
        const token = TOKENS[int(TOKENS.length)];
        const tokenBytes = token === '\xff\xfe' ? Buffer.from([0xff, 0xfe]) : Buffer.from(token, 'utf8');
        bytes = Buffer.concat([base.subarray(0, at), tokenBytes, base.subarray(at + int(4))]);
      } else bytes = mutate(base, k, rand).bytes;
      const label = `fuzz-${k}.csv`;
      const studyDir = resolve('/study');
      let manifest;
      try {
        manifest = parseManifest(bytes, label, studyDir);
      } catch (err) {
        expect(err, `mutant ${k}: ${String(err)}`).toBeInstanceOf(ManifestError);
        expect((err as ManifestError).message.startsWith(`${label} `), `mutant ${k}`).toBe(true);
        refused++;
        continue;
      }
      accepted++;
      expect(manifest.columns.map((c) => c.toLowerCase())).toContain('file');
      const ids = new Set<string>();
      for (const row of manifest.rows) {
        const where = `mutant ${k}, ${JSON.stringify(row)}`;
        const abs = resolve(studyDir, row.file);
        const rel = relative(studyDir, abs);
        expect(rel === '' || rel.startsWith('..') || isAbsolute(rel), where).toBe(false);
        expect(row.file.includes('\0'), where).toBe(false);
        for (const v of [row.captureFps, row.coinDiameterMm, row.coinThicknessMm, row.focalPx]) {
          if (v !== undefined) expect(Number.isFinite(v) && v > 0, where).toBe(true);
        }
        for (const face of [row.startFace, row.observedFace]) if (face !== undefined) expect(['heads', 'tails'], where).toContain(face);
        expect(ids.has(row.tossId), where).toBe(false);
        ids.add(row.tossId);
      }
    }
    process.stdout.write(`\nmanifest fuzz, seed ${SEED + 1}: ${accepted} accepted, ${refused} refused with a ManifestError\n`);
    expect(accepted + refused).toBe(MUTANTS);
    // The fuzzer must reach both sides, or it tests nothing.
    expect(accepted).toBeGreaterThan(10);
    expect(refused).toBeGreaterThan(10);
  });
});
