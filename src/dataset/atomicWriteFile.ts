/**
 * Writes a file so that readers see either the old content or the new one, never half of it.
 */
import { randomBytes } from 'node:crypto';
import { open, rename, rm } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';

/**
 * Writes `data` to a temporary file in the same folder (`.<name>.<pid>.<random>.tmp`), flushes it
 * to disk, then renames it over `path` (atomic on POSIX file systems). On any error the temporary
 * file is removed and the error is rethrown; `path` is then untouched. The folder must exist.
 *
 * @param path - destination file
 * @param data - text (written as UTF-8) or bytes
 */
export async function atomicWriteFile(path: string, data: string | Uint8Array): Promise<void> {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(6).toString('hex')}.tmp`);
  try {
    const handle = await open(tmp, 'wx');
    try {
      await handle.writeFile(data);
      await handle.sync();
    } finally {
      await handle.close();
    }
    await rename(tmp, path);
  } catch (err) {
    await rm(tmp, { force: true });
    throw err;
  }
}
