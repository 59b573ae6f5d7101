import { constants } from 'node:fs';
import { access, chmod, stat, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { ffmpegPath, ffmpegVersion, ffprobePath, ffprobeVersion } from '../../src/video/paths.ts';
import { tempDir } from './fixtures.ts';

const require = createRequire(import.meta.url);
const saved = { ffmpeg: process.env.TOSSMETER_FFMPEG, ffprobe: process.env.TOSSMETER_FFPROBE };
afterEach(() => {
  for (const [k, v] of [['TOSSMETER_FFMPEG', saved.ffmpeg], ['TOSSMETER_FFPROBE', saved.ffprobe]] as const) {
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  }
});

describe('ffmpegPath / ffprobePath', () => {
  it('name the bundled binaries, executable', async () => {
    delete process.env.TOSSMETER_FFMPEG;
    delete process.env.TOSSMETER_FFPROBE;
    expect(ffmpegPath()).toBe((require('@ffmpeg-installer/ffmpeg') as { path: string }).path);
    expect(ffprobePath()).toBe((require('@ffprobe-installer/ffprobe') as { path: string }).path);
    await access(ffmpegPath(), constants.X_OK);
    await access(ffprobePath(), constants.X_OK);
  });

  it('follow TOSSMETER_FFMPEG / TOSSMETER_FFPROBE, and add a missing execute bit themselves', async () => {
    const { dir, cleanup } = await tempDir();
    try {
      const fake = join(dir, 'my ffprobe');
      await writeFile(fake, '#!/bin/sh\necho "ffprobe version 9.9-test"\n');
      await chmod(fake, 0o644);
      process.env.TOSSMETER_FFPROBE = fake;
      expect(ffprobePath()).toBe(fake);
      expect((await stat(fake)).mode & 0o111).toBe(0o111);
      expect(await ffprobeVersion()).toBe('9.9-test');
      process.env.TOSSMETER_FFMPEG = 'ffmpeg-from-path';
      expect(ffmpegPath()).toBe('ffmpeg-from-path');
    } finally {
      await cleanup();
    }
  });

  it('throw a clear error when the override names no file', () => {
    process.env.TOSSMETER_FFMPEG = '/nonexistent/bin/ffmpeg';
    expect(() => ffmpegPath()).toThrow(/^ffmpeg named by TOSSMETER_FFMPEG "\/nonexistent\/bin\/ffmpeg" is not a file .*; set TOSSMETER_FFMPEG to an executable ffmpeg build, or unset it$/);
  });
});

describe('ffmpegVersion', () => {
  it('matches the build the installer package records (its git hash)', async () => {
    delete process.env.TOSSMETER_FFMPEG;
    // @ffmpeg-installer/linux-x64's package.json records the build as "<date>-g<hash>".
    const pkg = require(`@ffmpeg-installer/${process.platform}-${process.arch}/package.json`) as { ffmpeg: string };
    const hash = pkg.ffmpeg.split('-').pop() ?? '';
    expect(hash).toMatch(/^g[0-9a-f]{7,}$/);
    expect(await ffmpegVersion()).toContain(hash);
  });
});
