/**
 * Writes a file so that readers never see it half-written: the bytes go to a temporary file in
 * the same folder (same file system, so the rename is atomic on POSIX), which is then renamed
 * over the target. On failure the temporary file is removed and the error re-thrown.
 * Creates missing parent folders. Overwrites an existing target: callers decide beforehand
 * whether that is allowed (see `assertNoClobber`).
 * @example await writeFileAtomic('run/report.html', '<!doctype html>…')
 */
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { randomBytes } from 'node:crypto';

export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  const dir = dirname(path);
  await mkdir(dir, { recursive: true });
  const temp = join(dir, `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  try {
    await writeFile(temp, data);
    await rename(temp, path);
  } catch (err) {
    await rm(temp, { force: true });
    throw err;
  }
}
