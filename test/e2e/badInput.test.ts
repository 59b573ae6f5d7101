/**
 * Bad input, end to end through the CLI (`main(argv)` in-process): a corpus of broken, odd and hostile clips and
 * manifests made at test time. Each bad clip gives a `failed` or `flagged` row and a message naming it, the exit
 * code is the documented one (1 when a clip failed or is flagged with no rotation measured, 2 for a manifest that
 * cannot be used), and the good clips beside them are measured byte for byte as in a run without the bad ones.
 * Nothing crashes or hangs.
 *
 * Exit codes and the one-row-per-clip rule are this project's contract (README, DEVELOPERS.md); the CSV formula
 * guard follows the OWASP "CSV Injection" guidance (owasp.org community page, 2014 onward: prefix a cell that starts
 * with = + - @ tab or CR with a single quote).
 */
import { copyFile, mkdir, readFile, readdir, symlink, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readTosses, type TossRow } from '../../src/dataset/index.ts';
import { encodeFrames, ffmpegPath, fileUrl, runChild } from '../../src/video/index.ts';
import { linesFor, readCsvRecords, renderSmall, renderTiny, runCli, tempDir, type CliRun } from '../pipeline/fixtures.ts';

let root = '';
let cleanup: () => Promise<void> = async () => {};
/** The two good clips' folder (with its manifest) and the corpus folder (good clips + every bad one). */
let base = '';
let corpus = '';
let tiny = '';
let corpusRun: CliRun;
let corpusRows: TossRow[] = [];

/** Deterministic bytes (xorshift32), so the "random" clip is the same on every run. */
function pseudoRandomBytes(n: number, seed: number): Uint8Array {
  const out = new Uint8Array(n);
  let s = seed >>> 0 || 1;
  for (let i = 0; i < n; i++) {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    out[i] = s & 0xff;
  }
  return out;
}

/** File names that a shell or ffmpeg's own parsing would misread; each is a copy of the tiny clip. */
const ODD_NAMES = ['with space.mp4', 'ünïcødé-硬币.mp4', '-i evil.mp4', '-y.mp4', `quote'"s.mp4`, '$(touch pwned).mp4', '`touch pwned2`.mp4', 'concat:a|b.mp4', '..dots.mp4'];

/** What each bad clip is expected to give: the statuses it may have (a documented behaviour each). */
const BAD: Record<string, 'failed' | 'failed-or-flagged'> = {
  'empty.mp4': 'failed', // zero bytes
  'random.mp4': 'failed', // random bytes
  'cut10.mp4': 'failed', // truncated (moov atom at the end is gone)
  'cut50.mp4': 'failed',
  'cut99.mp4': 'failed',
  'picture.mov': 'failed-or-flagged', // a PNG: ffmpeg reads one still frame, no toss in it
  'audio.mp4': 'failed', // no video stream
  'nocoin.mp4': 'failed-or-flagged', // frames of noise, no coin
  'oneframe.mp4': 'failed-or-flagged', // a single frame: no flight to fit
  'outside.mp4': 'failed', // symbolic link to a clip outside the input folder
  'ghost.mp4': 'failed', // a manifest row for a clip that does not exist
};

beforeAll(async () => {
  ({ dir: root, cleanup } = await tempDir('tossmeter-badinput-'));
  base = join(root, 'base');
  corpus = join(root, 'corpus');
  await mkdir(corpus);
  await renderSmall(base); // toss-0001.mp4, toss-0002.mp4 and manifest.csv
  for (const f of ['toss-0001.mp4', 'toss-0002.mp4']) await copyFile(join(base, f), join(corpus, f));
  const manifest = await readFile(join(base, 'manifest.csv'), 'utf8');
  await writeFile(join(corpus, 'manifest.csv'), `${manifest.trimEnd()}\nghost.mp4,ghost,500,,,T09,,,,,\n`);

  const clip = await readFile(join(base, 'toss-0001.mp4'));
  await writeFile(join(corpus, 'empty.mp4'), new Uint8Array(0));
  await writeFile(join(corpus, 'random.mp4'), pseudoRandomBytes(64 * 1024, 7));
  for (const pct of [10, 50, 99]) await writeFile(join(corpus, `cut${pct}.mp4`), clip.subarray(0, Math.floor((clip.length * pct) / 100)));
  await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 200, g: 120, b: 40 } } }).png().toFile(join(corpus, 'picture.mov'));
  const audio = await runChild(ffmpegPath(), ['-hide_banner', '-nostdin', '-f', 'lavfi', '-i', 'sine=frequency=440:duration=1', '-c:a', 'aac', '-y', fileUrl(join(corpus, 'audio.mp4'))], { timeoutMs: 60_000 });
  expect(audio.code, audio.stderrTail).toBe(0);
  const noise = (k: number) => pseudoRandomBytes(320 * 240, 100 + k).map((v) => 120 + (v % 16));
  await encodeFrames(join(corpus, 'nocoin.mp4'), Array.from({ length: 60 }, (_, k) => noise(k)), { width: 320, height: 240, pixFmt: 'gray', containerFps: 30, codec: 'h264', preset: 'ultrafast' });
  await encodeFrames(join(corpus, 'oneframe.mp4'), [noise(0)], { width: 320, height: 240, pixFmt: 'gray', containerFps: 30, codec: 'h264', preset: 'ultrafast' });

  // Two coins: two clips rendered at 160x240 side by side.
  const pair = join(root, 'pair');
  const [a, b] = await renderSmall(pair, { width: 160, height: 240, seed: 11, focalPx: 277 });
  const stack = await runChild(ffmpegPath(), ['-hide_banner', '-nostdin', '-i', fileUrl(a), '-i', fileUrl(b), '-filter_complex', 'hstack=inputs=2:shortest=1', '-c:v', 'libx264', '-preset', 'ultrafast', '-crf', '18', '-pix_fmt', 'yuv420p', '-y', fileUrl(join(corpus, 'twocoins.mp4'))], { timeoutMs: 120_000 });
  expect(stack.code, stack.stderrTail).toBe(0);
  // A coin that leaves the top of the frame and comes back: 3.5 m/s rises 0.62 m, the frame shows ±0.26 m at 0.6 m.
  const [high] = await renderSmall(join(root, 'high'), { count: 1, seed: 7, launchSpeedMS: [3.5, 3.5] });
  await copyFile(high, join(corpus, 'outandback.mp4'));

  tiny = await renderTiny(join(root, 'tiny'));
  await copyFile(tiny, join(corpus, 'plain.mp4'));
  for (const name of ODD_NAMES) await copyFile(tiny, join(corpus, name));
  await mkdir(join(root, 'elsewhere'));
  await copyFile(tiny, join(root, 'elsewhere', 'real.mp4'));
  await symlink(join(root, 'elsewhere', 'real.mp4'), join(corpus, 'outside.mp4'));

  // The whole corpus in one run, two clips at a time (the worker pool); the baseline below runs in this thread.
  corpusRun = await runCli(['measure', corpus, '--out', join(root, 'corpus-out'), '--fps', '500', '--jobs', '2']);
  // Read back through the dataset reader: typed values, the formula guard undone (a name like "-i evil.mp4" is
  // written as "'-i evil.mp4" in the CSV).
  corpusRows = await readTosses(join(root, 'corpus-out', 'tosses.csv'));
  process.stdout.write(`\nbad-input corpus:\n${corpusRows.map((r) => `  ${r.file}: ${r.status} ${r.flags} ${r.error ?? ''}`).join('\n')}\n`);
}, 600_000);

afterAll(async () => {
  await cleanup();
});

const rowOf = (file: string) => corpusRows.find((r) => r.file === file);

describe('a folder of bad clips', () => {
  it('exits 1 and writes one row per clip or manifest row, nothing dropped', () => {
    expect(corpusRun.code).toBe(1);
    const expected = ['toss-0001.mp4', 'toss-0002.mp4', 'twocoins.mp4', 'outandback.mp4', 'plain.mp4', ...ODD_NAMES, ...Object.keys(BAD)].sort();
    expect(corpusRows.map((r) => r.file).sort()).toEqual(expected);
  });

  it('exits 1 for a clip with no coin in it alone (flagged or failed, no rotation measured: unusable)', async () => {
    const dir = join(root, 'nocoin-only');
    await mkdir(dir, { recursive: true });
    await copyFile(join(corpus, 'nocoin.mp4'), join(dir, 'nocoin.mp4'));
    const run = await runCli(['measure', dir, '--out', join(root, 'nocoin-out'), '--fps', '500', '--quiet']);
    const rows = await readTosses(join(root, 'nocoin-out', 'tosses.csv'));
    expect(rows.length).toBe(1);
    expect(rows[0].spin_rev_s).toBeNull();
    expect(run.code).toBe(1);
  });

  it.each(Object.entries(BAD))('%s gives a %s row and a message that names it', (file, expectation) => {
    const row = rowOf(file)!;
    expect(row, file).toBeDefined();
    if (expectation === 'failed') {
      expect(row.status).toBe('failed');
      expect(row.flags).toBe('not_measured');
    } else {
      expect(['failed', 'flagged']).toContain(row.status);
    }
    if (row.status === 'failed') {
      expect(row.error).toContain(`clip "${file}"`);
      expect(corpusRun.stderr).toContain(`${file}: failed: clip "${file}"`);
    } else {
      expect(row.flags).not.toBe('');
      expect(corpusRun.stderr).toMatch(new RegExp(`\\] ${file.replace('.', '\\.')}: flagged \\(`));
    }
  });

  it('says why: empty, not a video, truncated, outside the folder, missing', () => {
    expect(rowOf('empty.mp4')!.error).toMatch(/empty|no data|0 bytes/i);
    expect(rowOf('outside.mp4')!.error).toBe('clip "outside.mp4": refused, it resolves outside the input folder');
    expect(rowOf('ghost.mp4')!.error).toBe('clip "ghost.mp4": listed in the manifest but the file does not exist');
    for (const f of ['random.mp4', 'audio.mp4', 'cut10.mp4', 'cut50.mp4', 'cut99.mp4']) expect(String(rowOf(f)!.error).length).toBeGreaterThan(`clip "${f}": `.length + 5);
    // The manifest's values still reach a row that could not be measured.
    expect(rowOf('ghost.mp4')!.tosser).toBe('T09');
  });

  it('gives the two-coin and the out-and-back clips a row without crashing (measured one coin, or flagged)', () => {
    for (const f of ['twocoins.mp4', 'outandback.mp4']) {
      const row = rowOf(f)!;
      expect(['ok', 'flagged', 'failed'], f).toContain(row.status);
      if (row.status === 'failed') expect(row.error).toContain(`clip "${f}"`);
      else expect(Number(row.frames_total)).toBeGreaterThan(100);
    }
    // The coin that left the frame: its frames touch the edge or go undetected, so the row must carry a flag.
    expect(rowOf('outandback.mp4')!.status).not.toBe('ok');
  });

  it('reads every odd file name as a plain file: same measurement as the same clip named plain.mp4, no command run', async () => {
    const plain = rowOf('plain.mp4')!;
    expect(plain.status).not.toBe('failed');
    const measured = (r: TossRow) => {
      const { toss_id: _id, file: _file, ...rest } = r;
      return rest;
    };
    for (const name of ODD_NAMES) {
      const row = rowOf(name)!;
      expect(row, name).toBeDefined();
      expect(measured(row), name).toEqual(measured(plain));
    }
    const everywhere = [...(await readdir(corpus)), ...(await readdir(root)), ...(await readdir(process.cwd()))];
    expect(everywhere).not.toContain('pwned');
    expect(everywhere).not.toContain('pwned2');
  });

  it('measures the good clips exactly as a run without the bad ones (tosses.csv and frames.csv rows, --jobs 2 vs 1)', async () => {
    const clean = await runCli(['measure', base, '--out', join(root, 'base-out'), '--fps', '500', '--jobs', '1']);
    expect(clean.code).toBeLessThanOrEqual(1);
    const good = new Set(['toss-0001', 'toss-0002']);
    for (const table of ['tosses.csv', 'frames.csv']) {
      const withBad = linesFor(await readFile(join(root, 'corpus-out', table), 'utf8'), 'toss_id', (v) => good.has(v));
      const without = linesFor(await readFile(join(root, 'base-out', table), 'utf8'), 'toss_id', (v) => good.has(v));
      expect(withBad.length, table).toBeGreaterThan(table === 'tosses.csv' ? 1 : 100);
      expect(withBad, table).toEqual(without);
    }
  });
});

describe('manifests that cannot be used: exit 2, a message naming the file, row and column, nothing written', () => {
  const header = 'file,toss_id,capture_fps,tosser,start_face';
  const cases: [string, string | Uint8Array, RegExp][] = [
    ['no file column', 'clip,toss_id\nplain.mp4,a\n', /header: expected a column named "file"/],
    ['an unknown face word', `${header}\nplain.mp4,a,500,T01,edge\n`, /row 1, column start_face: expected heads or tails but received "edge"/],
    ['a negative rate', `${header}\nplain.mp4,a,-500,T01,heads\n`, /row 1, column capture_fps: expected a positive number but received "-500"/],
    ['a zero rate', `${header}\nplain.mp4,a,0,T01,heads\n`, /row 1, column capture_fps: expected a positive number but received "0"/],
    ['a duplicate toss_id', `${header}\nplain.mp4,a,500,T01,heads\nother.mp4,a,500,T02,tails\n`, /row 2, column toss_id: expected a unique toss_id but received "a", already used in row 1/],
    ['a path outside the folder', `${header}\n../elsewhere/real.mp4,a,500,T01,heads\n`, /row 1, column file: expected a clip path relative to the manifest's folder/],
    ['an absolute path', `${header}\n/etc/passwd,a,500,T01,heads\n`, /row 1, column file: expected a clip path relative/],
    ['bytes that are not UTF-8', Buffer.concat([Buffer.from(`${header}\nplain.mp4,a,500,`), Buffer.from([0x54, 0xe9, 0x30, 0x31]), Buffer.from(',heads\n')]), /row 1, column tosser: expected UTF-8 text/],
  ];
  it.each(cases)('%s', async (_what, text, message) => {
    const dir = join(root, `manifest-${_what.replace(/\W+/g, '-')}`);
    await mkdir(dir, { recursive: true });
    await copyFile(tiny, join(dir, 'plain.mp4'));
    await writeFile(join(dir, 'manifest.csv'), text);
    const out = join(dir, 'out');
    const run = await runCli(['measure', dir, '--out', out]);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain(join(dir, 'manifest.csv'));
    expect(run.stderr).toMatch(message);
    const written = await readdir(out).catch(() => []);
    expect(written).toEqual([]);
  });
});

describe('manifests in other spellings are read the same (BOM, CRLF, semicolons)', () => {
  const rows = ['file,toss_id,capture_fps,tosser,start_face', 'plain.mp4,t-7,200,T07,heads'];
  const variants: [string, string | Uint8Array][] = [
    ['plain', `${rows.join('\n')}\n`],
    ['a UTF-8 BOM', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(`${rows.join('\n')}\n`)])],
    ['CRLF line ends', `${rows.join('\r\n')}\r\n`],
    ['a semicolon delimiter', `${rows.map((r) => r.replaceAll(',', ';')).join('\n')}\n`],
  ];
  let reference = '';
  it.each(variants)('%s', async (what, text) => {
    const dir = join(root, 'spelling', what.replace(/\W+/g, '-'));
    await mkdir(dir, { recursive: true });
    await copyFile(tiny, join(dir, 'plain.mp4'));
    await writeFile(join(dir, 'manifest.csv'), text);
    // One output folder for all four: the same clip and the same manifest values make the same cache key,
    // so only the first spelling measures; each still writes its whole dataset.
    const out = join(root, 'spelling-out');
    const run = await runCli(['measure', dir, '--out', out]);
    expect(run.code).toBeLessThanOrEqual(1);
    const tosses = await readFile(join(out, 'tosses.csv'), 'utf8');
    const [row] = await readCsvRecords(join(out, 'tosses.csv'));
    expect([row.toss_id, row.tosser, row.start_face, row.capture_fps, row.fps_source]).toEqual(['t-7', 'T07', 'heads', '200', 'manifest']);
    if (what === 'plain') reference = tosses;
    else {
      expect(run.stderr).toContain('kept from an earlier run');
      expect(tosses).toBe(reference);
    }
  });
});

describe('spreadsheet formula guard through a full measure', () => {
  it('writes a tosser named =HYPERLINK(...) with a leading quote in tosses.csv, as text in Parquet', async () => {
    const dir = join(root, 'guard');
    await mkdir(dir);
    await copyFile(tiny, join(dir, 'plain.mp4'));
    const evil = '=HYPERLINK("http://example.invalid/x","open me")';
    // The toss id is shell syntax too: manifest values never reach a shell (children get argument arrays).
    await writeFile(join(dir, 'manifest.csv'), `file,toss_id,capture_fps,tosser,notes\nplain.mp4,$(touch pwned5),200,"${evil.replaceAll('"', '""')}",@SUM(1+1)\n`);
    const run = await runCli(['measure', dir, '--out', join(dir, 'out')]);
    expect(run.code).toBeLessThanOrEqual(1);
    const [row] = await readCsvRecords(join(dir, 'out', 'tosses.csv'));
    expect(row.tosser).toBe(`'${evil}`);
    expect(row.notes).toBe(`'@SUM(1+1)`);
    expect(row.toss_id).toBe('$(touch pwned5)');
    expect([...(await readdir(dir)), ...(await readdir(process.cwd()))]).not.toContain('pwned5');
    const back = await readTosses(join(dir, 'out', 'tosses.csv'));
    expect(back[0].tosser).toBe(evil);
    const parquet = await readTosses(join(dir, 'out', 'tosses.parquet'));
    expect(parquet[0].tosser).toBe(evil);
  });
});
