import { mkdir, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { atomicWriteFile } from '../../src/dataset/atomicWriteFile.ts';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tossmeter-atomic-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('atomicWriteFile', () => {
  it('writes text and bytes, replaces an existing file, and leaves no temporary file', async () => {
    const file = join(dir, 'a.txt');
    await writeFile(file, 'old content that is longer');
    await atomicWriteFile(file, 'new ✓');
    expect(await readFile(file, 'utf8')).toBe('new ✓');
    await atomicWriteFile(join(dir, 'b.bin'), new Uint8Array([0, 255, 7]));
    expect([...(await readFile(join(dir, 'b.bin')))]).toEqual([0, 255, 7]);
    expect((await readdir(dir)).sort()).toEqual(['a.txt', 'b.bin']);
  });

  it('on failure (the target is a folder) throws, removes its temporary file and keeps the target', async () => {
    const target = join(dir, 'taken');
    await mkdir(target);
    await writeFile(join(target, 'inside'), 'x');
    await expect(atomicWriteFile(target, 'data')).rejects.toThrow();
    expect(await readdir(dir)).toEqual(['taken']);
    expect(await readdir(target)).toEqual(['inside']);
  });

  it('fails when the folder does not exist', async () => {
    await expect(atomicWriteFile(join(dir, 'missing', 'x.txt'), 'data')).rejects.toThrow(/ENOENT/);
  });
});
