/**
 * Checks an input clip on disk before any child sees it, and names it for
 * ffmpeg: always `file:` + the absolute path, so a name that begins with `-`
 * or holds `:` is still read as a plain file.
 */
import { constants } from 'node:fs';
import { access, stat } from 'node:fs/promises';
import { resolve } from 'node:path';
import { VideoError } from './errors.ts';

/** A checked input: its absolute path and size. */
export interface InputFile {
  /** The absolute path. */
  abs: string;
  /** Its size in bytes. */
  sizeBytes: number;
}

/** The ffmpeg/ffprobe input URL of an absolute path: `file:` + path. */
export function fileUrl(abs: string): string {
  return `file:${abs}`;
}

/**
 * Resolves `file` to an absolute path and checks it is a readable regular file.
 * Throws a {@link VideoError}: `missing` (no such file), `unreadable` (a folder,
 * a device or pipe, no permission). An empty file passes (the probe names it).
 */
export async function checkInputFile(file: string): Promise<InputFile> {
  const abs = resolve(file);
  let sizeBytes: number;
  try {
    const st = await stat(abs);
    if (st.isDirectory()) throw new VideoError(file, 'unreadable', 'is a folder, not a video file');
    if (!st.isFile()) throw new VideoError(file, 'unreadable', 'is not a regular file (a device, socket or pipe)');
    sizeBytes = st.size;
  } catch (err) {
    if (err instanceof VideoError) throw err;
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'ENOTDIR') throw new VideoError(file, 'missing', 'no such file', { cause: err });
    throw new VideoError(file, 'unreadable', `cannot be read (${code ?? (err as Error).message})`, { cause: err });
  }
  try {
    await access(abs, constants.R_OK);
  } catch (err) {
    throw new VideoError(file, 'unreadable', 'no permission to read it', { cause: err });
  }
  return { abs, sizeBytes };
}
