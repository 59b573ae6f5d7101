import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.ts';
import { ManifestError, ManifestRowSchema, parseManifest, readManifest } from '../../src/dataset/manifest.ts';

const L = 'manifest.csv';
const msg = (text: string | Uint8Array): string => {
  try {
    parseManifest(text, L);
  } catch (err) {
    expect(err).toBeInstanceOf(ManifestError);
    return (err as Error).message;
  }
  throw new Error('expected parseManifest to throw');
};

let root: string;
beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tossmeter-manifest-'));
});
afterAll(async () => {
  await rm(root, { recursive: true, force: true });
});

describe('parseManifest', () => {
  const full =
    'file,toss_id,capture_fps,coin_diameter_mm,coin_thickness_mm,tosser,start_face,observed_face,landing,notes,focal_px,camera\n' +
    'T01/001.mp4,T01-001,1000,24.26,1.75,T01,heads,Tails,caught,"windy, door open",1850,A\n' +
    'T01/002.mov,,,,,T01,,,,,,\n';

  it('parses every documented column into camelCase typed fields and keeps unknown columns in extra', () => {
    const m = parseManifest(full, L);
    expect(m.columns).toEqual(['file', 'toss_id', 'capture_fps', 'coin_diameter_mm', 'coin_thickness_mm', 'tosser',
      'start_face', 'observed_face', 'landing', 'notes', 'focal_px', 'camera']);
    expect(m.rows[0]).toEqual({ file: 'T01/001.mp4', tossId: 'T01-001', captureFps: 1000, coinDiameterMm: 24.26,
      coinThicknessMm: 1.75, tosser: 'T01', startFace: 'heads', observedFace: 'tails', landing: 'caught',
      notes: 'windy, door open', focalPx: 1850, extra: { camera: 'A' } });
  });

  it('empty cells are absent (not 0) and toss_id defaults to the file name without extension', () => {
    expect(parseManifest(full, L).rows[1]).toEqual({ file: 'T01/002.mov', tossId: '002', tosser: 'T01', extra: {} });
    expect(parseManifest('file\nclip.take2.mp4\n', L).rows[0].tossId).toBe('clip.take2');
    expect(parseManifest('FILE , Capture_FPS\n a.mp4 , 500 \n', L).rows[0]).toMatchObject({ file: 'a.mp4', captureFps: 500 });
  });

  it('accepts a UTF-8 BOM (bytes and string), CRLF line ends, and a semicolon delimiter with decimal points', () => {
    const bom = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('file,tosser\r\na.mp4,Zoë\r\nb.mp4,T02\r\n')]);
    expect(parseManifest(bom, L).rows.map((r) => [r.file, r.tosser])).toEqual([['a.mp4', 'Zoë'], ['b.mp4', 'T02']]);
    expect(parseManifest('\uFEFFfile\r\na.mp4\r\n', L).rows[0].file).toBe('a.mp4');
    const semi = parseManifest('file;capture_fps;notes\r\na.mp4;1000.5;"one, two; three"\r\n;;\r\n', L);
    expect(semi.rows).toEqual([{ file: 'a.mp4', tossId: 'a', captureFps: 1000.5, notes: 'one, two; three', extra: {} }]);
  });

  it('skips blank lines and rows of empty cells without renumbering what follows', () => {
    expect(msg('file,capture_fps\na.mp4,1\n,\nc.mp4,0\n')).toBe('manifest.csv row 3, column capture_fps: expected a positive number but received "0"');
  });

  it('rejects a manifest without a file column, or an empty one', () => {
    expect(msg('clip,capture_fps\na.mp4,1000\n')).toBe('manifest.csv header: expected a column named "file" but found "clip", "capture_fps"');
    expect(msg('')).toBe('manifest.csv header: expected a header row with a "file" column but the file is empty');
    expect(msg('file,File\na,b\n')).toBe('manifest.csv header: column File: expected each column once but it appears twice');
  });

  it('rejects non-positive or non-numeric rates, diameters, thicknesses and focal lengths', () => {
    const head = 'file,capture_fps,coin_diameter_mm,coin_thickness_mm,focal_px\n';
    expect(msg(`${head}a.mp4,1000\nb.mp4,1000\nc.mp4,-5\n`)).toBe('manifest.csv row 3, column capture_fps: expected a positive number but received "-5"');
    expect(msg(`${head}a.mp4,fast\n`)).toBe('manifest.csv row 1, column capture_fps: expected a positive number but received "fast"');
    expect(msg(`${head}a.mp4,1000,0\n`)).toBe('manifest.csv row 1, column coin_diameter_mm: expected a positive number but received "0"');
    expect(msg(`${head}a.mp4,1000,24,-1.7\n`)).toBe('manifest.csv row 1, column coin_thickness_mm: expected a positive number but received "-1.7"');
    expect(msg(`${head}a.mp4,1000,24,1.7,Infinity\n`)).toBe('manifest.csv row 1, column focal_px: expected a positive number but received "Infinity"');
    expect(msg('file;capture_fps\na.mp4;1000,5\n')).toBe('manifest.csv row 1, column capture_fps: expected a positive number but received "1000,5"');
  });

  it('rejects an unknown face word or landing', () => {
    expect(msg('file,start_face\na.mp4,heads\nb.mp4,edge\n')).toBe('manifest.csv row 2, column start_face: expected heads or tails but received "edge"');
    expect(msg('file,observed_face\na.mp4,H\n')).toBe('manifest.csv row 1, column observed_face: expected heads or tails but received "H"');
    expect(msg('file,landing\na.mp4,floor\n')).toBe('manifest.csv row 1, column landing: expected caught or surface but received "floor"');
  });

  it('rejects a duplicate toss_id, given or taken from the file name', () => {
    expect(msg('file,toss_id\na.mp4,X\nb.mp4,X\n')).toBe('manifest.csv row 2, column toss_id: expected a unique toss_id but received "X", already used in row 1');
    expect(msg('file\nT01/a.mp4\nT02/a.mov\n')).toBe(
      'manifest.csv row 2, column toss_id: expected a unique toss_id but received "a" (taken from the file name; give each row a toss_id), already used in row 1');
  });

  it('rejects a file that leaves the manifest folder: absolute, drive letter, UNC, or ".."', () => {
    const want = (v: string, row = 1) =>
      `manifest.csv row ${row}, column file: expected a clip path relative to the manifest's folder (not absolute, no "..") but received ${JSON.stringify(v)}`;
    for (const v of ['/data/a.mp4', '../a.mp4', 'clips/../../a.mp4', 'C:\\clips\\a.mp4', 'C:a.mp4', '\\\\server\\share\\a.mp4', 'a\\..\\..\\b.mp4', '.', './']) {
      expect(msg(`file\n"${v}"\n`)).toBe(want(v));
    }
    expect(msg('file,tosser\n,T01\n')).toBe('manifest.csv row 1, column file: expected a clip path relative to the manifest\'s folder (not absolute, no "..") but the cell is empty');
    expect(parseManifest('file\n./clips/..a.mp4\n', L).rows[0].file).toBe('./clips/..a.mp4');
  });

  it('rejects bytes that are not UTF-8 and says in which row and column', () => {
    const latin1 = Buffer.concat([Buffer.from('file,tosser\na.mp4,T01\nb.mp4,Zo'), Buffer.from([0xeb]), Buffer.from('\n')]);
    expect(msg(latin1)).toBe('manifest.csv row 2, column tosser: expected UTF-8 text but found bytes that are not UTF-8 (save the manifest as UTF-8)');
  });

  it('rejects values in cells beyond the header and unreadable CSV', () => {
    expect(msg('file,tosser\na.mp4,T01,surplus\n')).toBe('manifest.csv row 1: expected at most 2 cells, one per named header column, but found a value "surplus" in cell 3');
    expect(msg('file,notes\na.mp4,"never closed\n')).toMatch(/^manifest\.csv line \d+: not readable as CSV \(Quote Not Closed/);
  });

  it('ManifestError is a UsageError carrying file, row and column', () => {
    try {
      parseManifest('file,capture_fps\na.mp4,-1\n', L);
    } catch (err) {
      expect(err).toBeInstanceOf(UsageError);
      expect(err).toMatchObject({ name: 'ManifestError', file: L, row: 1, column: 'capture_fps' });
      return;
    }
    throw new Error('expected a ManifestError');
  });

  it('ManifestRowSchema never turns an empty string into 0', () => {
    expect(ManifestRowSchema.safeParse({ file: 'a.mp4', captureFps: '' }).success).toBe(false);
    expect(ManifestRowSchema.safeParse({ file: 'a.mp4', captureFps: '  ' }).success).toBe(false);
    expect(ManifestRowSchema.parse({ file: 'a.mp4', captureFps: ' 250 ' })).toMatchObject({ captureFps: 250, tossId: 'a', extra: {} });
  });
});

describe('readManifest', () => {
  it('reads a file, names it in messages, and takes clip paths relative to its folder', async () => {
    const file = join(root, 'manifest.csv');
    await writeFile(file, 'file,capture_fps\na.mp4,2000\n');
    const m = await readManifest(file);
    expect(m).toMatchObject({ file, dir: root, rows: [{ file: 'a.mp4', captureFps: 2000 }] });
    await writeFile(file, 'file,capture_fps\na.mp4,-5\n');
    await expect(readManifest(file)).rejects.toThrow(`${file} row 1, column capture_fps: expected a positive number but received "-5"`);
    await expect(readManifest(join(root, 'none.csv'))).rejects.toThrow(`${join(root, 'none.csv')}: cannot read the manifest (ENOENT)`);
  });
});
