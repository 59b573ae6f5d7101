import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkInputFile, fileUrl } from '../../src/video/inputFile.ts';
import { tempDir } from './fixtures.ts';

describe('fileUrl', () => {
  it('prefixes file: so a leading dash or a colon cannot be read as an option or a protocol', () => {
    expect(fileUrl('/clips/-x.mp4')).toBe('file:/clips/-x.mp4');
    expect(fileUrl('/clips/http:a.mp4')).toBe('file:/clips/http:a.mp4');
  });
});

describe('checkInputFile', () => {
  it('gives the absolute path and size of a readable file; missing and folder are VideoErrors', async () => {
    const { dir, cleanup } = await tempDir();
    try {
      const f = join(dir, 'x y.bin');
      await writeFile(f, new Uint8Array(123));
      expect(await checkInputFile(f)).toEqual({ abs: f, sizeBytes: 123 });
      await expect(checkInputFile(join(dir, 'none'))).rejects.toMatchObject({ code: 'missing' });
      await expect(checkInputFile(join(f, 'below-a-file'))).rejects.toMatchObject({ code: 'missing' });
      await mkdir(join(dir, 'sub'));
      await expect(checkInputFile(join(dir, 'sub'))).rejects.toMatchObject({ code: 'unreadable', message: `clip "${join(dir, 'sub')}": is a folder, not a video file` });
    } finally {
      await cleanup();
    }
  });
});
