/**
 * Plain words for an input path that cannot be opened: a symbolic-link loop or a link to nothing
 * is said as such instead of "does not exist" (which sends the user looking for a missing file).
 * Returns `fallback` for an ordinary missing path.
 * @example missingPathText('clip.mp4', 'clip.mp4 does not exist')
 *   // → "clip.mp4 is a symbolic link that points, through other links, back to itself (a loop)"
 */
import { lstatSync, readlinkSync, realpathSync } from 'node:fs';

export function missingPathText(path: string, fallback: string): string {
  try {
    realpathSync(path);
    return fallback;
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ELOOP') return `${path} is a symbolic link that points, through other links, back to itself (a loop)`;
    try {
      if (lstatSync(path).isSymbolicLink()) return `${path} is a symbolic link to ${readlinkSync(path)}, which does not exist`;
    } catch {
      // plainly missing
    }
    if (code === 'ENOTDIR') return `${path} goes through a file as if it were a folder`;
    return fallback;
  }
}
